/** `npm run seed:large`: a 10,000-device team in DATABASE_URL (default file:./data/baudbook.db). */
import { ensureDatabase } from '../src/db/migrate';
import { seedLarge } from '../src/lib/server/seed/large';

const started = Date.now();
await ensureDatabase();
const result = await seedLarge();
console.log(
  result.created
    ? `Created team ${result.teamId} with ${result.devices} devices in ${((Date.now() - started) / 1000).toFixed(1)} s.`
    : `Team ${result.teamId} already exists; nothing added.`,
);
console.log(`Sign in as ${result.email} / ${result.password}`);
