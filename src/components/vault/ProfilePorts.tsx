/** The default ports of a device profile: shorthand, copy-as-text, edit, add, remove (saved as one profile update). */
import { useState } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../lib/client/api';
import { vaultKeys } from '../../lib/client/keys';
import type { PortInput } from '../../lib/schemas/vault';
import { QueryProvider } from '../QueryProvider';
import { PortForm, type PortRecord } from './PortForm';
import { ErrorNotice, isConflict } from './shared';

interface Profile { id: string; version: number; name: string; ports: PortInput[]; shorthands: string[] }

function Ports({ profile, canEdit }: { profile: Profile; canEdit: boolean }) {
  const qc = useQueryClient();
  const q = useQuery({ queryKey: vaultKeys.record('profile', profile.id), queryFn: () => api<Profile>(`/api/profiles/${profile.id}`), initialData: profile });
  const [editing, setEditing] = useState<number | 'new' | null>(null);
  const save = useMutation({
    mutationFn: (ports: PortInput[]) => api<Profile>(`/api/profiles/${profile.id}`, { method: 'PATCH', body: { version: q.data.version, ports } }),
    onSuccess: (p) => { qc.setQueryData(vaultKeys.record('profile', profile.id), p); qc.invalidateQueries({ queryKey: vaultKeys.all() }); },
  });
  const ports = q.data.ports;
  const asRecord = (p: PortInput, i: number): PortRecord => ({ ...p, id: `${profile.id}-${i}`, version: q.data.version, shorthand: q.data.shorthands[i] ?? '', text: '' });
  return (
    <div className="grid gap-2">
      {save.isError && <ErrorNotice error={isConflict(save.error) ? new Error('Someone changed this profile meanwhile; reload the page and make your change again.') : save.error} />}
      {ports.length === 0 && <p className="text-muted">No default ports yet.</p>}
      {ports.map((p, i) => (
        <article key={i} className="border border-line rounded p-2">
          <div className="flex flex-wrap items-baseline gap-2">
            <h3 className="font-semibold">{p.name}</h3><span className="mono">{q.data.shorthands[i]}</span>
            {canEdit && editing === null && (
              <span className="ml-auto flex gap-2">
                <button type="button" className="btn btn-quiet btn-sm" onClick={() => setEditing(i)}>Edit</button>
                <button type="button" className="btn btn-quiet btn-sm" onClick={() => confirm(`Remove ${p.name} from the profile?`) && save.mutate(ports.filter((_, j) => j !== i))}>Remove</button>
              </span>
            )}
          </div>
          {editing === i && <PortForm port={asRecord(p, i)} onSave={(v) => save.mutateAsync(ports.map((x, j) => (j === i ? v : x)))} onDone={() => setEditing(null)} />}
        </article>
      ))}
      {canEdit && editing === null && <div><button type="button" className="btn btn-sm" onClick={() => setEditing('new')}>Add a default port</button></div>}
      {editing === 'new' && <div className="border border-line rounded p-2"><PortForm onSave={(v) => save.mutateAsync([...ports, v])} onDone={() => setEditing(null)} /></div>}
    </div>
  );
}

export default function ProfilePorts(props: { profile: Profile; canEdit: boolean }) {
  return (
    <QueryProvider>
      <Ports {...props} />
    </QueryProvider>
  );
}
