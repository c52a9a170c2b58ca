import { config } from '../../config';
import { ensureDatabase } from '../../db/migrate';
import { startOrphanSweep } from './field/orphan-sweep';
import { sweepAbandoned } from './jobs/jobs';

let ready: Promise<void> | null = null;

/**
 * Migrates the database, clears the staged rows of interrupted jobs and, when SEED_DEMO is on, seeds the invented
 * demo scenario (idempotent); then starts the background sweep of stored files left without an attachment record.
 */
export function startup(): Promise<void> {
  ready ??= (async () => {
    await ensureDatabase({ checkpointer: true });
    await sweepAbandoned();
    if (config.seedDemo) {
      const { seedDemo } = await import('./seed');
      await seedDemo();
    }
    startOrphanSweep();
  })().catch((err) => {
    ready = null;
    throw err;
  });
  return ready;
}
