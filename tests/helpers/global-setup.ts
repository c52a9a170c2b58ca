import type { TestProject } from 'vitest/node';
import { startServer, type RunningServer } from './server';

let server: RunningServer | null = null;

export async function setup(project: TestProject) {
  server = await startServer();
  project.provide('baseUrl', server.baseUrl);
  project.provide('databaseUrl', server.databaseUrl);
}

export async function teardown() {
  await server?.stop();
}

declare module 'vitest' {
  export interface ProvidedContext {
    baseUrl: string;
    databaseUrl: string;
  }
}
