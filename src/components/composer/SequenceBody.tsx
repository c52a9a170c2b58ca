/**
 * The sequence composer below its details: the port, how it is sent, the steps, the preview of the whole string,
 * the replies, saving and the history. The server renders it with the rest of the island; the browser loads it,
 * the frame engine and zod with it, once the shell (SequenceComposer.tsx) is interactive (composer JavaScript
 * budget, issue 16).
 */
import { lazy, Suspense, useMemo, useState, type Dispatch, type SetStateAction } from 'react';
import { assembleSaved, sequenceInputs, type SavedSequence, type StepCommand } from '../../lib/composer/saved-sequence';
import { defaultPortSettings } from '../../lib/frame/port-settings';
import { templateSchema, type Template } from '../../lib/frame/template';
import { Section } from '../ui/Section';
import { PortPicker } from './PortPicker';
import { sequenceCompare, type SavedSequenceCommand, type SequenceDraft } from './sequence-conflict';
import { PlcCodeSection } from './PlcCodeSection';
import { SequencePreview } from './SequencePreview';
import { SequenceReplies as SequenceRepliesNow } from './SequenceReplies';
import { SaveBar } from './SaveBar';
import { SequenceSteps as SequenceStepsNow, type KeyedStep } from './SequenceSteps';
import { Later } from './Later';
import type { LibraryCommand } from './sequence-types';
import { draftOf, type CommandDraft, type NamedPort } from './types';

const EMPTY: Template = { version: 1, segments: [] };
const History = /* @__PURE__ */ lazy(() => import('./History'));
const SequenceConflict = /* @__PURE__ */ lazy(() => import('./SequenceConflict'));
// Rendered by the server at once; in the browser each loads after the body is interactive (see Later).
const SequenceSteps = import.meta.env.SSR ? SequenceStepsNow : /* @__PURE__ */ lazy(() => import('./SequenceSteps').then((m) => ({ default: m.SequenceSteps })));
const SequenceReplies = import.meta.env.SSR ? SequenceRepliesNow : /* @__PURE__ */ lazy(() => import('./SequenceReplies').then((m) => ({ default: m.SequenceReplies })));

export type SequenceDetails = Pick<CommandDraft, 'name' | 'purpose' | 'notes' | 'movesMachinery' | 'portName'>;

export interface SequenceBodyProps {
  command: CommandDraft;
  ports: NamedPort[];
  owner: { kind: 'device' | 'profile'; id: string };
  basePath: string;
  readOnly: boolean;
  plcStringCapacity: number | null;
  saved: { id: string; version: number } | null;
  base: SequenceDraft;
  onSaved: (c: { id: string; version: number }, sent: SequenceDraft) => void;
  onLoad: (c: SavedSequenceCommand) => void;
  details: SequenceDetails;
  setDetails: Dispatch<SetStateAction<SequenceDetails>>;
  steps: KeyedStep[];
  setSteps: Dispatch<SetStateAction<KeyedStep[]>>;
  mode: SavedSequence['mode'];
  setMode: (m: SavedSequence['mode']) => void;
  delayMs: number;
  setDelayMs: (ms: number) => void;
  /** The library of the device or profile, live and in the trash (null while it loads). */
  lib: { live: LibraryCommand[] | null; trashed: LibraryCommand[]; error: Error | null };
  /** The sequence as it would be saved now, and whether it differs from `base`. */
  draft: SequenceDraft;
  dirty: boolean;
}

