/** The first bytes of the frame on the wire (idle, start, data LSB first, parity, stop), drawn from the engine's bitSequence. */
import { useMemo } from 'react';
import { wireLayout, type WireLayout } from '../../lib/composer/wire';
import type { PortSettings } from '../../lib/frame/port-settings';

const FILL = { idle: '#f6f7f4', start: '#e3eef2', data: '#ffffff', parity: '#fdf3e3', stop: '#e8f5ec' } as const;

export function WirePicture({ layout, shorthand }: { layout: WireLayout; shorthand: string }) {
  const { width, height, highY, lowY } = layout;
  const labelY = lowY + 16;
  const markY = lowY + 38;
  return (
    <figure>
      <div className="overflow-x-auto border border-line rounded bg-white" tabIndex={0} aria-label="Wire picture, scrolls sideways">
        <svg width={width} height={height} viewBox={`0 0 ${width} ${height}`} role="img" data-testid="wire-svg"
          aria-label={`The first ${layout.shownBytes} bytes at ${shorthand}: start bit, data bits least significant first, stop bits`}>
          <text x={4} y={highY + 4} fontSize="11" fill="#5b6773">1 mark</text>
          <text x={4} y={lowY + 4} fontSize="11" fill="#5b6773">0 space</text>
          {layout.cells.map((c, i) => (
            <g key={i}>
              <rect x={c.x} y={highY - 12} width={c.width} height={lowY - highY + 24} fill={FILL[c.kind]} stroke="#d5dbe1" strokeWidth="0.5" />
              <text x={c.x + c.width / 2} y={labelY} fontSize="12" textAnchor="middle" fill="#16202a" fontFamily="Fira Code, monospace">{c.kind === 'idle' ? '' : c.label}</text>
              {c.sub && <text x={c.x + c.width / 2} y={highY - 16} fontSize="10" textAnchor="middle" fill="#5b6773">{c.sub}</text>}
            </g>
          ))}
          {layout.bytes.map((b) => (
            <g key={b.index}>
              <line x1={b.x} x2={b.x} y1={8} y2={markY - 10} stroke="#0f5e7a" strokeDasharray="3 3" />
              <text x={b.x + 4} y={14} fontSize="11" fill="#0f5e7a" fontFamily="Fira Code, monospace">byte {b.index}: {b.label}</text>
            </g>
          ))}
          <path d={layout.path} fill="none" stroke="#16202a" strokeWidth="2.5" />
          {layout.marks.map((m, i) => (
            <text key={i} x={m.x + 2} y={markY} fontSize="11" fill="#5b6773">{m.label}</text>
          ))}
        </svg>
      </div>
      <figcaption className="text-xs text-muted mt-1">
        {layout.shownBytes} of the frame's bytes{layout.truncated ? ' (the rest follow the same pattern)' : ''}; times count from the first start bit's edge; S start, D0… data bits least significant first, P parity.
      </figcaption>
    </figure>
  );
}

/** The wire picture of a frame's bytes at the port's settings, or why it cannot be drawn. */
export function WirePanel({ bytes, settings, shorthand }: { bytes: Uint8Array; settings: PortSettings; shorthand: string }) {
  const wire = useMemo(() => wireLayout(bytes, settings), [bytes, settings]);
  return wire.ok ? <WirePicture layout={wire.value} shorthand={shorthand} /> : <p className="field-error" role="alert">{wire.error.message}.</p>;
}
