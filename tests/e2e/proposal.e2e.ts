/** A replacement logged on site reaches the record: a technician on a phone logs it, an engineer at a desk accepts it. */
import { describe, expect, it } from 'vitest';
import { browserPool, DESKTOP, PHONE, shot, signIn, visit } from './helpers/browser';

const DEVICE = 'dev_demo_drv202';
const OLD_SERIAL = 'QD40-77202';
const NEW_SERIAL = 'QS23-01188';

const openInPool = browserPool();
const browser = (viewport = DESKTOP) => openInPool({ viewport });

describe('proposals in the browser', () => {
  it('a technician logs a replacement at 390 px, an engineer accepts it at 1280 px, and search finds the device by both serials', async () => {
    const tech = await browser(PHONE);
    await signIn(tech.page, 'technician@fernhollow.test');
    await visit(tech.page, `/field/devices/${DEVICE}`);
    await tech.page.getByLabel('Replacement unit fitted').check();
    await tech.page.getByLabel('Serial number of the unit fitted').fill(NEW_SERIAL);
    await tech.page.getByLabel('Firmware of the unit fitted (if shown)').fill('2.2.0');
    await tech.page.getByLabel('Note').fill('Drive would not start; fitted the spare.');
    await tech.page.getByRole('button', { name: 'Save entry' }).click();
    const entry = tech.page.locator('[data-testid="log-entry"][data-kind="replacement"]').first();
    await entry.getByText(NEW_SERIAL).waitFor();
    expect(await entry.getByTestId('proposal-outcome').getAttribute('data-status')).toBe('pending');
    await visit(tech.page, `/field/devices/${DEVICE}`);
    expect(await tech.page.getByTestId('card-pending').textContent()).toContain('Replacement pending review');
    expect(await tech.page.getByTestId('field-card').textContent()).toContain(OLD_SERIAL);
    await shot(tech.page, 'proposal-card-pending-phone');

    const eng = await browser(DESKTOP);
    await signIn(eng.page, 'engineer@fernhollow.test');
    await visit(eng.page, '/vault');
    const waiting = eng.page.getByTestId('waiting-for-review');
    expect(await waiting.textContent()).toContain(NEW_SERIAL);
    await shot(eng.page, 'proposal-vault-home-desktop');
    await waiting.locator('li', { hasText: NEW_SERIAL }).getByRole('link', { name: 'DRV-202' }).click();
    await eng.page.waitForURL(`**/vault/devices/${DEVICE}`);
    await visit(eng.page, `/vault/devices/${DEVICE}`);
    const proposal = eng.page.getByTestId('proposal');
    expect(await proposal.getByTestId('proposal-rows').textContent()).toMatch(new RegExp(`Serial number${OLD_SERIAL}${NEW_SERIAL}`));
    await shot(eng.page, 'proposal-device-desktop');
    await proposal.getByRole('button', { name: 'Accept into the record' }).click();
    await expect.poll(() => eng.page.getByRole('heading', { level: 1 }).locator('xpath=following-sibling::p[1]').textContent()).toContain(`S/N ${NEW_SERIAL} (earlier ${OLD_SERIAL})`);
    expect(await eng.page.getByTestId('device-proposals').count()).toBe(0);
    await shot(eng.page, 'proposal-device-accepted-desktop');

    for (const serial of [NEW_SERIAL, OLD_SERIAL]) {
      await visit(eng.page, '/vault');
      await eng.page.getByLabel('Find a device, command or port note anywhere in the team').fill(serial);
      await eng.page.getByTestId('search-results').getByRole('link', { name: 'DRV-202' }).waitFor();
    }
    await shot(eng.page, 'proposal-search-old-serial-desktop');

    await visit(tech.page, `/field/devices/${DEVICE}`);
    expect(await tech.page.getByTestId('card-pending').count()).toBe(0);
    expect(await tech.page.getByTestId('field-card').textContent()).toContain(NEW_SERIAL);
    const outcome = tech.page.locator('[data-testid="log-entry"][data-kind="replacement"]').first().getByTestId('proposal-outcome');
    expect(await outcome.getAttribute('data-status')).toBe('accepted');
    expect(await outcome.textContent()).toContain('Accepted into the record by Priya Castell');
    await outcome.scrollIntoViewIfNeeded();
    await shot(tech.page, 'proposal-log-accepted-phone', false);
  }, 180_000);

  it("shows a colleague's save before an accept beside the proposal, and accepts onto it when asked again", async () => {
    const device = 'dev_demo_plc400';
    const tech = await browser(PHONE);
    await signIn(tech.page, 'technician@fernhollow.test');
    const logged = await tech.page.evaluate(async (id) => {
      const res = await fetch(`/api/devices/${id}/field-log`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ kind: 'replacement', newSerialNumber: 'VX12-7777', appliedVersion: 1 }) });
      return res.status;
    }, device);
    expect(logged).toBe(201);

    const eng = await browser(DESKTOP);
    await signIn(eng.page, 'engineer@fernhollow.test');
    await visit(eng.page, `/vault/devices/${device}`);
    const colleague = await eng.page.evaluate(async (id) => {
      const current = await (await fetch(`/api/devices/${id}`)).json();
      const res = await fetch(`/api/devices/${id}`, { method: 'PATCH', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ version: current.version, serialNumber: 'VX12-1201-B' }) });
      return res.status;
    }, device);
    expect(colleague).toBe(200);
    // The accept meets the colleague's save: the server's 409 is the point of the test.
    eng.allow('the server responded with a status of 409');
    await eng.page.getByTestId('proposal').getByRole('button', { name: 'Accept into the record' }).click();
    const notice = eng.page.getByTestId('conflict');
    await notice.waitFor();
    expect(await notice.textContent()).toMatch(/Serial number.*VX12-1201-B.*VX12-7777/);
    await shot(eng.page, 'proposal-conflict-desktop');
    await notice.getByRole('button', { name: 'Accept onto the record as it is now' }).click();
    await expect.poll(() => eng.page.getByRole('heading', { level: 1 }).locator('xpath=following-sibling::p[1]').textContent()).toContain('S/N VX12-7777 (earlier VX12-1201, VX12-1201-B)');
  }, 180_000);

  it('shows the demo replacement waiting for review on the device page at both widths', async () => {
    for (const [name, viewport] of [['phone', PHONE], ['desktop', DESKTOP]] as const) {
      const { page } = await browser(viewport);
      await signIn(page, 'engineer@fernhollow.test');
      await visit(page, '/vault/devices/dev_demo_drv203');
      expect(await page.getByTestId('proposal').textContent()).toContain('QD40-81377');
      expect(await page.getByRole('button', { name: 'Accept into the record' }).isVisible()).toBe(true);
      const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
      expect(overflow).toBeLessThanOrEqual(0);
      await shot(page, `proposal-demo-device-${name}`);
    }
  }, 120_000);
});
