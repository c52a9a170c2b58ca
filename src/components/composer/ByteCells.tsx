import { useState } from 'react';
import type { ByteCell } from '../../lib/composer/cells';

const SEV = { error: 'border-bad bg-[#fdecea]', warning: 'border-warn bg-[#fdf3e3]', info: 'border-ok' } as const;

/** The frame as a row of byte cells; each one focusable to show offset, hex, decimal, character and segment. */
export function ByteCells({ cells, highlight }: { cells: ByteCell[]; highlight: [number, number] | null }) {
  const [active, setActive] = useState<number | null>(null);
  const shown = active !== null ? cells[active] : undefined;
  if (cells.length === 0) return <p className="text-muted text-sm">No bytes yet: add a segment.</p>;
  return (
    <div>
      <ol className="flex flex-wrap gap-1" aria-label="Bytes of the frame" data-testid="byte-cells">
        {cells.map((c) => {
          const lit = highlight && c.offset >= highlight[0] && c.offset < highlight[1];
          return (
            <li key={c.offset}>
              <button
                type="button"
                className={`mono w-11 rounded border text-center leading-tight py-0.5 ${c.severity ? SEV[c.severity] : 'border-line bg-white'} ${lit ? 'ring-2 ring-accent' : ''} ${active === c.offset ? 'outline outline-2 outline-ink' : ''}`}
                onMouseEnter={() => setActive(c.offset)}
                onFocus={() => setActive(c.offset)}
                onClick={() => setActive(c.offset)}
              >
                <span className="block text-[0.7rem] text-muted">{c.hex}</span>
                <span className="block text-sm">{c.glyph}</span>
                <span className="sr-only">: byte {c.offset}, hex {c.hex}, decimal {c.decimal}, from {c.segmentLabel}</span>
              </button>
            </li>
          );
        })}
      </ol>
      <p className="mt-2 text-sm min-h-[1.5rem]" aria-live="polite" data-testid="byte-detail">
        {shown
          ? <>Offset <b>{shown.offset}</b> · hex <b className="mono">{shown.hex}</b> · decimal <b>{shown.decimal}</b> · <b className="mono">{shown.glyph}</b> · {shown.segmentLabel}</>
          : <span className="text-muted">Point at or tab to a byte to see its details.</span>}
      </p>
    </div>
  );
}
