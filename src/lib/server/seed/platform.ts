import { eq } from 'drizzle-orm';
import { db } from '../../../db/client';
import { membership, team, user } from '../../../db/schema';
import { createConfirmedUser } from '../auth';
import type { Role } from '../../permissions';

/** Shared password of every demo account (documented in the README; demo data only). */
export const DEMO_PASSWORD = 'baudbook-demo';
export const DEMO_TEAM_ID = 'team_demo_fernhollow';
export const DEMO_CUSTOMER_TEAM_ID = 'team_demo_brackwater';

/** One demo account per role in the invented integrator team "Fernhollow Integration". */
export const DEMO_ACCOUNTS: { email: string; name: string; role: Role }[] = [
  { email: 'owner@fernhollow.test', name: 'Maren Okafor', role: 'owner' },
  { email: 'admin@fernhollow.test', name: 'Tobias Lind', role: 'admin' },
  { email: 'engineer@fernhollow.test', name: 'Priya Castell', role: 'engineer' },
  { email: 'technician@fernhollow.test', name: 'Jonas Weir', role: 'technician' },
  { email: 'viewer@fernhollow.test', name: 'Ilse Dunmore', role: 'viewer' },
];

async function ensureUser(email: string, name: string): Promise<string> {
  const [existing] = await db.select({ id: user.id }).from(user).where(eq(user.email, email));
  if (existing) return existing.id;
  return createConfirmedUser(email, name, DEMO_PASSWORD);
}

export async function seedPlatform(): Promise<Record<Role, string>> {
  await db.insert(team).values({ id: DEMO_TEAM_ID, name: 'Fernhollow Integration' }).onConflictDoNothing();
  await db.insert(team).values({ id: DEMO_CUSTOMER_TEAM_ID, name: 'Brackwater Creamery Maintenance' }).onConflictDoNothing();
  const ids = {} as Record<Role, string>;
  for (const account of DEMO_ACCOUNTS) {
    const id = await ensureUser(account.email, account.name);
    ids[account.role] = id;
    await db.insert(membership).values({ teamId: DEMO_TEAM_ID, userId: id, role: account.role }).onConflictDoNothing();
  }
  // The owner also belongs to the customer's maintenance team, so the team switcher has something to switch.
  await db.insert(membership).values({ teamId: DEMO_CUSTOMER_TEAM_ID, userId: ids.owner, role: 'owner' }).onConflictDoNothing();
  return ids;
}
