/** TanStack Query key factory: one entry per entity, so invalidation stays consistent. */
export const keys = {
  members: (teamId: string) => ['members', teamId] as const,
};

/** The settings vault: every vault query starts with 'vault', so a save can refresh them all at once. */
export const vaultKeys = {
  all: () => ['vault'] as const,
  list: (kind: string, params: Record<string, unknown>) => ['vault', kind, 'list', params] as const,
  record: (kind: string, id: string) => ['vault', kind, id] as const,
  history: (type: string, id: string, page: number) => ['vault', 'history', type, id, page] as const,
  search: (q: string) => ['vault', 'search', q] as const,
  trash: (page: number) => ['vault', 'trash', page] as const,
  copy: (body: unknown) => ['vault', 'copy', body] as const,
};

/** The command library: lists per device/profile, one command, its history. */
export const commandKeys = {
  all: () => ['commands'] as const,
  list: (owner: { kind: string; id: string }, trashed = false) => ['commands', 'list', owner.kind, owner.id, trashed] as const,
  history: (id: string) => ['commands', 'history', id] as const,
  devices: () => ['commands', 'devices'] as const,
};
