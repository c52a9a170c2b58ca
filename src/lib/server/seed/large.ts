/**
 * A large team for benchmarks and scale checks: by default 10,000 devices (20 sites × 10 machines × 50 devices),
 * each device with one or two ports; `devices` asks for another count (sites of 500 devices, the last one partly
 * filled). Batched inserts in one transaction; skipped if the team exists.
 */
import { eq } from 'drizzle-orm';
import { db } from '../../../db/client';
import { device, machine, membership, port, site, team, user } from '../../../db/schema';
import { createConfirmedUser } from '../auth';
import { defaultPortSettings, type PortSettings } from '../../frame/port-settings';
import { DEVICE_ROLES } from '../../../db/schema';

export const LARGE_TEAM_ID = 'team_large_10k';
export const LARGE_EMAIL = 'large@baudbook.test';
export const LARGE_PASSWORD = 'baudbook-large-team';

const MAKERS = ['Quillmoor', 'Tallowby', 'Vellmar Systems', 'Orrinstall', 'Fenwray', 'Kestmoor', 'Brindlecott', 'Harlowe Motion'];
const BAUDS = [9600, 19200, 38400, 115200];
const PREFIX: Record<string, string> = { plc: 'PLC', drive: 'DRV', scale: 'SCL', reader: 'RDR', printer: 'PRN', sensor: 'TT', hmi: 'HMI', converter: 'CV', other: 'DEV' };

function chunk<T>(rows: T[], size: number): T[][] {
  const out: T[][] = [];
  for (let i = 0; i < rows.length; i += size) out.push(rows.slice(i, i + size));
  return out;
}

export async function seedLarge(opts: { sites?: number; machinesPerSite?: number; devicesPerMachine?: number; devices?: number } = {}) {
  const perSite = opts.machinesPerSite ?? 10;
  const perMachine = opts.devicesPerMachine ?? 50;
  if (opts.devices !== undefined && !(Number.isInteger(opts.devices) && opts.devices > 0)) throw new Error('devices: a whole number above 0');
  const sites = opts.devices !== undefined ? Math.ceil(opts.devices / (perSite * perMachine)) : (opts.sites ?? 20);
  const limit = opts.devices ?? sites * perSite * perMachine;
  const [existing] = await db.select({ id: team.id }).from(team).where(eq(team.id, LARGE_TEAM_ID));
  if (existing) return { teamId: LARGE_TEAM_ID, email: LARGE_EMAIL, password: LARGE_PASSWORD, created: false, devices: 0 };

  const [known] = await db.select({ id: user.id }).from(user).where(eq(user.email, LARGE_EMAIL));
  const userId = known?.id ?? (await createConfirmedUser(LARGE_EMAIL, 'Scale Tester', LARGE_PASSWORD));

  const siteRows: (typeof site.$inferInsert)[] = [];
  const machineRows: (typeof machine.$inferInsert)[] = [];
  const deviceRows: (typeof device.$inferInsert)[] = [];
  const portRows: (typeof port.$inferInsert)[] = [];
  let n = 0;
  for (let s = 0; s < sites; s++) {
    const siteId = `site_large_${s}`;
    siteRows.push({ id: siteId, teamId: LARGE_TEAM_ID, name: `Plant ${s + 1} Northfold`, customer: `Customer ${(s % 7) + 1}`, updatedBy: userId });
    for (let m = 0; m < perSite; m++) {
      const machineId = `mach_large_${s}_${m}`;
      machineRows.push({ id: machineId, teamId: LARGE_TEAM_ID, siteId, name: `Line ${m + 1} of plant ${s + 1}`, code: `L${m + 1}`, updatedBy: userId });
      for (let d = 0; d < perMachine && n < limit; d++, n++) {
        const role = DEVICE_ROLES[n % DEVICE_ROLES.length]!;
        const id = `dev_large_${n}`;
        deviceRows.push({
          id, teamId: LARGE_TEAM_ID, machineId, tag: `${PREFIX[role]}-${String(n).padStart(5, '0')}`, name: `${role} ${d + 1}`, role,
          maker: MAKERS[n % MAKERS.length]!, model: `M-${(n % 40) + 10}`, serialNumber: `SN${(1_000_000 + n * 7919) % 9_999_999}`,
          location: `Cabinet ${(d % 5) + 1}`, updatedBy: userId,
        });
        const settings: PortSettings = { ...defaultPortSettings, baud: BAUDS[n % BAUDS.length]!, interface: n % 3 ? 'rs485-2w' : 'rs232', rs485Direction: n % 3 ? 'auto' : 'none', nodeAddress: n % 3 ? (d % 247) + 1 : null };
        portRows.push({ id: `port_large_${n}_0`, teamId: LARGE_TEAM_ID, deviceId: id, name: 'COM1', position: 0, settings, wiring: [], updatedBy: userId });
        if (n % 4 === 0) portRows.push({ id: `port_large_${n}_1`, teamId: LARGE_TEAM_ID, deviceId: id, name: 'Service', position: 1, settings: defaultPortSettings, wiring: [], updatedBy: userId });
      }
    }
  }
  await db.transaction(async (tx) => {
    await tx.insert(team).values({ id: LARGE_TEAM_ID, name: 'Northfold Scale Test' });
    await tx.insert(membership).values({ teamId: LARGE_TEAM_ID, userId, role: 'owner' });
    for (const rows of chunk(siteRows, 200)) await tx.insert(site).values(rows);
    for (const rows of chunk(machineRows, 200)) await tx.insert(machine).values(rows);
    for (const rows of chunk(deviceRows, 400)) await tx.insert(device).values(rows);
    for (const rows of chunk(portRows, 400)) await tx.insert(port).values(rows);
  });
  return { teamId: LARGE_TEAM_ID, email: LARGE_EMAIL, password: LARGE_PASSWORD, created: true, devices: deviceRows.length };
}
