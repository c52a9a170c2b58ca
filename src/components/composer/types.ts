import type { PortSettings } from '../../lib/frame/port-settings';
import type { FieldValues, Template } from '../../lib/frame/template';
import type { CommandPreset } from '../../lib/composer/presets';

/** The editable part of a command, as the composer holds it. */
export interface CommandDraft {
  name: string;
  purpose: string;
  notes: string;
  movesMachinery: boolean;
  /** Only reads: the framing search may repeat it (set by an engineer). */
  safeToRepeat: boolean;
  /** Writes the device's settings: offered after a framing search. */
  setsUpDevice: boolean;
  template: Template;
  fieldValues: FieldValues;
  replyTemplate: Template | null;
  portName: string;
  rawUnits: Record<string, string>;
  /** Named value sets kept with the command. */
  presets: CommandPreset[];
}

export interface NamedPort {
  name: string;
  settings: PortSettings;
}

export const DRAFT_KEYS = ['name', 'purpose', 'notes', 'movesMachinery', 'safeToRepeat', 'setsUpDevice', 'template', 'fieldValues', 'replyTemplate', 'portName', 'rawUnits', 'presets'] as const;

export function draftOf(c: CommandDraft): CommandDraft {
  return Object.fromEntries(DRAFT_KEYS.map((k) => [k, c[k]])) as unknown as CommandDraft;
}
