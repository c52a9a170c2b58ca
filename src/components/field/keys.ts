/** TanStack Query keys of the field-work islands (kept here, beside them, rather than in the shared key file). */
export const fieldKeys = {
  log: (deviceId: string) => ['field', 'log', deviceId] as const,
  attachments: (ownerType: string, ownerId: string) => ['field', 'attachments', ownerType, ownerId] as const,
  shares: () => ['field', 'shares'] as const,
};
