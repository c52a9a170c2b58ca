/**
 * The bus page's poll cycle panel: the polls the master sends each member (from the member's library commands or
 * typed byte counts), the cycle it makes, the worst case, findings, and the timeline. Worked out in the page with
 * the frame engine. The plan is the link's `busPlan` and the drops its members' `dropM` / `tapPorts`: loaded with
 * the link, saved through the link's route with the version it was opened at (a 409 shows the conflict notice).
 */
import { useEffect, useId, useMemo, useRef, useState } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../lib/client/api';
import { vaultKeys } from '../../lib/client/keys';
import { changedPaths } from '../../lib/client/conflict';
import { useConflict } from '../../lib/client/use-conflict';
import { busCycleReport } from '../../lib/frame/bus-cycle';
import { busCycleSchema } from '../../lib/frame/bus-cycle-schema';
import { BUS_TOPOLOGIES, type BusTopology } from '../../lib/frame/bus-layout';
import { type BusPlan, type PlanMember, type PollDraft, firstPoll } from '../../lib/composer/bus-plan';
import { type PlanDraft, type PlanShape, type SavedPlan, draftOf, dropsOf, num, planOf, saveBody, shapeOf, storedDrops } from '../../lib/composer/bus-plan-draft';
import type { StoredBusPoll } from '../../lib/schemas/bus-plan';
import { ConflictNotice } from '../ui/ConflictNotice';
import { QueryProvider } from '../QueryProvider';
import { BusTimeline } from './BusTimeline';
import { ErrorNotice, useUnsavedGuard } from './shared';

type PollRow = PollDraft & { key: number };
type Draft = Omit<PlanDraft, 'polls'> & { polls: PollRow[] };

/** The link as `/api/links/{id}` answers it, as far as the panel reads it. */
export interface PlanLink extends SavedPlan {
  id: string;
  version: number;
  cableLengthM: number | null;
  members: (SavedPlan['members'][number] & { role: 'master' | 'slave' | 'peer'; isEnd: boolean | null; unitLoads: number | null })[];
}

const TOPOLOGY_TEXT: Record<BusTopology, string> = { 'daisy-chain': 'Daisy chain', 'trunk-and-drops': 'Trunk with drops', star: 'Star' };
const PART_TEXT: Record<string, string> = { polls: 'Polls', responseTimeoutMs: 'Response timeout (ms)', retries: 'Retries', targetCycleMs: 'Target cycle (ms)', topology: 'Layout' };

/** One attempt at saving: the version it is based on, the link's state at that version and mine, and the members then. */
interface Attempt { version: number; base: PlanShape; mine: PlanShape; members: PlanLink['members'] }

const recordShape = (l: PlanLink): PlanShape => shapeOf(l.busPlan, storedDrops(l.members));

