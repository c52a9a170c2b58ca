import type { Finding } from '../../lib/frame/findings';

const TONE = { error: 'notice-bad', warning: 'notice-warn', info: 'notice-ok' } as const;

/** Findings with their byte ranges; focusing or hovering one highlights its bytes (`onHighlight`). */
export function FindingsList({ findings, onHighlight, empty }: { findings: Finding[]; onHighlight?: (range: [number, number] | null) => void; empty: string }) {
  if (findings.length === 0) return <p className="notice notice-ok text-sm" data-testid="no-findings">{empty}</p>;
  return (
    <ul className="grid gap-2" data-testid="findings">
      {findings.map((f, i) => (
        <li key={i}>
          <button
            type="button"
            className={`notice ${TONE[f.severity]} text-sm text-left w-full`}
            data-code={f.code}
            onMouseEnter={() => f.range && onHighlight?.(f.range)}
            onMouseLeave={() => onHighlight?.(null)}
            onFocus={() => f.range && onHighlight?.(f.range)}
            onBlur={() => onHighlight?.(null)}
          >
            <span className="font-semibold capitalize">{f.severity}</span>
            {f.range && <span className="mono text-xs"> · bytes {f.range[0]}–{Math.max(f.range[0], f.range[1] - 1)}</span>}
            <span className="block">{f.message}</span>
          </button>
        </li>
      ))}
    </ul>
  );
}
