/** Shown when a save answers 409: what you changed, what is saved now, and the two ways forward. */
import { fieldLabel, showValue } from './shared';

interface Props {
  mine: Record<string, unknown>;
  base: Record<string, unknown>;
  current: Record<string, unknown> & { version: number };
  fields: string[];
  onReapply(): void;
  onDiscard(): void;
  busy?: boolean;
  /** Form labels by field name, when the fields have them. */
  labels?: Record<string, string>;
}

export function ConflictPanel({ mine, base, current, fields, onReapply, onDiscard, busy, labels = {} }: Props) {
  const theirs = fields.filter((f) => JSON.stringify(base[f] ?? null) !== JSON.stringify(current[f] ?? null));
  const rows = [...new Set([...Object.keys(mine), ...theirs])];
  return (
    <div className="notice notice-warn grid gap-2" role="alert" data-testid="conflict">
      <p className="font-semibold">Someone saved this record while you were editing (now version {current.version}).</p>
      <p className="text-sm">Nothing of yours was saved. Compare, then apply your changes on top of the saved version or drop them.</p>
      <div className="overflow-x-auto">
        <table className="table bg-white">
          <thead><tr><th>Field</th><th>You had opened</th><th>Saved now</th><th>Yours</th></tr></thead>
          <tbody>
            {rows.map((f) => (
              <tr key={f}>
                <td>{labels[f] ?? fieldLabel(f)}</td>
                <td className="mono text-xs break-all">{showValue(base[f])}</td>
                <td className={`mono text-xs break-all ${theirs.includes(f) ? 'font-semibold' : ''}`}>{showValue(current[f])}</td>
                <td className="mono text-xs break-all">{f in mine ? showValue(mine[f]) : <span className="text-muted">unchanged</span>}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <div className="flex flex-wrap gap-2">
        <button type="button" className="btn btn-sm" onClick={onReapply} disabled={busy}>Apply my changes on version {current.version}</button>
        <button type="button" className="btn btn-quiet btn-sm" onClick={onDiscard} disabled={busy}>Drop mine, show the saved version</button>
      </div>
    </div>
  );
}
