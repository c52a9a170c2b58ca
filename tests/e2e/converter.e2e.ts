/** A converter in the browser: record one, pair its ports, see the link agree through it, break a setting, see red. */
import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { browserPool, DESKTOP, hydrated, PHONE, shot, signIn, visit } from './helpers/browser';

const stamp = Date.now().toString(36).slice(-5).toUpperCase();
const openInPool = browserPool();

async function api(page: Page, method: string, path: string, data?: unknown) {
  const res = await page.request.fetch(path, { method, data, headers: { origin: new URL(page.url()).origin } });
  expect(res.status(), await res.text()).toBeLessThan(300);
  return res.json();
}

describe('converters in the browser', () => {
  it('records a converter, pairs its ports, sees both links agree through it, and sees red without a reload when one setting breaks', async () => {
    const { page } = await openInPool({ viewport: DESKTOP });
    await signIn(page, 'engineer@fernhollow.test');
    await visit(page, '/vault');
    const site = await api(page, 'POST', '/api/sites', { name: `Glaze works ${stamp}` });
    const machine = await api(page, 'POST', '/api/machines', { siteId: site.id, name: 'Glaze line' });
    // The PLC (RTS raised while sending, CTS not checked: common practice for an RTS-switched converter) and the drive.
    const plc = await api(page, 'POST', '/api/devices', { machineId: machine.id, tag: `PLC-${stamp}`, role: 'plc',
      ports: [{ name: 'X2', settings: { interface: 'rs232', baud: 9600, parity: 'none', rtsMode: 'transmit', ctsMode: 'ignore', rtsTailMs: 2, protocol: 'ascii' } }] });
    const drv = await api(page, 'POST', '/api/devices', { machineId: machine.id, tag: `DRV-${stamp}`, role: 'drive',
      ports: [{ name: 'RS-485', settings: { interface: 'rs485-2w', baud: 9600, parity: 'none', rs485Direction: 'auto', nodeAddress: 1, termination: true, protocol: 'ascii' } }] });

    // The converter, recorded in the browser: the device, its two ports, and the pair.
    await visit(page, `/vault/machines/${machine.id}`);
    await page.getByRole('button', { name: 'Add a device' }).click();
    const form = page.getByRole('form', { name: 'Add a device' });
    await form.getByLabel('Tag', { exact: true }).fill(`CV-${stamp}`);
    await form.getByLabel('Role', { exact: true }).selectOption('converter');
    await form.getByRole('button', { name: 'Create' }).click();
    await page.waitForURL(/\/vault\/devices\/[^/]+$/);
    await hydrated(page);
    const cvId = page.url().split('/').pop()!;
    expect(await page.getByTestId('no-bridges').textContent()).toContain('add the converter\'s two ports first');
    for (const [name, iface] of [['RS-232', 'rs232'], ['RS-485', 'rs485-2w']] as const) {
      await page.getByRole('button', { name: 'Add a port' }).click();
      const pf = page.getByRole('form', { name: 'Add a port' });
      await pf.getByLabel('Port name').fill(name);
      await pf.getByLabel('Electrical interface').selectOption(iface);
      await pf.getByLabel('Parity').selectOption('none');
      await pf.getByLabel('Protocol').selectOption('ascii');
      if (iface === 'rs485-2w') {
        await pf.getByLabel('Direction control').selectOption('auto');
        await pf.getByLabel('Termination on at this device').check();
        await pf.getByLabel('Bias on at this device').check();
      }
      await pf.getByRole('button', { name: 'Add port' }).click();
      await page.getByRole('article', { name: `Port ${name}` }).waitFor();
    }
    const panel = page.getByTestId('bridge-panel');
    await panel.getByLabel('One side').selectOption({ label: 'RS-232 (RS-232)' });
    await panel.getByLabel('Carried across to').selectOption({ label: 'RS-485 (RS-485 2-wire)' });
    await panel.getByRole('button', { name: 'Pair these ports' }).click();
    await expect.poll(() => panel.getByTestId('bridges').textContent()).toContain('RS-232 (RS-232) ⇄ RS-485 (RS-485 2-wire)');

    // Links on either side of it (through the API), then the device page's link box: both agree.
    const cv = await api(page, 'GET', `/api/devices/${cvId}`);
    expect(cv.bridges).toEqual([[cv.ports[0].id, cv.ports[1].id]]);
    await api(page, 'POST', '/api/links', { machineId: machine.id, name: `PLC to converter ${stamp}`, kind: 'point-to-point',
      members: [{ portId: plc.ports[0].id, role: 'master' }, { portId: cv.ports[0].id, role: 'slave' }] });
    await api(page, 'POST', '/api/links', { machineId: machine.id, name: `Glaze drive bus ${stamp}`, kind: 'rs485-bus',
      members: [{ portId: cv.ports[1].id, role: 'master', isEnd: true }, { portId: drv.ports[0].id, role: 'slave', isEnd: true }] });
    await visit(page, `/vault/devices/${cvId}`);
    const box = page.getByTestId('device-links');
    const state = (link: string) => box.locator('li', { hasText: link }).getByTestId('link-state').getAttribute('data-state');
    expect(await state(`PLC to converter ${stamp}`)).toBe('ok');
    expect(await state(`Glaze drive bus ${stamp}`)).toBe('ok');
    await shot(page, 'converter-device-desktop');
    await page.setViewportSize(PHONE);
    await shot(page, 'converter-device-phone');
    await page.setViewportSize(DESKTOP);

    // The machine page draws the chain, PLC first.
    await visit(page, `/vault/machines/${machine.id}`);
    const chain = page.getByTestId('chains').locator(`[data-converter="CV-${stamp}"]`);
    expect(await chain.textContent()).toMatch(new RegExp(`PLC-${stamp} X2.*CV-${stamp} RS-232 ⇄ RS-485.*DRV-${stamp} RS-485`));
    await page.setViewportSize(PHONE);
    await shot(page, 'converter-machine-phone');
    await page.setViewportSize(DESKTOP);

    // Break one setting on the far side of the converter: the converter's RS-485 baud. The PLC's link turns red.
    await visit(page, `/vault/devices/${cvId}`);
    const port485 = page.getByRole('article', { name: 'Port RS-485' });
    await port485.getByRole('button', { name: 'Edit port' }).click();
    const edit = page.getByRole('form', { name: 'Edit port RS-485' });
    await edit.getByLabel('Baud rate').fill('19200');
    await edit.getByRole('button', { name: 'Save port' }).click();
    await expect.poll(() => port485.getByTestId('shorthand').textContent()).toBe('19200 8-N-1');
    await expect.poll(() => state(`Glaze drive bus ${stamp}`)).toBe('error');
    await visit(page, `/vault/devices/${plc.id}`);
    expect(await page.getByTestId('device-links').locator('li', { hasText: `PLC to converter ${stamp}` }).getByTestId('link-state').getAttribute('data-state')).toBe('ok');

    // On the PLC's page: its own baud changed, its link turns red without a reload, naming the drive beyond the converter too.
    const drvPort = (await api(page, 'GET', `/api/devices/${drv.id}`)).ports[0];
    const plcPort = page.getByRole('article', { name: 'Port X2' });
    await plcPort.getByRole('button', { name: 'Edit port' }).click();
    const plcEdit = page.getByRole('form', { name: 'Edit port X2' });
    await plcEdit.getByLabel('Baud rate').fill('19200');
    await plcEdit.getByRole('button', { name: 'Save port' }).click();
    const plcLink = page.getByTestId('device-links').locator('li', { hasText: `PLC to converter ${stamp}` });
    await expect.poll(() => plcLink.getByTestId('link-state').getAttribute('data-state')).toBe('error');
    expect(await plcLink.textContent()).toContain('Mismatch');
    const link = (await api(page, 'GET', `/api/links?machineId=${machine.id}&q=PLC`)).items[0];
    expect(link.report.findings.map((f: { code: string; memberLabel: string }) => `${f.code} ${f.memberLabel}`)).toEqual([`baud-mismatch CV-${stamp} RS-232`, `baud-mismatch DRV-${stamp} RS-485 (through CV-${stamp})`]);
    expect(drvPort.settings.baud).toBe(9600);
  }, 120_000);

  it('the demo PLC-400 reaches the infeed drive through CV-430: the chain agrees and the field card says so', async () => {
    const { page } = await openInPool({ viewport: PHONE });
    await signIn(page, 'technician@fernhollow.test');
    await visit(page, '/vault/machines/mach_demo_kiln');
    const chain = page.getByTestId('chains').locator('[data-converter="CV-430"]');
    expect(await chain.textContent()).toMatch(/PLC-400 X2 RS-232.*CV-430 RS-232 ⇄ RS-485.*DRV-440 RS-485/);
    expect(await chain.getByTestId('link-state').evaluateAll((els) => els.map((e) => e.getAttribute('data-state')))).toEqual(['ok', 'ok']);
    await visit(page, '/field/devices/dev_demo_plc400');
    const route = page.getByRole('region', { name: 'Port X2 RS-232' }).getByTestId('card-route');
    expect((await route.textContent())?.trim()).toBe('Wired to CV-430 RS-232, through CV-430 to DRV-440 RS-485 (PLC to infeed converter)');
    await shot(page, 'converter-card-phone');
  }, 120_000);
});
