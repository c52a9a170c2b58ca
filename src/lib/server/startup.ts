import { ensureDatabase } from '../../db/migrate';
import { sweepAbandoned } from './jobs/jobs';

let ready: Promise<void> | null = null;

/** Migrates the database, clears the staged rows of interrupted jobs and, when SEED_DEMO=1, seeds the invented demo scenario (idempotent). */
export function startup(): Promise<void> {
  ready ??= (async () => {
    await ensureDatabase();
    await sweepAbandoned();
    if (process.env.SEED_DEMO === '1') {
      const { seedDemo } = await import('../../db/seed');
      await seedDemo();
    }
  })().catch((err) => {
    ready = null;
    throw err;
  });
  return ready;
}
