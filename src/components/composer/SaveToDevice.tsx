/** Saving a workbench command to one of the team's devices (loaded only for signed-in editors). */
import { useMutation, useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { api } from '../../lib/client/api';
import { vaultKeys } from '../../lib/client/keys';
import type { CommandDraft } from './types';

export default function SaveToDevice({ draft, valid }: { draft: CommandDraft; valid: boolean }) {
  const [deviceId, setDeviceId] = useState('');
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
      <button type="button" className="btn" disabled={!deviceId || !valid || save.isPending} onClick={() => save.mutate()}>Save to this device</button>
      {save.isError && <p className="notice notice-bad text-sm w-full" role="alert">{save.error.message}</p>}
    </div>
  );
}

