import { seedPlatform } from './platform';
import { seedVault } from './vault';

/** Seeds the invented demo scenario; safe to run on every start (nothing is duplicated). */
export async function seedDemo(): Promise<void> {
  const ids = await seedPlatform();
  await seedVault(ids);
  await (await import('./commands')).seedCommands(ids);
  await (await import('./field')).seedFieldWork(ids);
}
