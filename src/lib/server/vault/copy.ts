/** Copy settings from one device or port to another: preview the differences, then apply them as revisions. */
import type { FieldChange } from '../../../db/schema';
import type { DbOrTx } from '../../../db/client';
import { db } from '../../../db/client';
import type { TeamContext } from '../guard';
import type { CopySettings } from '../../schemas/vault';
import { diffSnapshots } from '../records/diff';
import { findLive, updateVersioned } from './records';
import { deviceEntity, portEntity, type PortRow } from '../records/entities';
import { livePorts } from './devices';
import { Conflict, Invalid } from '../errors';

export interface CopyPair {
  sourcePortId: string;
  sourceLabel: string;
  targetPortId: string;
  targetLabel: string;
  targetVersion: number;
  changes: FieldChange[];
}

export interface CopyPreview {
  pairs: CopyPair[];
  /** Source ports with no port to copy onto. */
  unmatched: string[];
  applied: boolean;
}

type Labelled = PortRow & { label: string };

async function resolve(q: DbOrTx, ctx: TeamContext, end: CopySettings['source']): Promise<Labelled[]> {
  if (end.kind === 'port') {
    const p = await findLive(q, ctx, portEntity, end.id);
    const d = await findLive(q, ctx, deviceEntity, p.deviceId);
    return [{ ...p, label: `${d.tag} ${p.name}` }];
  }
  const d = await findLive(q, ctx, deviceEntity, end.id);
  return (await livePorts(q, d.id)).map((p) => ({ ...p, label: `${d.tag} ${p.name}` }));
}

/** Same-name ports first, then the rest in order. */
function pairUp(sources: Labelled[], targets: Labelled[]): { pairs: [Labelled, Labelled][]; unmatched: Labelled[] } {
  const free = [...targets];
  const pairs: [Labelled, Labelled][] = [];
  const rest: Labelled[] = [];
  for (const s of sources) {
    const i = free.findIndex((t) => t.name.toLowerCase() === s.name.toLowerCase());
    if (i >= 0) pairs.push([s, free.splice(i, 1)[0]!]);
    else rest.push(s);
  }
  const unmatched: Labelled[] = [];
  for (const s of rest) {
    const t = free.shift();
    if (t) pairs.push([s, t]);
    else unmatched.push(s);
  }
  return { pairs, unmatched };
}

function copied(source: PortRow, target: PortRow, opts: CopySettings): Pick<PortRow, 'settings' | 'wiring'> {
  const settings = { ...source.settings };
  if (!opts.includeAddress) {
    settings.nodeAddress = target.settings.nodeAddress;
    settings.tcpHost = target.settings.tcpHost;
    settings.tcpPort = target.settings.tcpPort;
    if (settings.tcpHost === undefined) delete settings.tcpHost;
    if (settings.tcpPort === undefined) delete settings.tcpPort;
  }
  return { settings, wiring: opts.includeWiring ? source.wiring : target.wiring };
}

async function plan(q: DbOrTx, ctx: TeamContext, opts: CopySettings) {
  const [sources, targets] = await Promise.all([resolve(q, ctx, opts.source), resolve(q, ctx, opts.target)]);
  const targetIds = new Set(targets.map((t) => t.id));
  if (sources.some((s) => targetIds.has(s.id))) {
    throw new Invalid('target: choose a different device or port to copy onto', { fields: { target: 'The target is the same as the source.' } });
  }
  if (sources.length === 0) throw new Invalid('source: the source has no ports', { fields: { source: 'The source has no ports to copy from.' } });
  if (targets.length === 0) throw new Invalid('target: the target has no ports', { fields: { target: 'The target has no ports; add one first.' } });
  const { pairs, unmatched } = pairUp(sources, targets);
  return {
    pairs: pairs.map(([s, t]) => {
      const next = copied(s, t, opts);
      return {
        source: s,
        target: t,
        next,
        summary: {
          sourcePortId: s.id, sourceLabel: s.label, targetPortId: t.id, targetLabel: t.label, targetVersion: t.version,
          changes: diffSnapshots({ settings: t.settings, wiring: t.wiring }, { settings: next.settings, wiring: next.wiring }),
        } satisfies CopyPair,
      };
    }),
    unmatched: unmatched.map((u) => u.label),
  };
}

export async function previewCopy(ctx: TeamContext, opts: CopySettings): Promise<CopyPreview> {
  const p = await plan(db, ctx, opts);
  return { pairs: p.pairs.map((x) => x.summary), unmatched: p.unmatched, applied: false };
}

/** Writes every pair with changes as one transaction; any target changed since the preview answers 409 with a fresh preview. */
export async function applyCopy(ctx: TeamContext, opts: CopySettings): Promise<CopyPreview> {
  const basedOn = opts.basedOn;
  if (!basedOn) throw new Invalid('basedOn: preview first and send the versions you saw', { fields: { basedOn: 'Preview first and send the target versions you saw.' } });
  return db.transaction(async (tx) => {
    const p = await plan(tx, ctx, opts);
    const stale = p.pairs.filter((x) => x.summary.changes.length > 0 && basedOn[x.target.id] !== x.target.version);
    if (stale.length) {
      throw new Conflict(`${stale.map((s) => s.target.label).join(', ')} changed since the preview; look at the differences again.`, {
        current: { pairs: p.pairs.map((x) => x.summary), unmatched: p.unmatched, applied: false },
      });
    }
    for (const x of p.pairs) {
      if (x.summary.changes.length === 0) continue;
      await updateVersioned(tx, ctx, portEntity, x.target.id, x.target.version, x.next, { action: 'copy', summary: `Copied settings from ${x.source.label}` });
    }
    return { pairs: p.pairs.map((x) => x.summary), unmatched: p.unmatched, applied: true };
  });
}
