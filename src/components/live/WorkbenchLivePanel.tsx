/**
 * The live link on the workbench (imported only when "Open the live link" is pressed there): the port settings the
 * workbench edits, and the command composed there as the library to send and to simulate. Nothing is saved; the
 * exchange log can be downloaded.
 */
import { useMemo } from 'react';
import type { PortSettings } from '../../lib/frame/port-settings';
import type { FieldValues, Template } from '../../lib/frame/template';
import type { CommandPreset } from '../../lib/composer/presets';
import { LinkPanel } from './LinkPanel';
import type { LibraryCommand } from './library';

export interface WorkbenchLiveProps {
  settings: PortSettings;
  command: {
    name: string; movesMachinery: boolean; safeToRepeat: boolean; setsUpDevice: boolean;
    template: Template; fieldValues: FieldValues; presets: CommandPreset[]; replyTemplate: Template | null;
  };
}

/** The one command of the workbench's library, as the live link reads a library command. */
export function workbenchCommand(c: WorkbenchLiveProps['command']): LibraryCommand {
  return { id: 'workbench', name: c.name.trim() || 'One-off command', movesMachinery: c.movesMachinery, safeToRepeat: c.safeToRepeat, setsUpDevice: c.setsUpDevice,
    template: c.template, fieldValues: c.fieldValues, presets: c.presets, replyTemplate: c.replyTemplate, portName: 'Workbench' };
}

export default function WorkbenchLivePanel({ settings, command }: WorkbenchLiveProps) {
  const key = JSON.stringify(command);
  // eslint-disable-next-line react-hooks/exhaustive-deps
  const commands = useMemo(() => [workbenchCommand(command)], [key]);
  const ports = useMemo(() => [{ name: 'Workbench', settings }], [settings]);
  return <LinkPanel label="Workbench" ports={ports} commands={commands} commandsNoun="the command composed here" fieldLog={null} />;
}
