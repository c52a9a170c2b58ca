/**
 * Moving a command to the trash from the library sends the version listed. If someone saved the command since,
 * nothing moves: their change is shown in the one conflict notice and the move is asked again with their version.
 */
import { lazy, Suspense } from 'react';
import { useMutation } from '@tanstack/react-query';
import { api } from '../../lib/client/api';
import { useConflict } from '../../lib/client/use-conflict';
import { commandShape, segmentIsLeaf, type CommandShape } from './command-conflict';
import { draftOf, type CommandDraft } from './types';

const CommandConflict = lazy(() => import('./CommandConflict'));

type Listed = CommandDraft & { id: string; version: number };

/** `mutate()` moves the command as listed; `notice` is the conflict notice while one is open (else null). */
export function useCommandTrash(item: Listed, onDone: () => void) {
  const conflicts = useConflict<CommandDraft, Listed, CommandShape>(commandShape, segmentIsLeaf);
  const conflict = conflicts.conflict;
  const m = useMutation({
    mutationFn: (version: number) => api(`/api/commands/${item.id}?version=${version}`, { method: 'DELETE' }),
    onSuccess: () => { conflicts.clear(); onDone(); },
    // The comparison starts from the command as listed when the move was first asked for.
    onError: (err) => { conflicts.take(err, conflict?.base ?? draftOf(item), conflict?.base ?? draftOf(item)); },
  });
  const theirs = conflict && draftOf(conflict.current);
  const notice = conflict && theirs && (
    <Suspense fallback={<p className="notice notice-warn text-sm" role="alert">Someone else saved this command meanwhile; loading the comparison…</p>}>
      <CommandConflict version={conflict.version} rows={conflict.rows} base={conflict.base} mine={conflict.mine} theirs={theirs} busy={m.isPending}
        ask={{
          explain: `Nothing was moved to the trash. Their change to command ${conflict.base.name} is below; move the command as it is now, or keep it.`,
          reapplyLabel: `Move version ${conflict.version} to the trash`,
          discardLabel: 'Keep it',
        }}
        onReapply={() => m.mutate(conflict.version)}
        onDiscard={() => { conflicts.clear(); onDone(); }} />
    </Suspense>
  );
  return { mutate: () => m.mutate(item.version), isPending: m.isPending, error: conflict ? null : m.error, notice: notice || null };
}
