/** History of one record: who changed which field from what to what; any revision can be restored. */
import { useState } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api, isStale } from '../../lib/client/api';
import { vaultKeys } from '../../lib/client/keys';
import { QueryProvider } from '../QueryProvider';
import { ErrorNotice, fieldLabel, Pager, showValue } from './shared';

interface Revision {
  id: string; version: number; action: string; userName: string; summary: string; createdAt: string;
  changes: { field: string; from: unknown; to: unknown }[];
}
interface PageOf<T> { items: T[]; total: number; page: number; pageSize: number }

const ACTION: Record<string, string> = { create: 'Created', update: 'Changed', delete: 'Moved to trash', restore: 'Back from trash', revert: 'Restored', copy: 'Settings copied' };

export function HistoryList({ type, id, canRestore, reload }: { type: string; id: string; canRestore: boolean; reload?: boolean }) {
  const qc = useQueryClient();
  const [page, setPage] = useState(1);
  const q = useQuery({ queryKey: vaultKeys.history(type, id, page), queryFn: () => api<PageOf<Revision>>(`/api/revisions?entityType=${type}&entityId=${id}&page=${page}&pageSize=10`) });
  const latest = q.data?.page === 1 ? q.data.items[0]?.version : undefined;
  const restore = useMutation({
    mutationFn: async (rev: Revision) => {
      // The record's current version is the newest revision's: restoring is refused if someone changed it since.
      const newest = await api<PageOf<Revision>>(`/api/revisions?entityType=${type}&entityId=${id}&pageSize=1`);
      if (latest !== undefined && newest.items[0]!.version !== latest) throw new Error('This record changed while you were looking; the history has been refreshed.');
      return api(`/api/revisions/${rev.id}/restore`, { body: { version: newest.items[0]!.version } });
    },
    onSuccess: () => (reload ? location.reload() : qc.invalidateQueries({ queryKey: vaultKeys.all() })),
    onSettled: () => qc.invalidateQueries({ queryKey: vaultKeys.historyOf(type, id) }),
  });
  if (q.isPending) return <p className="text-sm text-muted">Loading history…</p>;
  if (q.isError) return <ErrorNotice error={q.error} />;
  return (
    <div>
      {restore.isError && <ErrorNotice error={isStale(restore.error) ? new Error('Someone changed this record meanwhile; look at the newest version and try again.') : restore.error} />}
      <ol className="grid gap-2" data-testid="history">
        {q.data.items.map((r) => (
          <li key={r.id} className="border border-line rounded p-2 bg-white" data-version={r.version}>
            <div className="flex flex-wrap items-baseline gap-x-2 text-sm">
              <strong>v{r.version}</strong>
              <span>{ACTION[r.action] ?? r.action}</span>
              <span className="text-muted">by {r.userName || 'someone since removed'} · {new Date(r.createdAt).toLocaleString()}</span>
              {canRestore && r.version !== latest && !['delete', 'restore'].includes(r.action) && (
                <button type="button" className="btn btn-quiet btn-sm ml-auto" disabled={restore.isPending}
                  onClick={() => confirm(`Put this record back as it was at version ${r.version}? This is saved as a new version.`) && restore.mutate(r)}>
                  Restore v{r.version}
                </button>
              )}
            </div>
            {r.summary && <p className="text-sm">{r.summary}</p>}
            {r.action !== 'create' && r.changes.length > 0 && (
              <div className="overflow-x-auto">
                <table className="table text-xs mt-1">
                  <thead><tr><th>Field</th><th>From</th><th>To</th></tr></thead>
                  <tbody>
                    {r.changes.map((c) => (
                      <tr key={c.field}><td>{fieldLabel(c.field)}</td><td className="mono break-all">{showValue(c.from)}</td><td className="mono break-all">{showValue(c.to)}</td></tr>
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

export default function HistoryPanel(props: { type: string; id: string; canRestore: boolean; reload?: boolean }) {
  return (
    <QueryProvider>
      <HistoryList {...props} />
    </QueryProvider>
  );
}
