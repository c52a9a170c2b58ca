/**
 * Stored files that no attachment row names (a crash between storing the bytes and recording the row)
 * are swept at start and on a schedule, in the local folder and in an S3 bucket; files with a row,
 * files younger than the grace period and files that are not attachments stay.
 */
import { existsSync, mkdirSync, mkdtempSync, rmSync, utimesSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { GetObjectCommand, PutObjectCommand, S3Client } from '@aws-sdk/client-s3';
import { createClient } from '@libsql/client';
// @ts-expect-error s3rver ships no types
import S3rver from 's3rver';
import { TestClient } from '../helpers/client';
import { freePort, startServer, type RunningServer } from '../helpers/server';
import { expectOk, makeDevice } from './vault-fixtures';
import { download, PNG_BYTES, upload } from './field-fixtures';

const cleanup: (() => Promise<void> | void)[] = [];
afterAll(async () => {
  for (const f of cleanup.reverse()) await f();
});

async function serve(env: Record<string, string>): Promise<RunningServer> {
  const app = await startServer(env);
  cleanup.push(() => app.stop());
  return app;
}

/** A signed-in owner of a new team with one device, and a photo uploaded to it; the photo's storage key. */
async function teamWithPhoto(app: RunningServer, label: string, databaseUrl = app.databaseUrl) {
  const owner = await new TestClient(app.baseUrl).signUp(label);
  const team = expectOk(await owner.post('/api/teams', { name: `${label} ${Date.now()}` }), 201);
  const d = await makeDevice(owner);
  const put = await upload(owner, { ownerType: 'device', ownerId: d.id, kind: 'photo' }, PNG_BYTES, 'cabinet.png', 'image/png');
  expect(put.status, JSON.stringify(put.body)).toBe(201);
  const db = createClient({ url: databaseUrl });
  const key = String((await db.execute({ sql: 'SELECT storage_key FROM attachment WHERE id = ?', args: [put.body.id] })).rows[0]!.storage_key);
  db.close();
  return { owner, teamId: team.id as string, url: put.body.url as string, key };
}

async function until(check: () => Promise<boolean> | boolean, ms = 10_000): Promise<boolean> {
  const deadline = Date.now() + ms;
  while (Date.now() < deadline) {
    if (await check()) return true;
    await new Promise((r) => setTimeout(r, 100));
  }
  return check();
}

describe('sweeping files left without a record', () => {
  it('in the local upload folder: at start and then on schedule, past the grace period only', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'baudbook-sweep-'));
    cleanup.push(() => rmSync(dir, { recursive: true, force: true }));
    const uploads = join(dir, 'uploads');
    const env = { DATABASE_URL: `file:${join(dir, 'app.db')}`, UPLOAD_DIR: uploads };

    const first = await serve(env);
    const { owner, teamId, url, key } = await teamWithPhoto(first, 'sweep-local', env.DATABASE_URL);
    await first.stop();

    const hoursAgo = (h: number) => new Date(Date.now() - h * 3_600_000);
    const place = (k: string, age: number | null) => {
      mkdirSync(join(uploads, k, '..'), { recursive: true });
      writeFileSync(join(uploads, k), 'left over');
      if (age !== null) utimesSync(join(uploads, k), hoursAgo(age), hoursAgo(age));
      return join(uploads, k);
    };
    const orphan = place(`${teamId}/att_crashedBeforeRow`, 2);
    const otherTeam = place('team_deletedTeam0000/att_gone', 30 * 24);
    const inFlight = place(`${teamId}/att_stillUploading`, null);
    const notOurs = place('README', 2);
    const kept = join(uploads, key);
    utimesSync(kept, hoursAgo(2), hoursAgo(2));

    const second = await serve({ ...env, UPLOAD_SWEEP_GRACE_SECONDS: '3600', UPLOAD_SWEEP_INTERVAL_SECONDS: '1' });
    expect(await until(() => !existsSync(orphan) && !existsSync(otherTeam))).toBe(true);
    expect(existsSync(kept)).toBe(true);
    expect(existsSync(inFlight)).toBe(true);
    expect(existsSync(notOurs)).toBe(true);

    const later = place(`${teamId}/att_crashedWhileRunning`, 2);
    expect(await until(() => !existsSync(later))).toBe(true);
    expect(existsSync(kept)).toBe(true);
    expect(existsSync(inFlight)).toBe(true);
    // The file with a row still downloads through the app (the session lives in the same database).
    const same = new TestClient(second.baseUrl);
    same.cookies = owner.cookies;
    expect((await download(same, url)).status).toBe(200);
  });

  it('in an S3 bucket', async () => {
    const s3Dir = mkdtempSync(join(tmpdir(), 'baudbook-s3-sweep-'));
    const s3Port = await freePort();
    const bucket = 'baudbook-sweep';
    const s3 = new S3rver({ port: s3Port, address: '127.0.0.1', silent: true, directory: s3Dir, configureBuckets: [{ name: bucket }] });
    await (s3 as { run(): Promise<unknown> }).run();
    cleanup.push(async () => {
      await (s3 as { close(): Promise<void> }).close();
      rmSync(s3Dir, { recursive: true, force: true });
    });
    const endpoint = `http://127.0.0.1:${s3Port}`;
    const client = new S3Client({ endpoint, region: 'us-east-1', forcePathStyle: true, credentials: { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' } });
    const exists = async (k: string) => client.send(new GetObjectCommand({ Bucket: bucket, Key: k })).then(() => true, () => false);
    const app = await serve({
      S3_BUCKET: bucket, S3_ENDPOINT: endpoint, S3_REGION: 'us-east-1', S3_ACCESS_KEY_ID: 'S3RVER', S3_SECRET_ACCESS_KEY: 'S3RVER', S3_FORCE_PATH_STYLE: 'true',
      UPLOAD_SWEEP_GRACE_SECONDS: '2', UPLOAD_SWEEP_INTERVAL_SECONDS: '1',
    });
    const { owner, teamId, url, key } = await teamWithPhoto(app, 'sweep-s3');
    const orphan = `${teamId}/att_crashedBeforeRow`;
    await client.send(new PutObjectCommand({ Bucket: bucket, Key: orphan, Body: 'left over' }));
    await client.send(new PutObjectCommand({ Bucket: bucket, Key: 'notes/readme', Body: 'not an attachment' }));
    expect(await exists(orphan)).toBe(true);
    expect(await until(async () => !(await exists(orphan)))).toBe(true);
    expect(await exists(key)).toBe(true);
    expect(await exists('notes/readme')).toBe(true);
    expect((await download(owner, url)).status).toBe(200);
  });
});
