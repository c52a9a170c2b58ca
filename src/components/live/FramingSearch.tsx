/**
 * Framing search on the open port: one query an engineer marked safe to repeat, at common framings; then, where the
 * library has setup commands, sending them at the framing found (after the caution) and verifying at the stored
 * settings. The link reopens at the stored settings after each.
 */
import { useState } from 'react';
import { runFramingSearch, searchCandidates, searchQueries, type SearchResult } from '../../lib/live/framing-search';
import { runSetup, setupCommands, type SetupResult } from '../../lib/live/setup';
import { LiveLink } from '../../lib/live/session';
import { lineShorthand } from '../../lib/frame/port-text';
import type { PortSettings } from '../../lib/frame/port-settings';
import type { SerialPortLike } from '../../lib/live/serial';
import { Caution } from '../ui/Caution';
import { commandRequest, setupRequest, type LibraryCommand } from './library';

const OUTCOME = { answered: 'Answered', garbled: 'Garbage back', silent: 'Silent', 'not-opened': 'Could not open' } as const;
const SETUP_OUTCOME = { acknowledged: 'Acknowledged', sent: 'Sent', 'no-reply': 'No reply', 'bad-reply': 'Reply does not decode', 'not-sent': 'Not sent' } as const;

interface Props {
  commands: LibraryCommand[];
  port: SerialPortLike;
  settings: PortSettings;
  /** Closes the link before the search and reopens it after (at the stored settings), noting what happened. */
  pause: () => Promise<void>;
  resume: (note: string | null) => Promise<void>;
  /** Why a search cannot start now (a command or sequence is on the line), or null. */
  blocked?: string | null;
  /** Told when a search or setup starts and ends, so nothing else is sent meanwhile. */
  onActive?: (active: boolean) => void;
}

const hex = (b: Uint8Array) => [...b].map((x) => x.toString(16).toUpperCase().padStart(2, '0')).join(' ');

