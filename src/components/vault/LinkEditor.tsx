/** A link: its fields, its members (ports and roles) and the findings of the link check, refreshed on every save. */
import { useState } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../lib/client/api';
import { vaultKeys } from '../../lib/client/keys';
import { keyed, mergedList, showValue } from '../../lib/client/conflict';
import { useConflict } from '../../lib/client/use-conflict';
import { ConflictNotice } from '../ui/ConflictNotice';
import { QueryProvider } from '../QueryProvider';
import { linkFormSchema, MEMBER_ROLES } from '../../lib/schemas/vault';
import { EntityForm } from './EntityForm';
import { linkFieldDefs } from './field-defs';
import { ErrorNotice, StateBadge, useUnsavedGuard } from './shared';
import type { ChainMember } from '../../lib/field/chains';

interface Member { portId: string; role: (typeof MEMBER_ROLES)[number]; isEnd: boolean | null; unitLoads: number | null; dropM: number | null; tapPorts: number | null; deviceTag: string; portName: string; deviceId: string; shorthand: string; inTrash: boolean; bridge?: ChainMember['bridge'] }
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

type MemberRow = Pick<Member, 'portId' | 'role' | 'isEnd' | 'unitLoads'>;
const memberRows = (members: MemberRow[]): MemberRow[] => members.map(({ portId, role, isEnd, unitLoads }) => ({ portId, role, isEnd, unitLoads }));
/** The members as the conflict notice compares them: member by member (keyed by port), each role and cable end. */
const memberShape = (v: MemberRow[] | LinkData) => ({ members: keyed(memberRows(Array.isArray(v) ? v : v.members), (m) => m.portId) });
const ids = (rows: MemberRow[]) => rows.map((r) => r.portId);
const MEMBER_PART: Record<string, string> = { role: 'role', isEnd: 'at a cable end', unitLoads: 'unit loads' };

/** An update of the member list: the version it is based on, the list at that version and mine. */
interface Attempt { version: number; base: MemberRow[]; mine: MemberRow[] }

function Members({ link, candidates, canEdit }: { link: LinkData; candidates: Candidate[]; canEdit: boolean }) {
  const qc = useQueryClient();
  const initial = () => memberRows(link.members);
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
  const conflicts = useConflict<MemberRow[], LinkData, ReturnType<typeof memberShape>>(memberShape);
  const conflict = conflicts.conflict;
  // Saved or dropped: the link's record takes the answer, and these rows start again from it (keyed by version).
  const save = useMutation({
    mutationFn: (a: Attempt) => api<LinkData>(`/api/links/${link.id}`, { method: 'PATCH', body: { version: a.version, members: a.mine } }),
    onSuccess: (saved) => {
      qc.setQueryData(vaultKeys.record('link', link.id), saved);
      qc.invalidateQueries({ queryKey: vaultKeys.all() });
    },
    onError: (err, a) => conflicts.take(err, a.base, a.mine),
  });
  const memberLabel = (path: string[]) => {
    const [, portId, part] = path;
    const theirs = conflict?.current.members.find((m) => m.portId === portId);
    const who = portId ? `Member ${theirs ? `${theirs.deviceTag} ${theirs.portName}` : label(portId)}` : 'Members';
    return part ? `${who} · ${MEMBER_PART[part] ?? part}` : who;
  };
  const memberValue = (path: string[], v: unknown) => {
    if (path.length === 2) {
      if (!v) return 'not a member';
      const m = v as MemberRow;
      return `${m.role}, at a cable end: ${m.isEnd === null ? 'not recorded' : m.isEnd ? 'yes' : 'no'}`;
    }
    if (path[2] === 'isEnd') return v === null ? 'not recorded' : v ? 'yes' : 'no';
    return showValue(v);
  };
  const set = (i: number, patch: Partial<(typeof rows)[number]>) => setRows(rows.map((r, j) => (j === i ? { ...r, ...patch } : r)));
  const free = candidates.filter((c) => !rows.some((r) => r.portId === c.portId));
  return (
    <div>
      <div className="overflow-x-auto">
        <table className="table table-cards" data-testid="members">
          <thead><tr><th>Port</th><th>Settings</th><th>Role</th><th>At a cable end</th>{canEdit && <th><span className="sr-only">Remove</span></th>}</tr></thead>
          <tbody>
            {rows.map((r, i) => (
              <tr key={r.portId}>
                <td className="font-semibold sm:font-normal">{label(r.portId)}</td>
                <td className="mono text-sm whitespace-nowrap" data-label="Settings">{shorthand(r.portId)}</td>
                <td data-label="Role">
                  <select className="input !w-auto !py-1" aria-label={`Role of ${label(r.portId)}`} disabled={!canEdit} value={r.role} onChange={(e) => set(i, { role: e.target.value as Member['role'] })}>
                    {MEMBER_ROLES.map((m) => <option key={m} value={m}>{m}</option>)}
                  </select>
                </td>
                <td data-label="At a cable end">
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
          <label className="grow min-w-0 max-w-full"><span className="label">Add a port on this machine</span>
            <select className="input" value={adding} onChange={(e) => setAdding(e.target.value)}>
              <option value="">Choose a port…</option>
              {free.map((c) => <option key={c.portId} value={c.portId}>{c.deviceTag} {c.portName} — {c.shorthand}</option>)}
            </select>
          </label>
          <button type="button" className="btn btn-quiet" disabled={!adding} onClick={() => { setRows([...rows, { portId: adding, role: rows.length === 0 ? 'master' : link.kind === 'rs485-bus' ? 'slave' : 'peer', isEnd: null, unitLoads: null }]); setAdding(''); }}>Add</button>
          <button type="button" className="btn" disabled={!dirty || save.isPending} onClick={() => save.mutate({ version: link.version, base: initial(), mine: rows })}>Save members</button>
        </div>
      )}
      {conflict && (
        <div className="mt-3">
          <ConflictNotice noun="link's members" version={conflict.version} rows={conflict.rows} label={memberLabel} show={memberValue} busy={save.isPending}
            onReapply={() => {
              const theirs = memberRows(conflict.current.members);
              const mine = mergedList(conflict.merged.members, { base: ids(conflict.base), mine: ids(conflict.mine), theirs: ids(theirs) });
              save.mutate({ version: conflict.version, base: theirs, mine });
            }}
            onDiscard={() => qc.setQueryData(vaultKeys.record('link', link.id), conflict.current)} />
        </div>
      )}
      {save.isError && !conflict && <ErrorNotice error={save.error} />}
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
