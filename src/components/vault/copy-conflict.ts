/**
 * Copying settings meets a 409 when a target port was saved by someone else after the preview: the API answers
 * with a fresh preview. The conflict notice compares the two previews setting by setting: what the target had
 * when you previewed, what it has now (theirs), and what copying sets (yours).
 */
import { same, type ConflictRow } from '../../lib/client/conflict';

export interface CopyChange { field: string; from: unknown; to: unknown }
export interface CopyPair { sourceLabel: string; targetPortId: string; targetLabel: string; targetVersion: number; changes: CopyChange[] }
export interface CopyPreview { pairs: CopyPair[]; unmatched: string[]; applied: boolean }

/** The target ports saved since the preview. */
export const staleTargets = (previewed: CopyPreview, fresh: CopyPreview): CopyPair[] =>
  fresh.pairs.filter((p) => previewed.pairs.find((o) => o.targetPortId === p.targetPortId)?.targetVersion !== p.targetVersion);

/** One row per setting of a stale target that the copy sets or that they changed; path `[targetPortId, field]`. */
export function copyConflictRows(previewed: CopyPreview, fresh: CopyPreview): ConflictRow[] {
  return staleTargets(previewed, fresh).flatMap((p) => {
    const o = previewed.pairs.find((x) => x.targetPortId === p.targetPortId);
    const fields = [...new Set([...(o?.changes ?? []), ...p.changes].map((c) => c.field))];
    return fields.map((field) => {
      const before = o?.changes.find((c) => c.field === field);
      const now = p.changes.find((c) => c.field === field);
      // A setting missing from a preview's changes was already the source's there, i.e. the copy's value.
      const base = before ? before.from : now?.to;
      const theirs = now ? now.from : before?.to;
      const mine = now ? now.to : before?.to;
      const theirsChanged = !same(base, theirs);
      return { path: [p.targetPortId, field], base, theirs, mine, theirsChanged, mineChanged: !!now, clash: theirsChanged && !!now && !same(theirs, mine) };
    });
  });
}
