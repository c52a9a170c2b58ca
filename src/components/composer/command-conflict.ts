/**
 * A command as the conflict notice compares it (docs/decisions/003): its fields by name, field values and raw
 * units field by field, and the request and reply templates segment by segment (a segment is compared whole,
 * as the segment editor edits it; its order apart).
 */
import { keyed, mergedList, reordered, same, type ConflictRow, type Path } from '../../lib/client/conflict';
import type { OpenConflict } from '../../lib/client/use-conflict';
import type { Segment, Template } from '../../lib/frame/template';
import type { DraftCompare } from './SaveBar';
import { DRAFT_KEYS, draftOf, type CommandDraft } from './types';

export type Segments = Record<string, Segment>;
export type CommandShape = Omit<CommandDraft, 'template' | 'replyTemplate'> & { template: Segments; replyTemplate: Segments | null };

const TEMPLATES = ['template', 'replyTemplate'] as const;
export type TemplateKey = (typeof TEMPLATES)[number];
export const ids = (t: Template | null | undefined) => t?.segments.map((s) => s.id) ?? [];
/** The key of a template's segment order in a row's path; no segment id is empty. */
export const ORDER = '';

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

/** A command as the API answers it. */
export type SavedCommand = CommandDraft & { id: string; version: number };

/** How the save bar compares and saves a command: segment by segment, a re-apply rebuilt in the merged order. */
export const commandCompare: DraftCompare<CommandDraft, SavedCommand, CommandShape> = {
  shapeOf: commandShape,
  isLeaf: segmentIsLeaf,
  changed: changedDraftFields,
  reapply(c: OpenConflict<CommandDraft, SavedCommand, CommandShape>) {
    const theirs = draftOf(c.current);
    return { base: theirs, mine: mergedDraft(c.merged, c.base, c.mine, theirs) };
  },
};
