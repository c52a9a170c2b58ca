/** TanStack Query key factory: one entry per entity, so invalidation stays consistent. */
export const keys = {
  members: (teamId: string) => ['members', teamId] as const,
};

/** The command library: lists per device/profile, one command, its history. */
export const commandKeys = {
  all: () => ['commands'] as const,
  list: (owner: { kind: string; id: string }, trashed = false) => ['commands', 'list', owner.kind, owner.id, trashed] as const,
  history: (id: string) => ['commands', 'history', id] as const,
  devices: () => ['commands', 'devices'] as const,
};
