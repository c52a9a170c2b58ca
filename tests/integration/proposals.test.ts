/** Field proposals: a replacement or finding on site reaches the record through an engineer's review. */
import { beforeAll, describe, expect, it } from 'vitest';
import { createTeamWithRoles, testDb, type TeamFixture } from '../helpers/client';
import { expectOk, makeDevice, uid } from './vault-fixtures';
import { logEntry, PNG_BYTES, upload } from './field-fixtures';

let team: TeamFixture;
let other: TeamFixture;
beforeAll(async () => {
  [team, other] = await Promise.all([createTeamWithRoles('prop'), createTeamWithRoles('prop-other')]);
}, 60_000);

/** Messages in the outbox to `email` whose subject names `tag`. */
async function mailsAbout(email: string, tag: string): Promise<{ subject: string; text: string }[]> {
  const db = testDb();
  try {
    const rs = await db.execute({ sql: 'SELECT subject, text FROM outbox_message WHERE "to" = ? AND subject LIKE ?', args: [email, `%${tag}%`] });
    return rs.rows.map((r) => ({ subject: String(r.subject), text: String(r.text) }));
  } finally {
    db.close();
  }
}

const search = async (q: string) => expectOk(await team.members.viewer.get(`/api/devices/search?q=${encodeURIComponent(q)}`)).items.map((d: { id: string }) => d.id);

