/** The live exchangeLog: every chunk in both directions, line errors and notes, with milliseconds since the link opened. */
import { renderHex } from '../../lib/frame/notations/numeric';
import { renderMnemonic } from '../../lib/frame/notations/mnemonic';
import type { ExchangeLogEntry } from '../../lib/live/session';

const DIR = { sent: 'TX', received: 'RX', 'line-error': 'ERR', note: '—' } as const;

export function ExchangeLogView({ entries }: { entries: readonly ExchangeLogEntry[] }) {
  return (
    <div className="grid gap-2">
      <h3>Exchange log</h3>
      {entries.length === 0 ? <p className="text-sm text-muted">Nothing sent or received yet.</p> : (
        <div className="overflow-x-auto max-h-80 overflow-y-auto border border-line rounded" tabIndex={0} role="region" aria-label="Exchange log entries">
          <table className="table text-sm" data-testid="live-exchange-log">
            <thead><tr><th>ms</th><th>Dir</th><th>Bytes</th></tr></thead>
            <tbody>
              {entries.map((e, i) => (
                <tr key={i} data-kind={e.kind}>
                  <td className="mono whitespace-nowrap">{e.atMs.toFixed(3)}</td>
                  <td className="mono">{DIR[e.kind]}</td>
                  <td className="mono break-all">
                    {e.kind === 'sent' || e.kind === 'received' ? <>{renderHex(e.bytes)} <span className="text-muted">| {renderMnemonic(e.bytes)}</span></> : e.kind === 'line-error' ? e.error : e.text}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </div>
  );
}
