/** Copy settings from this device (or one of its ports) onto another: choose, preview the differences, apply. */
import { useEffect, useState } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api, isStale } from '../../lib/client/api';
import { vaultKeys } from '../../lib/client/keys';
import { QueryProvider } from '../QueryProvider';
import { ErrorNotice, fieldLabel, showValue } from './shared';
import { Caution } from '../ui/Caution';
import { ConflictNotice } from '../ui/ConflictNotice';
import { copyConflictRows, staleTargets, type CopyPreview as Preview } from './copy-conflict';
import { portPartLabel } from './port-parts';
interface Hit { id: string; tag: string; name: string; siteName: string; machineName: string }

interface Props { device: { id: string; tag: string; ports: { id: string; name: string }[] } }

function Copier({ device }: Props) {
  const qc = useQueryClient();
  const [source, setSource] = useState('device');
  const [find, setFind] = useState('');
  const [target, setTarget] = useState<Hit | null>(null);
  const [targetPort, setTargetPort] = useState('device');
  const [includeAddress, setIncludeAddress] = useState(false);
  const [includeWiring, setIncludeWiring] = useState(false);
  const [preview, setPreview] = useState<Preview | null>(null);
  const [note, setNote] = useState<string | null>(null);
  /** The preview applied and the fresh one the 409 brought, while the conflict notice is up. */
  const [conflict, setConflict] = useState<{ previewed: Preview; fresh: Preview } | null>(null);

  const hits = useQuery({
    queryKey: vaultKeys.search(find, 8),
    queryFn: () => api<{ items: Hit[] }>(`/api/devices/search?pageSize=8&q=${encodeURIComponent(find)}`),
    enabled: /[\p{L}\p{N}]/u.test(find) && !target,
  });
  const targetPorts = useQuery({
    queryKey: vaultKeys.list('ports', { deviceId: target?.id }),
    queryFn: () => api<{ items: { id: string; name: string }[] }>(`/api/ports?deviceId=${target!.id}`),
    enabled: !!target,
  });
  const body = () => ({
    source: source === 'device' ? { kind: 'device', id: device.id } : { kind: 'port', id: source },
    target: targetPort === 'device' ? { kind: 'device', id: target!.id } : { kind: 'port', id: targetPort },
    includeAddress,
    includeWiring,
  });
  useEffect(() => { setPreview(null); setConflict(null); }, [source, target, targetPort, includeAddress, includeWiring]);

  const look = useMutation({ mutationFn: () => api<Preview>('/api/devices/copy', { body: body() }), onSuccess: (p) => { setPreview(p); setNote(null); } });
  // Applies a preview: the target versions it showed are what the copy is based on.
  const apply = useMutation({
    mutationFn: (seen: Preview) => api<Preview>('/api/devices/copy', { body: { ...body(), apply: true, basedOn: Object.fromEntries(seen.pairs.map((p) => [p.targetPortId, p.targetVersion])) } }),
    onSuccess: (p) => {
      setPreview(null);
      setConflict(null);
      setNote(`Copied onto ${p.pairs.filter((x) => x.changes.length).map((x) => x.targetLabel).join(', ') || 'nothing (already the same)'}.`);
      qc.invalidateQueries({ queryKey: vaultKeys.all() });
    },
    onError: (err, seen) => {
      if (isStale(err)) {
        const fresh = err.body.current as unknown as Preview;
        setConflict({ previewed: seen, fresh });
        setPreview(fresh);
      }
    },
  });
  const changes = preview?.pairs.reduce((n, p) => n + p.changes.length, 0) ?? 0;

  return (
    <div className="grid gap-3">
      <Caution />
      <div className="grid gap-3 sm:grid-cols-2">
        <label><span className="label">Copy from</span>
          <select className="input" value={source} onChange={(e) => setSource(e.target.value)}>
            <option value="device">All ports of {device.tag}</option>
            {device.ports.map((p) => <option key={p.id} value={p.id}>{device.tag} {p.name}</option>)}
          </select>
        </label>
        {target ? (
          <div>
            <span className="label">Copy onto</span>
            <div className="flex gap-2">
              <select className="input" value={targetPort} onChange={(e) => setTargetPort(e.target.value)} aria-label="Target port">
                <option value="device">All ports of {target.tag} (same names first)</option>
                {targetPorts.data?.items.map((p) => <option key={p.id} value={p.id}>{target.tag} {p.name}</option>)}
              </select>
              <button type="button" className="btn btn-quiet btn-sm" onClick={() => { setTarget(null); setTargetPort('device'); }}>Change</button>
            </div>
          </div>
        ) : (
          <div>
            <label htmlFor="copy-target" className="label">Copy onto (find the device)</label>
            <input id="copy-target" className="input" type="search" value={find} onChange={(e) => setFind(e.target.value)} placeholder="Tag, serial number…" autoComplete="off" />
            <ul className="mt-1">
              {hits.data?.items.filter((h) => h.id !== device.id).map((h) => (
                <li key={h.id}><button type="button" className="text-left hover:underline text-accent py-1" onClick={() => setTarget(h)}>{h.tag} {h.name} <span className="text-xs text-muted">— {h.siteName} › {h.machineName}</span></button></li>
              ))}
            </ul>
          </div>
        )}
      </div>
      <div className="flex flex-wrap gap-4 text-sm">
        <label className="flex items-center gap-2"><input type="checkbox" checked={includeAddress} onChange={(e) => setIncludeAddress(e.target.checked)} /> Also copy node address and TCP host</label>
        <label className="flex items-center gap-2"><input type="checkbox" checked={includeWiring} onChange={(e) => setIncludeWiring(e.target.checked)} /> Also copy wiring</label>
      </div>
      <div><button type="button" className="btn btn-quiet" disabled={!target || look.isPending} onClick={() => look.mutate()}>Preview differences</button></div>
      <ErrorNotice error={look.error} />
      {apply.isError && !conflict && <ErrorNotice error={apply.error} />}
      {note && <p className="notice notice-ok" role="status">{note}</p>}
      {conflict && (() => {
        const stale = staleTargets(conflict.previewed, conflict.fresh);
        const labels = stale.map((p) => p.targetLabel).join(', ');
        const byId = new Map(conflict.fresh.pairs.map((p) => [p.targetPortId, p.targetLabel]));
        return (
          <ConflictNotice noun="port" version={stale[0]?.targetVersion ?? 0} rows={copyConflictRows(conflict.previewed, conflict.fresh)}
            title={`Someone else saved ${labels} after your preview. Nothing was copied.`}
            explain="Below, each setting as it is on the target now (theirs) beside what copying sets (yours). Copying again writes only the settings that still differ, onto the versions saved now."
            sides={{ theirs: 'On the target now', mine: 'After copying' }}
            label={(p) => `${byId.get(p[0]!) ?? p[0]} · ${portPartLabel(p[1]!.split('.'))}`}
            reapplyLabel="Copy onto what is saved now" busy={apply.isPending}
            onReapply={() => apply.mutate(conflict.fresh)}
            onDiscard={() => { setConflict(null); setPreview(null); }} />
        );
      })()}
      {preview && !conflict && (
        <div className="grid gap-2" data-testid="copy-preview">
          {preview.pairs.map((p) => (
            <div key={p.targetPortId} className="border border-line rounded p-2">
              <p className="text-sm font-semibold">{p.sourceLabel} → {p.targetLabel}</p>
              {p.changes.length === 0 ? <p className="text-sm text-muted">Already the same.</p> : (
                <div className="overflow-x-auto"><table className="table text-xs">
                  <thead><tr><th>Setting</th><th>Now on {p.targetLabel}</th><th>After copying</th></tr></thead>
                  <tbody>{p.changes.map((c) => <tr key={c.field}><td>{fieldLabel(c.field)}</td><td className="mono">{showValue(c.from)}</td><td className="mono">{showValue(c.to)}</td></tr>)}</tbody>
                </table></div>
              )}
            </div>
          ))}
          {preview.unmatched.length > 0 && <p className="text-sm text-muted">No port to copy onto for: {preview.unmatched.join(', ')}.</p>}
          <div><button type="button" className="btn" disabled={changes === 0 || apply.isPending} onClick={() => apply.mutate(preview)}>Apply {changes} change{changes === 1 ? '' : 's'}</button></div>
        </div>
      )}
    </div>
  );
}

export default function CopySettingsPanel(props: Props) {
  return (
    <QueryProvider>
      <Copier {...props} />
    </QueryProvider>
  );
}
