/** One request and what came back: every notation, the reply decoded with each checksum's verdict, round trip against the wire. */
import { decodeReply } from '../../lib/frame/decode-reply';
import { renderAllNotations } from '../../lib/frame/notations';
import type { Template } from '../../lib/frame/template';
import { ms } from '../../lib/composer/format';
import { LINE_ERROR_TEXT, type Exchange } from '../../lib/live/session';
import { DecodedReply, type DecodedReplyProps } from '../composer/DecodedReply';

/** What to check, in order, when a device does not answer (common practice). */
export const NO_REPLY_CAUSES = [
  'Settings: baud, data bits, parity and stop bits of the device against this port (a framing search can find them).',
  'Wiring: TX and RX crossed, or not crossed where they must be (device to PC usually needs a null-modem cable).',
  'RS-485: A and B swapped (the names differ between makers; try swapping them).',
  'RS-485: termination at both ends of the line, and bias where the line needs it.',
  'Address: the command names the address the device is set to.',
  'Terminator: the device waits for its own end of frame (CR, CR LF, ETX …) before it answers.',
];

const ENDED: Record<Exchange['endedBy'], string> = {
  terminator: 'ended at its terminator',
  length: 'ended at the reply template length',
  silence: 'ended at a silence',
  timeout: 'no reply',
  'none-expected': 'no reply expected',
};

function Notations({ bytes, testId }: { bytes: Uint8Array; testId: string }) {
  const n = renderAllNotations(bytes);
  return (
    <dl className="grid gap-x-3 gap-y-1 text-sm sm:grid-cols-[9rem_1fr]" data-testid={testId}>
      <dt className="text-muted">Hex</dt><dd className="mono break-all" data-notation="hex">{n.hex}</dd>
      <dt className="text-muted">Control names</dt><dd className="mono break-all" data-notation="mnemonic">{n.mnemonic}</dd>
      <dt className="text-muted">PLC string</dt><dd className="mono break-all" data-notation="iec">{n.iecLiteral}</dd>
      <dt className="text-muted">Escaped</dt><dd className="mono break-all" data-notation="escaped">{n.escaped}</dd>
      <dt className="text-muted">Decimal</dt><dd className="mono break-all" data-notation="decimal">{n.decimal}</dd>
    </dl>
  );
}

export function ExchangeView({ x, atMs, replyTemplate, responseTimeoutMs }: { x: Exchange; atMs: number; replyTemplate: Template | null; responseTimeoutMs: number }) {
  const decoded = replyTemplate && x.reply.length ? decodeReply(replyTemplate, x.reply) : null;
  return (
    <li className="card grid gap-2" data-testid="live-exchange" data-ended={x.endedBy}>
      <p className="font-semibold">
        <span className="mono text-muted">{atMs.toFixed(3)} ms</span> · {x.label} · {x.request.length} bytes out, {x.reply.length} back, {ENDED[x.endedBy]}
      </p>
      <details>
        <summary className="text-sm cursor-pointer">Sent</summary>
        <Notations bytes={x.request} testId="live-sent" />
      </details>
      {x.lineErrors.length > 0 && (
        <p className="notice notice-bad" role="alert" data-testid="live-line-error">{LINE_ERROR_TEXT} ({x.lineErrors.length} {x.lineErrors.length === 1 ? 'error' : 'errors'}; the link carries on.)</p>
      )}
      {x.reply.length === 0 && x.endedBy === 'none-expected' ? (
        <p className="text-sm text-muted" data-testid="live-none-expected">No reply expected, and none came.</p>
      ) : x.reply.length === 0 ? (
        <div className="notice notice-bad" role="alert" data-testid="live-timeout">
          <p className="font-semibold">No reply within the response timeout ({responseTimeoutMs} ms). Check, in this order:</p>
          <ol className="list-decimal pl-5 text-sm">{NO_REPLY_CAUSES.map((c) => <li key={c}>{c}</li>)}</ol>
        </div>
      ) : (
        <>
          <Notations bytes={x.reply} testId="live-reply" />
          <p className="text-sm" data-testid="live-round-trip">
            Round trip measured <strong className="mono">{x.roundTripMs === null ? '–' : ms(x.roundTripMs)}</strong>; on the wire alone{' '}
            <strong className="mono">{ms(x.wireMs)}</strong> (request and reply at the port's settings). The rest is the device's response time and the
            adapter's and browser's delays.
          </p>
        </>
      )}
      {decoded && replyTemplate && <DecodedView decoded={decoded} template={replyTemplate} />}
    </li>
  );
}

/** A reply read against its template, as the live link shows it. */
export function DecodedView({ decoded, template }: Pick<DecodedReplyProps, 'decoded' | 'template'>) {
  return <DecodedReply decoded={decoded} template={template} testIds={{ root: 'live-decoded', checksum: 'live-checksum', fields: 'live-fields' }} />;
}
