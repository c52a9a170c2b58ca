/** Island for the public /workbench: the same composer with its own port settings, tools, and saving for signed-in users. */
import { useMutation, useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { api } from '../../lib/client/api';
import { commandKeys } from '../../lib/client/keys';
import { defaultPortSettings } from '../../lib/frame/port-settings';
import { starterTemplate } from '../../lib/composer/segments';
import { QueryProvider } from '../QueryProvider';
import { ComposerCore } from './Composer';
import { PortQuick } from './PortQuick';
import { Section } from './Section';
import { Tools } from './Tools';
import type { CommandDraft } from './types';

interface Props { signedIn: boolean; canSave: boolean; signInHref: string }

const blank: CommandDraft = {
  name: 'One-off command', purpose: '', notes: '', movesMachinery: false, template: starterTemplate({ terminator: '0D' }),
  fieldValues: {}, replyTemplate: null, portName: '', rawUnits: {},
};

function SaveToDevice({ draft, valid }: { draft: CommandDraft; valid: boolean }) {
  const [deviceId, setDeviceId] = useState('');
  const devices = useQuery({ queryKey: commandKeys.devices(), queryFn: () => api<{ items: { id: string; tag: string; name: string }[] }>('/api/devices?pageSize=200&sort=tag') });
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

export default function Workbench({ signedIn, canSave, signInHref }: Props) {
  return (
    <QueryProvider>
      <div className="grid gap-4">
        <ComposerCore initial={blank} ports={[{ name: 'Workbench', settings: defaultPortSettings }]} readOnly={false}
          portSlot={(s, set) => <PortQuick settings={s} onChange={set} />}
          footer={(draft, valid) => (
            <Section title="Keep it" id="save">
              {!signedIn && <p><a href={signInHref} data-testid="sign-in-to-save">Sign in to save to a device</a>; everything else here works without an account.</p>}
              {signedIn && !canSave && <p className="text-sm text-muted">Your role in this team cannot add commands; ask an engineer to save it.</p>}
              {signedIn && canSave && <SaveToDevice draft={draft} valid={valid} />}
            </Section>
          )} />
        <Tools />
      </div>
    </QueryProvider>
  );
}
