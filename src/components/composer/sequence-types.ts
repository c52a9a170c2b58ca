/** The library commands the sequence editor and the library list read (`GET /api/commands`). */
import type { CommandPreset } from '../../lib/composer/presets';
import type { SavedSequence, StepInfo } from '../../lib/composer/saved-sequence';
import type { FieldValues, Template } from '../../lib/frame/template';

export interface LibraryCommand {
  id: string;
  name: string;
  version: number;
  inherited: boolean;
  movesMachinery: boolean;
  template: Template;
  fieldValues: FieldValues;
  replyTemplate: Template | null;
  rawUnits: Record<string, string>;
  presets: CommandPreset[];
  sequence: SavedSequence | null;
  steps?: StepInfo[];
}
