/** Island for the library page: the commands of a device (its own and its profile's) or of a profile, with copy and trash. */
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { api } from '../../lib/client/api';
import { commandKeys } from '../../lib/client/keys';
import { QueryProvider } from '../QueryProvider';
import { presetValues, renderCommand, timingPort, type CommandPreset } from '../../lib/composer/presets';
import { ms } from '../../lib/composer/format';
import type { FieldValues, Template } from '../../lib/frame';
import type { NamedPort } from './types';
import { useCommandTrash } from './use-command-trash';
import type { SavedSequence, StepInfo } from '../../lib/composer/saved-sequence';

interface Item {
  id: string; name: string; purpose: string; version: number; movesMachinery: boolean; safeToRepeat: boolean; setsUpDevice: boolean; inherited: boolean; owner: { kind: string; id: string; label: string }; updatedAt: string;
  template: Template; fieldValues: FieldValues; presets: CommandPreset[]; portName: string;
  notes: string; replyTemplate: Template | null; rawUnits: Record<string, string>;
  /** Set for a sequence, with its steps as they stand (gaps named). */
  sequence?: SavedSequence | null; steps?: StepInfo[];
}
interface Target { value: string; label: string }
interface Props { owner: { kind: 'device' | 'profile'; id: string; label: string }; basePath: string; canEdit: boolean; ports: NamedPort[] }

function useTargets(enabled: boolean) {
  return useQuery({
    queryKey: commandKeys.copyTargets(),
    enabled,
    queryFn: async () => {
      const [d, p] = await Promise.all([
        api<{ items: { id: string; tag: string; name: string }[] }>('/api/devices?pageSize=200&sort=tag'),
        api<{ items: { id: string; name: string }[] }>('/api/profiles?pageSize=200'),
      ]);
      return [
        ...d.items.map((x) => ({ value: `device:${x.id}`, label: `Device ${x.tag}${x.name ? ` ${x.name}` : ''}` })),
        ...p.items.map((x) => ({ value: `profile:${x.id}`, label: `Profile ${x.name}` })),
      ] as Target[];
    },
  });
}

/** A command's presets as they are sent: PLC string, hex, bytes and time on the wire at its port. */
function Presets({ item, ports }: { item: Item; ports: NamedPort[] }) {
  const port = timingPort(ports, item.portName);
  return (
    <details className="text-sm" data-testid="library-presets">
      <summary>{item.presets.length} {item.presets.length === 1 ? 'preset' : 'presets'}{port ? ` (times at ${port.name})` : ''}</summary>
      <ul className="grid gap-2 mt-2">
        {item.presets.map((p) => {
          const r = renderCommand(item.template, presetValues(item.fieldValues, p), port?.settings ?? null, p.name);
          return (
            <li key={p.name} className="grid gap-0.5" data-preset={p.name}>
              <b>{p.name}</b>
              {r.problem ? <span className="text-bad">Cannot be built: {r.problem}</span> : (
                <>
                  <code className="mono break-all">{r.plc}</code>
                  <code className="mono break-all text-xs">{r.hex}</code>
                  <span className="text-xs text-muted">{r.byteCount} bytes{r.wireMs !== null && ` · ${ms(r.wireMs)} on the wire`}</span>
                </>
              )}
            </li>
          );
        })}
      </ul>
    </details>
  );
}

/** A sequence's steps in order, each gap in words. */
function SequenceSteps({ item }: { item: Item }) {
  const steps = item.steps ?? [];
  return (
    <div className="text-sm grid gap-1" data-testid="library-sequence-steps">
      <p className="text-muted">{steps.length} {steps.length === 1 ? 'step' : 'steps'}, {item.sequence?.mode === 'separate' ? 'sent separately' : 'sent as one string'}</p>
      <ol className="list-decimal pl-5">
        {steps.map((st) => (
          <li key={st.index} className={st.gap ? 'text-bad' : undefined} data-state={st.state}>{st.gap ?? st.name}</li>
        ))}
      </ol>
    </div>
  );
}

