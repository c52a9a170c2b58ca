/**
 * Demo field work: the technician's log entry for the drive swapped on churn line 2 (DRV-203), whose replacement
 * waits for an engineer's review, so the vault home, the device page and the field card show a pending proposal.
 * Fixed ids: safe to run on every start (a decided proposal is left as it is).
 */
import { eq } from 'drizzle-orm';
import { db } from '../../../db/client';
import { device, fieldLogEntry, fieldProposal } from '../../../db/schema';
import type { Role } from '../../permissions';
import { cardRevision } from '../field/cards';
import { DEMO_ACCOUNTS, DEMO_TEAM_ID } from './platform';

const DEVICE_ID = 'dev_demo_drv203';
export const DEMO_PROPOSAL_ID = 'prop_demo_drv203_swap';

export async function seedFieldWork(ids: Record<Role, string>): Promise<void> {
  const [dev] = await db.select().from(device).where(eq(device.id, DEVICE_ID));
  if (!dev) return;
  const at = new Date('2026-11-24T09:40:00Z');
  const rev = await cardRevision({ team: { id: DEMO_TEAM_ID } }, DEVICE_ID);
  await db.insert(fieldLogEntry).values({
    id: 'flog_demo_drv203_swap', teamId: DEMO_TEAM_ID, deviceId: DEVICE_ID, kind: 'replacement',
    note: 'Old unit tripped on a fault at every start. Fitted the spare from stores and loaded the settings from the card.',
    newSerialNumber: 'QD40-81377', appliedVersion: Math.max(rev.number, 1), deviceVersion: Math.max(rev.number, 1),
    userId: ids.technician, userName: DEMO_ACCOUNTS.find((a) => a.role === 'technician')!.name, createdAt: at,
  }).onConflictDoNothing();
  await db.insert(fieldProposal).values({
    id: DEMO_PROPOSAL_ID, teamId: DEMO_TEAM_ID, deviceId: DEVICE_ID, entryId: 'flog_demo_drv203_swap', kind: 'replacement',
    serialNumber: 'QD40-81377', recordSerialNumber: dev.serialNumber, recordFirmware: dev.firmware, recordVersion: dev.version, createdAt: at,
  }).onConflictDoNothing();
}
