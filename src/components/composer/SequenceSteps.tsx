/** The steps of a sequence: add from the library or inline, reorder, remove, and each step's values and wait. */
import { lazy, useState } from 'react';
import type { FrameRulesInput } from '../../lib/frame/frame-rules';
import type { Protocol } from '../../lib/frame/port-settings';
import type { SavedSequenceStep, StepInfo } from '../../lib/composer/saved-sequence';
import { starterTemplate } from '../../lib/composer/segments';
import { ms } from '../../lib/composer/format';
import type { SequenceStep } from '../../lib/frame/sequence';
import { SegmentEditor as SegmentEditorNow } from './SegmentEditor';
import { Later } from './Later';
import { ValuesForm } from './ValuesForm';
import type { LibraryCommand } from './sequence-types';

/** A step with a key of its own, so reordering keeps each step's form. */
export interface KeyedStep { key: string; step: SavedSequenceStep; epoch: number }

interface Props {
  steps: KeyedStep[];
  /** Takes an update of the steps as they are then (a form's change handler outlives the render it was made in). */
  onChange: (update: (steps: KeyedStep[]) => KeyedStep[]) => void;
  /** Single commands of the same device or profile that a step can use. */
  library: LibraryCommand[];
  info: StepInfo[];
  assembled: SequenceStep[];
  separate: boolean;
  rules: FrameRulesInput;
  protocol?: Protocol;
  readOnly: boolean;
}

// One chunk of its own, shared with the command composer's editors (see Later).
const SegmentEditor = import.meta.env.SSR ? SegmentEditorNow : /* @__PURE__ */ lazy(() => import('./SegmentEditor').then((m) => ({ default: m.SegmentEditor })));

let counter = 0;
export const newKey = () => `s${++counter}`;

