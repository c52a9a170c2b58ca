/**
 * Moving a command to the trash from the library sends the version listed. If someone saved the command since,
 * nothing moves: their change is shown in the one conflict notice and the move is asked again with their version.
 * A command that sequences use as a step is moved only after a second question naming them.
 */
import { lazy, Suspense } from 'react';
import { useMutation } from '@tanstack/react-query';
import { api, ApiError } from '../../lib/client/api';
import { useConflict } from '../../lib/client/use-conflict';
import { commandShape, segmentIsLeaf, type CommandShape } from './command-conflict';
import { draftOf, type CommandDraft } from './types';

const CommandConflict = /* @__PURE__ */ lazy(() => import('./CommandConflict'));

type Listed = CommandDraft & { id: string; version: number };

/** The sequences a command is a step of, when the server refused to move it for that reason. */
const usedByOf = (e: unknown): { name: string; steps: number[] }[] | null =>
  e instanceof ApiError && e.status === 409 && Array.isArray(e.body.usedBy) ? (e.body.usedBy as { name: string; steps: number[] }[]) : null;

/** `mutate()` moves the command as listed; `notice` is the conflict notice while one is open (else null). */
export function useCommandTrash(item: Listed, onDone: () => void) {
  const conflicts = useConflict<CommandDraft, Listed, CommandShape>(commandShape, segmentIsLeaf);
  const conflict = conflicts.conflict;
  const m = useMutation({
    mutationFn: async (version: number) => {
      const url = `/api/commands/${item.id}?version=${version}`;
      try {
        return await api(url, { method: 'DELETE' });
      } catch (e) {
        // A step of sequences: ask again, naming them, before leaving a gap in each.
        const used = usedByOf(e);
        if (!used) throw e;
        const list = used.map((u) => `"${u.name}" (step ${u.steps.join(', ')})`).join(', ');
        if (!confirm(`"${item.name}" is a step of ${list}. In the trash it leaves a gap there until it is restored or the step replaced. Move it to the trash anyway?`)) return null;
        return api(`${url}&confirmUsed=true`, { method: 'DELETE' });
      }
    },
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
