import { useMutation, useQueryClient } from '@tanstack/react-query';
import { QueryProvider } from '../QueryProvider';
import { When } from '../ui/When';
import { offlineKeys } from '../../lib/client/keys';
import { refreshKept, stopKeeping } from '../../lib/client/offline/kept';
import type { Scope } from '../../lib/client/offline/store';
import { OutboxList } from './OutboxList';
import { useKept } from './use-offline';

function Panel({ scope }: { scope: Scope }) {
  const qc = useQueryClient();
  const q = useKept();
  const done = () => qc.invalidateQueries({ queryKey: offlineKeys.all() });
  const refresh = useMutation({ mutationFn: () => refreshKept(scope), onSettled: done });
  const drop = useMutation({ mutationFn: (key: string) => stopKeeping(scope, key), onSettled: done });
  if (!q.data) return <p>Reading what this phone keeps…</p>;
  if (!q.data.supported) {
    return <p className="notice notice-warn" role="status">This browser keeps nothing for offline use here: it needs a secure connection (https, or this computer's own localhost).</p>;
  }
  const { scopes, refreshedAt, list } = q.data;
  return (
    <div className="grid gap-6">
      <section className="grid gap-3" aria-label="Kept cards">
        {scopes.length === 0 ? (
          <p className="text-muted">No cards are kept on this phone. Open a machine's field cards (or a site's page in the vault) and choose <strong>Keep on this phone</strong>.</p>
        ) : (
          <>
            <p data-testid="kept-refreshed">{refreshedAt ? <>Last brought up to date <When iso={refreshedAt} />.</> : 'Not brought up to date yet.'}</p>
            <ul className="grid gap-3">
              {scopes.map((s) => {
                const machines = list?.scopes.find((x) => `${x.type}:${x.id}` === s.key)?.machines ?? [];
                return (
                  <li key={s.key} className="card grid gap-2" data-testid="kept-scope">
                    <h2 className="text-lg">{s.type === 'site' ? 'Site' : 'Machine'} {s.name}</h2>
                    {machines.map((m) => (
                      <div key={m.id} className="grid gap-1">
                        <a href={m.cardsUrl} className="font-semibold">All cards of {m.name}</a>
                        <ul className="flex flex-wrap gap-x-4 gap-y-1">
                          {m.devices.map((d) => <li key={d.id}><a href={d.cardUrl}>{d.tag}{d.name && ` ${d.name}`}</a></li>)}
                        </ul>
                      </div>
                    ))}
                    <button type="button" className="btn btn-quiet btn-sm justify-self-start" onClick={() => drop.mutate(s.key)} disabled={drop.isPending}>Stop keeping {s.name}</button>
                  </li>
                );
              })}
            </ul>
            <button type="button" className="btn justify-self-start" onClick={() => refresh.mutate()} disabled={refresh.isPending}>{refresh.isPending ? 'Bringing up to date…' : 'Bring up to date now'}</button>
            {(refresh.error ?? drop.error) && <p className="notice notice-bad" role="alert">{(refresh.error ?? drop.error)!.message}</p>}
          </>
        )}
      </section>
      <OutboxList scope={scope} />
    </div>
  );
}

/** The cards kept on this phone and the field-log entries written on it (the page /field/kept). */
export default function KeptCardsPanel({ scope }: { scope: Scope }) {
  return <QueryProvider><Panel scope={scope} /></QueryProvider>;
}
