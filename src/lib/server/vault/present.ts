/** How ports look in API answers: the stored row plus the shorthand and the copy-as-text block. */
import { portSettingsText, portShorthand, type PortSettings } from '../../frame/port-settings';
import type { PortRow } from '../records/entities';

export interface PortView extends PortRow {
  shorthand: string;
  text: string;
}

export function presentPort(row: PortRow): PortView {
  return { ...row, shorthand: shorthandOf(row.settings), text: settingsBlock(row.name, row.settings, row.wiring) };
}

export function shorthandOf(s: PortSettings): string {
  const base = portShorthand(s);
  return s.interface === 'tcp' && s.tcpHost ? `${base} @ ${s.tcpHost}:${s.tcpPort ?? ''}` : base;
}

/** The text block behind "copy settings as text": the frame engine's summary plus wiring and frame rules. */
export function settingsBlock(name: string, s: PortSettings, wiring: PortRow['wiring'], heading?: string): string {
  const lines = [heading ? `${heading} — ${name}` : name, portSettingsText(s)];
  const r = s.frameRules;
  const rules = [
    r.start ? `start ${r.start}` : '',
    r.terminator ? `terminator ${r.terminator}` : '',
    r.maxLength ? `max ${r.maxLength} bytes` : '',
    r.byteSet !== '8-bit' ? `${r.byteSet} bytes` : '',
    r.letterCase !== 'any' ? `${r.letterCase} case` : '',
  ].filter(Boolean);
  if (rules.length) lines.push(`Frame rules: ${rules.join(', ')}`);
  if (wiring.length) {
    lines.push('Wiring:');
    for (const w of wiring) lines.push(`  pin ${w.pin || '-'}  ${w.signal || '-'}  ${w.colour || ''}`.trimEnd());
  }
  return lines.join('\n');
}
