/** Field log: entries of each kind, validation, photos claimed by an entry, append-only annotations, no edits. */
import { beforeAll, describe, expect, it } from 'vitest';
import { createTeamWithRoles, type TeamFixture } from '../helpers/client';
import { expectOk, makeDevice } from './vault-fixtures';
import { download, logEntry, PNG_BYTES, upload } from './field-fixtures';

let team: TeamFixture;
let other: TeamFixture;
beforeAll(async () => {
  [team, other] = await Promise.all([createTeamWithRoles('flog'), createTeamWithRoles('flog-other')]);
}, 60_000);

describe('field log', () => {
  it('records a replacement with a photo, a verification and a finding, newest first', async () => {
    const tech = team.members.technician;
    const d = await makeDevice(team.members.engineer);
    const photo = await upload(tech, { ownerType: 'device', ownerId: d.id, kind: 'photo' }, PNG_BYTES, 'new-unit.png', 'image/png');
    expect(photo.status, JSON.stringify(photo.body)).toBe(201);
    const rep = await logEntry(tech, d.id, { kind: 'replacement', newSerialNumber: 'QX-99120', appliedVersion: 1, note: 'Swapped after fault', photoIds: [photo.body.id] });
    expect(rep).toMatchObject({ kind: 'replacement', newSerialNumber: 'QX-99120', appliedVersion: 1, userName: tech.user!.name });
    expect(rep.photos.map((p: { id: string }) => p.id)).toEqual([photo.body.id]);
    await logEntry(tech, d.id, { kind: 'verified', note: 'Polled 50 times without error' });
    await logEntry(tech, d.id, { kind: 'found-different', foundSettings: '19200 8-E-1, address 4' });
    const list = expectOk(await team.members.viewer.get(`/api/devices/${d.id}/field-log`));
    expect(list.items.map((e: { kind: string }) => e.kind)).toEqual(['found-different', 'verified', 'replacement']);
  });

  it('refuses incomplete entries with a message per field and writes nothing', async () => {
    const tech = team.members.technician;
    const d = await makeDevice(team.members.engineer);
    const noSerial = await tech.post(`/api/devices/${d.id}/field-log`, { kind: 'replacement', appliedVersion: 1 });
    expect(noSerial.status).toBe(422);
    expect(noSerial.body.fields.newSerialNumber).toBeTruthy();
    const future = await tech.post(`/api/devices/${d.id}/field-log`, { kind: 'replacement', newSerialNumber: 'X1', appliedVersion: 999 });
    expect(future.status).toBe(422);
    expect(future.body.fields.appliedVersion).toMatch(/revision/);
    const unknown = await tech.post(`/api/devices/${d.id}/field-log`, { kind: 'verified', rating: 5 });
    expect(unknown.status).toBe(422);
    const foreignPhoto = await upload(other.members.owner, { ownerType: 'device', ownerId: (await makeDevice(other.members.owner)).id, kind: 'photo' }, PNG_BYTES, 'x.png');
    const stolen = await tech.post(`/api/devices/${d.id}/field-log`, { kind: 'verified', photoIds: [foreignPhoto.body.id] });
    expect(stolen.status).toBe(422);
    expect(expectOk(await tech.get(`/api/devices/${d.id}/field-log`)).items).toEqual([]);
  });

  it('a "communication verified" entry claims the live link exchange log (a configuration file of the device) and lists it among its files', async () => {
    const tech = team.members.technician;
    const d = await makeDevice(team.members.engineer);
    const exchangeLog = new TextEncoder().encode('Live link exchange log\n     0.000  TX   31 3F 53 54 41 2A 34 38 0D\n');
    const file = await upload(tech, { ownerType: 'device', ownerId: d.id, kind: 'config', name: 'live-link.txt' }, exchangeLog, 'live-link.txt', 'text/plain');
    expect(file.status, JSON.stringify(file.body)).toBe(201);
    const photo = await upload(tech, { ownerType: 'device', ownerId: d.id, kind: 'photo' }, PNG_BYTES, 'p.png');
    // A photo is not an exchange log, and an exchange log belongs to a verification only.
    expect((await tech.post(`/api/devices/${d.id}/field-log`, { kind: 'verified', exchangeLogId: photo.body.id })).status).toBe(422);
    expect((await tech.post(`/api/devices/${d.id}/field-log`, { kind: 'found-different', foundSettings: 'x', exchangeLogId: file.body.id })).status).toBe(422);
    const entry = await logEntry(tech, d.id, { kind: 'verified', note: 'Status query answered', exchangeLogId: file.body.id });
    expect(entry.files.map((f: { id: string }) => f.id)).toEqual([file.body.id]);
    expect(entry.photos).toEqual([]);
    expect((await tech.post(`/api/devices/${d.id}/field-log`, { kind: 'verified', exchangeLogId: file.body.id })).status).toBe(422);
    const got = await download(tech, file.body.url);
    expect(got.status).toBe(200);
    expect(got.headers.get('content-disposition')).toMatch(/attachment; filename="live-link.txt"/);
    expect(new TextDecoder().decode(got.bytes)).toBe(new TextDecoder().decode(exchangeLog));
    expect((await team.members.owner.del(`/api/attachments/${file.body.id}`)).status).toBe(409);
  });

  it('cannot be changed or removed, only annotated', async () => {
    const tech = team.members.technician;
    const d = await makeDevice(team.members.engineer);
    const photo = await upload(tech, { ownerType: 'device', ownerId: d.id, kind: 'photo' }, PNG_BYTES, 'cabinet.png');
    const entry = await logEntry(tech, d.id, { kind: 'verified', note: 'Original note', photoIds: [photo.body.id] });
    const owner = team.members.owner;
    for (const [method, path] of [
      ['PATCH', `/api/devices/${d.id}/field-log`], ['DELETE', `/api/devices/${d.id}/field-log`], ['PUT', `/api/devices/${d.id}/field-log`],
      ['PATCH', `/api/field-log/${entry.id}`], ['DELETE', `/api/field-log/${entry.id}`],
      ['PATCH', `/api/field-log/${entry.id}/annotations`], ['DELETE', `/api/field-log/${entry.id}/annotations`],
    ] as const) {
      const res = await owner.request(method, path, method === 'DELETE' ? undefined : { note: 'Rewritten' });
      expect([404, 405], `${method} ${path}`).toContain(res.status);
    }
    const delPhoto = await owner.del(`/api/attachments/${photo.body.id}`);
    expect(delPhoto.status).toBe(409);
    const ann = expectOk(await tech.post(`/api/field-log/${entry.id}/annotations`, { note: 'Serial plate was unreadable' }), 201);
    expect(ann.note).toBe('Serial plate was unreadable');
    expect((await tech.post(`/api/field-log/${entry.id}/annotations`, { note: '' })).status).toBe(422);
    const [after] = expectOk(await tech.get(`/api/devices/${d.id}/field-log`)).items;
    expect(after.note).toBe('Original note');
    expect(after.photos).toHaveLength(1);
    expect(after.annotations.map((a: { note: string }) => a.note)).toEqual(['Serial plate was unreadable']);
  });

  it("answers 404 for another team's device or entry", async () => {
    const d = await makeDevice(other.members.owner);
    const e = await logEntry(other.members.owner, d.id);
    expect((await team.members.owner.get(`/api/devices/${d.id}/field-log`)).status).toBe(404);
    expect((await team.members.owner.post(`/api/field-log/${e.id}/annotations`, { note: 'x' })).status).toBe(404);
  });

  it('shows entries on the field card, the log page and in the device timeline', async () => {
    const d = await makeDevice(team.members.engineer);
    await logEntry(team.members.technician, d.id, { kind: 'found-different', foundSettings: 'Parity odd on site' });
    const page = await team.members.viewer.get(`/field/devices/${d.id}/log`);
    expect(page.status).toBe(200);
    expect(page.body).toContain('Parity odd on site');
    expect(page.body).toContain('data-source="field-log"');
    expect(page.body).toContain('data-source="revision"');
  });
});
