import { useMutation, useQueryClient } from '@tanstack/react-query';
import { QueryProvider } from '../QueryProvider';
import { When } from '../ui/When';
import { offlineKeys } from '../../lib/client/keys';
import { keep, stopKeeping } from '../../lib/client/offline/kept';
import type { Scope } from '../../lib/client/offline/store';
import { useKept } from './use-offline';

interface Props { scope: Scope; type: 'machine' | 'site'; id: string; name: string }

function Control({ scope, type, id, name }: Props) {
  const qc = useQueryClient();
  const q = useKept();
  const key = `${type}:${id}`;
  const done = () => qc.invalidateQueries({ queryKey: offlineKeys.kept() });
  const add = useMutation({ mutationFn: () => keep(scope, { type, id, name }), onSettled: done });
  const drop = useMutation({ mutationFn: () => stopKeeping(scope, key), onSettled: done });
  const noun = type === 'machine' ? "this machine's cards" : "this site's cards";
  if (!q.data) return null;
  if (!q.data.supported) {
    return <p className="notice notice-warn" role="status">Keeping cards on a phone needs a secure connection (https, or this computer's own localhost): ask whoever runs Baudbook to serve it over https.</p>;
  }
  const kept = q.data.scopes.find((s) => s.key === key);
  const error = add.error ?? drop.error;
  return (
    <div className="grid gap-2" data-testid="keep-on-phone">
      {kept ? (
        <p className="notice notice-ok" role="status">
          Kept on this phone{q.data.refreshedAt && <>, brought up to date <When iso={q.data.refreshedAt} /></>}: {kept.cards} card{kept.cards === 1 ? '' : 's'} open without a network. <a href="/field/kept">Cards kept on this phone</a>
        </p>
      ) : null}
      <div className="flex flex-wrap gap-2">
        {kept ? (
          <>
            <button type="button" className="btn btn-quiet" onClick={() => add.mutate()} disabled={add.isPending}>{add.isPending ? 'Bringing up to date…' : 'Bring up to date now'}</button>
            <button type="button" className="btn btn-quiet" onClick={() => drop.mutate()} disabled={drop.isPending}>Stop keeping {noun}</button>
          </>
        ) : (
          <button type="button" className="btn" onClick={() => add.mutate()} disabled={add.isPending}>{add.isPending ? 'Keeping…' : 'Keep on this phone'}</button>
        )}
      </div>
      {error && <p className="notice notice-bad" role="alert">{error.message}</p>}
    </div>
  );
}

/** "Keep on this phone" for a machine's or a site's field cards (docs/field-work.md, offline cards). */
export default function KeepOnPhone(props: Props) {
  return <QueryProvider><Control {...props} /></QueryProvider>;
}
