/** A device's ports: shorthand, copy-as-text, edit, add and move to trash. */
import { useState } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../lib/client/api';
import { vaultKeys } from '../../lib/client/keys';
import { QueryProvider } from '../QueryProvider';
import { PortForm, type PortRecord } from './PortForm';
import { ErrorNotice } from './shared';
import { INTERFACE_LABELS, PROTOCOL_LABELS } from '../../lib/frame/port-text';
import { CopyButton } from '../ui/CopyButton';
import { HistoryList } from './HistoryPanel';
import { ConflictNotice } from '../ui/ConflictNotice';
import { showValue } from '../../lib/client/conflict';
import { useConflict } from '../../lib/client/use-conflict';
import { portPartLabel, portPartValue, portShape } from './port-parts';

interface DeviceData { id: string; tag: string; ports: PortRecord[] }

interface Props { device: DeviceData; canEdit: boolean }

function Ports({ device, canEdit }: Props) {
  const qc = useQueryClient();
  const q = useQuery({ queryKey: vaultKeys.record('device', device.id), queryFn: () => api<DeviceData>(`/api/devices/${device.id}`), initialData: device });
  const [editing, setEditing] = useState<string | null>(null);
  const [history, setHistory] = useState<string | null>(null);
  // Moving a port someone saved meanwhile shows their change first (the one conflict notice), then asks again.
  const trashConflicts = useConflict<PortRecord, PortRecord, ReturnType<typeof portShape>>(portShape);
  const [trashing, setTrashing] = useState<PortRecord | null>(null);
  const trashConflict = trashConflicts.conflict;
  const remove = useMutation({
    mutationFn: (p: PortRecord) => api(`/api/ports/${p.id}?version=${p.version}`, { method: 'DELETE' }),
    onSuccess: () => { trashConflicts.clear(); setTrashing(null); qc.invalidateQueries({ queryKey: vaultKeys.all() }); },
    onError: (err, p) => { if (trashConflicts.take(err, p, p)) setTrashing(p); },
  });
  const ports = q.data.ports;
  const allText = ports.map((p) => `${device.tag} — ${p.text}`).join('\n\n');
  return (
    <div className="grid grid-cols-1 gap-3">
      <div className="flex flex-wrap gap-2 items-center">
        <h2 className="mr-auto">Ports</h2>
        {ports.length > 1 && <CopyButton text={allText} label="Copy all ports as text" />}
        {canEdit && editing !== 'new' && <button type="button" className="btn btn-sm" onClick={() => setEditing('new')}>Add a port</button>}
      </div>
      {trashConflict && trashing && (
        <ConflictNotice noun="port" version={trashConflict.version} rows={trashConflict.rows} label={portPartLabel}
          show={(path, v) => portPartValue(path, v) ?? showValue(v)} busy={remove.isPending}
          explain={`Nothing was moved to the trash. Their change to port ${trashing.name} is below; move the port as it is now, or keep it.`}
          reapplyLabel={`Move version ${trashConflict.version} to the trash`} discardLabel="Keep it"
          onReapply={() => remove.mutate({ ...trashing, version: trashConflict.version })}
          onDiscard={() => { trashConflicts.clear(); setTrashing(null); qc.invalidateQueries({ queryKey: vaultKeys.all() }); }} />
      )}
      {!trashConflict && <ErrorNotice error={remove.error} />}
      {ports.length === 0 && editing !== 'new' && <p className="text-muted">No ports recorded yet.{canEdit && ' Add the first one.'}</p>}
      {ports.map((p) => (
        <article key={p.id} className="card" data-testid="port" aria-label={`Port ${p.name}`}>
          <div className="flex flex-wrap items-baseline gap-x-3 gap-y-1">
            <h3 className="font-semibold">{p.name}</h3>
            <span className="mono text-lg" data-testid="shorthand">{p.shorthand}</span>
            <span className="text-sm text-muted">{INTERFACE_LABELS[p.settings.interface]} · {PROTOCOL_LABELS[p.settings.protocol]}{p.settings.nodeAddress !== null ? ` · address ${p.settings.nodeAddress}` : ''}</span>
            <span className="text-xs text-muted ml-auto">version {p.version}</span>
          </div>
          <details className="mt-2">
            <summary className="cursor-pointer text-sm">All settings</summary>
            <pre className="mono text-xs bg-paper p-2 rounded mt-1 whitespace-pre-wrap">{p.text}</pre>
          </details>
          <div className="flex flex-wrap gap-2 mt-2">
            <CopyButton text={`${device.tag} — ${p.text}`} label="Copy as text" what={`${p.name} settings`} />
            {canEdit && editing !== p.id && <button type="button" className="btn btn-quiet btn-sm" onClick={() => setEditing(p.id)}>Edit port</button>}
            <button type="button" className="btn btn-quiet btn-sm" onClick={() => setHistory(history === p.id ? null : p.id)} aria-expanded={history === p.id}>History</button>
            {canEdit && (
              <button type="button" className="btn btn-quiet btn-sm" onClick={() => confirm(`Move port ${p.name} to the trash?`) && remove.mutate(p)}>Move to trash</button>
            )}
          </div>
          {editing === p.id && <PortForm port={p} deviceId={device.id} onDone={() => setEditing(null)} />}
          {history === p.id && <div className="mt-3"><HistoryList type="port" id={p.id} canRestore={canEdit} /></div>}
        </article>
      ))}
      {editing === 'new' && <div className="card"><h3 className="font-semibold">New port</h3><PortForm deviceId={device.id} onDone={() => setEditing(null)} /></div>}
    </div>
  );
}

export default function PortsPanel(props: Props) {
  return (
    <QueryProvider>
      <Ports {...props} />
    </QueryProvider>
  );
}
