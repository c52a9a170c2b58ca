import { ensureDatabase } from '../../db/migrate';

let ready: Promise<void> | null = null;

/** Migrates the database and, when SEED_DEMO=1, seeds the invented demo scenario (idempotent). */
export function startup(): Promise<void> {
  ready ??= (async () => {
    await ensureDatabase();
    if (process.env.SEED_DEMO === '1') {
      const { seedDemo } = await import('./seed');
      await seedDemo();
    }
  })().catch((err) => {
    ready = null;
    throw err;
  });
  return ready;
}
