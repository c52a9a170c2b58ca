/** Which port the command goes out on: its frame rules check the frame, its settings drive the timing. */
import { PROTOCOL_LABELS, portShorthand } from '../../lib/frame/port-text';
import type { NamedPort } from './types';

export function PortPicker({ ports, value, onChange, readOnly }: { ports: NamedPort[]; value: string; onChange: (name: string) => void; readOnly: boolean }) {
  if (ports.length === 0) return <p className="text-sm text-muted">No ports recorded: timing uses 9600 8-N-1 and no frame rules apply.</p>;
  return (
    <div>
      <label htmlFor="composer-port" className="label">Sent on port</label>
      <select id="composer-port" className="input sm:!w-auto" value={value || ports[0]!.name} disabled={readOnly} onChange={(e) => onChange(e.target.value)}>
        {ports.map((p) => <option key={p.name} value={p.name}>{p.name} · {portShorthand(p.settings)} · {PROTOCOL_LABELS[p.settings.protocol]}</option>)}
      </select>
    </div>
  );
}
