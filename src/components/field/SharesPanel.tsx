import { useState } from 'react';
import { CopyButton } from '../ui/CopyButton';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { QueryProvider } from '../QueryProvider';
import { api, ApiError } from '../../lib/client/api';
import { fieldKeys } from '../../lib/client/keys';

interface Share {
  id: string; scopeType: 'machine' | 'site'; scopeId: string; scopeName: string; label: string; createdByName: string;
  createdAt: string; expiresAt: string; revokedAt: string | null; accessCount: number; lastAccessAt: string | null; state: 'active' | 'expired' | 'revoked';
  /** The link this one was e-mailed from; revoking a link ends its copies too. */
  parentId: string | null;
}

/** How many active links were e-mailed from `id`, directly or from its copies. */
function activeCopies(items: Share[], id: string): number {
  const children = items.filter((s) => s.parentId === id);
  return children.reduce((n, c) => n + (c.state === 'active' ? 1 : 0) + activeCopies(items, c.id), 0);
}

function revokeQuestion(items: Share[], s: Share): string {
  const copies = activeCopies(items, s.id);
  const also = copies === 0 ? 'It stops' : `It and the ${copies === 1 ? 'copy' : `${copies} copies`} e-mailed from it stop`;
  return `Revoke the link to ${s.scopeName}? ${also} working at once.`;
}
interface Option { id: string; label: string }
interface Props { machines: Option[]; sites: Option[]; initial?: { scopeType: 'machine' | 'site'; scopeId: string } }

const day = (iso: string | null) => (iso ? new Date(iso).toISOString().slice(0, 10) : '—');
const inDays = (n: number) => new Date(Date.now() + n * 86_400_000).toISOString().slice(0, 10);

function CreateShare({ machines, sites, initial }: Props) {
  const qc = useQueryClient();
  const [scopeType, setScopeType] = useState<'machine' | 'site'>(initial?.scopeType ?? 'machine');
  const options = scopeType === 'machine' ? machines : sites;
  const [scopeId, setScopeId] = useState(initial?.scopeId ?? options[0]?.id ?? '');
  const [label, setLabel] = useState('');
  const [expiresAt, setExpiresAt] = useState(inDays(30));
  const m = useMutation({
    mutationFn: () => api<Share & { url: string }>('/api/shares', { body: { scopeType, scopeId, label, expiresAt } }),
    onSuccess: () => qc.invalidateQueries({ queryKey: fieldKeys.shares() }),
  });
  const fields = m.error instanceof ApiError ? m.error.fields : {};
  return (
    <form className="card grid gap-3" onSubmit={(e) => { e.preventDefault(); m.mutate(); }} aria-label="New share link">
      <h2>New read-only link</h2>
      <div className="grid gap-3 sm:grid-cols-[10rem_1fr]">
        <label className="grid gap-1"><span className="label">Share</span>
          <select className="input" value={scopeType} onChange={(e) => { const t = e.target.value as 'machine' | 'site'; setScopeType(t); setScopeId((t === 'machine' ? machines : sites)[0]?.id ?? ''); }}>
            <option value="machine">A machine</option><option value="site">A whole site</option>
          </select></label>
        <label className="grid gap-1"><span className="label">{scopeType === 'machine' ? 'Machine' : 'Site'}</span>
          <select className="input" value={scopeId} onChange={(e) => setScopeId(e.target.value)} aria-invalid={!!fields.scopeId}>
            {options.map((o) => <option key={o.id} value={o.id}>{o.label}</option>)}
          </select></label>
        <label className="grid gap-1"><span className="label">Last day</span>
          <input className="input" type="date" value={expiresAt} min={inDays(1)} onChange={(e) => setExpiresAt(e.target.value)} aria-invalid={!!fields.expiresAt} />
          {fields.expiresAt && <span className="field-error">{fields.expiresAt}</span>}</label>
        <label className="grid gap-1"><span className="label">Label (who it is for)</span>
          <input className="input" value={label} onChange={(e) => setLabel(e.target.value)} placeholder="e.g. Night-shift maintenance" /></label>
      </div>
      <button className="btn justify-center min-h-11" disabled={m.isPending || !scopeId}>Create link</button>
      {m.isError && <p className="notice notice-bad" role="alert">{m.error.message}</p>}
      {m.isSuccess && (
        <div className="notice notice-ok grid gap-2" role="status">
          <p>Link created. Copy it now: it is shown only once.</p>
          <input className="input mono" readOnly value={m.data.url} aria-label="The new share link" data-testid="new-share-url" onFocus={(e) => e.target.select()} />
          <span className="justify-self-start"><CopyButton text={m.data.url} label="Copy link" what="the new share link" /></span>
        </div>
      )}
    </form>
  );
}

