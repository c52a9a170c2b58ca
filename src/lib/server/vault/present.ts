/** How ports look in API answers: the stored row plus the shorthand and the copy-as-text block (../../frame/port-text.ts). */
import { portSettingsBlock, portShorthand } from '../../frame/port-text';
import type { PortRow } from '../records/entities';

export interface PortView extends PortRow {
  shorthand: string;
  text: string;
}

export function presentPort(row: PortRow): PortView {
  return { ...row, shorthand: portShorthand(row.settings), text: portSettingsBlock(row.name, row.settings, row.wiring) };
}
