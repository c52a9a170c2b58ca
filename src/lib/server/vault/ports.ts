/** Ports of a device: settings (the frame engine's PortSettings), wiring rows and notes. */
import { and, eq, isNull, sql } from 'drizzle-orm';
import type { z } from 'zod';
import { db, type DbOrTx } from '../../../db/client';
import { port } from '../../../db/schema';
import type { TeamContext } from '../guard';
import type { portCreateSchema, portUpdateSchema } from '../../schemas/vault';
import { findLive, updateVersioned } from './records';
import { deviceEntity, portEntity } from '../records/entities';
import { insertPorts, livePorts, uniqueName } from './devices';
import { presentPort, type PortView } from './present';
import { definedOnly } from '../records/diff';

export async function listPorts(ctx: TeamContext, deviceId: string): Promise<PortView[]> {
  await findLive(db, ctx, deviceEntity, deviceId);
  return (await livePorts(db, deviceId)).map(presentPort);
}

export async function getPort(ctx: TeamContext, id: string, q: DbOrTx = db): Promise<PortView & { deviceTag: string }> {
  const row = await findLive(q, ctx, portEntity, id);
  const dev = await findLive(q, ctx, deviceEntity, row.deviceId);
  return { ...presentPort(row), deviceTag: dev.tag };
}

export async function createPort(ctx: TeamContext, input: z.infer<typeof portCreateSchema>): Promise<PortView> {
  const { deviceId, ...fields } = input;
  return db.transaction(async (tx) => {
    await findLive(tx, ctx, deviceEntity, deviceId);
    const [last] = await tx
      .select({ n: sql<number>`coalesce(max(${port.position}) + 1, 0)` })
      .from(port)
      .where(and(eq(port.deviceId, deviceId), isNull(port.deletedAt)));
    const [row] = await insertPorts(tx, ctx, deviceId, [fields], Number(last?.n ?? 0), () => 'name');
    return presentPort(row!);
  });
}

export async function updatePort(ctx: TeamContext, id: string, input: z.infer<typeof portUpdateSchema>): Promise<PortView> {
  const { version, ...values } = input;
  return db.transaction(async (tx) => {
    try {
      const { row } = await updateVersioned(tx, ctx, portEntity, id, version, definedOnly(values), { present: (r) => presentPort(r) });
      return presentPort(row);
    } catch (err) {
      throw uniqueName(err, 'name');
    }
  });
}
