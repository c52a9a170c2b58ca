/**
 * History of one record: who changed which field from what to what; any revision can be restored. A restore names
 * the version the history shows as the newest; if someone saved since, nothing is restored: their change is shown
 * in the one conflict notice and the restore is asked again over their version.
 */
import { useState } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../lib/client/api';
import { vaultKeys } from '../../lib/client/keys';
import { useConflict } from '../../lib/client/use-conflict';
import { QueryProvider } from '../QueryProvider';
import { ConflictNotice } from '../ui/ConflictNotice';
import { ErrorNotice, Pager } from './shared';
import { historyFieldLabel, historySummary, historyValue, type Names } from './history-words';
import { revisionPartLabel, revisionPartValue, snapshotShape, type Snapshot } from './revision-parts';

interface Revision {
  id: string; version: number; action: string; userName: string; summary: string; createdAt: string;
  changes: { field: string; from: unknown; to: unknown }[];
  snapshot: Snapshot;
}
interface PageOf<T> { items: T[]; total: number; page: number; pageSize: number }
/** A restore: the revision, the version it is sent over, and the snapshot of the version seen (what their change is counted from). */
interface Attempt { rev: Revision; version: number; seen: Revision }

const ACTION: Record<string, string> = { create: 'Created', update: 'Changed', delete: 'Moved to trash', restore: 'Back from trash', revert: 'Restored', copy: 'Settings copied' };

/** `names` gives the names of records the history points at by id (a link's ports, a device's machine). */
export function HistoryList({ type, id, canRestore, reload, names = {} }: { type: string; id: string; canRestore: boolean; reload?: boolean; names?: Names }) {
  const qc = useQueryClient();
  const [page, setPage] = useState(1);
  const pageOf = (n: number) => () => api<PageOf<Revision>>(`/api/revisions?entityType=${type}&entityId=${id}&page=${n}&pageSize=10`);
  const q = useQuery({ queryKey: vaultKeys.history(type, id, page), queryFn: pageOf(page) });
  // The newest revision is the version the history shows; on a later page it comes from the first.
  const first = useQuery({ queryKey: vaultKeys.history(type, id, 1), queryFn: pageOf(1), enabled: page > 1 });
  const newest = (page === 1 ? q.data : first.data)?.items[0];
  const latest = newest?.version;
  const conflicts = useConflict<Snapshot, Snapshot & { version: number }>(snapshotShape(newest?.snapshot ?? {}));
  const conflict = conflicts.conflict;
  const [asked, setAsked] = useState<Pick<Attempt, 'rev' | 'seen'> | null>(null);
  const restore = useMutation({
    mutationFn: ({ rev, version }: Attempt) => api(`/api/revisions/${rev.id}/restore`, { body: { version } }),
    onSuccess: () => {
      conflicts.clear();
      setAsked(null);
      return reload ? location.reload() : qc.invalidateQueries({ queryKey: vaultKeys.all() });
    },
    onError: (err, { rev, seen }) => { if (conflicts.take(err, seen.snapshot, seen.snapshot)) setAsked({ rev, seen }); },
    onSettled: () => qc.invalidateQueries({ queryKey: vaultKeys.historyOf(type, id) }),
  });
  if (q.isPending) return <p className="text-sm text-muted">Loading history…</p>;
  if (q.isError) return <ErrorNotice error={q.error} />;
  return (
    <div>
      {restore.isError && !conflict && <ErrorNotice error={restore.error} />}
      {conflict && asked && (
        <div className="mb-2">
          <ConflictNotice noun={type} version={conflict.version} rows={conflict.rows} busy={restore.isPending}
            label={(p) => revisionPartLabel(type, p)} show={(p, v) => revisionPartValue(type, p, v)}
            title={`Someone else saved this ${type} while you were looking at version ${asked.seen.version}; it is now at version ${conflict.version}.`}
            explain={`Nothing was restored. Their change is below. Restoring revision ${asked.rev.version} now puts the whole ${type} back as it was then, undoing their change too; or keep version ${conflict.version} as they saved it.`}
            reapplyLabel={`Restore revision ${asked.rev.version} over version ${conflict.version}`} discardLabel={`Keep version ${conflict.version}`}
            onReapply={() => restore.mutate({ ...asked, version: conflict.version })}
            onDiscard={() => { conflicts.clear(); setAsked(null); qc.invalidateQueries({ queryKey: vaultKeys.all() }); }} />
        </div>
      )}
      <ol className="grid gap-2" data-testid="history">
        {q.data.items.map((r) => (
          <li key={r.id} className="border border-line rounded p-2 bg-white" data-version={r.version}>
            <div className="flex flex-wrap items-baseline gap-x-2 text-sm">
              <strong>v{r.version}</strong>
              <span>{ACTION[r.action] ?? r.action}</span>
              <span className="text-muted">by {r.userName || 'someone since removed'} · {new Date(r.createdAt).toLocaleString()}</span>
              {canRestore && r.version !== latest && !['delete', 'restore'].includes(r.action) && (
                <button type="button" className="btn btn-quiet btn-sm ml-auto" disabled={restore.isPending || !newest}
                  onClick={() => newest && confirm(`Put this record back as it was at version ${r.version}? This is saved as a new version.`) && restore.mutate({ rev: r, version: newest.version, seen: newest })}>
                  Restore v{r.version}
                </button>
              )}
            </div>
            {r.summary && <p className="text-sm">{historySummary(type, r.summary, r.changes)}</p>}
            {r.action !== 'create' && r.changes.length > 0 && (
              <div className="overflow-x-auto">
                <table className="table text-xs mt-1">
                  <thead><tr><th>Field</th><th>From</th><th>To</th></tr></thead>
                  <tbody>
                    {r.changes.map((c) => (
                      <tr key={c.field}><td>{historyFieldLabel(type, c.field)}</td><td className="break-words">{historyValue(type, c.field, c.from, names)}</td><td className="break-words">{historyValue(type, c.field, c.to, names)}</td></tr>
                    ))}
                  </tbody>
                </table>
              </div>
            )}
          </li>
        ))}
      </ol>
      {q.data.total > q.data.pageSize && <Pager page={page} pageSize={q.data.pageSize} total={q.data.total} onPage={setPage} />}
    </div>
  );
}

export default function HistoryPanel(props: { type: string; id: string; canRestore: boolean; reload?: boolean; names?: Names }) {
  return (
    <QueryProvider>
      <HistoryList {...props} />
    </QueryProvider>
  );
}
