import type { NotationRow } from '../../lib/composer/notations';
import { CopyButton } from '../ui/CopyButton';

/** Every notation of the frame, each with a copy button. */
export function NotationList({ rows }: { rows: NotationRow[] }) {
  return (
    <dl className="grid gap-3" data-testid="notations">
      {rows.map((r) => (
        <div key={r.id} data-notation={r.id} className="min-w-0">
          <dt className="flex items-start justify-between gap-2 mb-1">
            <span className="min-w-0"><span className="font-medium">{r.label}</span> <span className="text-xs text-muted">{r.hint}</span></span>
            <CopyButton text={r.text} what={r.label} />
          </dt>
          <dd className="mono text-sm bg-paper border border-line rounded px-2 py-1 break-all whitespace-pre-wrap" data-testid={`notation-${r.id}`}>
            {r.text || <span className="text-muted">(empty)</span>}
          </dd>
        </div>
      ))}
    </dl>
  );
}