function EmailShare({ share }: { share: Share }) {
  const [to, setTo] = useState('');
  const qc = useQueryClient();
  const m = useMutation({ mutationFn: () => api(`/api/shares/${share.id}/email`, { body: { to } }), onSuccess: () => qc.invalidateQueries({ queryKey: fieldKeys.shares() }) });
  return (
    <form className="flex flex-wrap gap-2" onSubmit={(e) => { e.preventDefault(); m.mutate(); }}>
      <label className="sr-only" htmlFor={`mail-${share.id}`}>E-mail a link to</label>
      <input id={`mail-${share.id}`} className="input !w-56" type="email" placeholder="name@example.com" value={to} onChange={(e) => setTo(e.target.value)} />
      <button className="btn btn-quiet btn-sm" disabled={m.isPending}>E-mail a link</button>
      {m.isSuccess && <span className="text-ok text-sm" role="status">Sent.</span>}
      {m.isError && <span className="field-error" role="alert">{m.error.message}</span>}
    </form>
  );
}

function Panel(props: Props) {
  const qc = useQueryClient();
  const q = useQuery({ queryKey: fieldKeys.shares(), queryFn: () => api<{ items: Share[] }>('/api/shares') });
  const revoke = useMutation({ mutationFn: (id: string) => api(`/api/shares/${id}`, { method: 'DELETE' }), onSuccess: () => qc.invalidateQueries({ queryKey: fieldKeys.shares() }) });
  return (
    <div className="grid gap-5">
      <CreateShare {...props} />
      <section className="card overflow-x-auto" aria-label="Share links">
        <h2 className="mb-2">Links</h2>
        {q.isPending && <p>Loading…</p>}
        {q.isError && <p className="notice notice-bad" role="alert">{q.error.message}</p>}
        {q.data?.items.length === 0 && <p className="text-muted">No links yet.</p>}
        <ul className="divide-y divide-line" data-testid="shares">
          {q.data?.items.map((s) => (
            <li key={s.id} className="py-3 grid gap-1" data-state={s.state}>
              <p><strong>{s.scopeName}</strong> <span className="text-muted">({s.scopeType})</span>{s.label && ` · ${s.label}`} · <span className={s.state === 'active' ? 'text-ok font-semibold' : 'text-bad font-semibold'}>{s.state}</span></p>
              <p className="text-sm text-muted">Until {day(s.expiresAt)} · opened {s.accessCount} times, last {day(s.lastAccessAt)} · by {s.createdByName} on {day(s.createdAt)}</p>
              {s.state === 'active' && (
                <div className="flex flex-wrap gap-3 items-center">
                  <EmailShare share={s} />
                  <button className="btn btn-danger btn-sm" onClick={() => confirm(revokeQuestion(q.data.items, s)) && revoke.mutate(s.id)}>Revoke</button>
                </div>
              )}
            </li>
          ))}
        </ul>
      </section>
    </div>
  );
}

export default function SharesPanel(props: Props) {
  return <QueryProvider><Panel {...props} /></QueryProvider>;
}