describe('a replacement logged in the field', () => {
  it('waits for review on the device and the vault home, mails the reviewers, and once accepted changes the record', async () => {
    const u = uid();
    const tech = team.members.technician;
    const eng = team.members.engineer;
    const d = await makeDevice(eng, undefined, { serialNumber: `QS23-OLD${u}`, firmware: '2.1.7' });
    const photo = await upload(tech, { ownerType: 'device', ownerId: d.id, kind: 'photo' }, PNG_BYTES, 'plate.png', 'image/png');
    const entry = await logEntry(tech, d.id, { kind: 'replacement', newSerialNumber: `QS23-NEW${u}`, firmware: '2.2.0', appliedVersion: 1, note: 'Fault 31 on the old unit', photoIds: [photo.body.id] });
    expect(entry.proposal).toMatchObject({ status: 'pending', found: { serialNumber: `QS23-NEW${u}`, firmware: '2.2.0' }, atEntry: { serialNumber: `QS23-OLD${u}`, firmware: '2.1.7' } });

    const onDevice = expectOk(await team.members.viewer.get(`/api/proposals?deviceId=${d.id}`)).items;
    expect(onDevice.map((p: { entryId: string }) => p.entryId)).toEqual([entry.id]);
    const pending = expectOk(await tech.get('/api/proposals')).items;
    expect(pending.map((p: { id: string }) => p.id)).toContain(entry.proposal.id);

    const home = await team.members.viewer.get('/vault');
    expect(home.body).toContain('Waiting for review');
    expect(home.body).toContain(d.tag);
    const devicePage = await eng.get(`/vault/devices/${d.id}`);
    expect(devicePage.body).toContain(`QS23-NEW${u}`);
    const card = await tech.get(`/field/devices/${d.id}`);
    expect(card.body).toContain('Replacement pending review');

    for (const role of ['owner', 'admin', 'engineer'] as const) {
      const mails = await mailsAbout(team.members[role].user!.email, d.tag);
      expect(mails, role).toHaveLength(1);
      expect(mails[0]!.subject).toMatch(/^Waiting for review/);
      expect(mails[0]!.text).toContain(`QS23-OLD${u} → QS23-NEW${u}`);
      expect(mails[0]!.text).toContain(`/vault/devices/${d.id}`);
    }
    for (const role of ['technician', 'viewer'] as const) expect(await mailsAbout(team.members[role].user!.email, d.tag), role).toEqual([]);

    const accepted = expectOk(await eng.post(`/api/proposals/${entry.proposal.id}/accept`, { version: d.version }));
    expect(accepted).toMatchObject({ status: 'accepted', decision: { by: eng.user!.name, version: d.version + 1 } });
    const record = expectOk(await eng.get(`/api/devices/${d.id}`));
    expect(record).toMatchObject({ serialNumber: `QS23-NEW${u}`, firmware: '2.2.0', formerSerials: [`QS23-OLD${u}`], version: d.version + 1 });
    const history = expectOk(await eng.get(`/api/revisions?entityType=device&entityId=${d.id}`)).items;
    expect(history[0].summary).toContain(entry.id);
    expect(history[0].changes.map((c: { field: string }) => c.field).sort()).toEqual(['firmware', 'serialNumber']);

    expect(await search(`QS23-NEW${u}`)).toEqual([d.id]);
    expect(await search(`QS23-OLD${u}`)).toEqual([d.id]);
    const hit = expectOk(await team.members.viewer.get(`/api/devices/search?q=${encodeURIComponent(`OLD${u}`)}`)).items[0];
    expect(hit.matched).toContain('formerSerials');

    const [logged] = expectOk(await tech.get(`/api/devices/${d.id}/field-log`)).items;
    expect(logged.proposal).toMatchObject({ status: 'accepted', decision: { by: eng.user!.name } });
    expect(expectOk(await tech.get('/api/proposals')).items.map((p: { id: string }) => p.id)).not.toContain(entry.proposal.id);
    expect((await tech.get(`/field/devices/${d.id}`)).body).not.toContain('Replacement pending review');
  });

  it('declined with a note leaves the record and tells the technician', async () => {
    const d = await makeDevice(team.members.engineer, undefined, { serialNumber: 'KEEP-1' });
    const entry = await logEntry(team.members.technician, d.id, { kind: 'replacement', newSerialNumber: 'TYPO-1', appliedVersion: 1 });
    const declined = expectOk(await team.members.admin.post(`/api/proposals/${entry.proposal.id}/decline`, { note: 'That is the spare on the shelf; read the plate on the fitted unit.' }));
    expect(declined).toMatchObject({ status: 'declined', decision: { note: 'That is the spare on the shelf; read the plate on the fitted unit.' } });
    expect(expectOk(await team.members.engineer.get(`/api/devices/${d.id}`))).toMatchObject({ serialNumber: 'KEEP-1', version: d.version, formerSerials: [] });
    const [logged] = expectOk(await team.members.technician.get(`/api/devices/${d.id}/field-log`)).items;
    expect(logged.proposal).toMatchObject({ status: 'declined', decision: { note: 'That is the spare on the shelf; read the plate on the fitted unit.', by: team.members.admin.user!.name } });
    const again = await team.members.engineer.post(`/api/proposals/${entry.proposal.id}/accept`, { version: d.version });
    expect(again.status).toBe(409);
    expect(again.body.error).toMatch(/already declined/);
  });

  it('applies port settings found on site as a new revision of the named port', async () => {
    const eng = team.members.engineer;
    const d = await makeDevice(eng);
    const rs485 = d.ports.find((p: { name: string }) => p.name === 'RS-485');
    const entry = await logEntry(team.members.technician, d.id, {
      kind: 'found-different', foundSettings: '19200 8-E-1, address 4', firmware: '2.3.1',
      port: { portId: rs485.id, settings: { baud: 19200, nodeAddress: 4 } },
    });
    expect(entry.proposal.found.port).toMatchObject({ name: 'RS-485', settings: { baud: 19200, nodeAddress: 4 } });
    const noPortVersion = await eng.post(`/api/proposals/${entry.proposal.id}/accept`, { version: d.version });
    expect(noPortVersion.status).toBe(422);
    expect(noPortVersion.body.fields.portVersion).toMatch(/RS-485/);
    expect(expectOk(await eng.get(`/api/devices/${d.id}`)).firmware).toBe('');

    expectOk(await eng.post(`/api/proposals/${entry.proposal.id}/accept`, { version: d.version, portVersion: rs485.version }));
    const port = expectOk(await eng.get(`/api/ports/${rs485.id}`));
    expect(port.settings).toMatchObject({ baud: 19200, nodeAddress: 4, parity: 'even', interface: 'rs485-2w' });
    expect(port.version).toBe(rs485.version + 1);
    const portHistory = expectOk(await eng.get(`/api/revisions?entityType=port&entityId=${rs485.id}`)).items;
    expect(portHistory[0].summary).toContain(entry.id);
    expect(expectOk(await eng.get(`/api/devices/${d.id}`)).firmware).toBe('2.3.1');
  });

  it('found handshaking laid over the record brings the control lines along instead of disagreeing with them', async () => {
    const eng = team.members.engineer;
    const d = await makeDevice(eng);
    const service = d.ports.find((p: { name: string }) => p.name === 'Service');
    expect(service.settings).toMatchObject({ handshake: 'none', rtsMode: 'off', ctsMode: 'ignore' });
    const entry = await logEntry(team.members.technician, d.id, {
      kind: 'found-different', foundSettings: 'RTS/CTS handshaking on', port: { portId: service.id, settings: { handshake: 'rts-cts' } },
    });
    expectOk(await eng.post(`/api/proposals/${entry.proposal.id}/accept`, { version: d.version, portVersion: service.version }));
    // rts-cts means RTS used for flow control and sending gated by CTS (docs/decisions/013-control-lines.md).
    expect(expectOk(await eng.get(`/api/ports/${service.id}`)).settings).toMatchObject({ handshake: 'rts-cts', rtsMode: 'flow', ctsMode: 'gate' });
  });

  it('answers a stale accept with 409 and the record as it is now, writing nothing', async () => {
    const eng = team.members.engineer;
    const d = await makeDevice(eng, undefined, { serialNumber: 'S-1' });
    const entry = await logEntry(team.members.technician, d.id, { kind: 'replacement', newSerialNumber: 'S-2', appliedVersion: 1 });
    expectOk(await team.members.admin.patch(`/api/devices/${d.id}`, { version: d.version, location: 'Moved to bay 3' }));
    const stale = await eng.post(`/api/proposals/${entry.proposal.id}/accept`, { version: d.version });
    expect(stale.status).toBe(409);
    expect(stale.body.current).toMatchObject({ id: d.id, version: d.version + 1, serialNumber: 'S-1' });
    expect(expectOk(await eng.get(`/api/proposals/${entry.proposal.id}`)).status).toBe('pending');
    expectOk(await eng.post(`/api/proposals/${entry.proposal.id}/accept`, { version: d.version + 1 }));
    expect(expectOk(await eng.get(`/api/devices/${d.id}`)).serialNumber).toBe('S-2');
  });

  it('an engineer changing the serial by hand keeps the old one searchable too', async () => {
    const u = uid();
    const d = await makeDevice(team.members.engineer, undefined, { serialNumber: `HAND-A${u}` });
    expectOk(await team.members.engineer.patch(`/api/devices/${d.id}`, { version: d.version, serialNumber: `HAND-B${u}` }));
    expect(await search(`HAND-A${u}`)).toEqual([d.id]);
  });
});

