/** Framing search on the open port: one safe query at common framings; the link reopens at the stored settings afterwards. */
import { useState } from 'react';
import { runFramingSearch, searchCandidates, searchRefusal, type SearchResult } from '../../lib/live/framing-search';
import { LiveLink } from '../../lib/live/session';
import type { PortSettings } from '../../lib/frame/port-settings';
import type { SerialPortLike } from '../../lib/live/serial';
import { commandRequest, type LibraryCommand } from './library';

const OUTCOME = { answered: 'Answered', garbled: 'Garbage back', silent: 'Silent', 'not-opened': 'Could not open' } as const;

interface Props {
  commands: LibraryCommand[];
  port: SerialPortLike;
  settings: PortSettings;
  /** Closes the link before the search and reopens it after (at the stored settings). */
  pause: () => Promise<void>;
  resume: (results: SearchResult[]) => Promise<void>;
}

export function FramingSearch({ commands, port, settings, pause, resume }: Props) {
  const queries = commands.filter((c) => !searchRefusal({ name: c.name, movesMachinery: c.movesMachinery, request: new Uint8Array(0), replyTemplate: c.replyTemplate }));
  const [commandId, setCommandId] = useState(queries[0]?.id ?? '');
  const [safe, setSafe] = useState(false);
  const [running, setRunning] = useState<{ done: number; total: number } | null>(null);
  const [results, setResults] = useState<SearchResult[] | null>(null);
  const [error, setError] = useState<string | null>(null);
  const total = searchCandidates(settings).length;
  const run = async () => {
    const c = queries.find((q) => q.id === commandId);
    if (!c || !safe) return;
    setError(null);
    setResults(null);
    setRunning({ done: 0, total });
    await pause();
    let found: SearchResult[] = [];
    try {
      found = await runFramingSearch(
        { name: c.name, movesMachinery: c.movesMachinery, request: commandRequest(c, null).bytes, replyTemplate: c.replyTemplate },
        { port, settings, open: (p, s) => LiveLink.open(p, s), progress: (done, n) => setRunning({ done: done.length, total: n }) },
      );
      setResults(found);
    } catch (e) {
      setError(e instanceof Error ? e.message : String(e));
    } finally {
      setRunning(null);
      await resume(found).catch((e) => setError(`The port could not be opened again at the stored settings: ${e instanceof Error ? e.message : String(e)}`));
    }
  };
  const answered = results?.filter((r) => r.outcome === 'answered') ?? [];
  return (
    <div className="grid gap-2" data-testid="live-search">
      <h3>Find the framing</h3>
      <p className="text-sm text-muted">Sends one query at {total} framings ({'8 baud rates × parity none, even, odd × 1 or 2 stop bits, 8 data bits'}) and reports which answered with a reply
        that decodes and a good checksum. Only commands that do not move machinery and have a reply template are offered.</p>
      {queries.length === 0 ? <p className="text-sm">No command of this device qualifies: a search needs a query with a reply template that does not move machinery.</p> : (
        <form className="grid gap-2" onSubmit={(e) => { e.preventDefault(); void run(); }} aria-label="Framing search">
          <div className="grid gap-1"><label className="label" htmlFor="live-search-command">Query to repeat</label>
            <select id="live-search-command" className="input" value={commandId} onChange={(e) => setCommandId(e.target.value)}>
              {queries.map((q) => <option key={q.id} value={q.id}>{q.name}</option>)}
            </select></div>
          <label className="flex items-center gap-2"><input type="checkbox" checked={safe} onChange={(e) => setSafe(e.target.checked)} /> This query only reads; it is safe to send it {total} times.</label>
          <div><button className="btn btn-quiet" disabled={!safe || !!running}>{running ? `Trying ${running.done + 1} of ${running.total}…` : 'Search'}</button></div>
        </form>
      )}
      {error && <p className="notice notice-bad" role="alert">{error}</p>}
      {results && (
        <div className="grid gap-2">
          <p className={`notice ${answered.length ? 'notice-ok' : 'notice-bad'}`} role="status" data-testid="live-search-answered">
            {answered.length ? `Answered at ${answered.map((r) => r.shorthand).join(', ')}.` : 'No framing answered. Check the wiring, the address and the terminator.'}
            {answered.length > 1 && ' Receivers check only the first stop bit, so one and two stop bits can both answer; the device\'s setting is usually the first.'}
          </p>
          <details>
            <summary className="text-sm cursor-pointer">Every framing tried</summary>
            <table className="table text-sm">
              <thead><tr><th>Framing</th><th>Outcome</th><th>Detail</th></tr></thead>
              <tbody>{results.map((r) => <tr key={r.shorthand}><td className="mono">{r.shorthand}</td><td>{OUTCOME[r.outcome]}</td><td>{r.detail}</td></tr>)}</tbody>
            </table>
          </details>
        </div>
      )}
    </div>
  );
}
