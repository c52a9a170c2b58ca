/** Copy settings from this device (or one of its ports) onto another: choose, preview the differences, apply. */
import { useEffect, useState } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api, ApiError } from '../../lib/client/api';
import { vaultKeys } from '../../lib/client/keys';
import { QueryProvider } from '../QueryProvider';
import { ErrorNotice, fieldLabel, isConflict, showValue } from './shared';
import { Caution } from '../ui/Caution';

interface Pair { sourceLabel: string; targetPortId: string; targetLabel: string; targetVersion: number; changes: { field: string; from: unknown; to: unknown }[] }
interface Preview { pairs: Pair[]; unmatched: string[]; applied: boolean }
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

  const hits = useQuery({
    queryKey: vaultKeys.search(`copy:${find}`),
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
  useEffect(() => setPreview(null), [source, target, targetPort, includeAddress, includeWiring]);

  const look = useMutation({ mutationFn: () => api<Preview>('/api/devices/copy', { body: body() }), onSuccess: (p) => { setPreview(p); setNote(null); } });
  const apply = useMutation({
    mutationFn: () => api<Preview>('/api/devices/copy', { body: { ...body(), apply: true, basedOn: Object.fromEntries(preview!.pairs.map((p) => [p.targetPortId, p.targetVersion])) } }),
    onSuccess: (p) => {
      setPreview(null);
      setNote(`Copied onto ${p.pairs.filter((x) => x.changes.length).map((x) => x.targetLabel).join(', ') || 'nothing (already the same)'}.`);
      qc.invalidateQueries({ queryKey: vaultKeys.all() });
    },
    onError: (err) => {
      if (isConflict(err) && err instanceof ApiError) setPreview(err.body.current as Preview);
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
      {apply.isError && <ErrorNotice error={apply.error} />}
      {note && <p className="notice notice-ok" role="status">{note}</p>}
      {preview && (
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
          <div><button type="button" className="btn" disabled={changes === 0 || apply.isPending} onClick={() => apply.mutate()}>Apply {changes} change{changes === 1 ? '' : 's'}</button></div>
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
