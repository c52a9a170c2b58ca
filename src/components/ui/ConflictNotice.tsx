/**
 * The one conflict notice (docs/decisions/003): someone else saved first, so their change is shown beside
 * yours, part by part, and the way forward is to apply only your changes on their version or to keep theirs.
 */
import { showValue, type ConflictRow } from '../../lib/client/conflict';

interface Props {
  /** What was saved: "device", "link's members", "command". */
  noun: string;
  version: number;
  rows: ConflictRow[];
  /** How a part is named to people ("Baud rate", "Member DRV-203 RS-485"). */
  label(path: string[]): string;
  /** How a value of a part reads; `showValue` when left out. */
  show?(path: string[], value: unknown): string;
  onReapply(): void;
  onDiscard(): void;
  busy?: boolean;
  /** For a write that is not an edit of one record (copying settings): its own first line, explanation and names. */
  title?: string;
  explain?: string;
  sides?: { theirs: string; mine: string };
  reapplyLabel?: string;
  discardLabel?: string;
}

const BADGE = 'rounded border px-1.5 text-xs font-semibold whitespace-nowrap';

export function ConflictNotice({ noun, version, rows, label, show = (_p, v) => showValue(v), onReapply, onDiscard, busy, title, explain, sides, reapplyLabel, discardLabel = 'Drop mine, keep theirs' }: Props) {
  const mine = rows.filter((r) => r.mineChanged);
  const clashes = rows.filter((r) => r.clash);
  const list = (rs: ConflictRow[]) => rs.map((r) => label(r.path)).join(', ');
  return (
    <div className="notice notice-warn grid gap-2 min-w-0" role="alert" data-testid="conflict">
      <p className="font-semibold">{title ?? `Someone else saved this ${noun} while you were editing; it is now at version ${version}.`}</p>
      <p className="text-sm">
        {explain ?? <>Nothing of yours is saved yet. Their change is beside yours below.{rows.every((r) => !r.theirsChanged) && ` Their change was to parts of this ${noun} you did not edit here.`}</>}
      </p>
      <ul className="grid gap-2" aria-label="Their change beside yours">
        {rows.map((r) => (
          <li key={JSON.stringify(r.path)} className={`rounded border bg-white p-2 text-ink ${r.clash ? 'border-bad' : 'border-line'}`} data-clash={r.clash || undefined}>
            <div className="flex flex-wrap items-baseline gap-2 mb-1">
              <span className="font-semibold text-sm break-words min-w-0">{label(r.path)}</span>
              {r.clash ? <span className={`${BADGE} border-bad text-bad`}>both changed</span>
                : r.theirsChanged && r.mineChanged ? <span className={`${BADGE} border-line text-muted`}>same change</span>
                : r.mineChanged ? <span className={`${BADGE} border-accent text-accent`}>your change</span>
                : <span className={`${BADGE} border-warn text-warn`}>their change</span>}
            </div>
            <div className="grid grid-cols-2 gap-2 text-sm">
              <div className="min-w-0">
                <span className="block text-xs text-muted">{sides?.theirs ?? `Theirs (version ${version})`}</span>
                <span className={`mono text-xs break-all ${r.theirsChanged ? 'font-semibold' : ''}`} data-side="theirs">{show(r.path, r.theirs)}</span>
                {r.theirsChanged && <span className="block text-xs text-muted break-all">was {show(r.path, r.base)}</span>}
              </div>
              <div className="min-w-0">
                <span className="block text-xs text-muted">{sides?.mine ?? 'Yours'}</span>
                {r.mineChanged
                  ? <span className="mono text-xs break-all font-semibold" data-side="mine">{show(r.path, r.mine)}</span>
                  : <span className="text-xs text-muted" data-side="mine">not changed by you</span>}
              </div>
            </div>
          </li>
        ))}
      </ul>
      {!explain && mine.length > 0 && (
        <p className="text-sm">
          Applying sends only your {mine.length === 1 ? 'change' : `${mine.length} changes`} ({list(mine)}) on version {version}; everything else stays as they saved it.
          {clashes.length > 0 && <strong> You both changed {list(clashes)}: yours would replace theirs there.</strong>}
        </p>
      )}
      <div className="flex flex-wrap gap-2">
        {(explain || mine.length > 0) && (
          <button type="button" className="btn btn-sm" onClick={onReapply} disabled={busy}>{reapplyLabel ?? `Apply my changes on version ${version}`}</button>
        )}
        <button type="button" className="btn btn-quiet btn-sm" onClick={onDiscard} disabled={busy}>{discardLabel}</button>
      </div>
    </div>
  );
}