export function FramingSearch({ commands, port, settings, pause, resume, blocked = null, onActive }: Props) {
  const queries = searchQueries(commands);
  const setups = setupCommands(commands);
  const [commandId, setCommandId] = useState(queries[0]?.id ?? '');
  const [running, setRunning] = useState<{ done: number; total: number } | null>(null);
  const [results, setResults] = useState<SearchResult[] | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [foundAt, setFoundAt] = useState('');
  const [confirming, setConfirming] = useState(false);
  const [settingUp, setSettingUp] = useState(false);
  const [setup, setSetup] = useState<SetupResult | null>(null);
  const total = searchCandidates(settings).length;
  const query = queries.find((q) => q.id === commandId) ?? null;
  const stored = lineShorthand(settings);
  const searchCommand = (c: LibraryCommand) => ({ name: c.name, movesMachinery: c.movesMachinery, safeToRepeat: c.safeToRepeat, request: commandRequest(c, null).bytes, replyTemplate: c.replyTemplate });
  const answered = results?.filter((r) => r.outcome === 'answered') ?? [];
  const found = answered.find((r) => r.shorthand === foundAt) ?? answered[0] ?? null;

  const run = async () => {
    if (!query || blocked) return;
    onActive?.(true);
    setError(null);
    setResults(null);
    setSetup(null);
    setConfirming(false);
    setRunning({ done: 0, total });
    await pause();
    let note: string | null = null;
    try {
      const list = await runFramingSearch(searchCommand(query), { port, settings, open: (p, s) => LiveLink.open(p, s), progress: (done, n) => setRunning({ done: done.length, total: n }) });
      setResults(list);
      setFoundAt(list.find((r) => r.outcome === 'answered')?.shorthand ?? '');
      const at = list.filter((r) => r.outcome === 'answered').map((r) => r.shorthand);
      note = `Framing search with "${query.name}": ${list.length} framings tried; answered at ${at.join(', ') || 'none'}.`;
    } catch (e) {
      setError(e instanceof Error ? e.message : String(e));
    } finally {
      setRunning(null);
      await resume(note).catch((e) => setError(`The port could not be opened again at the stored settings: ${e instanceof Error ? e.message : String(e)}`));
      onActive?.(false);
    }
  };

  const sendSetup = async () => {
    if (!query || !found || blocked) return;
    onActive?.(true);
    setConfirming(false);
    setError(null);
    setSettingUp(true);
    await pause();
    let note: string | null = null;
    try {
      const steps = setups.map((c) => ({ name: c.name, setsUpDevice: c.setsUpDevice, movesMachinery: c.movesMachinery, request: setupRequest(c, settings).bytes, replyTemplate: c.replyTemplate }));
      const r = await runSetup(steps, searchCommand(query), found.line, { port, settings, open: (p, s) => LiveLink.open(p, s) });
      setSetup(r);
      note = `Setup at ${r.at}: ${r.steps.map((s) => `${s.name} ${SETUP_OUTCOME[s.outcome].toLowerCase()}`).join('; ')}. Verified at ${stored} with "${query.name}": ${r.verify.outcome === 'answered' ? 'answered' : OUTCOME[r.verify.outcome].toLowerCase()}.`;
    } catch (e) {
      setError(e instanceof Error ? e.message : String(e));
    } finally {
      setSettingUp(false);
      await resume(note).catch((e) => setError(`The port could not be opened again at the stored settings: ${e instanceof Error ? e.message : String(e)}`));
      onActive?.(false);
    }
  };

  const verified = setup?.verify.outcome === 'answered';
  return (
    <div className="grid gap-2" data-testid="live-search">
      <h3>Find the framing</h3>
      <p className="text-sm text-muted">Sends one query at {total} framings (8 baud rates × parity none, even, odd × 1 or 2 stop bits, 8 data bits) and reports which
        answered with a reply that decodes and a good checksum. Only commands an engineer marked safe to repeat, with a reply template, are offered; a command
        that moves machinery never is.</p>
      {queries.length === 0 ? (
        <p className="text-sm" data-testid="live-search-none">No command of this device qualifies: a search needs a query marked safe to repeat, with a reply template,
          that does not move machinery. An engineer sets the mark in the command's composer.</p>
      ) : (
        <form className="grid gap-2" onSubmit={(e) => { e.preventDefault(); void run(); }} aria-label="Framing search">
          <div className="grid gap-1"><label className="label" htmlFor="live-search-command">Query to repeat (marked safe to repeat)</label>
            <select id="live-search-command" className="input" value={commandId} onChange={(e) => setCommandId(e.target.value)}>
              {queries.map((q) => <option key={q.id} value={q.id}>{q.name}</option>)}
            </select></div>
          {blocked && !running && <p className="text-sm text-muted">{blocked}</p>}
          <div><button className="btn btn-quiet" disabled={!!running || settingUp || !!blocked}>{running ? `Trying ${running.done + 1} of ${running.total}…` : 'Search'}</button></div>
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
      {found && query && (
        <div className="grid gap-2" data-testid="live-setup">
          <h3>Set it up</h3>
          {setups.length === 0 ? (
            <p className="text-sm text-muted" data-testid="live-setup-none">This device's library has no setup commands, so there is nothing to send to bring the unit to {stored}; set it up
              by its own means, then connect again. An engineer marks the commands that write a device's settings as setup commands.</p>
          ) : (
            <>
              {answered.length > 1 && (
                <div className="grid gap-1"><label className="label" htmlFor="live-setup-at">Send them at</label>
                  <select id="live-setup-at" className="input" value={found.shorthand} onChange={(e) => setFoundAt(e.target.value)}>
                    {answered.map((r) => <option key={r.shorthand} value={r.shorthand}>{r.shorthand}</option>)}
                  </select></div>
              )}
              <p className="text-sm">Sends the library's setup commands at {found.shorthand}, in this order, with the stored line settings in their baud, parity, data
                bits and stop bits fields; then reopens at the stored {stored} and sends "{query.name}" once to verify.</p>
              <ol className="list-decimal pl-5 text-sm grid gap-1" data-testid="live-setup-list">
                {setups.map((c) => (
                  <li key={c.id}>{c.name}{c.movesMachinery ? ' (moves machinery)' : ''}: <span className="mono break-all">{hex(setupRequest(c, settings).bytes)}</span></li>
                ))}
              </ol>
              {confirming ? (
                <div data-testid="live-setup-confirm">
                  <Caution lead={`Setup commands change the device's settings${setups.some((c) => c.movesMachinery) ? ', and one of them moves machinery' : ''}. Send them only with the machine in a safe state.`} />
                  <div className="flex flex-wrap gap-2">
                    <button type="button" className="btn" disabled={settingUp} onClick={() => void sendSetup()}>Send them: the machine is in a safe state</button>
                    <button type="button" className="btn btn-quiet" onClick={() => setConfirming(false)}>Don't send</button>
                  </div>
                </div>
              ) : (
                <div><button type="button" className="btn btn-quiet" disabled={settingUp || !!running} onClick={() => setConfirming(true)}>
                  {settingUp ? 'Sending the setup commands…' : `Send the setup commands at ${found.shorthand}`}</button></div>
              )}
            </>
          )}
          {setup && (
            <div className="grid gap-2">
              <table className="table text-sm" data-testid="live-setup-steps">
                <thead><tr><th>Setup command</th><th>Outcome</th><th>Detail</th></tr></thead>
                <tbody>{setup.steps.map((s) => <tr key={s.name} data-outcome={s.outcome}><td>{s.name}</td><td>{SETUP_OUTCOME[s.outcome]}</td><td>{s.detail}</td></tr>)}</tbody>
              </table>
              <p className={`notice ${verified ? 'notice-ok' : 'notice-bad'}`} role="status" data-testid="live-setup-verified" data-verified={verified}>
                {verified
                  ? `Verified: "${query.name}" answered at the stored ${stored}.`
                  : `Not verified: "${query.name}" at the stored ${stored}: ${setup.verify.detail} Search again to see where the unit is now.`}
              </p>
            </div>
          )}
        </div>
      )}
    </div>
  );
}