export default function SequenceBody(props: SequenceBodyProps) {
  const { command, ports, owner, basePath, readOnly, plcStringCapacity, saved, base, onSaved, onLoad } = props;
  const { details, setDetails, steps, setSteps, mode, setMode, delayMs, setDelayMs, lib, draft, dirty } = props;
  const [showHistory, setShowHistory] = useState(false);
  // Single commands kept on this very device or profile: the ones a step may use.
  const library = useMemo(() => (lib.live ?? []).filter((c) => !c.inherited && !c.sequence && c.id !== saved?.id), [lib.live, saved]);
  const lookup = useMemo(() => {
    const map = new Map<string, StepCommand>();
    // Inherited ones too: a profile's sequence seen from one of its devices refers to the profile's commands.
    for (const c of lib.live ?? []) map.set(c.id, { ...c, isSequence: !!c.sequence, trashed: false });
    for (const c of lib.trashed) map.set(c.id, { ...c, isSequence: !!c.sequence, trashed: true });
    return (id: string) => map.get(id);
  }, [lib.live, lib.trashed]);

  const sequence = draft.sequence;
  const port = ports.find((p) => p.name === details.portName) ?? ports[0];
  const settings = port?.settings ?? defaultPortSettings;
  // An inline step's template as its segment editor leaves it may not be whole yet: previewed empty until it is.
  const problems = sequence.steps.flatMap((x, i) => (['template', 'replyTemplate'] as const).flatMap((k) => {
    const t = x[k];
    const r = t ? templateSchema.safeParse(t) : null;
    return r && !r.success ? [`Step ${i + 1}${k === 'replyTemplate' ? ', expected reply' : ''}: ${r.error.issues[0]!.path.join('.')}: ${r.error.issues[0]!.message}`] : [];
  }));
  const parsed = (t: Template) => { const r = templateSchema.safeParse(t); return r.success ? r.data : null; };
  const previewed: SavedSequence = { ...sequence, steps: sequence.steps.map((x) => ({
    ...x,
    ...(x.template ? { template: parsed(x.template) ?? EMPTY } : {}),
    ...(x.replyTemplate ? { replyTemplate: parsed(x.replyTemplate) } : {}),
  })) };
  const s = useMemo(() => assembleSaved(previewed, lookup, { settings, ...(plcStringCapacity ? { plcStringCapacity } : {}) }),
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [JSON.stringify(previewed), lookup, settings, plcStringCapacity]);
  const templates = previewed.steps.map((x) => (x.commandId ? lookup(x.commandId)?.template : x.template));
  const replies = previewed.steps.map((x, i) => (s.info[i]?.gap ? null : x.commandId ? lookup(x.commandId)?.replyTemplate ?? null : x.replyTemplate ?? null));
  const names = s.info.map((i) => i.name);
  const plcGap = problems[0] ?? s.info.find((i) => i.gap)?.gap;
  const plcSource = { kind: 'sequence' as const, mode, delayMs: sequence.delayMs, steps: sequenceInputs(previewed, lookup).map((x) => ({ template: x.template, values: x.values ?? {} })), ...(plcGap ? { gap: plcGap } : {}) };
  const errors = s.findings.filter((f) => f.severity === 'error');
  const valid = !!details.name.trim() && steps.length > 0 && problems.length === 0;

  return (
    <>
      <div className="grid gap-4 lg:grid-cols-2 items-start">
        <div className="grid gap-4 min-w-0">
          <Section title="Port" id="port">
            <PortPicker ports={ports} value={details.portName} readOnly={readOnly} onChange={(portName) => setDetails((d) => ({ ...d, portName }))} />
          </Section>
          <Section title="How it is sent" id="send-mode">
            <fieldset className="grid gap-2 text-sm" disabled={readOnly}>
              <legend className="sr-only">How the steps are sent</legend>
              <label className="flex items-center gap-2"><input type="radio" name="seq-mode" checked={mode === 'one-string'} onChange={() => setMode('one-string')} /> As one string (each step keeps its own terminator)</label>
              <label className="flex items-center gap-2"><input type="radio" name="seq-mode" checked={mode === 'separate'} onChange={() => setMode('separate')} /> As separate sends, one per step</label>
              {mode === 'separate' && (
                <label className="flex flex-wrap items-center gap-2">Pause between sends
                  <input type="number" min={0} max={60000} className="input !py-1 !w-24" value={delayMs} onChange={(e) => setDelayMs(Math.max(0, Number(e.target.value) || 0))} /> ms
                </label>
              )}
            </fieldset>
          </Section>
          <Section title="Steps" id="steps">
            {lib.error && <p className="notice notice-bad text-sm" role="alert">{lib.error.message}</p>}
            {problems.map((p) => <p key={p} className="notice notice-bad text-sm mb-2" role="alert">{p}</p>)}
            <Later loading="Loading the steps…">
              <SequenceSteps steps={steps} onChange={setSteps} library={library} info={s.info} assembled={s.steps} separate={mode === 'separate'}
                rules={settings.frameRules ?? {}} protocol={settings.protocol} readOnly={readOnly} />
            </Later>
          </Section>
        </div>
        <div className="grid gap-4 min-w-0">
          <Section title="Preview" id="preview">
            {lib.live ? <SequencePreview s={s} info={s.info} templates={templates} /> : <p className="text-sm">Loading the library…</p>}
          </Section>
          <Section title="PLC code" id="plc-code-panel">
            <PlcCodeSection source={plcSource} name={details.name} />
          </Section>
        </div>
      </div>
      <Section title="Replies" id="reply">
        <Later loading="Loading the reply reader…"><SequenceReplies replies={replies} names={names} /></Later>
      </Section>
      {!readOnly && (
        <Section title="Save" id="save">
          <SaveBar noun="sequence" compare={sequenceCompare} draft={draft} base={base} saved={saved} owner={owner} composerHref={(id) => `${basePath}/${id}`}
            onSaved={onSaved} onLoad={onLoad} dirty={dirty} valid={valid} errors={errors}
            notice={(c, actions) => <SequenceConflict version={c.version} rows={c.rows} nameOf={(id) => lookup(id)?.name} {...actions} />}
            invalidReason={problems.length ? 'Fix the step templates above before saving.' : 'Name the sequence and give it at least one step before saving.'} />
        </Section>
      )}
      {saved && (
        <Section title="History" id="history-panel">
          {showHistory ? (
            <Suspense fallback={<p className="text-sm">Loading history…</p>}>
              {/* A restored version replaces the steps wholesale: the page reloads to show it as saved. */}
              <History key={saved.version} commandId={saved.id} canRestore={!readOnly} seen={{ version: saved.version, draft: draftOf({ ...command, ...details }) }}
                onRestored={() => location.reload()} onKeep={() => location.reload()} />
            </Suspense>
          ) : (
            <button type="button" className="btn btn-quiet btn-sm" onClick={() => setShowHistory(true)}>Show history (version {saved.version})</button>
          )}
        </Section>
      )}
    </>
  );
}
