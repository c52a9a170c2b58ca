import type { TestProject } from 'vitest/node';
import { startServer, type RunningServer } from '../../helpers/server';

let server: RunningServer | null = null;

export async function setup(project: TestProject) {
  server = await startServer({ SEED_DEMO: '1' });
  project.provide('baseUrl', server.baseUrl);
  project.provide('databaseUrl', server.databaseUrl);
}

export async function teardown() {
  await server?.stop();
}
