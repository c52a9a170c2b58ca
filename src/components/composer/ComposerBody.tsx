/**
 * The command composer below its details: the port, the segment editors, values and presets, the live preview over
 * the frame engine, PLC code, timing, the wire picture, the reply and the footer (save bar, history). The server
 * renders it with the rest of the island; the browser loads it, the frame engine and zod with it, once the
 * composer's shell (Composer.tsx) is interactive (composer JavaScript budget, issue 16).
 */
import { lazy, useMemo, useState } from 'react';
import { previewFrame } from '../../lib/frame/preview';
import { plcStringFit } from '../../lib/frame/plc-string';
import { defaultPortSettings } from '../../lib/frame/port-settings';
import { templateSchema, type Template } from '../../lib/frame/template';
import { restartForPort, starterTemplate } from '../../lib/composer/segments';
import { timingSummary } from '../../lib/composer/timing';
import { decodeReplyLength } from '../../lib/composer/reply-length';
import { PortPicker } from './PortPicker';
import { PlcCodeSection } from './PlcCodeSection';
import { PreviewPanel } from './PreviewPanel';
import { ReplyDecoder as ReplyDecoderNow } from './ReplyDecoder';
import { Section } from '../ui/Section';
import { SegmentEditor as SegmentEditorNow } from './SegmentEditor';
import { TimingPanel } from './TimingPanel';
import { ValuesForm as ValuesFormNow } from './ValuesForm';
import { PresetsPanel as PresetsPanelNow } from './PresetsPanel';
import { WirePanel as WirePanelNow } from './WirePicture';
import { Later } from './Later';
import type { ComposerCoreProps } from './Composer';
import type { CommandDraft } from './types';

// Rendered by the server at once; in the browser each loads after the composer's body is interactive (see Later).
const SegmentEditor = import.meta.env.SSR ? SegmentEditorNow : /* @__PURE__ */ lazy(() => import('./SegmentEditor').then((m) => ({ default: m.SegmentEditor })));
const ValuesForm = import.meta.env.SSR ? ValuesFormNow : /* @__PURE__ */ lazy(() => import('./ValuesForm').then((m) => ({ default: m.ValuesForm })));
const PresetsPanel = import.meta.env.SSR ? PresetsPanelNow : /* @__PURE__ */ lazy(() => import('./PresetsPanel').then((m) => ({ default: m.PresetsPanel })));
const WirePanel = import.meta.env.SSR ? WirePanelNow : /* @__PURE__ */ lazy(() => import('./WirePicture').then((m) => ({ default: m.WirePanel })));
const ReplyDecoder = import.meta.env.SSR ? ReplyDecoderNow : /* @__PURE__ */ lazy(() => import('./ReplyDecoder').then((m) => ({ default: m.ReplyDecoder })));

export interface ComposerBodyProps extends Pick<ComposerCoreProps, 'ports' | 'readOnly' | 'portSlot' | 'footer'> {
  draft: CommandDraft;
  patch: (p: Partial<CommandDraft>) => void;
  /** Replaces the draft and opens the values form anew on it. */
  replace: (d: CommandDraft) => void;
  formKey: number;
  /** The workbench's own port settings (with `portSlot`); null for the default. */
  ownSettings: ComposerCoreProps['ports'][number]['settings'] | null;
  setOwnSettings: (s: NonNullable<ComposerBodyProps['ownSettings']>) => void;
  plcStringCapacity: number | null;
}

function useValidTemplate(t: Template | null): { valid: Template | null; error: string | null } {
  const [last, setLast] = useState<Template | null>(t);
  const r = useMemo(() => (t ? templateSchema.safeParse(t) : null), [t]);
  if (r?.success && r.data !== last && JSON.stringify(r.data) !== JSON.stringify(last)) setLast(r.data);
  const issue = r && !r.success ? r.error.issues[0] : undefined;
  return { valid: r?.success ? r.data : last, error: issue ? `${issue.path.join('.')}: ${issue.message}` : null };
}

