/**
 * Attachments through both storage backends: the default local folder (shared test server) and an
 * S3-compatible bucket (s3rver on loopback, with a second app server pointed at it).
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { GetObjectCommand, S3Client } from '@aws-sdk/client-s3';
import { createClient } from '@libsql/client';
// @ts-expect-error s3rver ships no types
import S3rver from 's3rver';
import { createTeamWithRoles, TestClient, type TeamFixture } from '../helpers/client';
import { freePort, startServer, type RunningServer } from '../helpers/server';
import { expectOk, makeDevice, makeMachine } from './vault-fixtures';
import { download, PDF_BYTES, PNG_BYTES, upload } from './field-fixtures';

const BUCKET = 'baudbook-test';
const MAX = 4096;
let s3: { close(): Promise<void> };
let s3Dir: string;
let s3Port: number;
let app: RunningServer;
let s3Client: S3Client;

async function ownerOn(baseUrl: string, label: string) {
  const c = await new TestClient(baseUrl).signUp(label);
  expectOk(await c.post('/api/teams', { name: `${label} ${Date.now()}` }), 201);
  return c;
}

beforeAll(async () => {
  s3Dir = mkdtempSync(join(tmpdir(), 'baudbook-s3-'));
  s3Port = await freePort();
  s3 = new S3rver({ port: s3Port, address: '127.0.0.1', silent: true, directory: s3Dir, configureBuckets: [{ name: BUCKET }] });
  await (s3 as unknown as { run(): Promise<unknown> }).run();
  const endpoint = `http://127.0.0.1:${s3Port}`;
  app = await startServer({
    S3_BUCKET: BUCKET, S3_ENDPOINT: endpoint, S3_REGION: 'us-east-1', S3_ACCESS_KEY_ID: 'S3RVER', S3_SECRET_ACCESS_KEY: 'S3RVER', S3_FORCE_PATH_STYLE: 'true',
    UPLOAD_MAX_BYTES: String(MAX),
  });
  s3Client = new S3Client({ endpoint, region: 'us-east-1', forcePathStyle: true, credentials: { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' } });
}, 60_000);

afterAll(async () => {
  await app?.stop();
  await s3?.close();
  rmSync(s3Dir, { recursive: true, force: true });
});

async function objectExists(key: string): Promise<boolean> {
  try {
    await s3Client.send(new GetObjectCommand({ Bucket: BUCKET, Key: key }));
    return true;
  } catch {
    return false;
  }
}

describe('attachments in an S3 bucket', () => {
  it('puts, gets and deletes the object; refuses size, type and other teams', async () => {
    const owner = await ownerOn(app.baseUrl, 's3-owner');
    const stranger = await ownerOn(app.baseUrl, 's3-stranger');
    const d = await makeDevice(owner);
    const put = await upload(owner, { ownerType: 'device', ownerId: d.id, kind: 'photo' }, PNG_BYTES, '../../etc/cabinet photo?.png', 'image/png');
    expect(put.status, JSON.stringify(put.body)).toBe(201);
    expect(put.body.fileName).toBe('cabinet photo_.png');
    const db = createClient({ url: app.databaseUrl });
    const key = String((await db.execute({ sql: 'SELECT storage_key FROM attachment WHERE id = ?', args: [put.body.id] })).rows[0]!.storage_key);
    db.close();
    expect(await objectExists(key)).toBe(true);

    const got = await download(owner, put.body.url);
    expect(got.status).toBe(200);
    expect(got.headers.get('content-type')).toBe('image/png');
    expect(got.headers.get('content-disposition')).toMatch(/^inline/);
    expect(Buffer.from(got.bytes).equals(Buffer.from(PNG_BYTES))).toBe(true);

    expect((await download(stranger, put.body.url)).status).toBe(404);
    expect((await stranger.del(put.body.url)).status).toBe(404);
    expect((await upload(stranger, { ownerType: 'device', ownerId: d.id, kind: 'config' }, PNG_BYTES, 'x.bin')).status).toBe(404);

    const big = await upload(owner, { ownerType: 'device', ownerId: d.id, kind: 'config' }, new Uint8Array(MAX + 1), 'big.bin');
    expect(big.status).toBe(413);
    const fakePdf = await upload(owner, { ownerType: 'device', ownerId: d.id, kind: 'manual' }, new TextEncoder().encode('<html>not a manual</html>'), 'manual.pdf', 'application/pdf');
    expect(fakePdf.status).toBe(415);
    expect(fakePdf.body.error).toMatch(/not a PDF/);
    const list = expectOk(await owner.get(`/api/attachments?ownerType=device&ownerId=${d.id}`));
    expect(list.items.map((i: { id: string }) => i.id)).toEqual([put.body.id]);
    expect(list.maxBytes).toBe(MAX);

    expectOk(await owner.del(put.body.url));
    expect(await objectExists(key)).toBe(false);
    expect((await download(owner, put.body.url)).status).toBe(404);
  });
});

describe('purging from the trash', () => {
  it('removes the attachments of everything purged, rows and stored bytes', async () => {
    const owner = await ownerOn(app.baseUrl, 's3-purge');
    const d = await makeDevice(owner);
    const onDevice = await upload(owner, { ownerType: 'device', ownerId: d.id, kind: 'photo' }, PNG_BYTES, 'cabinet.png', 'image/png');
    const onMachine = await upload(owner, { ownerType: 'machine', ownerId: d.machineId, kind: 'manual' }, PDF_BYTES, 'line.pdf', 'application/pdf');
    expect(onDevice.status).toBe(201);
    expect(onMachine.status).toBe(201);
    const db = createClient({ url: app.databaseUrl });
    const keysOf = async () =>
      (await db.execute({ sql: 'SELECT storage_key FROM attachment WHERE id IN (?, ?)', args: [onDevice.body.id, onMachine.body.id] })).rows.map((r) => String(r.storage_key));
    const keys = await keysOf();
    expect(keys).toHaveLength(2);
    for (const key of keys) expect(await objectExists(key)).toBe(true);

    expectOk(await owner.del(`/api/sites/${d.siteId}`));
    // In the trash, nothing is removed yet.
    for (const key of keys) expect(await objectExists(key)).toBe(true);
    expectOk(await owner.del(`/api/trash/site/${d.siteId}`));
    expect(await keysOf()).toEqual([]);
    for (const key of keys) expect(await objectExists(key)).toBe(false);
    db.close();
  });
});

describe('attachments in the local folder', () => {
  let team: TeamFixture;
  beforeAll(async () => {
    team = await createTeamWithRoles('files');
  }, 60_000);

  it('serves PDFs inline and configuration files only as downloads, never sniffed', async () => {
    const tech = team.members.technician;
    const m = await makeMachine(team.members.engineer);
    const pdf = await upload(tech, { ownerType: 'machine', ownerId: m.id, kind: 'manual' }, PDF_BYTES, 'Drive manual.pdf', 'application/pdf');
    expect(pdf.status, JSON.stringify(pdf.body)).toBe(201);
    const gotPdf = await download(team.members.viewer, pdf.body.url);
    expect(gotPdf.headers.get('content-type')).toBe('application/pdf');
    expect(gotPdf.headers.get('content-disposition')).toMatch(/^inline/);
    const html = new TextEncoder().encode('<script>alert(1)</script>');
    const cfg = await upload(tech, { ownerType: 'machine', ownerId: m.id, kind: 'config', name: 'panel.html' }, html, 'panel.html', 'text/html');
    expect(cfg.status).toBe(201);
    const gotCfg = await download(team.members.viewer, cfg.body.url);
    expect(gotCfg.headers.get('content-type')).toBe('application/octet-stream');
    expect(gotCfg.headers.get('content-disposition')).toMatch(/^attachment; filename="panel.html"/);
    expect(gotCfg.headers.get('x-content-type-options')).toBe('nosniff');
    const photoAsPng = await upload(tech, { ownerType: 'machine', ownerId: m.id, kind: 'photo' }, PDF_BYTES, 'photo.png', 'image/png');
    expect(photoAsPng.status).toBe(415);
  });

  it('checks role and input before storing anything', async () => {
    const d = await makeDevice(team.members.engineer);
    expect((await upload(team.members.viewer, { ownerType: 'device', ownerId: d.id, kind: 'config' }, PDF_BYTES, 'a.cfg')).status).toBe(403);
    expect((await upload(team.members.technician, { ownerType: 'robot', ownerId: d.id, kind: 'config' }, PDF_BYTES, 'a.cfg')).status).toBe(422);
    expect((await upload(team.members.technician, { ownerType: 'device', ownerId: d.id, kind: 'config' }, new Uint8Array(0), 'empty.cfg')).status).toBe(422);
    const cfg = await upload(team.members.technician, { ownerType: 'device', ownerId: d.id, kind: 'config' }, PDF_BYTES, 'a.cfg');
    expect((await team.members.technician.del(cfg.body.url)).status).toBe(403);
    expect(expectOk(await team.members.viewer.get(`/api/attachments?ownerType=device&ownerId=${d.id}`)).items).toHaveLength(1);
  });
});