function Panel({ plan, link, canEdit }: { plan: BusPlan; link: PlanLink; canEdit: boolean }) {
  const id = useId();
  const qc = useQueryClient();
  const q = useQuery({ queryKey: vaultKeys.record('link', link.id), queryFn: () => api<PlanLink>(`/api/links/${link.id}`), initialData: link });
  const record = q.data;
  const all = [plan.master, ...plan.members];
  const memberOf = (portId: string) => all.find((m) => m.portId === portId)!;
  // Keys of poll rows: the opened polls take 0…n-1 (the same on the server and in the browser, so the ids hydrate).
  const nextKey = useRef(0);
  const withKeys = (d: PlanDraft): Draft => ({ ...d, polls: d.polls.map((p, key) => ({ ...p, key })) });
  const open = (l: PlanLink) => {
    const o = draftOf(plan, l);
    nextKey.current = Math.max(nextKey.current, o.draft.polls.length);
    return o;
  };
  const [base, setBase] = useState<PlanLink>(record);
  const opened = useMemo(() => open(base), [base]); // eslint-disable-line react-hooks/exhaustive-deps
  const [draft, setDraft] = useState<Draft>(() => withKeys(opened.draft));
  const reset = (l: PlanLink) => {
    setBase(l);
    setDraft(withKeys(open(l).draft));
  };
  const { polls, timeout, retries, target, drops, topology } = draft;
  const put = (patch: Partial<Draft>) => setDraft({ ...draft, ...patch });
  const setPolls = (next: PollRow[]) => put({ polls: next });
  const newPoll = (m: PlanMember): PollRow => ({ ...firstPoll(m), key: nextKey.current++ });
  const [adding, setAdding] = useState(plan.members[0]!.portId);
  const trunkM = record.cableLengthM;

  const typed = (d: Draft): PlanDraft => ({ ...d, polls: d.polls.map(({ key: _k, ...p }) => p) });
  const edited = JSON.stringify(typed(draft)) !== JSON.stringify(opened.draft);
  useUnsavedGuard(edited);
  // A newer version saved elsewhere on the page (the link's members or details): take it while nothing is edited here.
  useEffect(() => {
    if (!edited && record.version > base.version) reset(record);
  }, [record.version]); // eslint-disable-line react-hooks/exhaustive-deps

  const body = {
    settings: plan.master.settings,
    polls: polls.map((p) => ({ label: p.label, device: memberOf(p.portId).label, requestBytes: num(p.requestBytes), replyBytes: num(p.replyBytes), responseMs: num(p.replyBytes) === 0 ? undefined : num(p.responseMs), perCycle: num(p.perCycle) })),
    responseTimeoutMs: num(timeout), retries: num(retries), targetCycleMs: num(target),
    layout: {
      ...(trunkM != null ? { trunkM } : {}), ...(topology ? { topology } : {}),
      members: all.map((m) => ({ label: m.label, dropM: num(drops[m.portId]?.dropM ?? ''), tapPorts: num(drops[m.portId]?.tapPorts ?? ''), termination: m.settings.termination, bias: m.settings.bias })),
    },
  };
  const parsed = useMemo(() => busCycleSchema.safeParse(body), [JSON.stringify(body)]);
  const problems: Record<string, string> = {};
  if (!parsed.success) for (const i of parsed.error.issues) problems[i.path.join('.')] ??= i.message;
  const report = useMemo(() => {
    if (!parsed.success) return null;
    const b = parsed.data;
    const layout = { ...b.layout!, members: b.layout!.members.map((m) => ({ ...m, id: m.label })) };
    const r = busCycleReport(plan.master.settings, b.polls, { retries: b.retries, responseTimeoutMs: b.responseTimeoutMs, targetCycleMs: b.targetCycleMs }, layout);
    // The link check above already reports terminators by cable end; say it once.
    const saidAbove = plan.linkCodes.some((c) => c === 'termination-count' || c === 'termination-in-middle');
    return { ...r, findings: r.findings.filter((f) => !(saidAbove && f.code === 'termination-too-many')) };
  }, [parsed, plan.linkCodes, plan.master.settings]);

  const baseShape = recordShape(base);
  const mineShape: PlanShape = shapeOf(planOf(plan, typed(draft)), { ...baseShape.drops, ...dropsOf(typed(draft), all.map((m) => m.portId)) });
  const changed = changedPaths(baseShape, mineShape);
  const conflicts = useConflict<PlanShape, PlanLink>((v) => ('version' in v ? recordShape(v as PlanLink) : (v as PlanShape)));
  const conflict = conflicts.conflict;
  const save = useMutation({
    mutationFn: (a: Attempt) => api<PlanLink>(`/api/links/${link.id}`, { method: 'PATCH', body: saveBody(a.version, a.mine, changedPaths(a.base, a.mine), a.members) }),
    onSuccess: (saved) => {
      conflicts.clear();
      qc.setQueryData(vaultKeys.record('link', link.id), saved);
      qc.invalidateQueries({ queryKey: vaultKeys.all() });
      reset(saved);
    },
    onError: (err, a) => conflicts.take(err, a.base, a.mine),
  });
  const partLabel = (path: string[]) => (path[0] === 'drops' ? `${path[1] ? (all.find((m) => m.portId === path[1])?.label ?? path[1]) : 'Drops'}${path[2] ? ` · ${path[2] === 'dropM' ? 'drop (m)' : 'ports on its tap'}` : ''}` : PART_TEXT[path[0]!] ?? path.join('.'));
  const pollText = (p: StoredBusPoll) => `${p.label || (all.find((m) => m.portId === p.portId)?.label ?? p.portId)}: ${p.requestBytes} → ${p.replyBytes} bytes${p.responseMs !== undefined ? `, ${p.responseMs} ms` : ''}${(p.perCycle ?? 1) > 1 ? ` ×${p.perCycle}` : ''}`;
  const partValue = (path: string[], v: unknown) => {
    if (path[0] === 'polls') return Array.isArray(v) ? (v as StoredBusPoll[]).map(pollText).join('; ') : 'no plan saved';
    if (path[0] === 'drops' && path.length === 2) return v ? `drop ${(v as { dropM: number | null }).dropM ?? '—'} m, tap ${(v as { tapPorts: number | null }).tapPorts ?? '—'}` : 'not a member';
    if (v === null || v === undefined || v === '') return path[0] === 'responseTimeoutMs' || path[0] === 'retries' ? "the master port's" : 'not recorded';
    return String(v);
  };

  const set = (key: number, patch: Partial<PollRow>) => setPolls(polls.map((p) => (p.key === key ? { ...p, ...patch } : p)));
  const pick = (p: PollRow, commandId: string) => {
    const m = memberOf(p.portId);
    const c = m.commands.find((x) => x.id === commandId);
    if (!c) return set(p.key, { commandId: '' });
    set(p.key, { commandId, label: `${m.label}: ${c.name}`, requestBytes: String(c.requestBytes), replyBytes: String(c.replyBytes ?? 0) });
  };
  const problem = (path: string) => problems[path] && <span className="block text-xs text-bad mt-1" role="alert">{problems[path]}</span>;
  const field = (label: string, fid: string, value: string, onChange: (v: string) => void, path: string, hint?: string) => (
    <div>
      <label htmlFor={fid} className="label !text-xs">{label}</label>
      <input id={fid} className="input !py-1 disabled:bg-paper disabled:border-line" inputMode="decimal" value={value} aria-invalid={!!problems[path]} onChange={(e) => onChange(e.target.value)} />
      {hint && <span className="block text-xs text-muted">{hint}</span>}
      {problem(path)}
    </div>
  );

  return (
    <section className="card min-w-0" aria-labelledby={`${id}-h`} data-testid="poll-cycle">
      <h2 id={`${id}-h`} className="mb-1">Poll cycle</h2>
      <p className="text-sm text-muted mb-3">
        What {plan.master.label} asks each member, and how long one round takes at {plan.master.settings.baud} bit/s. Response times start from
        each member port's turnaround delay; change them to what the device's manual says.
      </p>
      <p className="text-sm mb-3" data-testid="plan-state">
        {base.busPlan ? `The saved plan of this bus (link version ${base.version}).` : 'No plan saved for this bus yet: these are starting figures.'}
        {opened.dropped > 0 && ` ${opened.dropped} saved ${opened.dropped === 1 ? 'poll asks a port' : 'polls ask ports'} no longer on the bus; saving leaves ${opened.dropped === 1 ? 'it' : 'them'} out.`}
        {!canEdit && ' You can read the plan; engineers, admins and owners change it.'}
      </p>

      <fieldset disabled={!canEdit} className="min-w-0">
      <div className="grid grid-cols-2 sm:grid-cols-3 gap-3 mb-4">
        {field('Response timeout (ms)', `${id}-to`, timeout, (v) => put({ timeout: v }), 'responseTimeoutMs', `${plan.master.label}: ${plan.master.settings.responseTimeoutMs} ms`)}
        {field('Retries', `${id}-re`, retries, (v) => put({ retries: v }), 'retries')}
        {field('Target cycle (ms)', `${id}-tg`, target, (v) => put({ target: v }), 'targetCycleMs', 'optional')}
      </div>

      <h3 className="text-base font-semibold mb-2">Polls</h3>
      <ol className="grid gap-3 mb-3">
        {polls.map((p, i) => {
          const m = memberOf(p.portId);
          const f = (k: string) => `${id}-${p.key}-${k}`;
          return (
            <li key={p.key} className="border border-line rounded p-3" data-testid="poll-row">
              <fieldset>
                <legend className="font-medium text-sm mb-2">{m.label}</legend>
                <div className="grid grid-cols-2 sm:grid-cols-4 gap-3">
                  <div className="col-span-2">
                    <label htmlFor={f('cmd')} className="label !text-xs">Request</label>
                    <select id={f('cmd')} className="input !py-1" value={p.commandId} onChange={(e) => pick(p, e.target.value)}>
                      <option value="">Type the byte counts</option>
                      {m.commands.map((c) => <option key={c.id} value={c.id}>{`${c.name} (${c.requestBytes} bytes)`}</option>)}
                    </select>
                  </div>
                  <div className="col-span-2">
                    <label htmlFor={f('label')} className="label !text-xs">Label</label>
                    <input id={f('label')} className="input !py-1" value={p.label} onChange={(e) => set(p.key, { label: e.target.value })} />
                    {problem(`polls.${i}.label`)}
                  </div>
                  {field('Request bytes', f('rq'), p.requestBytes, (v) => set(p.key, { requestBytes: v, commandId: '' }), `polls.${i}.requestBytes`)}
                  {field('Reply bytes', f('rp'), p.replyBytes, (v) => set(p.key, { replyBytes: v }), `polls.${i}.replyBytes`, '0 = no reply (broadcast)')}
                  {field('Response time (ms)', f('rs'), p.responseMs, (v) => set(p.key, { responseMs: v }), `polls.${i}.responseMs`)}
                  {field('Per cycle', f('pc'), p.perCycle, (v) => set(p.key, { perCycle: v }), `polls.${i}.perCycle`)}
                </div>
                {canEdit && <button type="button" className="btn btn-quiet btn-sm mt-2" onClick={() => setPolls(polls.filter((x) => x.key !== p.key))} aria-label={`Remove poll ${p.label || i + 1}`}>Remove</button>}
              </fieldset>
            </li>
          );
        })}
      </ol>
      {problem('polls')}
      {canEdit && <div className="flex flex-wrap items-end gap-2 mb-4">
        <label className="grow"><span className="label">Add a poll of</span>
          <select className="input" value={adding} onChange={(e) => setAdding(e.target.value)}>
            {plan.members.map((m) => <option key={m.portId} value={m.portId}>{m.label}</option>)}
          </select>
        </label>
        <button type="button" className="btn btn-quiet" onClick={() => setPolls([...polls, newPoll(memberOf(adding))])}>Add poll</button>
      </div>}

      <details className="mb-4">
        <summary className="cursor-pointer font-medium">Cable layout (drops)</summary>
        <p className="text-sm text-muted my-2">Trunk: {trunkM != null ? `${trunkM} m (the link's cable length)` : 'not recorded (set the cable length in the link details)'}. A drop is the stub from the trunk to the device; 0 or empty when the trunk runs through it.</p>
        <div className="mb-2">
          <label htmlFor={`${id}-topo`} className="label !text-xs">Layout</label>
          <select id={`${id}-topo`} className="input !py-1 !w-auto" value={topology} onChange={(e) => put({ topology: e.target.value as '' | BusTopology })}>
            <option value="">Work it out from the drops</option>
            {BUS_TOPOLOGIES.map((t) => <option key={t} value={t}>{TOPOLOGY_TEXT[t]}</option>)}
          </select>
        </div>
        <div className="grid gap-2">
          {all.map((m, i) => (
            <div key={m.portId} className="grid grid-cols-2 sm:grid-cols-[minmax(0,1fr)_8rem_8rem] gap-2 items-end">
              <span className="col-span-2 sm:col-span-1 text-sm">{m.label}</span>
              {field('Drop (m)', `${id}-d-${i}`, drops[m.portId]?.dropM ?? '', (v) => put({ drops: { ...drops, [m.portId]: { tapPorts: drops[m.portId]?.tapPorts ?? '', dropM: v } } }), `layout.members.${i}.dropM`)}
              {field('Ports on its tap', `${id}-t-${i}`, drops[m.portId]?.tapPorts ?? '', (v) => put({ drops: { ...drops, [m.portId]: { dropM: drops[m.portId]?.dropM ?? '', tapPorts: v } } }), `layout.members.${i}.tapPorts`)}
            </div>
          ))}
        </div>
      </details>
      </fieldset>

      {canEdit && (
        <div className="flex flex-wrap items-center gap-2 mb-4">
          <button type="button" className="btn" disabled={!report || changed.length === 0 || save.isPending}
            onClick={() => save.mutate({ version: base.version, base: baseShape, mine: mineShape, members: base.members })}>Save the plan</button>
          <span className="text-sm text-muted" aria-live="polite">{save.isPending ? 'Saving…' : changed.length === 0 ? 'Nothing to save.' : !report ? 'Fill in the marked fields to save.' : 'Not saved yet.'}</span>
        </div>
      )}
      {conflict && (
        <div className="mb-4">
          <ConflictNotice noun="bus plan" version={conflict.version} rows={conflict.rows} label={partLabel} show={partValue} busy={save.isPending}
            onReapply={() => save.mutate({ version: conflict.version, base: conflict.theirs, mine: conflict.merged, members: conflict.current.members })}
            onDiscard={() => { qc.setQueryData(vaultKeys.record('link', link.id), conflict.current); conflicts.clear(); reset(conflict.current); }} />
        </div>
      )}
      {save.isError && !conflict && <div className="mb-4"><ErrorNotice error={save.error} /></div>}

      {report && (
        <div aria-live="polite">
          <dl className="grid grid-cols-2 sm:grid-cols-4 gap-3 mb-3" data-testid="cycle-figures">
            <div><dt className="text-xs text-muted">One cycle</dt><dd className="mono" data-figure="cycle">{report.cycleMs.toFixed(3)} ms</dd></div>
            <div><dt className="text-xs text-muted">Polls per second</dt><dd className="mono" data-figure="pps">{report.pollsPerSecond.toFixed(1)}</dd></div>
            <div><dt className="text-xs text-muted">Worst case</dt><dd className="mono" data-figure="worst">{report.worstCaseMs.toFixed(3)} ms</dd>
              {report.worstCaseDevice && <dd className="text-xs text-muted">when {report.worstCaseDevice} does not answer ({report.retries} {report.retries === 1 ? 'retry' : 'retries'})</dd>}</div>
            <div><dt className="text-xs text-muted">Silent interval</dt><dd className="mono">{report.interFrameGapMs ? `${report.interFrameGapMs.toFixed(3)} ms` : 'none'}</dd></div>
          </dl>
          <ul className="grid gap-2 mb-3" data-testid="cycle-findings">
            {report.findings.length === 0 && <li className="notice notice-ok text-sm">The timeout, the cycle and the layout raise nothing.</li>}
            {report.findings.map((f, i) => (
              <li key={i} className={`notice text-sm ${f.severity === 'error' ? 'notice-bad' : 'notice-warn'}`} data-code={f.code}>{f.message}</li>
            ))}
          </ul>
          <BusTimeline report={report} />
        </div>
      )}
      {!report && <p className="notice notice-warn text-sm">Fill in the marked fields to work out the cycle.</p>}
    </section>
  );
}

export default function PollCyclePanel(props: { plan: BusPlan; link: PlanLink; canEdit: boolean }) {
  return (
    <QueryProvider>
      <Panel {...props} />
    </QueryProvider>
  );
}
