/** The workbench's own port settings: line format, protocol and the frame rules that matter for a one-off command. */
import { PARITIES, PROTOCOLS, STANDARD_BAUD_RATES, type PortSettings } from '../../lib/frame/port-settings';
import { PARITY_LABELS, PROTOCOL_LABELS } from '../../lib/frame/port-text';
import { HexInput } from './inputs';

export function PortQuick({ settings, onChange }: { settings: PortSettings; onChange: (s: PortSettings) => void }) {
  const set = (p: Partial<PortSettings>) => onChange({ ...settings, ...p });
  const rules = (p: Partial<PortSettings['frameRules']>) => onChange({ ...settings, frameRules: { ...settings.frameRules, ...p } });
  return (
    <div className="grid grid-cols-2 sm:grid-cols-3 gap-2">
      <div>
        <label htmlFor="wb-baud" className="label !text-xs">Baud</label>
        <select id="wb-baud" className="input !py-1" value={settings.baud} onChange={(e) => set({ baud: Number(e.target.value) })}>
          {STANDARD_BAUD_RATES.map((b) => <option key={b} value={b}>{b}</option>)}
        </select>
      </div>
      <div>
        <label htmlFor="wb-bits" className="label !text-xs">Data bits</label>
        <select id="wb-bits" className="input !py-1" value={settings.dataBits} onChange={(e) => set({ dataBits: Number(e.target.value) as PortSettings['dataBits'] })}>
          {[8, 7, 6, 5].map((b) => <option key={b} value={b}>{b}</option>)}
        </select>
      </div>
      <div>
        <label htmlFor="wb-parity" className="label !text-xs">Parity</label>
        <select id="wb-parity" className="input !py-1" value={settings.parity} onChange={(e) => set({ parity: e.target.value as PortSettings['parity'] })}>
          {PARITIES.map((p) => <option key={p} value={p}>{PARITY_LABELS[p]}</option>)}
        </select>
      </div>
      <div>
        <label htmlFor="wb-stop" className="label !text-xs">Stop bits</label>
        <select id="wb-stop" className="input !py-1" value={settings.stopBits} onChange={(e) => set({ stopBits: Number(e.target.value) as PortSettings['stopBits'] })}>
          {[1, 1.5, 2].map((b) => <option key={b} value={b}>{b}</option>)}
        </select>
      </div>
      <div>
        <label htmlFor="wb-protocol" className="label !text-xs">Protocol</label>
        <select id="wb-protocol" className="input !py-1" value={settings.protocol} onChange={(e) => set({ protocol: e.target.value as PortSettings['protocol'] })}>
          {PROTOCOLS.map((p) => <option key={p} value={p}>{PROTOCOL_LABELS[p]}</option>)}
        </select>
      </div>
      <div>
        <label htmlFor="wb-term" className="label !text-xs">Terminator (hex)</label>
        <HexInput id="wb-term" value={settings.frameRules.terminator ?? '0D'} onChange={(terminator) => rules({ terminator })} />
      </div>
      <div>
        <label htmlFor="wb-case" className="label !text-xs">Letter case</label>
        <select id="wb-case" className="input !py-1" value={settings.frameRules.letterCase} onChange={(e) => rules({ letterCase: e.target.value as never })}>
          <option value="any">Any</option><option value="upper">Upper only</option><option value="lower">Lower only</option>
        </select>
      </div>
    </div>
  );
}
