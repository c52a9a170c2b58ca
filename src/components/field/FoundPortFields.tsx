/** The settings a technician found on one port, for a "found different" entry: each left blank was not checked. */
import { PARITIES } from '../../lib/frame/port-settings';
import { PARITY_LABELS } from '../../lib/frame/port-text';

export interface FoundPort { portId: string; baud: string; dataBits: string; parity: string; stopBits: string; nodeAddress: string; termination: string }
export const NO_PORT: FoundPort = { portId: '', baud: '', dataBits: '', parity: '', stopBits: '', nodeAddress: '', termination: '' };

/** The request's `port` part: only the settings filled in (none at all is sent as such, and refused with a message). */
export function foundPortBody(f: FoundPort): { portId: string; settings: Record<string, unknown> } | undefined {
  if (!f.portId) return undefined;
  const settings: Record<string, unknown> = {};
  if (f.baud.trim()) settings.baud = Number(f.baud);
  if (f.dataBits) settings.dataBits = Number(f.dataBits);
  if (f.parity) settings.parity = f.parity;
  if (f.stopBits) settings.stopBits = Number(f.stopBits);
  if (f.nodeAddress.trim()) settings.nodeAddress = Number(f.nodeAddress);
  if (f.termination) settings.termination = f.termination === 'on';
  return { portId: f.portId, settings };
}

interface Props { ports: { id: string; name: string }[]; value: FoundPort; onChange: (v: FoundPort) => void; errors: Record<string, string> }

export function FoundPortFields({ ports, value, onChange, errors }: Props) {
  const set = (k: keyof FoundPort) => (e: { target: { value: string } }) => onChange({ ...value, [k]: e.target.value });
  const err = (k: string) => errors[`port.settings.${k}`];
  const general = errors['port.portId'] ?? errors['port.settings'] ?? errors.port;
  if (!ports.length) return null;
  return (
    <fieldset className="grid gap-2">
      <legend className="label">Port settings as found (fill in what you read off the device)</legend>
      <label className="grid gap-1"><span className="text-sm">Port</span>
        <select className="input" value={value.portId} onChange={set('portId')} aria-invalid={!!general}>
          <option value="">No port settings</option>
          {ports.map((p) => <option key={p.id} value={p.id}>{p.name}</option>)}
        </select></label>
      {value.portId && (
        <div className="grid gap-2 grid-cols-2 sm:grid-cols-3">
          <label className="grid gap-1"><span className="text-sm">Baud rate</span>
            <input className="input" inputMode="numeric" value={value.baud} onChange={set('baud')} aria-invalid={!!err('baud')} />
            {err('baud') && <span className="field-error">{err('baud')}</span>}</label>
          <label className="grid gap-1"><span className="text-sm">Data bits</span>
            <select className="input" value={value.dataBits} onChange={set('dataBits')}><option value="">—</option>{[7, 8, 6, 5].map((n) => <option key={n} value={n}>{n}</option>)}</select></label>
          <label className="grid gap-1"><span className="text-sm">Parity</span>
            <select className="input" value={value.parity} onChange={set('parity')}><option value="">—</option>{PARITIES.map((p) => <option key={p} value={p}>{PARITY_LABELS[p]}</option>)}</select></label>
          <label className="grid gap-1"><span className="text-sm">Stop bits</span>
            <select className="input" value={value.stopBits} onChange={set('stopBits')}><option value="">—</option>{[1, 1.5, 2].map((n) => <option key={n} value={n}>{n}</option>)}</select></label>
          <label className="grid gap-1"><span className="text-sm">Node address</span>
            <input className="input" inputMode="numeric" value={value.nodeAddress} onChange={set('nodeAddress')} aria-invalid={!!err('nodeAddress')} />
            {err('nodeAddress') && <span className="field-error">{err('nodeAddress')}</span>}</label>
          <label className="grid gap-1"><span className="text-sm">Termination</span>
            <select className="input" value={value.termination} onChange={set('termination')}><option value="">—</option><option value="on">On</option><option value="off">Off</option></select></label>
        </div>
      )}
      {general && <span className="field-error">{general}</span>}
      {Object.entries(errors).filter(([k]) => k.startsWith('port.settings.') && !['baud', 'nodeAddress'].includes(k.slice(14))).map(([k, m]) => <span key={k} className="field-error">{m}</span>)}
    </fieldset>
  );
}
