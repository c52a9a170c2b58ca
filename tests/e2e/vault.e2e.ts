/** The vault in the browser: build a site → machine → device → link, edit a port, see a finding, restore, resolve a conflict. */
import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { browserPool, DESKTOP, hydrated, PHONE, shot, signIn, visit, type Browser } from './helpers/browser';

const stamp = Date.now().toString(36).slice(-5).toUpperCase();
/** The 409 a colleague's earlier save provokes, which the browser logs as a failed resource. */
const CONFLICT_409 = 'the server responded with a status of 409';
const openInPool = browserPool();
async function browser(options?: Parameters<typeof openInPool>[0]): Promise<Browser> {
  const b = await openInPool(options);
  b.page.on('dialog', (d) => d.accept());
  return b;
}

async function create(page: Page, button: string, fields: Record<string, string>) {
  // The page the form sits on matches the record pattern too (a site's page adds a machine), so wait for
  // the address to change, not just to match: otherwise the next step may click on the page being left.
  const from = page.url();
  await page.getByRole('button', { name: button }).click();
  const form = page.getByRole('form', { name: button });
  for (const [label, value] of Object.entries(fields)) {
    const field = form.getByLabel(label, { exact: true });
    if ((await field.evaluate((el) => el.tagName)) === 'SELECT') await field.selectOption(value);
    else await field.fill(value);
  }
  await form.getByRole('button', { name: 'Create' }).click();
  await page.waitForURL((url) => url.href !== from && /\/vault\/(sites|machines|devices|links|profiles)\/[^/]+$/.test(url.pathname));
  await hydrated(page);
}

async function api(page: Page, method: string, path: string, data?: unknown) {
  const res = await page.request.fetch(path, { method, data, headers: { origin: new URL(page.url()).origin } });
  expect(res.status(), await res.text()).toBeLessThan(300);
  return res.json();
}

