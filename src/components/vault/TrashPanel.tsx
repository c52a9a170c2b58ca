/** The trash: what was deleted, by whom, with what; restore (engineers) or purge for good (admins). */
import { useState } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../lib/client/api';
import { vaultKeys } from '../../lib/client/keys';
import { QueryProvider } from '../QueryProvider';
import { ErrorNotice, Pager } from './shared';

interface Item { type: string; id: string; label: string; deletedAt: number; deletedByName: string | null; contents: number }
interface PageOf<T> { items: T[]; total: number; page: number; pageSize: number }

const PAGE = { site: 'sites', machine: 'machines', device: 'devices', link: 'links', profile: 'profiles' } as Record<string, string>;

function Trash({ canPurge }: { canPurge: boolean }) {
  const qc = useQueryClient();
  const [page, setPage] = useState(1);
  const [done, setDone] = useState<{ text: string; href?: string } | null>(null);
  const q = useQuery({ queryKey: vaultKeys.trash(page), queryFn: () => api<PageOf<Item>>(`/api/trash?page=${page}&pageSize=25`) });
  const refresh = () => qc.invalidateQueries({ queryKey: vaultKeys.all() });
  const restore = useMutation({
    mutationFn: (i: Item) => api(`/api/trash/${i.type}/${i.id}`, { method: 'POST', body: {} }),
    onSuccess: (_r, i) => { setDone({ text: `Restored ${i.type} ${i.label}.`, href: PAGE[i.type] ? `/vault/${PAGE[i.type]}/${i.id}` : undefined }); refresh(); },
  });
  const purge = useMutation({
    mutationFn: (i: Item) => api(`/api/trash/${i.type}/${i.id}`, { method: 'DELETE' }),
    onSuccess: (_r, i) => { setDone({ text: `Purged ${i.type} ${i.label} for good.` }); refresh(); },
  });
  if (q.isPending) return <p>Loading the trash…</p>;
  if (q.isError) return <ErrorNotice error={q.error} />;
  return (
    <div className="grid gap-3">
      <ErrorNotice error={restore.error ?? purge.error} />
      {done && <p className="notice notice-ok" role="status">{done.text} {done.href && <a href={done.href}>Open it</a>}</p>}
      {q.data.items.length === 0 ? <p className="text-muted">The trash is empty.</p> : (
        <div className="overflow-x-auto">
          <table className="table table-cards" data-testid="trash">
            <thead><tr><th>What</th><th>Moved along</th><th>Deleted</th><th><span className="sr-only">Actions</span></th></tr></thead>
            <tbody>
              {q.data.items.map((i) => (
                <tr key={`${i.type}:${i.id}`}>
                  <td><span className="text-xs text-muted uppercase mr-1">{i.type}</span> {i.label}</td>
                  <td className="text-sm" data-label="Moved along">{i.contents ? `${i.contents} record${i.contents === 1 ? '' : 's'} inside` : '—'}</td>
                  <td className="text-sm" data-label="Deleted">{new Date(i.deletedAt).toLocaleString()}<span className="block text-muted">by {i.deletedByName ?? 'someone since removed'}</span></td>
                  <td className="whitespace-nowrap sm:text-right">
                    <button type="button" className="btn btn-quiet btn-sm" disabled={restore.isPending} onClick={() => restore.mutate(i)}>Restore</button>
                    {canPurge && (
                      <button type="button" className="btn btn-danger btn-sm ml-2" disabled={purge.isPending}
                        onClick={() => confirm(`Purge ${i.label}${i.contents ? ` and the ${i.contents} records inside it` : ''} for good? Its history goes too; this cannot be undone.`) && purge.mutate(i)}>
                        Purge
                      </button>
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      <Pager page={page} pageSize={25} total={q.data.total} onPage={setPage} />
    </div>
  );
}

export default function TrashPanel(props: { canPurge: boolean }) {
  return (
    <QueryProvider>
      <Trash {...props} />
    </QueryProvider>
  );
}
