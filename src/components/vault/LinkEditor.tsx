/** A link: its fields, its members (ports and roles) and the findings of the link check, refreshed on every save. */
import { useState } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../lib/client/api';
import { vaultKeys } from '../../lib/client/keys';
import { QueryProvider } from '../QueryProvider';
import { linkFormSchema, MEMBER_ROLES } from '../../lib/schemas/vault';
import { EntityForm } from './EntityForm';
import { linkFieldDefs } from './field-defs';
import { ErrorNotice, isConflict, StateBadge, useUnsavedGuard } from './shared';

interface Member { portId: string; role: (typeof MEMBER_ROLES)[number]; isEnd: boolean | null; unitLoads: number | null; deviceTag: string; portName: string; deviceId: string; shorthand: string; inTrash: boolean }
interface Finding { severity: 'error' | 'warning' | 'info'; code: string; message: string; memberLabel?: string }
export interface LinkData {
  id: string; version: number; name: string; kind: 'point-to-point' | 'rs485-bus'; cableType: string; cableLengthM: number | null; notes: string;
  members: Member[]; report: { state: 'ok' | 'warning' | 'error'; findings: Finding[] };
}
export interface Candidate { portId: string; deviceTag: string; portName: string; shorthand: string }

interface Props { link: LinkData; candidates: Candidate[]; canEdit: boolean; afterDelete: string }

export function Findings({ report }: { report: LinkData['report'] }) {
  return (
    <div aria-live="polite" data-testid="findings">
      <div className="flex items-center gap-2 mb-2"><StateBadge state={report.state} /><span className="text-sm">{report.findings.length === 0 ? 'Both ends agree; nothing to change.' : `${report.findings.length} finding${report.findings.length === 1 ? '' : 's'}`}</span></div>
      <ul className="grid gap-2">
        {report.findings.map((f, i) => (
          <li key={i} className={`notice text-sm ${f.severity === 'error' ? 'notice-bad' : f.severity === 'warning' ? 'notice-warn' : 'notice-ok'}`} data-code={f.code}>
            {f.memberLabel && <strong className="block">Change on {f.memberLabel}</strong>}
            {f.message}
          </li>
        ))}
      </ul>
    </div>
  );
}

function Members({ link, candidates, canEdit }: { link: LinkData; candidates: Candidate[]; canEdit: boolean }) {
  const qc = useQueryClient();
  const initial = () => link.members.map(({ portId, role, isEnd, unitLoads }) => ({ portId, role, isEnd, unitLoads }));
  const [rows, setRows] = useState(initial);
  const [adding, setAdding] = useState('');
  // Remounted (keyed by version) after every save of this link, so `link.version` is what these rows were based on.
  const dirty = JSON.stringify(rows) !== JSON.stringify(initial());
  useUnsavedGuard(dirty);
  const label = (portId: string) => {
    const m = link.members.find((x) => x.portId === portId) ?? candidates.find((c) => c.portId === portId);
    return m ? `${m.deviceTag} ${m.portName}` : portId;
  };
  const shorthand = (portId: string) => (link.members.find((x) => x.portId === portId) ?? candidates.find((c) => c.portId === portId))?.shorthand;
  const save = useMutation({
    mutationFn: () => api<LinkData>(`/api/links/${link.id}`, { method: 'PATCH', body: { version: link.version, members: rows } }),
    onSuccess: (saved) => {
      qc.setQueryData(vaultKeys.record('link', link.id), saved);
      qc.invalidateQueries({ queryKey: vaultKeys.all() });
    },
  });
  const set = (i: number, patch: Partial<(typeof rows)[number]>) => setRows(rows.map((r, j) => (j === i ? { ...r, ...patch } : r)));
  const free = candidates.filter((c) => !rows.some((r) => r.portId === c.portId));
  return (
    <div>
      <div className="overflow-x-auto">
        <table className="table" data-testid="members">
          <thead><tr><th>Port</th><th>Settings</th><th>Role</th><th>At a cable end</th>{canEdit && <th><span className="sr-only">Remove</span></th>}</tr></thead>
          <tbody>
            {rows.map((r, i) => (
              <tr key={r.portId}>
                <td>{label(r.portId)}</td>
                <td className="mono text-sm whitespace-nowrap">{shorthand(r.portId)}</td>
                <td>
                  <select className="input !w-auto !py-1" aria-label={`Role of ${label(r.portId)}`} disabled={!canEdit} value={r.role} onChange={(e) => set(i, { role: e.target.value as Member['role'] })}>
                    {MEMBER_ROLES.map((m) => <option key={m} value={m}>{m}</option>)}
                  </select>
                </td>
                <td>
                  <select className="input !w-auto !py-1" aria-label={`Cable end for ${label(r.portId)}`} disabled={!canEdit} value={r.isEnd === null ? '' : r.isEnd ? 'yes' : 'no'} onChange={(e) => set(i, { isEnd: e.target.value === '' ? null : e.target.value === 'yes' })}>
                    <option value="">not recorded</option><option value="yes">yes</option><option value="no">no</option>
                  </select>
                </td>
                {canEdit && <td><button type="button" className="btn btn-quiet btn-sm" onClick={() => setRows(rows.filter((_, j) => j !== i))} aria-label={`Remove ${label(r.portId)}`}>Remove</button></td>}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {canEdit && (
        <div className="flex flex-wrap items-end gap-2 mt-3">
          <label className="grow"><span className="label">Add a port on this machine</span>
            <select className="input" value={adding} onChange={(e) => setAdding(e.target.value)}>
              <option value="">Choose a port…</option>
              {free.map((c) => <option key={c.portId} value={c.portId}>{c.deviceTag} {c.portName} — {c.shorthand}</option>)}
            </select>
          </label>
          <button type="button" className="btn btn-quiet" disabled={!adding} onClick={() => { setRows([...rows, { portId: adding, role: rows.length === 0 ? 'master' : link.kind === 'rs485-bus' ? 'slave' : 'peer', isEnd: null, unitLoads: null }]); setAdding(''); }}>Add</button>
          <button type="button" className="btn" disabled={!dirty || save.isPending} onClick={() => save.mutate()}>Save members</button>
        </div>
      )}
      {save.isError && <ErrorNotice error={isConflict(save.error) ? new Error('Someone changed this link meanwhile. Reload the page to see their version, then make your change again.') : save.error} />}
    </div>
  );
}

function Editor({ link, candidates, canEdit, afterDelete }: Props) {
  const q = useQuery({ queryKey: vaultKeys.record('link', link.id), queryFn: () => api<LinkData>(`/api/links/${link.id}`), initialData: link });
  const data = q.data;
  return (
    <div className="grid grid-cols-1 gap-4 lg:grid-cols-[minmax(0,1fr)_22rem] items-start">
      <div className="grid grid-cols-1 gap-4 min-w-0">
        <section className="card"><h2 className="mb-3">Members</h2><Members key={data.version} link={data} candidates={candidates} canEdit={canEdit} /></section>
        <section className="card"><h2 className="mb-3">Link details</h2>
          <EntityForm noun="link" path={`/api/links/${link.id}`} record={data as never} fields={linkFieldDefs} schema={linkFormSchema} canEdit={canEdit} afterDelete={afterDelete} />
        </section>
      </div>
      <section className="card order-first lg:order-none lg:sticky lg:top-4"><h2 className="mb-3">Link check</h2><Findings report={data.report} /></section>
    </div>
  );
}

export default function LinkEditor(props: Props) {
  return (
    <QueryProvider>
      <Editor {...props} />
    </QueryProvider>
  );
}
