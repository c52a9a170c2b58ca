// Applies pending migrations to DATABASE_URL (the server also does this on start).
import { ensureDatabase } from '../src/db/migrate';

await ensureDatabase();
console.log('Database is up to date.');
