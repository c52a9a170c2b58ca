/** A command's compared parts in words, for the conflict notice (loaded with it, only when a save meets a 409). */
import { showValue } from '../../lib/client/conflict';
import type { Segment } from '../../lib/frame/template';
import { segmentTitle } from '../../lib/composer/cells';
import { labelOfBytes } from '../../lib/composer/bytes-text';
import { ORDER, type Segments, type TemplateKey } from './command-conflict';
import type { CommandDraft } from './types';

function describeSegment(s: Segment): string {
  const bytes = s.type === 'literal' || s.type === 'terminator' ? ` ${labelOfBytes(s.bytes)}` : '';
  return `${segmentTitle(s)}${bytes}`;
}

const NAMES: Record<string, string> = {
  name: 'Command name', purpose: 'Purpose', notes: 'Notes', movesMachinery: 'Moves machinery', safeToRepeat: 'Safe to repeat', setsUpDevice: 'Setup command', portName: 'Port',
  fieldValues: 'Values', rawUnits: 'Raw units', presets: 'Presets', template: 'Request template', replyTemplate: 'Reply template',
};

/** Names a compared part for people, using whichever version still has the segment. */
export function commandPartLabel(path: readonly string[], ...versions: CommandDraft[]): string {
  const [top, key] = path as [string, string | undefined];
  if (key === undefined) return NAMES[top] ?? top;
  if (top === 'fieldValues') return `Value of ${key}`;
  if (top === 'rawUnits') return `Raw unit of ${key}`;
  const which = top === 'replyTemplate' ? 'reply' : 'request';
  if (key === ORDER) return `Order of the ${which} segments`;
  for (const v of versions) {
    const t = v[top as TemplateKey];
    const i = t?.segments.findIndex((s) => s.id === key) ?? -1;
    if (t && i >= 0) return `${which === 'reply' ? 'Reply' : 'Request'} segment #${i + 1} (${segmentTitle(t.segments[i])})`;
  }
  return `${which === 'reply' ? 'Reply' : 'Request'} segment ${key}`;
}

/** A compared value in words: a segment by what it sends, an order as the segment titles, a template by its segments. */
export function commandPartValue(path: readonly string[], value: unknown, ...versions: CommandDraft[]): string {
  const [top, key] = path as [string, string | undefined];
  const isTemplate = top === 'template' || top === 'replyTemplate';
  if (value === undefined && isTemplate && key !== undefined) return 'not in this version';
  if (isTemplate && key === ORDER && Array.isArray(value)) {
    const all = versions.flatMap((v) => v[top as TemplateKey]?.segments ?? []);
    return (value as string[]).map((id, i) => `#${i + 1} ${segmentTitle(all.find((s) => s.id === id))}`).join(', ');
  }
  if (isTemplate && key !== undefined && value && typeof value === 'object') return describeSegment(value as Segment);
  if (isTemplate && key === undefined) return value ? Object.values(value as Segments).map(describeSegment).join(' · ') : 'none';
  return showValue(value);
}