export default function ComposerBody({ draft, patch, replace, formKey, ports, readOnly, portSlot, footer, ownSettings: own, setOwnSettings, plcStringCapacity }: ComposerBodyProps) {
  const ownSettings = own ?? defaultPortSettings;
  const port = ports.find((p) => p.name === draft.portName) ?? ports[0];
  const settings = portSlot ? ownSettings : port?.settings ?? defaultPortSettings;
  const rules = settings.frameRules;
  const request = useValidTemplate(draft.template);
  const reply = useValidTemplate(draft.replyTemplate);
  const template = request.valid ?? { version: 1 as const, segments: [] };
  const frame = useMemo(() => previewFrame(template, draft.fieldValues, settings), [template, draft.fieldValues, settings]);
  // Measured against the PLC STRING when the machine records its length: the string now and at its widest.
  const fit = useMemo(() => (plcStringCapacity === null ? null : plcStringFit(template, frame.byteCount, plcStringCapacity)), [template, frame.byteCount, plcStringCapacity]);
  const preview = useMemo(() => (fit && fit.findings.length ? { ...frame, ok: false, findings: [...frame.findings, ...fit.findings] } : frame), [frame, fit]);
  const replyBytes = draft.replyTemplate && reply.valid ? decodeReplyLength(reply.valid) : null;
  const timing = useMemo(() => timingSummary(settings, preview.byteCount, replyBytes), [settings, preview.byteCount, replyBytes]);
  const fieldSignature = JSON.stringify(template.segments.filter((s) => 'name' in s));
  const valid = !request.error && !reply.error && !!draft.name.trim();

  return (
    <>
      <div className="grid gap-4 lg:grid-cols-2 items-start">
        <div className="grid gap-4 min-w-0">
          <Section title="Port" id="port">
            {portSlot
              ? portSlot(ownSettings, (s) => { setOwnSettings(s); patch({ template: restartForPort(draft.template, ownSettings, s) }); })
              : <PortPicker ports={ports} value={draft.portName} readOnly={readOnly} onChange={(portName) => {
                const next = ports.find((p) => p.name === portName);
                patch({ portName, template: next ? restartForPort(draft.template, settings, next.settings) : draft.template });
              }} />}
          </Section>
          <Section title="Segments" id="segments">
            <Later loading="Loading the segment editor…">
              <SegmentEditor idPrefix="req" template={draft.template} rules={rules} protocol={settings.protocol} rawUnits={draft.rawUnits} readOnly={readOnly}
                onChange={(t) => patch({ template: t })} onRawUnits={(rawUnits) => patch({ rawUnits })} />
            </Later>
            {request.error && <p className="notice notice-bad text-sm mt-2" role="alert">{request.error}</p>}
          </Section>
          <Section title="Values" id="values">
            <Later loading="Loading the values…">
              <ValuesForm key={`${formKey}:${fieldSignature}`} template={template} values={draft.fieldValues} rawUnits={draft.rawUnits} onChange={(fieldValues) => patch({ fieldValues })} />
            </Later>
          </Section>
          {!portSlot && (
            <Section title="Presets" id="presets">
              <Later loading="Loading the presets…">
                <PresetsPanel template={template} values={draft.fieldValues} presets={draft.presets} line={settings.interface === 'tcp' ? null : settings}
                  readOnly={readOnly} onChange={(presets) => patch({ presets })} onUse={(fieldValues) => replace({ ...draft, fieldValues })} />
              </Later>
            </Section>
          )}
        </div>
        <div className="grid gap-4 min-w-0">
          <Section title="Preview" id="preview">
            <PreviewPanel preview={preview} template={template} plcString={fit && fit.capacity !== null ? { capacity: fit.capacity, length: fit.length, longestLength: fit.longestLength } : null} />
          </Section>
          <Section title="PLC code" id="plc-code-panel">
            <PlcCodeSection source={{ kind: 'command', template }} name={draft.name} />
          </Section>
          <Section title="Timing" id="timing">
            <TimingPanel timing={timing} />
          </Section>
          <Section title="On the wire" id="wire">
            <Later loading="Drawing the wire picture…">
              <WirePanel bytes={preview.bytes} settings={settings} shorthand={timing.shorthand} />
            </Later>
          </Section>
        </div>
      </div>
      <Section title="Reply" id="reply"
        actions={!readOnly && (
          <label className="text-sm flex items-center gap-2">
            <input type="checkbox" checked={!!draft.replyTemplate} onChange={(e) => patch({ replyTemplate: e.target.checked ? starterTemplate(rules, settings.protocol) : null })} />
            The device answers this command
          </label>
        )}>
        {draft.replyTemplate ? (
          <div className="grid gap-4 lg:grid-cols-2">
            <div className="min-w-0">
              <h3 className="font-semibold mb-1">Expected reply</h3>
              <Later loading="Loading the segment editor…">
                <SegmentEditor idPrefix="reply" template={draft.replyTemplate} rules={rules} protocol={settings.protocol} rawUnits={draft.rawUnits} readOnly={readOnly}
                  onChange={(t) => patch({ replyTemplate: t })} onRawUnits={(rawUnits) => patch({ rawUnits })} />
              </Later>
              {reply.error && <p className="notice notice-bad text-sm mt-2" role="alert">{reply.error}</p>}
            </div>
            <div className="min-w-0">
              <h3 className="font-semibold mb-1">Decode a received reply</h3>
              {reply.valid && <Later loading="Loading the reply decoder…"><ReplyDecoder template={reply.valid} /></Later>}
            </div>
          </div>
        ) : (
          <p className="text-sm text-muted">No reply expected. Tick the box to describe the answer and decode replies.</p>
        )}
      </Section>
      {footer?.(draft, valid, replace, preview.findings.filter((f) => f.severity === 'error'), { template, replyTemplate: draft.replyTemplate ? reply.valid : null, settings })}
    </>
  );
}
