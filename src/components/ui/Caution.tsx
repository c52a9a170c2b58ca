import { MACHINERY_CAUTION } from '../../lib/caution';

/** The machinery caution (one wording everywhere), with an optional first line saying what it is about. */
export function Caution({ lead, testId }: { lead?: string; testId?: string }) {
  return (
    <div className="notice notice-warn mb-4" role="note" data-testid={testId}>
      {lead && <p className="font-semibold">{lead}</p>}
      <p className="text-sm">{MACHINERY_CAUTION}</p>
    </div>
  );
}
