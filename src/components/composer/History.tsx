/** A command's revisions, newest first; editors can put any of them back. Loaded when asked for (kept out of the page's first load). */
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../lib/client/api';
import { commandKeys } from '../../lib/client/keys';

interface Rev { id: string; version: number; action: string; userName: string; summary: string; createdAt: string }

export default function History({ commandId, canRestore, onRestored }: { commandId: string; canRestore: boolean; onRestored: (c: any) => void }) {
  const qc = useQueryClient();
  const q = useQuery({ queryKey: commandKeys.history(commandId), queryFn: () => api<{ version: number; items: Rev[] }>(`/api/commands/${commandId}/revisions`) });
  const restore = useMutation({
    mutationFn: (rev: Rev) => api<{ command: any }>(`/api/commands/${commandId}/restore`, { body: { revisionId: rev.id, version: q.data!.version } }),
    onSuccess: (r) => { qc.invalidateQueries({ queryKey: commandKeys.all() }); onRestored(r.command); },
  });
  if (q.isPending) return <p className="text-sm">Loading history…</p>;
  if (q.isError) return <p className="notice notice-bad text-sm" role="alert">{q.error.message}</p>;
  return (
    <div>
      {restore.isError && <p className="notice notice-bad text-sm mb-2" role="alert">{restore.error.message}</p>}
      <ol className="grid gap-1 text-sm" data-testid="history">
        {q.data.items.map((r) => (
          <li key={r.id} className="flex flex-wrap items-center gap-x-3 gap-y-1 border-b border-line py-1">
            <span className="mono">v{r.version}</span>
            <span className="flex-1 min-w-[10rem]">{r.summary}</span>
            <span className="text-muted text-xs">{r.userName} · {new Date(r.createdAt).toLocaleString()}</span>
            {canRestore && r.version !== q.data.version && (
              <button type="button" className="btn btn-quiet btn-sm" disabled={restore.isPending} onClick={() => restore.mutate(r)}>Restore v{r.version}</button>
            )}
          </li>
        ))}
      </ol>
    </div>
  );
}
