#!/usr/bin/env node
// Quick start: build the app, then serve it on http://localhost:4321 with the demo data seeded.
// The server migrates the database on start; SEED_DEMO=1 seeds the invented demo scenario (idempotent).
// It listens on 127.0.0.1 unless HOST is set or BASE_URL names an address other machines use (server/serve.mjs).
import { spawn, spawnSync } from 'node:child_process';

const env = { ...process.env, SEED_DEMO: process.env.SEED_DEMO ?? '1', PORT: process.env.PORT ?? '4321' };

if (!process.argv.includes('--no-build')) {
  const build = spawnSync('node_modules/.bin/astro', ['build'], { stdio: 'inherit', env });
  if (build.status !== 0) process.exit(build.status ?? 1);
}

console.log(`\nBaudbook: http://localhost:${env.PORT}  (demo accounts: see README)\n`);
const server = spawn(process.execPath, ['server/serve.mjs'], { stdio: 'inherit', env });
for (const signal of ['SIGINT', 'SIGTERM']) process.on(signal, () => server.kill(signal));
server.on('exit', (code) => process.exit(code ?? 0));
