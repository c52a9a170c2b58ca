/** Saving a workbench command to one of the team's devices (loaded only for signed-in editors). */
import { useMutation, useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { api } from '../../lib/client/api';
import { vaultKeys } from '../../lib/client/keys';
import type { CommandDraft } from './types';
import { SaveWithFindings, type ErrorFinding } from './SaveWithFindings';

export default function SaveToDevice({ draft, valid, errors = [] }: { draft: CommandDraft; valid: boolean; errors?: readonly ErrorFinding[] }) {
  const [deviceId, setDeviceId] = useState('');
  // Saving with error findings asks first, as the composer's own save does (the history records them).
  const [asking, setAsking] = useState(false);
  const devices = useQuery({ queryKey: vaultKeys.list('devices', { pageSize: 200, sort: 'tag' }), queryFn: () => api<{ items: { id: string; tag: string; name: string }[] }>('/api/devices?pageSize=200&sort=tag') });
  const save = useMutation({
    mutationFn: () => api<{ id: string }>('/api/commands', { body: { deviceId, ...draft, portName: '' } }),
    onSuccess: (c) => location.assign(`/vault/devices/${deviceId}/commands/${c.id}`),
  });
  return (
    <div className="flex flex-wrap items-end gap-2">
      <div>
        <label htmlFor="wb-device" className="label">Device</label>
        <select id="wb-device" className="input !w-auto" value={deviceId} onChange={(e) => setDeviceId(e.target.value)}>
          <option value="">Choose a device…</option>
          {devices.data?.items.map((d) => <option key={d.id} value={d.id}>{d.tag} {d.name}</option>)}
        </select>
      </div>
      <button type="button" className="btn" disabled={!deviceId || !valid || save.isPending} onClick={() => (errors.length && !asking ? setAsking(true) : save.mutate())}>Save to this device</button>
      {asking && errors.length > 0 && <SaveWithFindings errors={errors} busy={save.isPending} onSave={() => save.mutate()} onCancel={() => setAsking(false)} />}
      {save.isError && <p className="notice notice-bad text-sm w-full" role="alert">{save.error.message}</p>}
    </div>
  );
}

