/**
 * What a restored state points at (a device's machine and profile, a machine's site, a link's member ports,
 * a command's device or profile), read from the entity declarations, and which of those are no longer live:
 * restores answer ReferenceMissing (409) naming them instead of writing a dangling reference.
 */
import { and, eq } from 'drizzle-orm';
import type { DbOrTx } from '../../../db/client';
import { device, port, type EntityType } from '../../../db/schema';
import type { TeamContext } from '../guard';
import { NotFound, ReferenceMissing } from '../errors';
import { findInTeam } from './engine';
import { entityOf } from './entities';
import type { AnyEntity } from './entity';

export interface Reference {
  type: EntityType;
  id: string;
  /** The field of the restored record that holds the reference. */
  field: string;
}

export interface MissingReference extends Reference {
  /** `trash`: it can come back from the trash first; `gone`: purged (or never in this team). */
  state: 'trash' | 'gone';
  /** How the trash lists it; null when it is gone. */
  label: string | null;
}

async function lookUp(q: DbOrTx, ctx: TeamContext, ref: Reference): Promise<MissingReference | null> {
  if (ref.type === 'port') {
    const [row] = await q
      .select({ name: port.name, deletedAt: port.deletedAt, tag: device.tag, deviceDeleted: device.deletedAt })
      .from(port)
      .innerJoin(device, eq(device.id, port.deviceId))
      .where(and(eq(port.id, ref.id), eq(port.teamId, ctx.team.id)));
    if (!row) return { ...ref, state: 'gone', label: null };
    return row.deletedAt || row.deviceDeleted ? { ...ref, state: 'trash', label: `${row.tag} ${row.name}` } : null;
  }
  const entity = entityOf(ref.type);
  const row = await findInTeam(q, ctx, entity, ref.id, 'any').catch((err: unknown) => {
    if (err instanceof NotFound) return null;
    throw err;
  });
  if (!row) return { ...ref, state: 'gone', label: null };
  return row.deletedAt ? { ...ref, state: 'trash', label: entity.describe(row) } : null;
}

/** The references that are in the trash or gone, in the order given. */
export async function missingReferences(q: DbOrTx, ctx: TeamContext, refs: Reference[]): Promise<MissingReference[]> {
  const out: MissingReference[] = [];
  for (const ref of refs) {
    const m = await lookUp(q, ctx, ref);
    if (m) out.push(m);
  }
  return out;
}

function words(m: MissingReference): string {
  const noun = entityOf(m.type).noun;
  return m.state === 'trash' ? `the ${noun} "${m.label}", which is in the trash` : `a ${noun} that was purged (id ${m.id})`;
}

/** 409 with every missing reference in words and as `missing: [{ type, id, field, state, label }]`. */
export function missingReferencesError(what: string, missing: MissingReference[]): ReferenceMissing {
  const list = missing.map(words);
  const joined = list.length === 1 ? list[0] : `${list.slice(0, -1).join('; ')} and ${list.at(-1)}`;
  const trash = missing.filter((m) => m.state === 'trash').length;
  const advice = trash === missing.length
    ? 'Restore that from the trash first.'
    : trash === 0
      ? 'What was purged cannot come back: edit the record instead.'
      : 'Restore what is in the trash first; what was purged cannot come back, so edit the record instead.';
  return new ReferenceMissing(`${what} points at ${joined}. ${advice}`, missing);
}

/**
 * The records `state` (a revision's snapshot, or the record itself) points at, as its entity declares them:
 * the parent, the other reference fields, and computed ones (a link's member ports). With `current`, only
 * those the record does not point at already (a reference it holds stays as it is). Empty ids are skipped.
 */
export function referencesOf(entity: AnyEntity, state: Record<string, unknown>, current?: Record<string, unknown>): Reference[] {
  const refs: Reference[] = [];
  for (const r of [...(entity.parent ? [entity.parent] : []), ...(entity.references ?? [])]) {
    const id = state[r.field];
    if (typeof id === 'string' && id !== '' && (!current || id !== current[r.field])) refs.push({ type: r.type, id, field: r.field });
  }
  const computed = entity.pointsAt?.(state) ?? [];
  const held = new Set(current ? (entity.pointsAt?.(current) ?? []).map((r) => `${r.type}:${r.id}`) : []);
  for (const r of computed) if (!held.has(`${r.type}:${r.id}`)) refs.push(r);
  return refs;
}

/** ReferenceMissing when any of `refs` is in the trash or gone. */
export async function refuseMissing(q: DbOrTx, ctx: TeamContext, what: string, refs: Reference[]): Promise<void> {
  const missing = await missingReferences(q, ctx, refs);
  if (missing.length) throw missingReferencesError(what, missing);
}