describe('who may decide, and bad input', () => {
  it('a technician or a viewer cannot accept or decline, and the vault stays as it was', async () => {
    const d = await makeDevice(team.members.engineer, undefined, { serialNumber: 'ROLE-1' });
    const entry = await logEntry(team.members.technician, d.id, { kind: 'replacement', newSerialNumber: 'ROLE-2', appliedVersion: 1 });
    for (const role of ['technician', 'viewer'] as const) {
      expect((await team.members[role].post(`/api/proposals/${entry.proposal.id}/accept`, { version: d.version })).status).toBe(403);
      expect((await team.members[role].post(`/api/proposals/${entry.proposal.id}/decline`, { note: 'no' })).status).toBe(403);
    }
    expect((await team.members.technician.patch(`/api/devices/${d.id}`, { version: d.version, serialNumber: 'ROLE-2' })).status).toBe(403);
    expect(expectOk(await team.members.viewer.get(`/api/devices/${d.id}`)).serialNumber).toBe('ROLE-1');
    expect(expectOk(await team.members.viewer.get(`/api/proposals/${entry.proposal.id}`)).status).toBe('pending');
  });

  it("answers 404 for another team's proposal", async () => {
    const d = await makeDevice(other.members.owner);
    const entry = await logEntry(other.members.technician, d.id, { kind: 'replacement', newSerialNumber: 'OTHER-2', appliedVersion: 1 });
    const id = entry.proposal.id;
    expect((await team.members.owner.get(`/api/proposals/${id}`)).status).toBe(404);
    expect((await team.members.owner.post(`/api/proposals/${id}/accept`, { version: d.version })).status).toBe(404);
    expect((await team.members.owner.post(`/api/proposals/${id}/decline`, { note: 'x' })).status).toBe(404);
    expect((await team.members.owner.get(`/api/proposals?deviceId=${d.id}`)).status).toBe(404);
    expect(expectOk(await team.members.owner.get('/api/proposals')).items.map((p: { id: string }) => p.id)).not.toContain(id);
  });

  it('refuses bad input with a message per field and writes nothing', async () => {
    const tech = team.members.technician;
    const eng = team.members.engineer;
    const d = await makeDevice(eng);
    const foreign = await makeDevice(eng);
    const cases: [Record<string, unknown>, string, RegExp][] = [
      [{ kind: 'found-different', foundSettings: 'x', port: { portId: foreign.ports[0].id, settings: { baud: 19200 } } }, 'port.portId', /this device/],
      [{ kind: 'found-different', foundSettings: 'x', port: { portId: d.ports[0].id, settings: {} } }, 'port.settings', /at least one setting/],
      [{ kind: 'found-different', foundSettings: 'x', port: { portId: d.ports[0].id, settings: { baud: 19200, colour: 'red' } } }, 'port.settings', /colour/],
      [{ kind: 'found-different', foundSettings: 'x', port: { portId: d.ports[0].id, settings: { parity: 'sometimes' } } }, 'port.settings.parity', /.+/],
      [{ kind: 'found-different', foundSettings: 'x', port: { portId: d.ports[1].id, settings: { interface: 'tcp' } } }, 'port.settings.tcpHost', /host/],
      [{ kind: 'replacement', newSerialNumber: 'X', appliedVersion: 1, firmware: 'x'.repeat(61) }, 'firmware', /60 characters/],
    ];
    for (const [body, field, message] of cases) {
      const res = await tech.post(`/api/devices/${d.id}/field-log`, body);
      expect(res.status, JSON.stringify(body)).toBe(422);
      expect(res.body.fields[field], JSON.stringify(res.body)).toMatch(message);
    }
    expect(expectOk(await tech.get(`/api/devices/${d.id}/field-log`)).items).toEqual([]);
    expect(expectOk(await tech.get(`/api/proposals?deviceId=${d.id}`)).items).toEqual([]);

    const entry = await logEntry(tech, d.id, { kind: 'replacement', newSerialNumber: 'BAD-2', appliedVersion: 1 });
    const path = `/api/proposals/${entry.proposal.id}`;
    const noVersion = await eng.post(`${path}/accept`, {});
    expect(noVersion.status).toBe(422);
    expect(noVersion.body.fields.version).toMatch(/version/);
    expect((await eng.post(`${path}/accept`, { version: d.version, serialNumber: 'SNEAKY' })).status).toBe(422);
    const noNote = await eng.post(`${path}/decline`, { note: '  ' });
    expect(noNote.status).toBe(422);
    expect(noNote.body.fields.note).toMatch(/Say why/);
    expect((await eng.get('/api/proposals?status=maybe')).status).toBe(422);
    expect(expectOk(await eng.get(path)).status).toBe('pending');
  });
});
