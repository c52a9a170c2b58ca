/** The content of a field card, built from vault records: what a technician reads at the cabinet. */
import {
  HANDSHAKE_LABELS, INTERFACE_LABELS, PARITY_LABELS, PROTOCOL_LABELS, RS485_DIRECTION_LABELS, controlLineFacts, frameRulesText,
  portSettingsBlock, portShorthand,
  type PortSettings, type Template, type FieldValues,
} from '../frame';
import { renderCommandVariants, timingPort, type CommandPreset, type CommandRendering } from '../composer/presets';
import { assembleSaved, type SavedSequence, type StepCommand } from '../composer/saved-sequence';

export { MACHINERY_CAUTION as CAUTION } from '../caution';

export interface CardPortInput {
  id: string;
  name: string;
  settings: PortSettings;
  wiring: { pin: string; signal: string; colour: string }[];
  notes: string;
}

export interface CardCommandInput {
  id: string;
  name: string;
  purpose: string;
  template: Template;
  fieldValues: FieldValues;
  presets: CommandPreset[];
  portName: string;
  movesMachinery: boolean;
  /** Set for a sequence (its own template is empty). */
  sequence?: SavedSequence | null;
}

export interface CardPort {
  id: string;
  name: string;
  shorthand: string;
  facts: { label: string; value: string }[];
  wiring: CardPortInput['wiring'];
  notes: string;
  /** Plain text for the copy button. */
  copyText: string;
}

export interface CardCommand {
  id: string;
  name: string;
  purpose: string;
  movesMachinery: boolean;
  /** The saved values first (`preset` null), then every preset: PLC literal, hex, bytes and time on the wire. */
  sends: CommandRendering[];
  /** The port the times are for, e.g. `Service RS-232, 9600 8-N-1`; null when the device has no serial port. */
  line: string | null;
  /** A sequence's steps in order: each command's name, or the gap in words. Absent for a single command. */
  steps?: string[];
}

export function cardPort(p: CardPortInput, heading: string): CardPort {
  const s = p.settings;
  const rs485 = s.interface.startsWith('rs485');
  const facts = [
    { label: 'Interface', value: INTERFACE_LABELS[s.interface] },
    ...(s.interface === 'tcp' ? [] : [
      { label: 'Baud', value: String(s.baud) },
      { label: 'Data bits', value: String(s.dataBits) },
      { label: 'Parity', value: PARITY_LABELS[s.parity] },
      { label: 'Stop bits', value: String(s.stopBits) },
      { label: 'Handshake', value: HANDSHAKE_LABELS[s.handshake] },
      ...controlLineFacts(s),
    ]),
    { label: 'Node address', value: s.nodeAddress === null ? '—' : String(s.nodeAddress) },
    { label: 'Termination', value: rs485 ? (s.termination ? 'ON' : 'off') : 'n/a' },
    ...(rs485 ? [{ label: 'Bias', value: s.bias ? 'ON' : 'off' }, { label: 'RS-485 direction', value: RS485_DIRECTION_LABELS[s.rs485Direction] }] : []),
    { label: 'Protocol', value: PROTOCOL_LABELS[s.protocol] },
    { label: 'Response timeout', value: `${s.responseTimeoutMs} ms` },
    { label: 'Inter-character timeout', value: `${s.interCharTimeoutMs} ms` },
    { label: 'Turnaround delay', value: `${s.turnaroundDelayMs} ms` },
    { label: 'Retries', value: String(s.retries) },
    ...(frameRulesText(s.frameRules) ? [{ label: 'Frame rules', value: frameRulesText(s.frameRules) }] : []),
  ];
  // The vault's copy (the same function), with the device named in front.
  const copyText = portSettingsBlock(p.name, s, p.wiring, heading);
  return { id: p.id, name: p.name, shorthand: portShorthand(s), facts, wiring: p.wiring, notes: p.notes, copyText };
}

/**
 * The command's bytes as a PLC string literal and as hex, with its saved values and with each preset, timed on
 * its port (the one it names, else the device's first serial port).
 */
export function cardCommand(c: CardCommandInput, ports: { name: string; settings: PortSettings }[] = [], lookup: (id: string) => StepCommand | undefined = () => undefined): CardCommand {
  const port = timingPort(ports, c.portName);
  if (c.sequence) {
    return {
      id: c.id, name: c.name, purpose: c.purpose, movesMachinery: c.movesMachinery,
      ...sequenceSends(c.sequence, lookup, port ? port.settings : null),
      line: port ? `${port.name}, ${portShorthand(port.settings)}` : null,
    };
  }
  return {
    id: c.id, name: c.name, purpose: c.purpose, movesMachinery: c.movesMachinery,
    sends: renderCommandVariants(c, port ? port.settings : null),
    line: port ? `${port.name}, ${portShorthand(port.settings)}` : null,
  };
}

/**
 * A sequence on the card: the whole string as one send, or each step as its own when sent separately; a gap or
 * an error finding is the problem that keeps it from being built.
 */
function sequenceSends(seq: SavedSequence, lookup: (id: string) => StepCommand | undefined, line: PortSettings | null): { sends: CommandRendering[]; steps: string[] } {
  const s = assembleSaved(seq, lookup, line ? { settings: line } : {});
  const steps = s.info.map((i) => i.gap ?? i.name);
  const problem = s.findings.find((f) => f.severity === 'error')?.message ?? null;
  const hexOf = (from: number, to: number) => s.notations.hex.split(' ').slice(from, to).join(' ');
  if (seq.mode === 'one-string') {
    return { steps, sends: [{ preset: null, plc: s.notations.iecLiteral, hex: s.notations.hex, byteCount: s.byteCount, wireMs: line ? s.timing.frameTimeMs : null, problem }] };
  }
  return {
    steps,
    sends: s.steps.map((step) => {
      const one = assembleSaved({ ...seq, mode: 'one-string', steps: [seq.steps[step.index]!] }, lookup, line ? { settings: line } : {});
      return {
        preset: `Step ${step.index + 1} · ${s.info[step.index]!.name}`, plc: one.notations.iecLiteral, hex: hexOf(step.start, step.end), byteCount: step.byteCount,
        wireMs: line ? step.frameTimeMs : null, problem: step.findings.find((f) => f.severity === 'error')?.message ?? null,
      };
    }),
  };
}
