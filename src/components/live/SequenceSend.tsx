/**
 * Send a saved sequence: pick it, see its steps and bytes, send it as saved or the other way (one string or
 * separate sends), confirm first with the machinery caution when it or a step moves machinery, stop a run of
 * separate sends before its next step. A sequence with a gap is listed with the reason it cannot be sent.
 */
import { useState } from 'react';
import type { SequenceMode } from '../../lib/frame/sequence-limits';
import type { LiveSequence } from '../../lib/live/sequence-send';
import { Caution } from '../ui/Caution';

interface Props {
  sequences: LiveSequence[];
  busy: boolean;
  /** A sequence of separate sends is on the line: offer Stop. */
  running: boolean;
  /** Why nothing can be sent now (a framing search has the port), or null. */
  blocked: string | null;
  send: (sequence: LiveSequence, mode: SequenceMode) => void;
  stop: () => void;
}

const hex = (b: Uint8Array) => [...b].map((x) => x.toString(16).toUpperCase().padStart(2, '0')).join(' ');
const modeText = (mode: SequenceMode, delayMs: number) => (mode === 'one-string' ? 'As one string' : `Separately, ${delayMs} ms apart`);

export function SequenceSend({ sequences, busy, running, blocked, send, stop }: Props) {
  const [id, setId] = useState(sequences[0]?.id ?? '');
  const [mode, setMode] = useState<SequenceMode | ''>('');
  const [confirming, setConfirming] = useState(false);
  const [stopping, setStopping] = useState(false);
  const seq = sequences.find((s) => s.id === id) ?? sequences[0] ?? null;
  if (!seq) return null;
  const sendAs: SequenceMode = mode || seq.mode;
  const moving = seq.steps.filter((s) => s.movesMachinery).map((s) => s.name);
  const go = () => {
    if (seq.refusal || blocked) return;
    if (seq.movesMachinery && !confirming) {
      setConfirming(true);
      return;
    }
    setConfirming(false);
    setStopping(false);
    send(seq, sendAs);
  };
  return (
    <form className="grid gap-2" onSubmit={(e) => { e.preventDefault(); go(); }} aria-label="Send a sequence" data-testid="live-sequence">
      <h3>Send a sequence</h3>
      <div className="grid gap-2 sm:grid-cols-2">
        <div className="grid gap-1"><label className="label" htmlFor="live-sequence-pick">Sequence</label>
          <select id="live-sequence-pick" className="input" value={seq.id} onChange={(e) => { setId(e.target.value); setMode(''); setConfirming(false); }}>
            {sequences.map((s) => <option key={s.id} value={s.id}>{s.name}{s.refusal ? ' (cannot be sent)' : s.movesMachinery ? ' (moves machinery)' : ''}</option>)}
          </select>
        </div>
        <div className="grid gap-1"><label className="label" htmlFor="live-sequence-mode">Send the steps</label>
          <select id="live-sequence-mode" className="input" value={sendAs} onChange={(e) => { setMode(e.target.value as SequenceMode); setConfirming(false); }}>
            {(['one-string', 'separate'] as const).map((m) => <option key={m} value={m}>{modeText(m, seq.delayMs)}{m === seq.mode ? ' (as saved)' : ''}</option>)}
          </select>
        </div>
      </div>
      <ol className="list-decimal pl-5 text-sm grid gap-1" data-testid="live-sequence-steps">
        {seq.steps.map((s) => (
          <li key={s.index}>
            {s.name}{s.movesMachinery ? ' (moves machinery)' : ''}{s.replyTemplate ? ', expects a reply' : ', no reply expected'}
            {sendAs === 'separate' && s.replyTemplate && s.waitForReplyMs ? ` (waits ${s.waitForReplyMs} ms)` : ''}:{' '}
            <span className="mono break-all">{hex(s.bytes)}</span>
          </li>
        ))}
      </ol>
      <p className="text-xs text-muted">
        {sendAs === 'one-string'
          ? 'One write of every step\'s bytes; the replies are read back to back and split per step.'
          : 'One step at a time: a step that expects a reply waits for it (at most its own reply timeout, else the port\'s response timeout); no reply stops the sequence.'}
      </p>
      {seq.refusal && <p className="notice notice-bad text-sm" data-testid="live-sequence-refusal">This sequence cannot be sent: {seq.refusal}</p>}
      {blocked && <p className="notice notice-warn text-sm">{blocked}</p>}
      {confirming && (
        <div data-testid="live-sequence-confirm">
          <Caution lead={seq.movesMachinery && !moving.length
            ? `"${seq.name}" moves machinery. Send it only when the machine is in a safe state.`
            : `"${seq.name}" moves machinery (${moving.join(', ')}). Send it only when the machine is in a safe state.`} />
          <div className="flex flex-wrap gap-2">
            <button type="submit" className="btn" disabled={busy || !!blocked}>Send the sequence: the machine is safe to move</button>
            <button type="button" className="btn btn-quiet" onClick={() => setConfirming(false)}>Don't send</button>
          </div>
        </div>
      )}
      {!confirming && (
        <div className="flex flex-wrap gap-2">
          <button type="submit" className="btn" disabled={busy || !!seq.refusal || !!blocked}>{running ? 'Sending the sequence…' : 'Send the sequence'}</button>
          {running && (
            <button type="button" className="btn btn-quiet" disabled={stopping} onClick={() => { setStopping(true); stop(); }}>
              {stopping ? 'Stopping after this step…' : 'Stop before the next step'}
            </button>
          )}
        </div>
      )}
    </form>
  );
}
