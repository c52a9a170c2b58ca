/** Where a field-log entry's proposal stands, as the technician sees it on the entry. */
import { ProposalTable } from './ProposalReview';
import { when, type Proposal } from './proposal-parts';

const TEXT = { pending: 'Waiting for review', accepted: 'Accepted into the record', declined: 'Declined' } as const;
const TONE = { pending: 'notice-warn', accepted: 'notice-ok', declined: 'notice-bad' } as const;

export function ProposalOutcome({ p }: { p: Proposal }) {
  return (
    <div className={`notice ${TONE[p.status]} grid gap-1`} data-testid="proposal-outcome" data-status={p.status}>
      <p className="font-semibold">{TEXT[p.status]}{p.decision && ` by ${p.decision.by || 'someone'}, ${when(p.decision.at)}`}</p>
      {p.status === 'declined' && p.decision?.note && <p className="whitespace-pre-wrap">“{p.decision.note}”</p>}
      {p.status === 'accepted' && p.decision?.version && <p className="text-sm">The device record is now at version {p.decision.version}.</p>}
      {p.status !== 'pending' && <details className="text-sm"><summary>What was proposed</summary><ProposalTable p={p} against="at-entry" /></details>}
    </div>
  );
}
