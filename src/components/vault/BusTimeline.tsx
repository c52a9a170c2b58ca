/** One poll cycle drawn as a timeline: a band per transaction, each with its request, silent time, response time and reply. */
import type { BusCycleReport } from '../../lib/frame/bus-cycle';

/** Viewbox width: about a phone's width, so text stays legible at 390 px and scales up on wider screens. */
const W = 360;
const PAD = 6;
const BAND = 36;
/** Most bands drawn; a longer cycle is drawn to here and said so. */
const MAX_BANDS = 48;

const PART = {
  request: { fill: '#0f5e7a', label: 'Request' },
  gap: { fill: '#c9d1d8', label: 'Silent interval or turnaround delay' },
  response: { fill: '#e2a23b', label: 'Device response time' },
  reply: { fill: '#2f8f57', label: 'Reply' },
} as const;
type Part = keyof typeof PART;

const ms = (x: number) => `${x === 0 ? '0' : x >= 10 ? x.toFixed(1) : x.toFixed(2)} ms`;

/** Keeps a band's label inside the drawing (about 56 characters fit at this font size). */
const fit = (label: string) => (label.length > 44 ? `${label.slice(0, 43)}…` : label);

export function BusTimeline({ report }: { report: BusCycleReport }) {
  const bands: { label: string; start: number; parts: { part: Part; ms: number }[]; totalMs: number }[] = [];
  let t = 0;
  let count = 0;
  for (const p of report.polls) {
    for (let k = 0; k < p.perCycle; k++) {
      count++;
      if (bands.length < MAX_BANDS) {
        const label = p.perCycle > 1 ? `${p.label} (${k + 1} of ${p.perCycle})` : p.label;
        bands.push({
          label, start: t, totalMs: p.totalMs,
          parts: [
            { part: 'request', ms: p.requestMs }, { part: 'gap', ms: p.requestGapMs }, { part: 'response', ms: p.responseMs },
            { part: 'reply', ms: p.replyMs }, { part: 'gap', ms: p.replyGapMs },
          ],
        });
      }
      t += p.totalMs;
    }
  }
  const drawnMs = bands.length ? bands[bands.length - 1]!.start + bands[bands.length - 1]!.totalMs : 0;
  const scale = drawnMs > 0 ? (W - 2 * PAD) / drawnMs : 0;
  const axisY = bands.length * BAND + 12;
  const height = axisY + 30;
  const summary = `One poll cycle of ${ms(report.cycleMs)}: ${count} transaction${count === 1 ? '' : 's'}${count > bands.length ? `, the first ${bands.length} drawn` : ''}.`;
  return (
    <figure className="print:break-inside-avoid" data-testid="bus-timeline">
      <svg viewBox={`0 0 ${W} ${height}`} width="100%" style={{ maxWidth: '32rem' }} role="img" aria-label={summary} className="block border border-line rounded bg-white">
        {bands.map((b, i) => {
          const y = i * BAND + 4;
          let x = PAD + b.start * scale;
          return (
            <g key={i}>
              <text x={PAD} y={y + 11} fontSize="12" fill="#16202a">{fit(b.label)} · {ms(b.totalMs)}</text>
              <rect x={PAD} y={y + 17} width={W - 2 * PAD} height={12} fill="#f6f7f4" />
              {b.parts.map((p, j) => {
                const w = p.ms * scale;
                const rect = w > 0 ? <rect key={j} x={x} y={y + 17} width={Math.max(w, 0.75)} height={12} fill={PART[p.part].fill}><title>{`${PART[p.part].label}: ${ms(p.ms)}`}</title></rect> : null;
                x += w;
                return rect;
              })}
            </g>
          );
        })}
        <line x1={PAD} x2={W - PAD} y1={axisY} y2={axisY} stroke="#5b6773" />
        {[0, 0.5, 1].map((f) => (
          <g key={f}>
            <line x1={PAD + f * (W - 2 * PAD)} x2={PAD + f * (W - 2 * PAD)} y1={axisY} y2={axisY + 4} stroke="#5b6773" />
            <text x={PAD + f * (W - 2 * PAD)} y={axisY + 16} fontSize="11" fill="#5b6773" textAnchor={f === 0 ? 'start' : f === 1 ? 'end' : 'middle'}>{ms(f * drawnMs)}</text>
          </g>
        ))}
      </svg>
      <figcaption className="text-xs text-muted mt-2">
        <span className="flex flex-wrap gap-x-3 gap-y-1 mb-1">
          {(Object.keys(PART) as Part[]).map((p) => (
            <span key={p} className="inline-flex items-center gap-1"><svg width="12" height="12" aria-hidden="true"><rect width="12" height="12" fill={PART[p].fill} /></svg>{PART[p].label}</span>
          ))}
        </span>
        {summary} Time runs left to right from the first request; each band is one transaction.
      </figcaption>
    </figure>
  );
}
