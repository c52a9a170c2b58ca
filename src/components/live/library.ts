/** The device's command library as the live link uses it: the request bytes of a command or preset, the simulator's view. */
import { assembleFrame } from '../../lib/frame/assemble';
import type { FieldValues, Template } from '../../lib/frame/template';
import { presetValues, type CommandPreset } from '../../lib/composer/presets';
import type { SimulatedCommand } from '../../lib/live/simulator';
import { setupValues } from '../../lib/live/setup';
import type { LineSettings } from '../../lib/frame/port-settings';
import type { SavedSequence, StepInfo } from '../../lib/composer/saved-sequence';

export interface LibraryCommand {
  id: string;
  name: string;
  movesMachinery: boolean;
  /** Marked by an engineer: the framing search may repeat it. */
  safeToRepeat: boolean;
  /** A setup command, offered after a framing search. */
  setsUpDevice: boolean;
  /** Set for a sequence (its own template is empty). */
  sequence?: SavedSequence | null;
  /** A sequence's steps as the server sees them: names, and the gap where a step's command is in the trash or purged. */
  steps?: StepInfo[];
  template: Template;
  fieldValues: FieldValues;
  presets: CommandPreset[];
  replyTemplate: Template | null;
  portName: string;
}

/** The bytes a command sends with its saved values (`preset` null) or with a preset laid over them. */
export function commandRequest(c: LibraryCommand, preset: string | null): { bytes: Uint8Array; label: string; ok: boolean } {
  const p = preset === null ? null : c.presets.find((x) => x.name === preset) ?? null;
  const frame = assembleFrame(c.template, p ? presetValues(c.fieldValues, p) : c.fieldValues);
  return { bytes: frame.bytes, label: p ? `${c.name}: ${p.name}` : c.name, ok: frame.ok };
}

/** The simulated device knows the single commands (a sequence is its steps' commands, sent one after another). */
export const simulatedCommands = (list: readonly LibraryCommand[]): SimulatedCommand[] =>
  list.filter((c) => !c.sequence).map((c) => ({ id: c.id, name: c.name, template: c.template, replyTemplate: c.replyTemplate, ...(c.setsUpDevice ? { setsUpDevice: true } : {}) }));

/** A setup command as sent to a replacement: its saved values, with its line fields set from the stored framing. */
export function setupRequest(c: LibraryCommand, line: LineSettings): { bytes: Uint8Array; ok: boolean } {
  const frame = assembleFrame(c.template, setupValues(c.template, c.fieldValues, line));
  return { bytes: frame.bytes, ok: frame.ok };
}
