/** The conflict notice of a command (loaded only when a write meets a 409, to keep the composer and library light). */
import { ConflictNotice } from '../ui/ConflictNotice';
import type { ConflictRow } from '../../lib/client/conflict';
import { orderRows } from './command-conflict';
import { commandPartLabel, commandPartValue } from './command-parts';
import type { CommandDraft } from './types';

interface Props {
  version: number;
  rows: ConflictRow[];
  base: CommandDraft;
  mine: CommandDraft;
  theirs: CommandDraft;
  busy: boolean;
  onReapply(): void;
  onDiscard(): void;
  /** For a write that is not an edit (moving to the trash, restoring a revision): its own words; mine is the base then. */
  ask?: { title?: string; explain: string; reapplyLabel: string; discardLabel: string };
}

export default function CommandConflict({ version, rows, base, mine, theirs, busy, onReapply, onDiscard, ask }: Props) {
  const versions = [mine, theirs, base];
  return (
    <ConflictNotice noun="command" version={version} busy={busy} rows={[...rows, ...orderRows(base, mine, theirs)]}
      label={(p) => commandPartLabel(p, ...versions)} show={(p, v) => commandPartValue(p, v, ...versions)}
      onReapply={onReapply} onDiscard={onDiscard} {...ask} />
  );
}