/** The sequences a command is a step of, as the API's 409 names them on a move to the trash. */
function Row({ item, basePath, canEdit, targets, ports }: { item: Item; basePath: string; canEdit: boolean; targets: Target[]; ports: NamedPort[] }) {
  const qc = useQueryClient();
  const [target, setTarget] = useState('');
  const done = () => qc.invalidateQueries({ queryKey: commandKeys.all() });
  const copy = useMutation({
    mutationFn: () => { const [kind, id] = target.split(':'); return api(`/api/commands/${item.id}/copy`, { body: { [kind === 'device' ? 'deviceId' : 'profileId']: id } }); },
    onSuccess: () => { setTarget(''); done(); },
  });
  const trash = useCommandTrash(item, done);
  const err = copy.error ?? trash.error;
  return (
    <li className="card grid gap-2" data-command={item.name}>
      <div className="flex flex-wrap items-baseline gap-x-3">
        <a href={`${basePath}/${item.id}`} className="font-semibold">{item.name}</a>
        {item.movesMachinery && <span className="text-xs rounded bg-[#fdf3e3] text-warn px-1.5">moves machinery</span>}
        {item.safeToRepeat && <span className="text-xs rounded border border-line px-1.5" data-testid="safe-badge">safe to repeat</span>}
        {item.setsUpDevice && <span className="text-xs rounded border border-line px-1.5" data-testid="setup-badge">setup</span>}
        {item.sequence && <span className="text-xs rounded border border-line px-1.5" data-testid="sequence-badge">sequence</span>}
        {item.inherited && <span className="text-xs text-muted">from profile {item.owner.label} · read-only here</span>}
      </div>
      {item.purpose && <p className="text-sm text-muted">{item.purpose}</p>}
      {item.sequence && <SequenceSteps item={item} />}
      {item.presets.length > 0 && <Presets item={item} ports={ports} />}
      {canEdit && (
        <div className="flex flex-wrap items-center gap-2 text-sm">
          <label htmlFor={`copy-${item.id}`} className="sr-only">Copy {item.name} to</label>
          <select id={`copy-${item.id}`} className="input !py-1 !w-auto max-w-full" value={target} onChange={(e) => setTarget(e.target.value)}>
            <option value="">Copy to…</option>
            {targets.map((t) => <option key={t.value} value={t.value}>{t.label}</option>)}
          </select>
          <button type="button" className="btn btn-quiet btn-sm" disabled={!target || copy.isPending} onClick={() => copy.mutate()}>Copy</button>
          {copy.isSuccess && <span role="status" className="text-ok">Copied</span>}
          {!item.inherited && (
            <button type="button" className="btn btn-quiet btn-sm !text-bad ml-auto" disabled={trash.isPending}
              onClick={() => confirm(`Move "${item.name}" to the trash?`) && trash.mutate()}>Move to trash</button>
          )}
        </div>
      )}
      {trash.notice}
      {err && <p className="notice notice-bad text-sm" role="alert">{err.message}</p>}
    </li>
  );
}

function Trash({ owner, canEdit }: Props) {
  const qc = useQueryClient();
  const param = owner.kind === 'device' ? 'deviceId' : 'profileId';
  const q = useQuery({ queryKey: commandKeys.list(owner, true), queryFn: () => api<{ items: Item[] }>(`/api/commands?${param}=${owner.id}&trashed=true`) });
  const restore = useMutation({
    mutationFn: async (item: Item) => {
      const h = await api<{ version: number; items: { id: string }[] }>(`/api/commands/${item.id}/revisions`);
      return api(`/api/commands/${item.id}/restore`, { body: { revisionId: h.items[0]!.id, version: h.version } });
    },
    onSuccess: () => qc.invalidateQueries({ queryKey: commandKeys.all() }),
  });
  if (!q.data?.items.length) return null;
  return (
    <details className="mt-4">
      <summary className="cursor-pointer text-sm">In the trash ({q.data.items.length})</summary>
      <ul className="grid gap-1 mt-2 text-sm">
        {q.data.items.map((i) => (
          <li key={i.id} className="flex items-center gap-2">{i.name}
            {canEdit && <button type="button" className="btn btn-quiet btn-sm" onClick={() => restore.mutate(i)}>Restore</button>}
          </li>
        ))}
      </ul>
    </details>
  );
}

function Library(props: Props) {
  const { owner, basePath, canEdit } = props;
  const param = owner.kind === 'device' ? 'deviceId' : 'profileId';
  const q = useQuery({ queryKey: commandKeys.list(owner), queryFn: () => api<{ items: Item[] }>(`/api/commands?${param}=${owner.id}`) });
  const targets = useTargets(canEdit);
  if (q.isPending) return <p>Loading commands…</p>;
  if (q.isError) return <p className="notice notice-bad" role="alert">{q.error.message}</p>;
  // The command's own device or profile first: copying there duplicates it (named "… (copy)").
  const here = `${owner.kind}:${owner.id}`;
  const list = [{ value: here, label: `This ${owner.kind} (duplicate)` }, ...(targets.data ?? []).filter((t) => t.value !== here)];
  return (
    <div>
      {q.data.items.length === 0 && <p className="text-muted">No commands yet.</p>}
      {owner.kind === 'device' && q.data.items.length > 0 && (
        <p className="mb-3"><a className="btn btn-quiet btn-sm" href={`/api/devices/${owner.id}/plc-code`} download data-testid="plc-code-download">PLC code for every command (.st)</a></p>
      )}
      <ul className="grid gap-3" data-testid="command-list">
        {q.data.items.map((i) => <Row key={i.id} item={i} basePath={basePath} canEdit={canEdit} targets={list} ports={props.ports} />)}
      </ul>
      <Trash {...props} />
    </div>
  );
}

export default function CommandLibrary(props: Props) {
  return (
    <QueryProvider>
      <Library {...props} />
    </QueryProvider>
  );
}
