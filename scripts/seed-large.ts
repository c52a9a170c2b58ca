/**
 * `npm run seed:large [-- --devices N]`: a large team (10,000 devices unless `--devices` says otherwise) in
 * DATABASE_URL (default file:./data/baudbook.db).
 */
import { parseArgs } from 'node:util';
import { ensureDatabase } from '../src/db/migrate';
import { seedLarge } from '../src/lib/server/seed/large';

const { values } = parseArgs({ options: { devices: { type: 'string' } } });
const devices = values.devices === undefined ? undefined : Number(values.devices.replaceAll('_', ''));
if (devices !== undefined && !(Number.isInteger(devices) && devices > 0 && devices <= 1_000_000)) {
  console.error(`--devices: a whole number from 1 to 1,000,000 (got "${values.devices}")`);
  process.exit(2);
}

const started = Date.now();
await ensureDatabase();
const result = await seedLarge({ devices });
console.log(
  result.created
    ? `Created team ${result.teamId} with ${result.devices} devices in ${((Date.now() - started) / 1000).toFixed(1)} s.`
    : `Team ${result.teamId} already exists; nothing added.`,
);
console.log(`Sign in as ${result.email} / ${result.password}`);
