import type { TestProject } from 'vitest/node';
import { startServer, type RunningServer } from '../../helpers/server';

let server: RunningServer | null = null;

export async function setup(project: TestProject) {
  // Every browser signs in from 127.0.0.1; the sign-in limit itself is tested in tests/integration.
  // No trusted proxy: the browsers are the people at this machine, so the local outbox is theirs to read.
  server = await startServer({ SEED_DEMO: '1', SIGN_IN_MAX_ATTEMPTS: '1000', TRUST_PROXY: '' });
  project.provide('baseUrl', server.baseUrl);
  project.provide('databaseUrl', server.databaseUrl);
}

export async function teardown() {
  await server?.stop();
}
