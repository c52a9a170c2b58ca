/** The device page's proposals from the field log: the record beside what was found, accept or decline with a note. */
import { useState } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { QueryProvider } from '../QueryProvider';
import { api, ApiError, isStale } from '../../lib/client/api';
import { compareVersions, type ConflictRow } from '../../lib/client/conflict';
import { ConflictNotice } from '../ui/ConflictNotice';
import { portPartLabel, portPartValue } from '../vault/port-parts';
import { fieldKeys, vaultKeys } from '../../lib/client/keys';
import { FIELD_LOG_LABELS } from '../../lib/schemas/field';
import { proposalRows, when, type Proposal } from './proposal-parts';

interface Props { deviceId: string; canDecide: boolean; initial: Proposal[] }

export function ProposalTable({ p, against }: { p: Proposal; against: 'now' | 'at-entry' }) {
  const rows = proposalRows(p, against);
  if (!rows.length) return <p className="text-sm text-muted">Nothing to apply to the record: the finding is described in words only.</p>;
  return (
    <div className="overflow-x-auto">
      <table className="table text-sm" data-testid="proposal-rows">
        <thead><tr><th scope="col"></th><th scope="col">{against === 'now' ? 'On record' : 'Record then'}</th><th scope="col">Found on site</th></tr></thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.what}>
              <th scope="row" className="font-normal">{r.what}</th>
              <td className="mono">{r.record}</td>
              <td className={`mono ${r.differs ? 'font-bold' : ''}`}>{r.found}{!r.differs && <span className="font-sans text-muted"> (same)</span>}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

interface Versions { version: number; portVersion?: number }
interface Clash { noun: string; versions: Versions; rows: ConflictRow[] }

const pickKeys = (from: Record<string, unknown> | null | undefined, keys: string[]) => Object.fromEntries(keys.map((k) => [k, from?.[k]]));

/** The 409's record beside the proposal: what the other person changed since the page was loaded, and what accepting changes. */
function clashOf(p: Proposal, current: Record<string, unknown> & { version?: number }): Clash {
  const portVersion = p.found.port && p.record.port ? p.record.port.version : undefined;
  if (p.found.port && 'settings' in current) {
    const keys = Object.keys(p.found.port.settings);
    const base = pickKeys(p.record.port?.settings, keys);
    const { rows } = compareVersions(base, { ...base, ...p.found.port.settings }, pickKeys(current.settings as Record<string, unknown>, keys));
    return { noun: `port ${p.found.port.name}`, versions: { version: p.record.version, portVersion: current.version }, rows: rows.map((r) => ({ ...r, path: ['settings', ...r.path] })) };
  }
  const keys = (['serialNumber', 'firmware'] as const).filter((k) => p.found[k]);
  const base = pickKeys(p.record, keys);
  const mine = Object.fromEntries(keys.map((k) => [k, p.found[k]]));
  const { rows } = compareVersions(base, mine, pickKeys(current, keys));
  return { noun: 'device', versions: { version: current.version ?? p.record.version, portVersion }, rows };
}

const clashLabel = (path: string[]) => path[0] === 'settings' ? portPartLabel(path) : path[0] === 'serialNumber' ? 'Serial number' : 'Firmware';
const clashValue = (path: string[], v: unknown) => v === undefined || v === '' ? '—' : path[0] === 'settings' ? portPartValue(path, v) ?? String(v) : String(v);

function Decide({ p, deviceId }: { p: Proposal; deviceId: string }) {
  const qc = useQueryClient();
  const [clash, setClash] = useState<Clash | null>(null);
  const [declining, setDeclining] = useState(false);
  const [note, setNote] = useState('');
  const done = () => {
    qc.invalidateQueries({ queryKey: fieldKeys.proposals(deviceId) });
    qc.invalidateQueries({ queryKey: fieldKeys.log(deviceId) });
  };
  const accept = useMutation({
    mutationFn: (v: Versions) => api<Proposal>(`/api/proposals/${p.id}/accept`, { body: v }),
    // The device's details, ports and history on this page show the record as loaded: read them again.
    onSuccess: () => { setClash(null); done(); qc.invalidateQueries({ queryKey: vaultKeys.all() }); window.location.reload(); },
    onError: (e) => {
      if (isStale(e)) setClash(clashOf(p, e.body.current));
      if (e instanceof ApiError && e.status === 409) done();
    },
  });
  const versions: Versions = { version: p.record.version, ...(p.found.port && p.record.port ? { portVersion: p.record.port.version } : {}) };
  const decline = useMutation({
    mutationFn: () => api<Proposal>(`/api/proposals/${p.id}/decline`, { body: { note } }),
    onSuccess: done,
  });
  const stale = !!clash && isStale(accept.error);
  const noteError = decline.error instanceof ApiError ? decline.error.fields.note : undefined;
  return (
    <div className="grid gap-2">
      {stale && clash && (
        <ConflictNotice noun={clash.noun} version={clash.versions.portVersion !== undefined && clash.noun !== 'device' ? clash.versions.portVersion : clash.versions.version} rows={clash.rows}
          label={clashLabel} show={clashValue} busy={accept.isPending}
          title={`Someone changed this ${clash.noun} since you opened the page; it is now at version ${clash.noun !== 'device' && clash.versions.portVersion !== undefined ? clash.versions.portVersion : clash.versions.version}.`}
          explain={`Nothing was written. Their change is below beside what accepting writes; the table shows the record as it is now.`}
          sides={{ theirs: 'On record now', mine: 'Found on site' }}
          reapplyLabel="Accept onto the record as it is now" discardLabel="Not now"
          onReapply={() => accept.mutate(clash.versions)} onDiscard={() => { setClash(null); accept.reset(); }} />
      )}
      {accept.isError && !stale && <p className="notice notice-bad" role="alert">{accept.error.message}</p>}
      <div className="flex flex-wrap gap-2">
        <button type="button" className="btn" disabled={accept.isPending || stale} onClick={() => accept.mutate(versions)}>{accept.isPending ? 'Accepting…' : 'Accept into the record'}</button>
        {!declining && <button type="button" className="btn btn-quiet" onClick={() => setDeclining(true)}>Decline…</button>}
      </div>
      {declining && (
        <form className="grid gap-2" onSubmit={(e) => { e.preventDefault(); decline.mutate(); }}>
          <label className="grid gap-1"><span className="label">Why not? The technician sees this note on the entry.</span>
            <textarea className="input" rows={2} value={note} onChange={(e) => setNote(e.target.value)} aria-invalid={!!noteError} /></label>
          {noteError && <span className="field-error">{noteError}</span>}
          {decline.isError && !noteError && <p className="notice notice-bad" role="alert">{decline.error.message}</p>}
          <div className="flex flex-wrap gap-2">
            <button className="btn" disabled={decline.isPending}>{decline.isPending ? 'Declining…' : 'Decline with this note'}</button>
            <button type="button" className="btn btn-quiet" onClick={() => setDeclining(false)}>Cancel</button>
          </div>
        </form>
      )}
    </div>
  );
}

function Review({ deviceId, canDecide, initial }: Props) {
  const q = useQuery({
    queryKey: fieldKeys.proposals(deviceId),
    queryFn: () => api<{ items: Proposal[] }>(`/api/proposals?deviceId=${deviceId}`),
    initialData: { items: initial },
  });
  const items = q.data.items;
  if (!items.length) return <p className="text-sm text-muted" role="status">Nothing waiting for review.</p>;
  return (
    <ul className="grid gap-4">
      {items.map((p) => (
        <li key={p.id} className="grid gap-2 border-l-4 border-warn pl-3" data-testid="proposal">
          <p className="font-semibold">{FIELD_LOG_LABELS[p.kind]}</p>
          <p className="text-sm text-muted">{when(p.entry.createdAt)} · {p.entry.userName || 'someone'} · <a href={`/field/devices/${deviceId}/log`}>field log</a></p>
          {p.entry.foundSettings && <p className="text-sm whitespace-pre-wrap">Found on site: {p.entry.foundSettings}</p>}
          {p.entry.note && <p className="text-sm whitespace-pre-wrap">{p.entry.note}</p>}
          <ProposalTable p={p} against="now" />
          {canDecide ? <Decide p={p} deviceId={deviceId} /> : <p className="text-sm text-muted">An engineer reviews it: accepting writes it into the record.</p>}
        </li>
      ))}
    </ul>
  );
}

export default function ProposalReview(props: Props) {
  return <QueryProvider><Review {...props} /></QueryProvider>;
}
