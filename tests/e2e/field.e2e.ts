/** Field work in the browser: a technician on a phone at the cabinet, a customer through a share link, the printed door cards. */
import { describe, expect, it } from 'vitest';
import { browserPool, DESKTOP, PHONE, shot, signIn, visit } from './helpers/browser';

const MACHINE = 'mach_demo_churn';
const DEVICE = 'dev_demo_drv201';
/** A 1×1 PNG built from its bytes, for the photo upload. */
const PNG = Buffer.from('iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mP8z8DwHwAFBQIAX8jx0gAAAABJRU5ErkJggg==', 'base64');

const openInPool = browserPool();
const browser = (viewport = DESKTOP) => openInPool({ viewport });

describe('field work in the browser', () => {
  it('a technician opens a card from its QR link, copies the settings and logs a replacement with a photo', async () => {
    const b = await browser(PHONE);
    await signIn(b.page, 'technician@fernhollow.test');
    await visit(b.page, `/field/machines/${MACHINE}`);
    const card = b.page.locator(`[data-testid="field-card"][data-device-id="${DEVICE}"]`);
    await expect.poll(() => card.locator('[data-testid="qr"] svg').count()).toBe(1);
    const qrUrl = await card.getByTestId('qr').getAttribute('data-qr-url');
    expect(qrUrl).toMatch(new RegExp(`/field/devices/${DEVICE}$`));
    await shot(b.page, 'field-machine-phone');

    await visit(b.page, new URL(qrUrl!).pathname);
    await expect.poll(() => b.page.getByTestId('shorthand').first().textContent()).toMatch(/^\d+ \d-[NEOMS]-[12]/);
    await shot(b.page, 'field-card-phone', false);
    await b.page.getByTestId('copy-settings').first().click();
    await expect.poll(() => b.page.getByTestId('copy-settings').first().textContent()).toContain('Copied');
    const copied = await b.page.evaluate(() => navigator.clipboard.readText());
    expect(copied).toContain('DRV-201');
    expect(copied).toMatch(/Baud rate: \d+/);

    await b.page.getByLabel('Replacement unit fitted').check();
    await b.page.getByLabel('Serial number of the unit fitted').fill('QD40-99001');
    await b.page.getByTestId('log-photo-input').setInputFiles({ name: 'new-drive.png', mimeType: 'image/png', buffer: PNG });
    await b.page.getByLabel('Photos for this entry').getByTestId('thumb').waitFor();
    await b.page.getByLabel('Note').fill('Old unit had a burnt RS-485 port.');
    await b.page.getByRole('button', { name: 'Save entry' }).click();
    const entry = b.page.locator('[data-testid="log-entry"][data-kind="replacement"]').first();
    await entry.getByText('QD40-99001').waitFor();
    expect(await entry.getByTestId('thumb').count()).toBe(1);
    // Written in the viewer's locale and time zone (the test browser's de-DE, Pacific/Auckland), the zone named.
    await expect.poll(() => entry.locator('time').first().textContent()).toMatch(/^\d{1,2}\. \S+ \d{4}, \d{2}:\d{2} GMT\+1[23]$/);
    await entry.scrollIntoViewIfNeeded();
    await shot(b.page, 'field-log-phone');
  });

  it('a viewer without an account sees the shared cards and nothing else', async () => {
    const eng = await browser();
    await signIn(eng.page, 'engineer@fernhollow.test');
    await visit(eng.page, `/field/shares?scopeType=machine&scopeId=${MACHINE}`);
    await eng.page.getByLabel('Label (who it is for)').fill('Creamery maintenance');
    await eng.page.getByRole('button', { name: 'Create link' }).click();
    const url = await eng.page.getByTestId('new-share-url').inputValue();
    expect(url).toMatch(/\/s\/[A-Za-z0-9_-]+$/);
    await shot(eng.page, 'field-shares-desktop');

    for (const [viewport, name] of [[PHONE, 'phone'], [DESKTOP, 'desktop']] as const) {
      const guest = await browser(viewport);
      await guest.page.goto(new URL(url).pathname);
      await guest.page.getByTestId('share-page').waitFor();
      expect(await guest.page.getByTestId('field-card').count()).toBeGreaterThan(1);
      expect(await guest.page.locator('nav, form, input, textarea, select, #sign-out, #team-switcher').count()).toBe(0);
      const links = await guest.page.locator('a[href]').evaluateAll((as) => as.map((a) => a.getAttribute('href')));
      expect(links).toEqual([]);
      await shot(guest.page, `field-share-${name}`, name === 'desktop');
    }
    await visit(eng.page, '/field/shares');
    await expect.poll(() => eng.page.getByTestId('shares').locator('li').first().textContent()).toMatch(/opened 2 times/);
  });

  it("lists the demo drive's presets (one index, a jog each way) on its card, copyable, and on the printed card", async () => {
    const b = await browser(PHONE);
    await signIn(b.page, 'technician@fernhollow.test');
    await visit(b.page, '/field/devices/dev_demo_drv501');
    const command = b.page.locator('[data-testid="card-command"][data-command-id="cmd_demo_drv501_index"]');
    const sends = command.getByTestId('card-send');
    await expect.poll(() => sends.evaluateAll((els) => els.map((e) => e.getAttribute('data-preset')))).toEqual(['', 'Index one station', 'Jog 1° one way', 'Jog 1° the other way']);
    // Worked out by hand in the demo syntax: -1° × 100 steps/° = -100; 0.05 rev/s × 36,000 = 1800 steps/s; 33 bytes at 9600 8-N-1.
    const back = sends.nth(3);
    expect(await back.locator('code').first().textContent()).toBe("'1!IDX:-100/R180000/F180000/S1800$0D'");
    expect(await back.textContent()).toContain('33 bytes · 34.375 ms on the wire (Service RS-232, 9600 8-N-1)');
    await back.locator('.fcopy').first().click();
    await expect.poll(() => b.page.evaluate(() => navigator.clipboard.readText())).toBe("'1!IDX:-100/R180000/F180000/S1800$0D'");
    await back.scrollIntoViewIfNeeded();
    await shot(b.page, 'field-card-presets-phone', false);
    await b.page.goto('/field/machines/mach_demo_seamer/print?paper=a4');
    for (const name of ['Index one station', 'Jog 1° one way', 'Jog 1° the other way']) expect(await b.page.locator(`[data-testid="card-send"][data-preset="${name}"]`).count()).toBe(1);
  });

  it("a trashed device's QR link says it is in the trash, with the way to restore it; an unknown address gets the app's page", async () => {
    const b = await browser(PHONE);
    // Both pages answer 404 on purpose; the browser logs that as a failed resource.
    b.allow('the server responded with a status of 404');
    await signIn(b.page, 'engineer@fernhollow.test');
    const origin = new URL(b.page.url()).origin;
    const made = await b.page.request.fetch('/api/devices', { method: 'POST', data: { machineId: MACHINE, tag: `OLD-${Date.now().toString(36)}` }, headers: { origin } });
    const device = await made.json();
    expect((await b.page.request.fetch(`/api/devices/${device.id}`, { method: 'DELETE', data: { version: device.version }, headers: { origin } })).status()).toBe(200);
    const res = await b.page.goto(`/field/devices/${device.id}`);
    expect(res!.status()).toBe(404);
    await b.page.getByRole('heading', { level: 1, name: 'This device is in the trash' }).waitFor();
    expect(await b.page.getByTestId('in-trash').getByRole('link', { name: 'restore it from the trash' }).getAttribute('href')).toBe('/vault/trash');
    await shot(b.page, 'field-card-trashed-phone');
    const other = await b.page.goto('/no-such-page');
    expect(other!.status()).toBe(404);
    expect(other!.headers()['content-type']).toContain('text/html');
    await b.page.getByRole('heading', { level: 1, name: 'No page at this address' }).waitFor();
    expect(await b.page.getByRole('main').getByRole('link', { name: 'Back to your home page' }).getAttribute('href')).toBe('/');
    await shot(b.page, 'not-found-phone');
  });

  it("prints a machine's cards on A4 and US Letter", async () => {
    const b = await browser();
    await signIn(b.page, 'engineer@fernhollow.test');
    for (const paper of ['a4', 'letter'] as const) {
      await b.page.goto(`/field/machines/${MACHINE}/print?paper=${paper}`);
      await b.page.emulateMedia({ media: 'print' });
      expect(await b.page.getByTestId('print-controls').isVisible()).toBe(false);
      expect(await b.page.locator('.fcopy').count()).toBe(0);
      expect(await b.page.locator('[data-testid="qr"] svg').count()).toBeGreaterThan(1);
      await expect.poll(() => b.page.getByTestId('card-revision').first().textContent()).toMatch(/Card revision \d+ · \d{4}-\d{2}-\d{2}/);
      await shot(b.page, `field-print-${paper}`);
      await b.page.emulateMedia({ media: 'screen' });
    }
  });
});
