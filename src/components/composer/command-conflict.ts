/**
 * A command as the conflict notice compares it (docs/decisions/003): its fields by name, field values and raw
 * units field by field, and the request and reply templates segment by segment (a segment is compared whole,
 * as the segment editor edits it; its order apart).
 */
import { keyed, mergedList, reordered, same, showValue, type ConflictRow, type Path } from '../../lib/client/conflict';
import type { Segment, Template } from '../../lib/frame/template';
import { segmentTitle } from '../../lib/composer/cells';
import { labelOfBytes } from '../../lib/composer/bytes-text';
import { DRAFT_KEYS, draftOf, type CommandDraft } from './types';

type Segments = Record<string, Segment>;
export type CommandShape = Omit<CommandDraft, 'template' | 'replyTemplate'> & { template: Segments; replyTemplate: Segments | null };

const TEMPLATES = ['template', 'replyTemplate'] as const;
type TemplateKey = (typeof TEMPLATES)[number];
const ids = (t: Template | null | undefined) => t?.segments.map((s) => s.id) ?? [];
/** The key of a template's segment order in a row's path; no segment id is empty. */
const ORDER = '';

export function commandShape(d: CommandDraft): CommandShape {
  const c = draftOf(d);
  return { ...c, template: keyed(c.template.segments, (s) => s.id), replyTemplate: c.replyTemplate && keyed(c.replyTemplate.segments, (s) => s.id) };
}

export const segmentIsLeaf = (p: Path) => p.length === 2 && (p[0] === 'template' || p[0] === 'replyTemplate');

/** The fields of `draft` that differ from `base`: all that a save sends. */
export function changedDraftFields(base: CommandDraft, draft: CommandDraft): Partial<CommandDraft> {
  return Object.fromEntries(DRAFT_KEYS.filter((k) => !same(base[k], draft[k])).map((k) => [k, draft[k]]));
}

/** The draft a re-apply saves: the merged shape with each template rebuilt in the merged segment order. */
export function mergedDraft(merged: CommandShape, base: CommandDraft, mine: CommandDraft, theirs: CommandDraft): CommandDraft {
  const rebuild = (k: TemplateKey): Template | null => {
    const items = merged[k];
    if (!items) return null;
    const order = { base: ids(base[k]), mine: ids(mine[k]), theirs: ids(theirs[k]) };
    return { version: (theirs[k] ?? mine[k])?.version ?? 1, segments: mergedList(items, order) } as Template;
  };
  return { ...merged, template: rebuild('template')!, replyTemplate: rebuild('replyTemplate') };
}

/** One row per template whose segments someone moved (neither adding nor removing counts as moving). */
export function orderRows(base: CommandDraft, mine: CommandDraft, theirs: CommandDraft): ConflictRow[] {
  return TEMPLATES.flatMap((k) => {
    if (!base[k] || !mine[k] || !theirs[k]) return [];
    const [b, m, t] = [ids(base[k]), ids(mine[k]), ids(theirs[k])];
    const mineChanged = reordered(b, m);
    const theirsChanged = reordered(b, t);
    if (!mineChanged && !theirsChanged) return [];
    const clash = mineChanged && theirsChanged && !same(m.filter((x) => t.includes(x)), t.filter((x) => m.includes(x)));
    return [{ path: [k, ORDER], base: b, mine: m, theirs: t, mineChanged, theirsChanged, clash }];
  });
}

function describeSegment(s: Segment): string {
  const bytes = s.type === 'literal' || s.type === 'terminator' ? ` ${labelOfBytes(s.bytes)}` : '';
  return `${segmentTitle(s)}${bytes}`;
}

const NAMES: Record<string, string> = {
  name: 'Command name', purpose: 'Purpose', notes: 'Notes', movesMachinery: 'Moves machinery', portName: 'Port',
  fieldValues: 'Values', rawUnits: 'Raw units', template: 'Request template', replyTemplate: 'Reply template',
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
