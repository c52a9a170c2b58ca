import { seedPlatform } from './platform';

/** Seeds the invented demo scenario; safe to run on every start (nothing is duplicated). */
export async function seedDemo(): Promise<void> {
  await seedPlatform();
}
