/**
 * Value presets: named value sets kept with a command ("index one station", "jog 1° one way"). A preset gives
 * values for the fields it sets; every other field takes the command's saved values, then the field's default.
 */
import { assembleFrame, lineTiming, renderHex, renderIecLiteral, type FieldValues, type LineSettings, type Template } from '../frame';

export interface CommandPreset {
  name: string;
  values: FieldValues;
}

/** At most this many presets per command. */
export const MAX_PRESETS = 20;

/** Preset names compare without letter case and surrounding spaces, as record names do. */
export const presetKey = (name: string) => name.trim().toLowerCase();

/** The values a preset sends: the command's saved values with the preset's on top. */
export function presetValues(saved: FieldValues, preset: CommandPreset): FieldValues {
  return { ...saved, ...preset.values };
}

/** The port a command's times are for: the serial port it names, else the first serial port; null when none. */
export function timingPort<P extends { name: string; settings: { interface: string } }>(ports: readonly P[], portName: string): P | null {
  const serial = ports.filter((p) => p.settings.interface !== 'tcp');
  return serial.find((p) => p.name === portName) ?? serial[0] ?? null;
}

/** One way of sending a command (its saved values or a preset) as a technician copies it. */
export interface CommandRendering {
  /** The preset's name, or null for the command's saved values. */
  preset: string | null;
  plc: string;
  hex: string;
  byteCount: number;
  /** Time on the wire at the port's settings, in ms; null when the port is not a serial line. */
  wireMs: number | null;
  /** Why the bytes cannot be built (an error finding), or null. */
  problem: string | null;
}

/** The command's bytes with `values`, as a PLC literal and hex, with the time they take on the wire. */
export function renderCommand(template: Template, values: FieldValues, line: LineSettings | null, preset: string | null = null): CommandRendering {
  try {
    const frame = assembleFrame(template, values);
    const error = frame.findings.find((f) => f.severity === 'error');
    return {
      preset, plc: renderIecLiteral(frame.bytes), hex: renderHex(frame.bytes), byteCount: frame.bytes.length,
      wireMs: line ? lineTiming(line, frame.bytes.length).frameTimeMs : null, problem: error ? error.message : null,
    };
  } catch (err) {
    return { preset, plc: '', hex: '', byteCount: 0, wireMs: null, problem: (err as Error).message };
  }
}

/** The command with its saved values, then each preset. */
export function renderCommandVariants(c: { template: Template; fieldValues: FieldValues; presets: CommandPreset[] }, line: LineSettings | null): CommandRendering[] {
  return [renderCommand(c.template, c.fieldValues, line), ...c.presets.map((p) => renderCommand(c.template, presetValues(c.fieldValues, p), line, p.name))];
}
