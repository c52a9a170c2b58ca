/** Commands on the record engine: their declaration is `commandEntity` (../records/entities.ts). */
import type { DbOrTx } from '../../../db/client';
import type { FieldChange } from '../../../db/schema';
import type { TeamContext } from '../guard';
import { notFound } from '../errors';
import { findInTeam, staleError, updateVersioned, type RevisionAction } from '../records/engine';
import { commandEntity, type CommandRow } from '../records/entities';

export type { CommandRow };

export const commandNotFound = () => notFound('command');

/** The command if it is the caller team's (and, unless `trashed`, not in the trash); 404 otherwise. */
export function findCommand(q: DbOrTx, ctx: TeamContext, id: string, opts: { trashed?: boolean } = {}): Promise<CommandRow> {
  return findInTeam(q, ctx, commandEntity, id, opts.trashed ? 'any' : 'live');
}

export const staleCommand = (current: CommandRow, version: number) => staleError(commandEntity, current, version);

/**
 * Applies `values` if the command is still at `version` and records a revision; 409 with the current
 * command when stale. `fromTrash` also takes it out of the trash.
 */
export function updateCommandVersioned(
  q: DbOrTx,
  ctx: TeamContext,
  id: string,
  version: number,
  values: Partial<CommandRow> | Record<string, unknown>,
  opts: { action?: RevisionAction; summary?: string; note?: string; fromTrash?: boolean } = {},
): Promise<{ row: CommandRow; changes: FieldChange[] }> {
  return updateVersioned(q, ctx, commandEntity, id, version, values, opts);
}
