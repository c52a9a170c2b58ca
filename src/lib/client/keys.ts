/** TanStack Query key factory: one entry per entity, so invalidation stays consistent. */
export const keys = {
  members: (teamId: string) => ['members', teamId] as const,
};
