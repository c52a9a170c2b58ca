/** RTS, DTR and break set from the page; CTS, DSR, DCD and RI read back every half second. */
import { useEffect, useState } from 'react';
import type { InputSignals } from '../../lib/live/serial';
import type { LiveLink } from '../../lib/live/session';

export function ControlLines({ link, rtsDirection }: { link: LiveLink; rtsDirection: boolean }) {
  const [out, setOut] = useState({ requestToSend: true, dataTerminalReady: true, break: false });
  const [inputs, setInputs] = useState<InputSignals | null>(null);
  const [error, setError] = useState<string | null>(null);
  useEffect(() => {
    let live = true;
    const read = () => link.getSignals().then((s) => { if (live) setInputs(s); }, (e) => { if (live) setError(e instanceof Error ? e.message : String(e)); });
    read();
    const t = setInterval(read, 500);
    return () => { live = false; clearInterval(t); };
  }, [link]);
  const set = (key: keyof typeof out, value: boolean) => {
    setOut((o) => ({ ...o, [key]: value }));
    link.setSignals({ [key]: value }).catch((e) => setError(e instanceof Error ? e.message : String(e)));
  };
  const lamp = (on: boolean | undefined, name: string) => (
    <li className={`rounded border-2 px-2 py-1 mono ${on ? 'border-ink bg-ink text-white' : 'border-line'}`} data-testid={`line-${name}`} data-on={!!on}>{name} {on ? 'on' : 'off'}</li>
  );
  return (
    <div className="grid gap-2" data-testid="live-lines">
      <h3>Control lines</h3>
      {rtsDirection && (
        <p className="notice notice-warn text-sm">This port switches its RS-485 transmitter with RTS. RTS set from the browser changes milliseconds late, too slow to turn the line
          around for a reply: use an adapter with automatic direction control.</p>
      )}
      <div className="flex flex-wrap gap-4">
        <label className="flex items-center gap-2"><input type="checkbox" checked={out.requestToSend} onChange={(e) => set('requestToSend', e.target.checked)} /> RTS</label>
        <label className="flex items-center gap-2"><input type="checkbox" checked={out.dataTerminalReady} onChange={(e) => set('dataTerminalReady', e.target.checked)} /> DTR</label>
        <label className="flex items-center gap-2"><input type="checkbox" checked={out.break} onChange={(e) => set('break', e.target.checked)} /> Break (line held at space)</label>
      </div>
      <ul className="flex flex-wrap gap-2 text-sm" aria-label="Input lines">
        {lamp(inputs?.clearToSend, 'CTS')}{lamp(inputs?.dataSetReady, 'DSR')}{lamp(inputs?.dataCarrierDetect, 'DCD')}{lamp(inputs?.ringIndicator, 'RI')}
      </ul>
      {error && <p className="field-error">{error}</p>}
    </div>
  );
}
