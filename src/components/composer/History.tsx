/**
 * A command's revisions, newest first; editors can put any of them back. Loaded when asked for (kept out of the
 * page's first load). A restore names the version the composer shows; if someone saved since, nothing is restored:
 * their change is shown in the one conflict notice and the restore is asked again over their version.
 */
import { lazy, Suspense, useState } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../lib/client/api';
import { commandKeys } from '../../lib/client/keys';
import { useConflict } from '../../lib/client/use-conflict';
import { commandShape, segmentIsLeaf, type CommandShape } from './command-conflict';
import { draftOf, type CommandDraft } from './types';

const CommandConflict = /* @__PURE__ */ lazy(() => import('./CommandConflict'));

interface Rev { id: string; version: number; action: string; userName: string; summary: string; createdAt: string }
type Saved = CommandDraft & { id: string; version: number };

interface Props {
  commandId: string;
  canRestore: boolean;
  /** The version the composer shows, and its draft: what a restore is sent over and their change is counted from. */
  seen: { version: number; draft: CommandDraft };
  onRestored: (c: Saved) => void;
  /** "Keep version N" after a conflict: nothing is written; the composer may show their version. */
  onKeep: (c: Saved) => void;
}

export default function History({ commandId, canRestore, seen, onRestored, onKeep }: Props) {
  const qc = useQueryClient();
  const q = useQuery({ queryKey: commandKeys.history(commandId), queryFn: () => api<{ version: number; items: Rev[] }>(`/api/commands/${commandId}/revisions`) });
  const conflicts = useConflict<CommandDraft, Saved, CommandShape>(commandShape, segmentIsLeaf);
  const conflict = conflicts.conflict;
  const [asked, setAsked] = useState<Rev | null>(null);
  const restore = useMutation({
    mutationFn: ({ rev, version }: { rev: Rev; version: number }) =>
      api<{ command: Saved }>(`/api/commands/${commandId}/restore`, { body: { revisionId: rev.id, version } }),
    onSuccess: (r) => { conflicts.clear(); setAsked(null); qc.invalidateQueries({ queryKey: commandKeys.all() }); onRestored(r.command); },
    onError: (err, { rev }) => {
      if (!conflicts.take(err, seen.draft, seen.draft)) return;
      setAsked(rev);
      qc.invalidateQueries({ queryKey: commandKeys.history(commandId) });
    },
  });
  if (q.isPending) return <p className="text-sm">Loading history…</p>;
  if (q.isError) return <p className="notice notice-bad text-sm" role="alert">{q.error.message}</p>;
  const theirs = conflict && draftOf(conflict.current);
  return (
    <div>
      {restore.isError && !conflict && <p className="notice notice-bad text-sm mb-2" role="alert">{restore.error.message}</p>}
      {conflict && theirs && asked && (
        <div className="mb-2">
          <Suspense fallback={<p className="notice notice-warn text-sm" role="alert">Someone else saved this command meanwhile; loading the comparison…</p>}>
            <CommandConflict version={conflict.version} rows={conflict.rows} base={conflict.base} mine={conflict.mine} theirs={theirs} busy={restore.isPending}
              ask={{
                title: `Someone else saved this command while you were looking at version ${seen.version}; it is now at version ${conflict.version}.`,
                explain: `Nothing was restored. Their change is below. Restoring revision ${asked.version} now puts the whole command back as it was then, undoing their change too; or keep version ${conflict.version} as they saved it.`,
                reapplyLabel: `Restore revision ${asked.version} over version ${conflict.version}`,
                discardLabel: `Keep version ${conflict.version}`,
              }}
              onReapply={() => restore.mutate({ rev: asked, version: conflict.version })}
              onDiscard={() => { const c = conflict.current; conflicts.clear(); setAsked(null); onKeep(c); }} />
          </Suspense>
        </div>
      )}
      <ol className="grid gap-1 text-sm" data-testid="history">
        {q.data.items.map((r) => (
          <li key={r.id} className="flex flex-wrap items-center gap-x-3 gap-y-1 border-b border-line py-1">
            <span className="mono">v{r.version}</span>
            <span className="flex-1 min-w-[10rem]">{r.summary}</span>
            <span className="text-muted text-xs">{r.userName} · {new Date(r.createdAt).toLocaleString()}</span>
            {canRestore && r.version !== seen.version && r.version !== q.data.version && (
              <button type="button" className="btn btn-quiet btn-sm" disabled={restore.isPending} onClick={() => restore.mutate({ rev: r, version: seen.version })}>Restore v{r.version}</button>
            )}
          </li>
        ))}
      </ol>
    </div>
  );
}
