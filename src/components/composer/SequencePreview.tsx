/**
 * A sequence's preview: the whole string's byte cells grouped by step (each step's span), byte counts per step
 * and in total (cells count their offsets within their step), every notation of the whole string with copy buttons, time on the wire, and the findings.
 */
import { useMemo, useState } from 'react';
import type { AssembledSequence } from '../../lib/frame/sequence';
import type { Template } from '../../lib/frame/template';
import { byteCells } from '../../lib/composer/cells';
import { notationRows } from '../../lib/composer/notations';
import { ms } from '../../lib/composer/format';
import type { StepInfo } from '../../lib/composer/saved-sequence';
import { ByteCells } from './ByteCells';
import { FindingsList } from './FindingsList';
import { NotationList } from './NotationList';

const EMPTY: Template = { version: 1, segments: [] };

export function SequencePreview({ s, info, templates }: { s: AssembledSequence; info: StepInfo[]; templates: (Template | undefined)[] }) {
  const [highlight, setHighlight] = useState<[number, number] | null>(null);
  const rows = useMemo(() => notationRows(s.bytes), [s.bytes]);
  const groups = useMemo(() => s.steps.map((step) => {
    const bytes = s.bytes.subarray(step.start, step.end);
    const spans = step.segments.map((x) => ({ ...x, start: x.start - step.start, end: x.end - step.start }));
    const findings = step.findings.map((f) => (f.range ? { ...f, range: [f.range[0] - step.start, f.range[1] - step.start] as [number, number] } : f));
    return byteCells(bytes, spans, templates[step.index] ?? EMPTY, findings);
  }), [s, templates]);
  const t = s.timing;
  const separate = s.mode === 'separate';
  return (
    <div className="grid gap-4">
      <p className="text-sm" data-testid="sequence-counts">
        <b data-testid="sequence-byte-count">{s.byteCount}</b> bytes in {s.steps.length} {s.steps.length === 1 ? 'step' : 'steps'}
        {' · '}<b>{rows[0]!.text.length}</b> characters in the PLC literal
        {separate ? ' · each step is its own send' : ' · one send'}
      </p>
      <ol className="grid gap-2" aria-label="Bytes of each step" data-testid="sequence-spans">
        {s.steps.map((step) => (
          <li key={step.index} className="border-l-4 border-accent pl-2 min-w-0" data-testid="step-span" data-start={step.start} data-end={step.end}>
            <p className="text-xs text-muted mb-1">
              Step {step.index + 1} · {info[step.index]?.name ?? ''} · {step.byteCount ? <>bytes {step.start}–{step.end - 1} · {step.byteCount} bytes · {ms(step.frameTimeMs)}</> : 'no bytes'}
              {step.startMs !== undefined && <> · goes out at {ms(step.startMs)} at the latest</>}
            </p>
            {info[step.index]?.gap
              ? <p className="notice notice-bad text-sm">{info[step.index]!.gap}</p>
              : <ByteCells cells={groups[step.index] ?? []} highlight={highlight && [highlight[0] - step.start, highlight[1] - step.start]} />}
          </li>
        ))}
      </ol>
      <table className="table text-sm" data-testid="sequence-timing">
        <tbody>
          <tr><th scope="row" className="!text-ink !font-medium">On the wire, all steps</th><td className="mono" data-testid="sequence-wire-ms">{ms(t.frameTimeMs)}</td><td className="text-xs text-muted hidden sm:table-cell">{s.byteCount} bytes at {t.port}, {ms(t.charTimeMs)} per character</td></tr>
          {separate && <tr><th scope="row" className="!text-ink !font-medium">Delays between sends</th><td className="mono">{ms(t.delayTotalMs)}</td><td className="text-xs text-muted hidden sm:table-cell">{Math.max(0, t.sends - 1)} × {ms(t.delayMs)}</td></tr>}
          {t.waitTotalMs > 0 && <tr><th scope="row" className="!text-ink !font-medium">Waiting for replies</th><td className="mono">{ms(t.waitTotalMs)}</td><td className="text-xs text-muted hidden sm:table-cell">each timeout counted whole (the worst case)</td></tr>}
          <tr><th scope="row" className="!text-ink !font-medium">First byte to last byte</th><td className="mono" data-testid="sequence-total-ms">{ms(t.totalMs)}</td><td className="text-xs text-muted hidden sm:table-cell">{separate ? 'sends, delays and waits' : 'one string'}</td></tr>
          {t.worstCaseMs !== t.totalMs && <tr><th scope="row" className="!text-ink !font-medium">Until the last wait ends</th><td className="mono">{ms(t.worstCaseMs)}</td><td className="text-xs text-muted hidden sm:table-cell">the last step's reply timeout too</td></tr>}
        </tbody>
      </table>
      <div>
        <h3 className="font-semibold mb-1">Findings</h3>
        <FindingsList findings={s.findings} onHighlight={setHighlight} empty="No findings: each step follows the port's frame rules." />
      </div>
      <div>
        <h3 className="font-semibold mb-1">Notations of the whole string</h3>
        <NotationList rows={rows} />
      </div>
    </div>
  );
}