describe('vault in the browser', () => {
  it('creates a site, machine, device and link, edits a port, sees the finding and restores an old revision', async () => {
    const { page } = await browser();
    await signIn(page, 'engineer@fernhollow.test');
    await visit(page, '/vault');
    await create(page, 'Add a site', { 'Site name': `Hollin Bakery ${stamp}`, Customer: 'Hollin Foods' });
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toContain('Hollin Bakery');
    await create(page, 'Add a machine', { 'Machine, line or cell': 'Proofer line', 'Customer’s number': 'P1' });
    await create(page, 'Add a device', { Tag: `PLC-${stamp}`, Name: 'Proofer controller', Role: 'plc' });
    const machineUrl = await page.getByRole('navigation', { name: 'Breadcrumb' }).getByRole('link', { name: 'Proofer line' }).getAttribute('href');

    // first port, through the port form
    await page.getByRole('button', { name: 'Add a port' }).click();
    const form = page.getByRole('form', { name: 'Add a port' });
    await form.getByLabel('Port name').fill('X3');
    await form.getByLabel('Electrical interface').selectOption('rs485-2w');
    await form.getByLabel('Baud rate').fill('19200');
    await form.getByLabel('Parity').selectOption('even');
    // Direction by RTS and the RTS line move together; back to automatic switches RTS off again.
    await form.getByLabel('Direction control').selectOption('rts');
    await expect.poll(() => form.getByLabel('RTS', { exact: true }).inputValue()).toBe('transmit');
    await form.getByLabel('Direction control').selectOption('auto');
    await expect.poll(() => form.getByLabel('RTS', { exact: true }).inputValue()).toBe('off');
    await shot(page, 'vault-port-form-desktop');
    await form.getByLabel('Termination on at this device').check();
    await form.getByLabel('Bias on at this device').check();
    await form.getByRole('button', { name: 'Add port' }).click();
    const port = page.getByTestId('port').first();
    await expect.poll(() => port.getByTestId('shorthand').textContent()).toBe('19200 8-E-1');
    const deviceId = page.url().split('/').pop()!;

    // edit it: bad input is refused inline, a good one saves
    await port.getByRole('button', { name: 'Edit port' }).click();
    const edit = page.getByRole('form', { name: 'Edit port X3' });
    await edit.getByLabel('Baud rate').fill('-5');
    await edit.getByRole('button', { name: 'Save port' }).click();
    await edit.locator('.field-error').first().waitFor();
    await edit.getByLabel('Baud rate').fill('38400');
    await edit.getByRole('button', { name: 'Save port' }).click();
    await expect.poll(() => port.getByTestId('shorthand').textContent()).toBe('38400 8-E-1');
    await shot(page, 'vault-device-desktop');

    // a second device at 9600 (made through the API) and a bus between the two, made in the browser
    const drive = await api(page, 'POST', '/api/devices', {
      machineId: machineUrl!.split('/').pop(), tag: `DRV-${stamp}`, role: 'drive',
      ports: [{ name: 'RS-485', settings: { interface: 'rs485-2w', baud: 9600, parity: 'even', rs485Direction: 'auto', nodeAddress: 1, termination: true } }],
    });
    await visit(page, machineUrl!);
    await create(page, 'Add a link', { 'Link name': 'Proofer bus', Kind: 'rs485-bus' });
    const add = page.getByLabel('Add a port on this machine');
    await add.selectOption({ label: `PLC-${stamp} X3 — 38400 8-E-1` });
    await page.getByRole('button', { name: 'Add', exact: true }).click();
    await add.selectOption({ label: `DRV-${stamp} RS-485 — 9600 8-E-1` });
    await page.getByRole('button', { name: 'Add', exact: true }).click();
    await page.getByRole('button', { name: 'Save members' }).click();
    const finding = page.getByTestId('findings').locator('[data-code="baud-mismatch"]');
    await finding.waitFor();
    expect(await finding.textContent()).toContain(`Change on DRV-${stamp} RS-485`);
    await expect.poll(() => page.getByTestId('findings').getByTestId('link-state').getAttribute('data-state')).toBe('error');
    await shot(page, 'vault-link-desktop');
    // The member table and its controls fit a phone without scrolling sideways (checked by shot()).
    await page.setViewportSize(PHONE);
    await shot(page, 'vault-link-phone');
    await page.setViewportSize(DESKTOP);

    // the machine page shows the link red
    await visit(page, machineUrl!);
    const row = page.getByTestId('links').locator('li', { hasText: 'Proofer bus' });
    expect(await row.getByTestId('link-state').getAttribute('data-state')).toBe('error');

    // restore the port's first revision: back to 19200
    await visit(page, `/vault/devices/${deviceId}`);
    const p = page.getByTestId('port').first();
    await p.getByRole('button', { name: 'History' }).click();
    await p.getByRole('button', { name: 'Restore v1' }).click();
    await expect.poll(() => p.getByTestId('shorthand').textContent()).toBe('19200 8-E-1');
    await expect.poll(() => p.getByTestId('history').locator('li').first().textContent()).toContain('Restored version 1');
    expect(drive.id).toBeTruthy();
  });

  it("the device page's link box turns to a mismatch as soon as a port's setting is saved, without a reload", async () => {
    const { page } = await browser();
    await signIn(page, 'engineer@fernhollow.test');
    const port = (name: string) => ({ name, settings: { interface: 'rs485-2w', baud: 19200, parity: 'even', rs485Direction: 'auto', nodeAddress: 1 } });
    const plc = await api(page, 'POST', '/api/devices', { machineId: 'mach_demo_press', tag: `LBX-${stamp}`, ports: [port('X1')] });
    const drv = await api(page, 'POST', '/api/devices', { machineId: 'mach_demo_press', tag: `LBY-${stamp}`, ports: [{ ...port('RS-485'), settings: { ...port('').settings, nodeAddress: 2 } }] });
    await api(page, 'POST', '/api/links', {
      machineId: 'mach_demo_press', name: `Press bus ${stamp}`, kind: 'rs485-bus',
      members: [{ portId: plc.ports[0].id, role: 'master', isEnd: true }, { portId: drv.ports[0].id, role: 'slave', isEnd: true }],
    });
    await visit(page, `/vault/devices/${plc.id}`);
    const box = page.getByTestId('device-links').locator('li', { hasText: `Press bus ${stamp}` });
    const before = await box.getByTestId('link-state').getAttribute('data-state');
    expect(before).not.toBe('error');
    const card = page.getByTestId('port').first();
    await card.getByRole('button', { name: 'Edit port' }).click();
    const edit = page.getByRole('form', { name: 'Edit port X1' });
    await edit.getByLabel('Baud rate').fill('38400');
    await edit.getByRole('button', { name: 'Save port' }).click();
    await expect.poll(() => card.getByTestId('shorthand').textContent()).toBe('38400 8-E-1');
    await expect.poll(() => box.getByTestId('link-state').getAttribute('data-state')).toBe('error');
    expect(await box.textContent()).toContain('Mismatch');
  });

  it('offers to compare and re-apply when someone else saved first', async () => {
    const b = await browser();
    b.allow(CONFLICT_409);
    const { page } = b;
    await signIn(page, 'engineer@fernhollow.test');
    await visit(page, '/vault/devices/dev_demo_scl210');
    const edit = page.getByRole('form', { name: 'Edit device' });
    const current = await api(page, 'GET', '/api/devices/dev_demo_scl210');
    await edit.getByLabel('Firmware').fill(`fw-${stamp}`);
    // a colleague changes the location meanwhile
    await api(page, 'PATCH', '/api/devices/dev_demo_scl210', { version: current.version, location: `Packing table ${stamp}` });
    await edit.getByRole('button', { name: 'Save device' }).click();
    const conflict = page.getByTestId('conflict');
    await conflict.waitFor();
    expect(await conflict.textContent()).toContain(`Packing table ${stamp}`);
    // their change beside mine, part by part; the re-apply sends only mine
    const theirs = conflict.locator('li', { hasText: 'Location in the cabinet' });
    expect(await theirs.textContent()).toContain('their change');
    expect(await theirs.locator('[data-side="theirs"]').textContent()).toBe(`Packing table ${stamp}`);
    const mine = conflict.locator('li', { hasText: 'Firmware' });
    expect(await mine.textContent()).toContain('your change');
    expect(await mine.locator('[data-side="mine"]').textContent()).toBe(`fw-${stamp}`);
    expect(await conflict.textContent()).toContain('Applying sends only your change (Firmware)');
    await shot(page, 'vault-conflict-desktop', false);
    await conflict.getByRole('button', { name: /Apply my changes on version/ }).click();
    await edit.getByText(/Saved · version/).waitFor();
    const after = await api(page, 'GET', '/api/devices/dev_demo_scl210');
    expect(after).toMatchObject({ firmware: `fw-${stamp}`, location: `Packing table ${stamp}`, version: current.version + 2 });
  });

  it('moving a port someone changed meanwhile shows their change first, then moves it as it is now', async () => {
    const b = await browser();
    b.allow(CONFLICT_409);
    const { page } = b;
    await signIn(page, 'engineer@fernhollow.test');
    const d = await api(page, 'POST', '/api/devices', { machineId: 'mach_demo_press', tag: `TRM-${stamp}`, ports: [{ name: 'Aux', settings: { interface: 'rs232', baud: 9600 } }] });
    await visit(page, `/vault/devices/${d.id}`);
    const port = d.ports[0];
    // The page has read the port (version 1) and asks for nothing more before the colleague's change.
    await page.getByRole('article', { name: 'Port Aux' }).getByText(`version ${port.version}`).waitFor();
    await page.waitForLoadState('networkidle');
    // Someone else changes the port's baud rate after the page was opened.
    await api(page, 'PATCH', `/api/ports/${port.id}`, { version: port.version, settings: { ...port.settings, baud: 19200 } });
    await page.getByRole('article', { name: 'Port Aux' }).getByRole('button', { name: 'Move to trash' }).click();
    const conflict = page.getByTestId('conflict');
    await conflict.waitFor();
    expect(await conflict.textContent()).toContain('Nothing was moved to the trash');
    expect(await conflict.locator('li', { hasText: 'Baud rate' }).locator('[data-side="theirs"]').textContent()).toBe('19200');
    await conflict.getByRole('button', { name: `Move version ${port.version + 1} to the trash` }).click();
    await page.getByText('No ports recorded yet.').waitFor();
    expect((await api(page, 'GET', `/api/devices/${d.id}`)).ports).toEqual([]);
  });

  it('restoring a revision after someone saved shows their change first; "Keep" writes nothing, the next ask restores', async () => {
    const b = await browser();
    b.allow(CONFLICT_409);
    const { page } = b;
    await signIn(page, 'engineer@fernhollow.test');
    const d = await api(page, 'POST', '/api/devices', { machineId: 'mach_demo_press', tag: `RST-${stamp}`, location: 'Cabinet 1' });
    await api(page, 'PATCH', `/api/devices/${d.id}`, { version: 1, location: 'Cabinet 2' });
    await visit(page, `/vault/devices/${d.id}`);
    const history = page.getByTestId('history');
    await history.getByRole('button', { name: 'Restore v1' }).waitFor();
    await page.waitForLoadState('networkidle');
    // A colleague saves the device while I look at version 2 in its history.
    await api(page, 'PATCH', `/api/devices/${d.id}`, { version: 2, firmware: `fw-${stamp}` });
    await history.getByRole('button', { name: 'Restore v1' }).click();
    const conflict = page.getByTestId('conflict');
    await conflict.waitFor();
    expect(await conflict.textContent()).toContain('while you were looking at version 2; it is now at version 3');
    expect(await conflict.textContent()).toContain('Nothing was restored');
    const firmware = conflict.locator('li', { hasText: 'firmware' });
    expect(await firmware.textContent()).toContain('their change');
    expect(await firmware.locator('[data-side="theirs"]').textContent()).toBe(`fw-${stamp}`);
    expect(await conflict.locator('li').count()).toBe(1);
    await conflict.scrollIntoViewIfNeeded();
    await shot(page, 'vault-restore-conflict-desktop', false);
    await page.setViewportSize(PHONE);
    await conflict.scrollIntoViewIfNeeded();
    await shot(page, 'vault-restore-conflict-phone', false);
    await page.setViewportSize(DESKTOP);

    // "Keep version 3": nothing is written; the history shows their version as the newest.
    await conflict.getByRole('button', { name: 'Keep version 3' }).click();
    await conflict.waitFor({ state: 'detached' });
    await history.locator('li[data-version="3"]').waitFor();
    expect(await api(page, 'GET', `/api/devices/${d.id}`)).toMatchObject({ version: 3, location: 'Cabinet 2', firmware: `fw-${stamp}` });
    await page.waitForLoadState('networkidle');

    // They save again; restoring version 1 over the version the notice names puts the device back as it was.
    await api(page, 'PATCH', `/api/devices/${d.id}`, { version: 3, location: `Cabinet 3 ${stamp}` });
    await history.getByRole('button', { name: 'Restore v1' }).click();
    await conflict.waitFor();
    expect(await conflict.locator('li', { hasText: 'location' }).locator('[data-side="theirs"]').textContent()).toBe(`Cabinet 3 ${stamp}`);
    await conflict.getByRole('button', { name: 'Restore revision 1 over version 4' }).click();
    await history.locator('li[data-version="5"]').waitFor();
    expect(await api(page, 'GET', `/api/devices/${d.id}`)).toMatchObject({ version: 5, location: 'Cabinet 1', firmware: d.firmware });
  });

  it('shows the demo bus fault and the screens at phone and desktop widths', async () => {
    for (const [name, viewport] of [['phone', PHONE], ['desktop', DESKTOP]] as const) {
      const { page } = await browser({ viewport });
      await signIn(page, 'technician@fernhollow.test');
      await visit(page, '/vault');
      await page.getByLabel('Find a device, command or port note anywhere in the team').fill('DRV-203');
      await page.getByTestId('search-results').getByRole('link', { name: 'DRV-203' }).waitFor();
      await shot(page, `vault-index-${name}`);
      // Commands are found too (the demo's turret index command, by a word of its purpose).
      await page.getByLabel('Find a device, command or port note anywhere in the team').fill('turret');
      await page.getByTestId('record-results').getByRole('link', { name: 'Index 45°' }).waitFor();
      await shot(page, `vault-index-commands-${name}`);
      await visit(page, '/vault/machines/mach_demo_churn');
      const bus = page.getByTestId('links').locator('li', { hasText: 'Churn drive bus' });
      expect(await bus.getByTestId('link-state').getAttribute('data-state')).toBe('error');
      expect(await bus.textContent()).toContain('DRV-203 RS-485: set the baud rate to 9600');
      await shot(page, `vault-machine-${name}`);
      await visit(page, '/vault/devices/dev_demo_drv203');
      await page.getByRole('heading', { name: 'Copy settings to another device' }).waitFor();
      expect(await page.getByRole('button', { name: 'Save device' }).count()).toBe(0);
      await shot(page, `vault-device-tech-${name}`);
      await visit(page, '/vault/links/link_demo_churn_bus');
      await shot(page, `vault-bus-${name}`);
    }
    const { page } = await browser();
    await signIn(page, 'admin@fernhollow.test');
    await visit(page, '/vault/trash');
    await shot(page, 'vault-trash-desktop');
    await visit(page, '/vault/profiles');
    await shot(page, 'vault-profiles-desktop');
  });
});
