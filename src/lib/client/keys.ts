/**
 * Every TanStack Query key of the islands, one factory per entity. A key names one request and so one data
 * shape: two queries with different query functions never share a key. Each factory's `all()` is the prefix
 * a save invalidates.
 */

/** The team: its members and open invitations. */
export const teamKeys = {
  members: (teamId: string) => ['members', teamId] as const,
};

/** The settings vault: every vault query starts with 'vault', so a save can refresh them all at once. */
export const vaultKeys = {
  all: () => ['vault'] as const,
  /** A page of `/api/{kind}` for these query parameters (`{ items, total, … }`). */
  list: (kind: string, params: Record<string, unknown>) => ['vault', kind, 'list', params] as const,
  /**
   * A machine's links with their check state (`/api/links?machineId=…&pageSize=200`), read by the machine page
   * and the device page's link box. A link's state depends on its ports and devices, so every port, device and
   * link write invalidates `all()`, which this key is under: no view of a link state waits for a reload.
   */
  linksOfMachine: (machineId: string) => ['vault', 'links', 'list', { machineId }] as const,
  /** One record as `/api/{kind}s/{id}` answers it. */
  record: (kind: string, id: string) => ['vault', kind, id] as const,
  /** Every page of one record's history. */
  historyOf: (type: string, id: string) => ['vault', 'history', type, id] as const,
  history: (type: string, id: string, page: number) => ['vault', 'history', type, id, page] as const,
  /** `/api/search` hits (devices, commands, port notes); the limit is part of the request. */
  search: (q: string, pageSize: number) => ['vault', 'search', q, pageSize] as const,
  trash: (page: number) => ['vault', 'trash', page] as const,
};

/** The command library: lists per device/profile, one command's history, and where a command can be copied to. */
export const commandKeys = {
  all: () => ['commands'] as const,
  list: (owner: { kind: string; id: string }, trashed = false) => ['commands', 'list', owner.kind, owner.id, trashed] as const,
  history: (id: string) => ['commands', 'history', id] as const,
  /** The devices and profiles a command can be copied to, as `{ value, label }` choices. */
  copyTargets: () => ['commands', 'copy-targets'] as const,
};

/** Field work: a device's field log and proposals, the files of a device or machine, the team's share links. */
export const fieldKeys = {
  log: (deviceId: string) => ['field', 'log', deviceId] as const,
  /** `/api/proposals?deviceId=` (pending ones). */
  proposals: (deviceId: string) => ['field', 'proposals', deviceId] as const,
  attachments: (ownerType: string, ownerId: string) => ['field', 'attachments', ownerType, ownerId] as const,
  shares: () => ['field', 'shares'] as const,
};

/** What this phone keeps for offline use (IndexedDB, not the API): kept cards and entries waiting to be sent. */
export const offlineKeys = {
  all: () => ['offline'] as const,
  kept: () => ['offline', 'kept'] as const,
  outbox: (deviceId?: string) => ['offline', 'outbox', deviceId ?? 'all'] as const,
};
