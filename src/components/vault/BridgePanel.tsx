/**
 * A converter's bridged ports: which of its ports it carries across to which (its RS-232 side to its RS-485 side,
 * a device server's network side to its serial port). The link check follows each bridge from one link into the
 * next. Shown on a device page while the device's role is Converter.
 */
import { useState } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../lib/client/api';
import { vaultKeys } from '../../lib/client/keys';
import { useConflict } from '../../lib/client/use-conflict';
import { INTERFACE_LABELS } from '../../lib/frame/port-text';
import type { PortSettings } from '../../lib/frame/port-settings';
import { QueryProvider } from '../QueryProvider';
import { ConflictNotice } from '../ui/ConflictNotice';
import { ErrorNotice } from './shared';

type Pair = [string, string];
interface DeviceData {
  id: string;
  tag: string;
  role: string;
  version: number;
  bridges: Pair[];
  ports: { id: string; name: string; settings: PortSettings }[];
}

interface Props { device: DeviceData; canEdit: boolean }

const shape = (d: { bridges: Pair[] }) => ({ bridges: d.bridges });

function Bridges({ device, canEdit }: Props) {
  const qc = useQueryClient();
  const q = useQuery({ queryKey: vaultKeys.record('device', device.id), queryFn: () => api<DeviceData>(`/api/devices/${device.id}`), initialData: device });
  const d = q.data;
  const [from, setFrom] = useState('');
  const [to, setTo] = useState('');
  const conflicts = useConflict<{ bridges: Pair[] }, DeviceData>(shape, (path) => path.length === 1);
  const conflict = conflicts.conflict;
  const save = useMutation({
    mutationFn: (v: { version: number; bridges: Pair[] }) => api<DeviceData>(`/api/devices/${d.id}`, { method: 'PATCH', body: v }),
    onSuccess: () => { conflicts.clear(); setFrom(''); setTo(''); qc.invalidateQueries({ queryKey: vaultKeys.all() }); },
    onError: (err, v) => { conflicts.take(err, { bridges: d.bridges }, { bridges: v.bridges }); },
  });
  if (d.role !== 'converter') return null;

  const name = (id: string) => {
    const p = d.ports.find((x) => x.id === id);
    return p ? `${p.name} (${INTERFACE_LABELS[p.settings.interface]})` : 'a port in the trash';
  };
  const words = (pairs: unknown) => (Array.isArray(pairs) && pairs.length ? (pairs as Pair[]).map(([a, b]) => `${name(a)} ⇄ ${name(b)}`).join('; ') : 'none');
  const taken = new Set(d.bridges.flat());
  const free = d.ports.filter((p) => !taken.has(p.id));
  const send = (bridges: Pair[]) => save.mutate({ version: d.version, bridges });

  return (
    <section className="card grid gap-3" aria-labelledby="bridge-h" data-testid="bridge-panel">
      <h2 id="bridge-h">Bridged ports</h2>
      <p className="text-sm text-muted">
        A converter carries what one of its ports receives out of another. Pair its ports here; the link check then follows each pair from the link on one side to the link on the other, and compares the settings end to end. Its RS-485 side's direction control (automatic, or switched by RTS from the other side), termination and bias are that port's own settings.
      </p>
      {conflict && (
        <ConflictNotice noun="device" version={conflict.version} rows={conflict.rows} label={() => 'Bridged ports'}
          show={(_p, v) => words(v)} busy={save.isPending}
          onReapply={() => save.mutate({ version: conflict.version, bridges: conflict.merged.bridges })}
          onDiscard={() => { conflicts.clear(); qc.invalidateQueries({ queryKey: vaultKeys.all() }); }} />
      )}
      {!conflict && <ErrorNotice error={save.error} />}
      {d.bridges.length === 0
        ? <p className="text-sm" data-testid="no-bridges">No ports bridged yet{d.ports.length < 2 ? '; add the converter\'s two ports first' : ''}.</p>
        : (
          <ul className="grid gap-2" data-testid="bridges">
            {d.bridges.map(([a, b]) => (
              <li key={`${a}-${b}`} className="flex flex-wrap items-center gap-2" data-bridge={`${a} ${b}`}>
                <span className="font-semibold break-words min-w-0">{name(a)} ⇄ {name(b)}</span>
                {canEdit && (
                  <button type="button" className="btn btn-quiet btn-sm" disabled={save.isPending}
                    onClick={() => send(d.bridges.filter(([x, y]) => !(x === a && y === b)))}>Unpair</button>
                )}
              </li>
            ))}
          </ul>
        )}
      {canEdit && free.length >= 2 && (
        <form className="grid gap-2 sm:grid-cols-[1fr_1fr_auto] items-end" onSubmit={(e) => { e.preventDefault(); if (from && to && from !== to) send([...d.bridges, [from, to]]); }}>
          <label className="min-w-0"><span className="label">One side</span>
            <select className="input" value={from} onChange={(e) => setFrom(e.target.value)}>
              <option value="">Choose a port</option>
              {free.map((p) => <option key={p.id} value={p.id}>{name(p.id)}</option>)}
            </select>
          </label>
          <label className="min-w-0"><span className="label">Carried across to</span>
            <select className="input" value={to} onChange={(e) => setTo(e.target.value)}>
              <option value="">Choose a port</option>
              {free.filter((p) => p.id !== from).map((p) => <option key={p.id} value={p.id}>{name(p.id)}</option>)}
            </select>
          </label>
          <button type="submit" className="btn btn-sm" disabled={!from || !to || from === to || save.isPending}>Pair these ports</button>
        </form>
      )}
    </section>
  );
}

export default function BridgePanel(props: Props) {
  return (
    <QueryProvider>
      <Bridges {...props} />
    </QueryProvider>
  );
}
