/** Send a library command (saved values or a preset), a saved sequence, or typed bytes; whatever moves machinery asks first. */
import { type ComponentProps, useEffect, useMemo, useState } from 'react';
import { SequenceSend } from './SequenceSend';
import { Caution } from '../ui/Caution';
import { BytesInput, useBytesInput } from '../composer/BytesInput';
import { commandRequest, simulatedCommands, type LibraryCommand } from './library';
import { recognise } from '../../lib/live/simulator';
import type { Template } from '../../lib/frame/template';

interface Props {
  /** The library: single commands and saved sequences. */
  library: LibraryCommand[];
  busy: boolean;
  send: (bytes: Uint8Array, label: string, replyTemplate: Template | null) => void;
  /** Sending a saved sequence (its own form below the commands). */
  sequences: Omit<ComponentProps<typeof SequenceSend>, 'busy'>;
}

export function SendPanel({ library, busy, send, sequences }: Props) {
  const commands = useMemo(() => library.filter((c) => !c.sequence), [library]);
  const [commandId, setCommandId] = useState(commands[0]?.id ?? '');
  const [preset, setPreset] = useState<string>('');
  const [confirming, setConfirming] = useState(false);
  const [confirmingTyped, setConfirmingTyped] = useState(false);
  const input = useBytesInput();
  useEffect(() => setConfirmingTyped(false), [input.text]);
  const typed = input.read?.ok && input.read.bytes.length ? input.read.bytes : null;
  const typedMatch = typed ? recognise(simulatedCommands(commands), typed) : null;
  const typedCommand = typedMatch ? commands.find((c) => c.id === typedMatch.command.id) ?? null : null;
  const sendTyped = () => {
    if (!typed) return;
    if (typedCommand?.movesMachinery && !confirmingTyped) {
      setConfirmingTyped(true);
      return;
    }
    setConfirmingTyped(false);
    send(typed, typedCommand ? `Typed bytes (${typedCommand.name})` : 'Typed bytes', typedCommand?.replyTemplate ?? null);
  };
  const command = commands.find((c) => c.id === commandId) ?? null;
  const request = command ? commandRequest(command, preset || null) : null;
  const go = () => {
    if (!command || !request) return;
    if (command.movesMachinery && !confirming) {
      setConfirming(true);
      return;
    }
    setConfirming(false);
    send(request.bytes, request.label, command.replyTemplate);
  };
  return (
    <div className="grid gap-4">
      <form className="grid gap-2" onSubmit={(e) => { e.preventDefault(); go(); }} aria-label="Send a command">
        <h3>Send a command</h3>
        {commands.length === 0 ? <p className="text-sm text-muted">This device has no commands yet; type bytes below.</p> : (
          <div className="grid gap-2 sm:grid-cols-2">
            <div className="grid gap-1"><label className="label" htmlFor="live-command">Command</label>
              <select id="live-command" className="input" value={commandId} onChange={(e) => { setCommandId(e.target.value); setPreset(''); setConfirming(false); }}>
                {commands.map((c) => <option key={c.id} value={c.id}>{c.name}{c.movesMachinery ? ' (moves machinery)' : ''}</option>)}
              </select>
            </div>
            <div className="grid gap-1"><label className="label" htmlFor="live-values">Values</label>
              <select id="live-values" className="input" value={preset} onChange={(e) => { setPreset(e.target.value); setConfirming(false); }}>
                <option value="">As saved</option>
                {command?.presets.map((p) => <option key={p.name} value={p.name}>Preset: {p.name}</option>)}
              </select>
            </div>
          </div>
        )}
        {request && <p className="text-sm"><span className="text-muted">Sends</span> <span className="mono break-all" data-testid="live-request-preview">{[...request.bytes].map((b) => b.toString(16).toUpperCase().padStart(2, '0')).join(' ')}</span></p>}
        {request && !request.ok && <p className="notice notice-bad text-sm">These values do not make a valid frame; fix the command in the composer first.</p>}
        {confirming && command && (
          <div data-testid="live-confirm">
            <Caution lead={`"${command.name}" moves machinery. Send it only when the machine is in a safe state.`} />
            <div className="flex flex-wrap gap-2">
              <button type="submit" className="btn" disabled={busy}>Send it: the machine is safe to move</button>
              <button type="button" className="btn btn-quiet" onClick={() => setConfirming(false)}>Don't send</button>
            </div>
          </div>
        )}
        {!confirming && command && <div><button type="submit" className="btn" disabled={busy || !request?.ok}>{busy ? 'Waiting for the reply…' : 'Send'}</button></div>}
      </form>
      <SequenceSend {...sequences} busy={busy} />
      <form className="grid gap-2" onSubmit={(e) => { e.preventDefault(); sendTyped(); }} aria-label="Send typed bytes">
        <h3>Send typed bytes</h3>
        <BytesInput input={input} id="live-typed" label="Bytes to send" placeholder="e.g. 1?STA*48$0D or 31 3F 53 54 41 2A 34 38 0D" showLength />
        <p className="text-xs text-muted">
          {typedCommand ? `These bytes are the command "${typedCommand.name}"; its reply template reads the answer.` : 'The reply ends at the port\'s terminator, or after a silence.'}
        </p>
        {confirmingTyped && typedCommand && (
          <div data-testid="live-confirm-typed">
            <Caution lead={`These bytes are "${typedCommand.name}", which moves machinery. Send them only when the machine is in a safe state.`} />
            <div className="flex flex-wrap gap-2">
              <button type="submit" className="btn" disabled={busy}>Send them: the machine is safe to move</button>
              <button type="button" className="btn btn-quiet" onClick={() => setConfirmingTyped(false)}>Don't send</button>
            </div>
          </div>
        )}
        {!confirmingTyped && <div><button type="submit" className="btn btn-quiet" disabled={busy || !typed}>Send these bytes</button></div>}
      </form>
    </div>
  );
}