export function SequenceSteps({ steps, onChange, library, info, assembled, separate, rules, protocol, readOnly }: Props) {
  const [pick, setPick] = useState('');
  // By key, not position: a values form may report after the steps were reordered.
  const set = (key: string, step: Partial<SavedSequenceStep>, reset = false) =>
    onChange((all) => all.map((s) => (s.key === key ? { ...s, step: { ...s.step, ...step }, epoch: s.epoch + (reset ? 1 : 0) } : s)));
  const move = (i: number, by: number) => onChange((all) => {
    const next = [...all];
    const [x] = next.splice(i, 1);
    next.splice(i + by, 0, x!);
    return next;
  });
  const full = steps.length >= 32;
  const add = (step: SavedSequenceStep) => onChange((all) => [...all, { key: newKey(), step, epoch: 0 }]);
  return (
    <div className="grid gap-3">
      {steps.length === 0 && <p className="text-sm text-muted">No steps yet: add a command from the library or an inline step.</p>}
      <ol className="grid gap-3" data-testid="sequence-steps">
        {steps.map(({ key, step, epoch }, i) => {
          const cmd = step.commandId ? library.find((c) => c.id === step.commandId) : undefined;
          const gap = info[i]?.gap;
          const a = assembled[i];
          const template = cmd?.template ?? step.template;
          const values = cmd ? { ...cmd.fieldValues, ...step.values } : step.values;
          const answers = cmd ? !!cmd.replyTemplate : !!step.replyTemplate;
          return (
            <li key={key} className="border border-line rounded p-3 grid gap-2 min-w-0" data-testid="sequence-step" data-step={i + 1}>
              <div className="flex flex-wrap items-baseline gap-x-3 gap-y-1">
                <b>Step {i + 1}</b>
                <span className="min-w-0 break-words">{step.commandId ? info[i]?.name ?? cmd?.name : 'Inline step'}</span>
                <span className="text-xs text-muted">{step.commandId ? 'from the library' : 'its own template'}</span>
                {a && <span className="text-xs text-muted" data-testid="step-bytes">{a.byteCount} bytes · {ms(a.frameTimeMs)}</span>}
                {!readOnly && (
                  <span className="ml-auto flex gap-1">
                    <button type="button" className="btn btn-quiet btn-sm" disabled={i === 0} onClick={() => move(i, -1)} aria-label={`Move step ${i + 1} up`}>↑</button>
                    <button type="button" className="btn btn-quiet btn-sm" disabled={i === steps.length - 1} onClick={() => move(i, 1)} aria-label={`Move step ${i + 1} down`}>↓</button>
                    <button type="button" className="btn btn-quiet btn-sm !text-bad" onClick={() => onChange((all) => all.filter((s) => s.key !== key))} aria-label={`Remove step ${i + 1}`}>Remove</button>
                  </span>
                )}
              </div>
              {gap ? (
                <div className="notice notice-bad text-sm grid gap-2" role="alert" data-testid="step-gap">
                  <p>{gap}</p>
                  {!readOnly && (
                    <label className="flex flex-wrap items-center gap-2">Replace with
                      <select className="input !py-1 !w-auto max-w-full" value="" onChange={(e) => e.target.value && set(key, { commandId: e.target.value, values: {} }, true)}>
                        <option value="">a command…</option>
                        {library.map((c) => <option key={c.id} value={c.id}>{c.name}</option>)}
                      </select>
                    </label>
                  )}
                </div>
              ) : (
                <>
                  {!step.commandId && step.template && !readOnly && (
                    <details>
                      <summary className="cursor-pointer text-sm">Segments of this step</summary>
                      <Later loading="Loading the segment editor…">
                        <SegmentEditor idPrefix={`step-${key}`} template={step.template} rules={rules} protocol={protocol} rawUnits={{}} readOnly={readOnly}
                          onChange={(t) => set(key, { template: t })} onRawUnits={() => {}} />
                      </Later>
                    </details>
                  )}
                  {!step.commandId && step.template && !readOnly && (
                    <label className="text-sm flex items-center gap-2">
                      <input type="checkbox" checked={!!step.replyTemplate}
                        onChange={(e) => set(key, e.target.checked ? { replyTemplate: starterTemplate(rules, protocol) } : { replyTemplate: undefined, waitForReplyMs: undefined })} />
                      The device answers this step
                    </label>
                  )}
                  {!step.commandId && step.replyTemplate && !readOnly && (
                    <details>
                      <summary className="cursor-pointer text-sm">Expected reply of this step</summary>
                      <Later loading="Loading the segment editor…">
                        <SegmentEditor idPrefix={`step-${key}-reply`} template={step.replyTemplate} rules={rules} protocol={protocol} rawUnits={{}} readOnly={readOnly}
                          onChange={(t) => set(key, { replyTemplate: t })} onRawUnits={() => {}} />
                      </Later>
                    </details>
                  )}
                  {cmd && cmd.presets.length > 0 && !readOnly && (
                    <label className="text-sm flex flex-wrap items-center gap-2">Values from a preset
                      <select className="input !py-1 !w-auto max-w-full" value="" data-testid="step-preset"
                        onChange={(e) => { const p = cmd.presets.find((x) => x.name === e.target.value); if (p) set(key, { values: { ...cmd.fieldValues, ...p.values } }, true); }}>
                        <option value="">Choose…</option>
                        {cmd.presets.map((p) => <option key={p.name} value={p.name}>{p.name}</option>)}
                      </select>
                    </label>
                  )}
                  {template && (
                    <div data-testid="step-values">
                      <ValuesForm key={`${key}:${epoch}:${JSON.stringify(template.segments.map((s) => s.id))}`} idPrefix={`step-${key}-value`} template={template} values={values} rawUnits={cmd?.rawUnits ?? {}}
                        onChange={(v) => set(key, { values: v })} />
                    </div>
                  )}
                  {separate && answers && (
                    <label className="text-sm flex flex-wrap items-center gap-2">
                      <input type="checkbox" checked={step.waitForReplyMs !== undefined} disabled={readOnly}
                        onChange={(e) => set(key, { waitForReplyMs: e.target.checked ? 500 : undefined })} />
                      Wait for its reply before the next send, at most
                      <input type="number" min={0} max={60000} className="input !py-1 !w-24" disabled={readOnly || step.waitForReplyMs === undefined}
                        value={step.waitForReplyMs ?? 500} onChange={(e) => set(key, { waitForReplyMs: Number(e.target.value) })} aria-label={`Reply timeout of step ${i + 1} in ms`} /> ms
                    </label>
                  )}
                </>
              )}
            </li>
          );
        })}
      </ol>
      {!readOnly && (
        <div className="flex flex-wrap items-center gap-2 text-sm">
          <label htmlFor="add-step" className="sr-only">Command for the new step</label>
          <select id="add-step" className="input !py-1 !w-auto max-w-full" value={pick} onChange={(e) => setPick(e.target.value)} data-testid="add-step-command">
            <option value="">A command of this {library.length ? 'library' : 'library (none yet)'}…</option>
            {library.map((c) => <option key={c.id} value={c.id}>{c.name}</option>)}
          </select>
          <button type="button" className="btn btn-sm" disabled={!pick || full} onClick={() => { add({ commandId: pick, values: {} }); setPick(''); }}>Add step</button>
          <button type="button" className="btn btn-quiet btn-sm" disabled={full} onClick={() => add({ template: starterTemplate(rules, protocol), values: {} })}>Add an inline step</button>
          {full && <span className="text-muted">A sequence has at most 32 steps.</span>}
        </div>
      )}
    </div>
  );
}
