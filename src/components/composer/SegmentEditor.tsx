/** The segment list: add literal text, control characters, fields, a checksum and a terminator; reorder, duplicate, remove. */
import { lazy, Suspense, useState } from 'react';
import { resolveChecksum } from '../../lib/frame/checksum';
import type { FrameRulesInput } from '../../lib/frame/frame-rules';
import type { PortSettings } from '../../lib/frame/port-settings';
import type { Segment, Template } from '../../lib/frame/template';
import { ADD_KINDS, addSegment, duplicateSegment, nudgeSegment, removeSegment, replaceSegment, type AddKind } from '../../lib/composer/segments';
import { CONTROL_CHOICES, labelOfBytes } from '../../lib/composer/bytes-text';
import { segmentTitle } from '../../lib/composer/cells';

// The editor of one segment's settings opens on demand (Edit), so it loads then (composer JavaScript budget).
const SegmentFields = /* @__PURE__ */ lazy(() => import('./SegmentFields').then((m) => ({ default: m.SegmentFields })));

interface Props {
  /** Prefix for element ids, so the request and reply editors can share a page. */
  idPrefix: string;
  template: Template;
  onChange: (t: Template) => void;
  rules: FrameRulesInput;
  /** The port's protocol: a new checksum follows it (LRC over the decoded hex for Modbus ASCII, CRC-16/MODBUS low byte first for RTU). */
  protocol?: PortSettings['protocol'];
  rawUnits: Record<string, string>;
  onRawUnits: (r: Record<string, string>) => void;
  readOnly: boolean;
}

function summary(s: Segment): string {
  if (s.type === 'literal') return labelOfBytes(s.bytes);
  if (s.type === 'terminator') return labelOfBytes(s.bytes);
  if (s.type === 'checksum') return `${resolveChecksum(s)?.name ?? s.algorithm} · ${s.encoding === 'binary' ? 'binary' : s.encoding === 'ascii-hex' ? 'hex characters' : 'decimal characters'}${s.over === 'decoded-hex' ? ' · over the decoded hex' : ''}`;
  return `${s.name}${'unit' in s && s.unit ? ` (${s.unit})` : ''}`;
}

export function SegmentEditor({ idPrefix, template, onChange, rules, protocol, rawUnits, onRawUnits, readOnly }: Props) {
  const [kind, setKind] = useState<AddKind>('text');
  const [text, setText] = useState('');
  const [code, setCode] = useState(0x0d);
  const [open, setOpen] = useState<string | null>(null);
  const hasTerminator = template.segments.some((s) => s.type === 'terminator');
  const add = () => {
    if (kind === 'text' && !text) return;
    const next = addSegment(template, kind, rules, { text, code, protocol });
    const added = next.segments.find((s) => !template.segments.some((o) => o.id === s.id));
    onChange(next);
    setText('');
    if (added && kind !== 'text' && kind !== 'control') setOpen(added.id);
  };
  const btn = 'btn btn-quiet btn-sm !px-2';
  return (
    <div>
      <ol className="grid gap-2" data-testid={`${idPrefix}-segments`}>
        {template.segments.map((s, i) => {
          const n = i + 1;
          const title = segmentTitle(s);
          return (
            <li key={s.id} className="border border-line rounded p-2" data-segment-type={s.type}>
              <div className="flex flex-wrap items-center gap-2">
                <span className="text-xs text-muted w-5">#{n}</span>
                <span className="text-sm font-medium">{s.type === 'literal' ? 'Literal' : title.split(' ')[0]}</span>
                <code className="mono text-sm break-all flex-1 min-w-[6rem]">{summary(s)}</code>
                <span className="flex flex-wrap gap-1">
                  <button type="button" className={btn} aria-expanded={open === s.id} aria-label={`${readOnly ? 'Details' : 'Edit'} segment ${n}`} onClick={() => setOpen(open === s.id ? null : s.id)}>{readOnly ? 'Details' : 'Edit'}</button>
                  {!readOnly && (
                    <>
                      <button type="button" className={btn} aria-label={`Move segment ${n} up`} disabled={i === 0} onClick={() => onChange(nudgeSegment(template, i, -1))}>↑</button>
                      <button type="button" className={btn} aria-label={`Move segment ${n} down`} disabled={i === template.segments.length - 1} onClick={() => onChange(nudgeSegment(template, i, 1))}>↓</button>
                      <button type="button" className={btn} aria-label={`Duplicate segment ${n}`} disabled={s.type === 'terminator'} onClick={() => onChange(duplicateSegment(template, i))}>Duplicate</button>
                      <button type="button" className={`${btn} !text-bad`} aria-label={`Remove segment ${n}`} onClick={() => onChange(removeSegment(template, i))}>✕</button>
                    </>
                  )}
                </span>
              </div>
              {open === s.id && (
                <div className="mt-2 border-t border-line pt-2">
                  <Suspense fallback={<p className="text-sm text-muted">Loading the segment settings…</p>}>
                    <SegmentFields seg={s} index={i} template={template} readOnly={readOnly}
                      onChange={(seg) => onChange(replaceSegment(template, i, seg))}
                      rawUnit={'name' in s ? rawUnits[s.name] ?? '' : ''}
                      onRawUnit={(u) => 'name' in s && onRawUnits({ ...rawUnits, [s.name]: u })} />
                  </Suspense>
                </div>
              )}
            </li>
          );
        })}
      </ol>
      {template.segments.length === 0 && <p className="text-sm text-muted">No segments yet.</p>}
      {!readOnly && (
        <div className="mt-3 flex flex-wrap items-end gap-2" role="group" aria-label="Add a segment">
          <div>
            <label htmlFor={`${idPrefix}-add-kind`} className="label !text-xs">Add</label>
            <select id={`${idPrefix}-add-kind`} className="input !py-1 !w-auto" value={kind} onChange={(e) => setKind(e.target.value as AddKind)}>
              {ADD_KINDS.filter((k) => k.kind !== 'terminator' || !hasTerminator).map((k) => <option key={k.kind} value={k.kind}>{k.label}</option>)}
            </select>
          </div>
          {kind === 'text' && (
            <div className="flex-1 min-w-[8rem]">
              <label htmlFor={`${idPrefix}-add-text`} className="label !text-xs">Text to send</label>
              <input id={`${idPrefix}-add-text`} className="input !py-1 mono" value={text} onChange={(e) => setText(e.target.value)}
                onKeyDown={(e) => { if (e.key === 'Enter') { e.preventDefault(); add(); } }} />
            </div>
          )}
          {kind === 'control' && (
            <div>
              <label htmlFor={`${idPrefix}-add-code`} className="label !text-xs">Character</label>
              <select id={`${idPrefix}-add-code`} className="input !py-1 !w-auto" value={code} onChange={(e) => setCode(Number(e.target.value))}>
                {CONTROL_CHOICES.map((c) => <option key={c.code} value={c.code}>{c.name} ({c.hex})</option>)}
              </select>
            </div>
          )}
          <button type="button" className="btn btn-sm" onClick={add} disabled={kind === 'text' && !text}>Add segment</button>
          {rules.letterCase && rules.letterCase !== 'any' && kind === 'text' && (
            <p className="text-xs text-muted w-full">Letters follow the port's frame rules ({rules.letterCase} case).</p>
          )}
        </div>
      )}
    </div>
  );
}
