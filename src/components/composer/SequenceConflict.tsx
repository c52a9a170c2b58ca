/** The conflict notice of a sequence (loaded only when a save meets a 409, to keep the sequence page light). */
import { ConflictNotice } from '../ui/ConflictNotice';
import type { ConflictRow } from '../../lib/client/conflict';
import { sequencePartLabel, sequencePartValue } from './sequence-parts';

interface Props {
  version: number;
  rows: ConflictRow[];
  /** The name of a library command a step uses, as far as this page knows it. */
  nameOf(id: string): string | undefined;
  busy: boolean;
  onReapply(): void;
  onDiscard(): void;
}

export default function SequenceConflict({ version, rows, nameOf, busy, onReapply, onDiscard }: Props) {
  return (
    <ConflictNotice noun="sequence" version={version} busy={busy} rows={rows}
      label={sequencePartLabel} show={(p, v) => sequencePartValue(p, v, nameOf)}
      onReapply={onReapply} onDiscard={onDiscard} />
  );
}
