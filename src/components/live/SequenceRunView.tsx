/** A sequence sent over the live link: each step's progress and reply (decoded, with its checksum verdicts), the round trip of one string. */
import type { SequenceRun, StepOutcome } from '../../lib/live/sequence-send';
import { DecodedView, ExchangeView, NO_REPLY_CAUSES } from './ExchangeView';

const OUTCOME: Record<StepOutcome, string> = {
  waiting: 'waiting', sending: 'on the line', sent: 'sent (no reply expected)', answered: 'answered', 'timed-out': 'no reply', 'not-sent': 'not sent',
};

export function SequenceRunView({ run, atMs, responseTimeoutMs }: { run: SequenceRun; atMs: number; responseTimeoutMs: number }) {
  const how = run.mode === 'one-string' ? 'as one string' : `separately, ${run.delayMs} ms apart`;
  // One string with part of the replies back: the exchange shows bytes, so the causes go with the stop.
  const causes = run.stopped?.by === 'timeout' && run.mode === 'one-string' && (run.whole?.reply.length ?? 0) > 0;
  return (
    <li className="card grid gap-2" data-testid="live-sequence-run" data-mode={run.mode} data-running={run.running}>
      <p className="font-semibold">
        <span className="mono text-muted">{atMs.toFixed(3)} ms</span> · Sequence "{run.sequence.name}" {how}{run.running ? ' · sending…' : ''}
      </p>
      <ol className="grid gap-2">
        {run.steps.map((s) => (
          <li key={s.index} className="grid gap-1" data-testid="live-sequence-step" data-outcome={s.outcome}>
            <p className="text-sm"><b>Step {s.index + 1}: {s.name}</b> · {OUTCOME[s.outcome]}</p>
            {s.reply && s.replyTemplate && (
              <div className="grid gap-1">
                <p className="text-xs text-muted">Bytes {s.reply.start + 1} to {s.reply.end} of the reply.</p>
                <DecodedView decoded={s.reply} template={s.replyTemplate} />
              </div>
            )}
            {s.exchange && (
              <ul className="grid gap-2">
                <ExchangeView x={s.exchange} atMs={s.sentAtMs ?? atMs} replyTemplate={s.replyTemplate} responseTimeoutMs={s.timeoutMs ?? responseTimeoutMs} />
              </ul>
            )}
          </li>
        ))}
      </ol>
      {run.whole && (
        <ul className="grid gap-2">
          <ExchangeView x={run.whole} atMs={atMs} replyTemplate={null} responseTimeoutMs={responseTimeoutMs} />
        </ul>
      )}
      {run.stopped && (
        <div className={`notice ${run.stopped.by === 'stop' ? 'notice-warn' : 'notice-bad'}`} role="alert" data-testid="live-sequence-stopped" data-by={run.stopped.by}>
          <p className="font-semibold">{run.stopped.message}</p>
          {causes && <ol className="list-decimal pl-5 text-sm">{NO_REPLY_CAUSES.map((c) => <li key={c}>{c}</li>)}</ol>}
        </div>
      )}
    </li>
  );
}
