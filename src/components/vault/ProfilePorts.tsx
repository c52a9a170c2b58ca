/** The default ports of a device profile: shorthand, copy-as-text, edit, add, remove (saved as one profile update). */
import { useState } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../lib/client/api';
import { vaultKeys } from '../../lib/client/keys';
import { mergeOrder, reapply, showValue } from '../../lib/client/conflict';
import { useConflict } from '../../lib/client/use-conflict';
import { portShorthand } from '../../lib/frame/port-text';
import type { PortInput } from '../../lib/schemas/vault';
import { QueryProvider } from '../QueryProvider';
import { ConflictNotice } from '../ui/ConflictNotice';
import { PortForm, type PortRecord } from './PortForm';
import { portPartLabel, portPartValue, portShape } from './port-parts';
import { ErrorNotice } from './shared';

interface Profile { id: string; version: number; name: string; ports: PortInput[]; shorthands: string[] }

/**
 * A profile port with the key the conflict notice compares it by: its name (letter case aside, as the API
 * tells names apart) in the version the edit started from, so a port renamed in the edit stays the same port.
 */
interface KeyedPort { key: string; port: PortInput }
const keyOf = (p: PortInput) => p.name.toLowerCase();
const keyedPorts = (ports: PortInput[]): KeyedPort[] => ports.map((p) => ({ key: keyOf(p), port: portShape(p) }));
const portsShape = (v: KeyedPort[] | Profile) => ({ ports: Object.fromEntries((Array.isArray(v) ? v : keyedPorts(v.ports)).map((k) => [k.key, k.port])) });

/** A save of the list: the version it is based on, the list at that version and mine. */
interface Attempt { version: number; base: KeyedPort[]; mine: KeyedPort[] }

function Ports({ profile, canEdit }: { profile: Profile; canEdit: boolean }) {
  const qc = useQueryClient();
  const q = useQuery({ queryKey: vaultKeys.record('profile', profile.id), queryFn: () => api<Profile>(`/api/profiles/${profile.id}`), initialData: profile });
  const [editing, setEditing] = useState<number | 'new' | null>(null);
  const conflicts = useConflict<KeyedPort[], Profile, ReturnType<typeof portsShape>>(portsShape);
  const conflict = conflicts.conflict;
  const save = useMutation({
    mutationFn: (a: Attempt) => api<Profile>(`/api/profiles/${profile.id}`, { method: 'PATCH', body: { version: a.version, ports: a.mine.map((k) => k.port) } }),
    onSuccess: (p) => { conflicts.clear(); qc.setQueryData(vaultKeys.record('profile', profile.id), p); qc.invalidateQueries({ queryKey: vaultKeys.all() }); },
    onError: (err, a) => conflicts.take(err, a.base, a.mine),
  });
  const ports = q.data.ports;
  /** Sends my change to the list I see: `change` makes my list from it. */
  const send = (change: (base: KeyedPort[]) => KeyedPort[]) => {
    const base = keyedPorts(ports);
    return save.mutateAsync({ version: q.data.version, base, mine: change(base) });
  };
  const asRecord = (p: PortInput, i: number): PortRecord => ({ ...p, id: `${profile.id}-${i}`, version: q.data.version, shorthand: q.data.shorthands[i] ?? '', text: '' });

  const nameOf = (key: string) => {
    const all = conflict ? [...conflict.base, ...keyedPorts(conflict.current.ports), ...conflict.mine] : [];
    return all.find((k) => k.key === key)?.port.name ?? key;
  };
  const label = (path: string[]) => {
    const [, key, ...rest] = path;
    return key === undefined ? 'Default ports' : rest.length ? `Port ${nameOf(key)} · ${portPartLabel(rest)}` : `Port ${nameOf(key)}`;
  };
  const show = (path: string[], v: unknown) => {
    if (path.length === 2) return v ? `${(v as PortInput).name}: ${portShorthand((v as PortInput).settings)}` : 'not in this version';
    return portPartValue(path.slice(2), v) ?? showValue(v);
  };
  const reapplyMine = () => {
    if (!conflict) return;
    const theirs = keyedPorts(conflict.current.ports);
    const merged = conflict.merged.ports;
    const order = mergeOrder(conflict.base.map((k) => k.key), conflict.mine.map((k) => k.key), theirs.map((k) => k.key), new Set(Object.keys(merged)));
    save.mutate({ version: conflict.version, base: theirs, mine: order.map((key) => ({ key, port: merged[key]! })) });
  };

  return (
    <div className="grid gap-2">
      {conflict && (
        <ConflictNotice noun="profile's ports" version={conflict.version} rows={conflict.rows} label={label} show={show} busy={save.isPending}
          onReapply={reapplyMine}
          onDiscard={() => { qc.setQueryData(vaultKeys.record('profile', profile.id), conflict.current); conflicts.clear(); }} />
      )}
      {save.isError && !conflict && <ErrorNotice error={save.error} />}
      {ports.length === 0 && <p className="text-muted">No default ports yet.</p>}
      {ports.map((p, i) => (
        <article key={i} className="border border-line rounded p-2">
          <div className="flex flex-wrap items-baseline gap-2">
            <h3 className="font-semibold">{p.name}</h3><span className="mono">{q.data.shorthands[i]}</span>
            {canEdit && editing === null && !conflict && (
              <span className="ml-auto flex gap-2">
                <button type="button" className="btn btn-quiet btn-sm" onClick={() => setEditing(i)}>Edit</button>
                <button type="button" className="btn btn-quiet btn-sm" onClick={() => confirm(`Remove ${p.name} from the profile?`) && send((base) => base.filter((_, j) => j !== i)).catch(() => {})}>Remove</button>
              </span>
            )}
          </div>
          {editing === i && (
            <PortForm port={asRecord(p, i)} onDone={() => setEditing(null)}
              onSave={(v, changed) => send((base) => base.map((k, j) => (j === i ? { key: k.key, port: reapply(portShape(v), k.port, changed) } : k)))} />
          )}
        </article>
      ))}
      {canEdit && editing === null && !conflict && <div><button type="button" className="btn btn-sm" onClick={() => setEditing('new')}>Add a default port</button></div>}
      {editing === 'new' && <div className="border border-line rounded p-2"><PortForm onSave={(v) => send((base) => [...base, { key: keyOf(v), port: portShape(v) }])} onDone={() => setEditing(null)} /></div>}
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
