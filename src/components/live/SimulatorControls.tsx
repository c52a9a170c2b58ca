/** The simulated device's knobs: its framing (to see what a mismatch looks like), response delay, faults, and reply values. */
import { useState } from 'react';
import { PARITIES, STANDARD_BAUD_RATES, type LineSettings } from '../../lib/frame/port-settings';
import { isField, type FieldValues } from '../../lib/frame/template';
import type { FakeSerial } from '../../lib/live/fake-serial';
import { SIMULATOR_FAULTS, SIMULATOR_FAULT_LABELS, type SimulatorFault } from '../../lib/live/simulator';
import type { LibraryCommand } from './library';

export function SimulatorControls({ fake, commands }: { fake: FakeSerial; commands: LibraryCommand[] }) {
  const [s, setS] = useState(() => fake.settings());
  const change = (c: Partial<ReturnType<FakeSerial['settings']>>) => {
    fake.configure(c);
    setS(fake.settings());
  };
  const setLine = (c: Partial<LineSettings>) => change({ line: { ...s.line, ...c } });
  const answering = commands.filter((c) => c.replyTemplate);
  const [replyOf, setReplyOf] = useState(answering[0]?.id ?? '');
  const reply = answering.find((c) => c.id === replyOf)?.replyTemplate ?? null;
  const values: FieldValues = s.replyValues?.[replyOf] ?? {};
  const setValue = (name: string, v: string) => change({ replyValues: { ...s.replyValues, [replyOf]: { ...values, [name]: v } } });
  return (
    <details className="card grid gap-2" data-testid="live-simulator" open>
      <summary className="font-semibold cursor-pointer">Simulated device (no hardware)</summary>
      <p className="text-sm text-muted">It answers this device's commands with their reply templates. Set it to another framing to see what a mismatch looks like: garbage
        with framing errors, not silence.</p>
      <div className="grid gap-2 sm:grid-cols-4">
        <label className="grid gap-1"><span className="label">Device baud</span>
          <select className="input" value={s.line.baud} onChange={(e) => setLine({ baud: Number(e.target.value) })}>
            {STANDARD_BAUD_RATES.map((b) => <option key={b} value={b}>{b}</option>)}
          </select></label>
        <label className="grid gap-1"><span className="label">Device data bits</span>
          <select className="input" value={s.line.dataBits} onChange={(e) => setLine({ dataBits: Number(e.target.value) })}>
            {[7, 8].map((b) => <option key={b} value={b}>{b}</option>)}
          </select></label>
        <label className="grid gap-1"><span className="label">Device parity</span>
          <select className="input" value={s.line.parity} onChange={(e) => setLine({ parity: e.target.value as LineSettings['parity'] })}>
            {PARITIES.map((p) => <option key={p} value={p}>{p}</option>)}
          </select></label>
        <label className="grid gap-1"><span className="label">Device stop bits</span>
          <select className="input" value={s.line.stopBits} onChange={(e) => setLine({ stopBits: Number(e.target.value) as 1 | 2 })}>
            {[1, 2].map((b) => <option key={b} value={b}>{b}</option>)}
          </select></label>
      </div>
      <div className="grid gap-2 sm:grid-cols-2">
        <label className="grid gap-1"><span className="label">Response delay (ms)</span>
          <input className="input" type="number" min={0} max={10000} value={s.responseDelayMs ?? 5} onChange={(e) => change({ responseDelayMs: Math.max(0, Number(e.target.value) || 0) })} /></label>
        <label className="grid gap-1"><span className="label">Behaviour</span>
          <select className="input" value={s.fault ?? 'none'} onChange={(e) => change({ fault: e.target.value as SimulatorFault })}>
            {SIMULATOR_FAULTS.map((f) => <option key={f} value={f}>{SIMULATOR_FAULT_LABELS[f]}</option>)}
          </select></label>
      </div>
      {reply && (
        <fieldset className="grid gap-2">
          <legend className="label">Values in the reply to</legend>
          <select className="input" aria-label="Reply of command" value={replyOf} onChange={(e) => setReplyOf(e.target.value)}>
            {answering.map((c) => <option key={c.id} value={c.id}>{c.name}</option>)}
          </select>
          <div className="grid gap-2 sm:grid-cols-3">
            {reply.segments.filter(isField).map((f) => (
              <label key={f.id} className="grid gap-1"><span className="label">{f.label || f.name}{f.unit ? ` (${f.unit})` : ''}</span>
                {f.type === 'choice' ? (
                  <select className="input" value={String(values[f.name] ?? f.default ?? f.options[0]?.value ?? '')} onChange={(e) => setValue(f.name, e.target.value)}>
                    {f.options.map((o) => <option key={o.value} value={o.value}>{o.label || o.value}</option>)}
                  </select>
                ) : (
                  <input className="input" value={String(values[f.name] ?? '')} placeholder={f.default !== undefined ? String(f.default) : 'from the request, or 0'} onChange={(e) => setValue(f.name, e.target.value)} />
                )}
              </label>
            ))}
          </div>
        </fieldset>
      )}
    </details>
  );
}
