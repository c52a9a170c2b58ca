/** The conflict notice of the composer's save (loaded only when a save meets a 409, to keep the composer light). */
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
}

export default function CommandConflict({ version, rows, base, mine, theirs, busy, onReapply, onDiscard }: Props) {
  const versions = [mine, theirs, base];
  return (
    <ConflictNotice noun="command" version={version} busy={busy} rows={[...rows, ...orderRows(base, mine, theirs)]}
      label={(p) => commandPartLabel(p, ...versions)} show={(p, v) => commandPartValue(p, v, ...versions)}
      onReapply={onReapply} onDiscard={onDiscard} />
  );
}
