/**
 * Offline field cards on a phone (docs/decisions/017-offline-cards.md): a technician keeps a machine's cards, the
 * network goes (Playwright's setOffline does not stop the service worker's own fetches, so every request is also
 * aborted by a route), the card opens from its QR link as the copy kept on the phone, an entry written there waits
 * and is sent when the network returns, and after sign-out nothing is served from a cache.
 */
import { describe, expect, it } from 'vitest';
import type { BrowserContext, CDPSession, Page } from 'playwright-core';
import { browserPool, PHONE, shot, signIn, visit } from './helpers/browser';

const MACHINE = 'mach_demo_kiln';
/** A 1×1 PNG (valid signature and chunks), as in tests/integration/field-fixtures.ts. */
const PNG = Buffer.from('iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mP8z8DwHwAFBQIAX8jx0gAAAABJRU5ErkJggg==', 'base64');
const openInPool = browserPool();

/**
 * Chromium applies the context's offline emulation to the network, but a document loaded while it is on starts
 * with navigator.onLine true and never hears `offline`. So the page's own target is told again that it is offline
 * at each document it loads, as a phone without a network reports from the start (and `online` when it returns).
 */
const conditions = (offline: boolean) => ({ offline, latency: 0, downloadThroughput: -1, uploadThroughput: -1 });
let cut: { page: Page; cdp: CDPSession; tell: () => Promise<unknown> } | null = null;

async function cutNetwork(context: BrowserContext, page: Page) {
  await context.setOffline(true);
  await context.route('**/*', (route) => route.abort('internetdisconnected'));
  const cdp = await context.newCDPSession(page);
  const tell = () => cdp.send('Network.emulateNetworkConditions', conditions(true)).catch(() => undefined);
  await tell();
  page.on('domcontentloaded', tell);
  cut = { page, cdp, tell };
}
async function restoreNetwork(context: BrowserContext) {
  await context.unroute('**/*');
  await context.setOffline(false);
  if (!cut) return;
  const { page, cdp, tell } = cut;
  cut = null;
  page.off('domcontentloaded', tell);
  await cdp.send('Network.emulateNetworkConditions', conditions(false));
  await cdp.detach();
}
/** The service worker is installed and controls the page (it claims open pages when it activates). */
async function workerInCharge(page: Page) {
  await page.waitForFunction(() => !!navigator.serviceWorker?.controller, undefined, { timeout: 30_000 });
}

describe('field cards kept on a phone', () => {
  it('a kept card opens from its QR link without a network; an entry written there is sent when the network returns; sign-out leaves nothing', async () => {
    const b = await openInPool({ viewport: PHONE });
    // What the cut network provokes on purpose: requests that fail while it is cut.
    b.allow('ERR_INTERNET_DISCONNECTED', 'net::ERR_FAILED');
    // The entry written without a description is refused on purpose when it is sent.
    b.allow('the server responded with a status of 422');
    await signIn(b.page, 'technician@fernhollow.test');
    await visit(b.page, `/field/machines/${MACHINE}`);
    await workerInCharge(b.page);
    const manifest = await b.page.evaluate(() => document.querySelector('link[rel="manifest"]')?.getAttribute('href'));
    expect(manifest).toBe('/manifest.webmanifest');
    await b.page.getByRole('button', { name: 'Keep on this phone' }).click();
    await b.page.getByText(/^Kept on this phone, brought up to date/).waitFor();
    await shot(b.page, 'offline-kept-machine-phone');
    const card = b.page.locator('[data-testid="field-card"]').first();
    const deviceId = (await card.getAttribute('data-device-id'))!;
    const qrUrl = (await card.getByTestId('qr').getAttribute('data-qr-url'))!;
    const cardPath = new URL(qrUrl).pathname;
    expect(cardPath).toBe(`/field/devices/${deviceId}`);

    await cutNetwork(b.context, b.page);
    await visit(b.page, cardPath);
    await b.page.getByTestId('kept-copy').waitFor();
    expect(await b.page.getByTestId('kept-copy').textContent()).toMatch(/No network: this is the copy kept on this phone, last brought up to date/);
    await expect.poll(() => b.page.getByTestId('shorthand').first().textContent()).toMatch(/^\d+ \d-[NEOMS]-[12]/);
    await b.page.getByTestId('offline-note').waitFor();
    // First an entry the server will refuse (a finding without saying what was found), then a good one.
    await b.page.getByLabel('Settings found different on site').check();
    await b.page.getByRole('button', { name: 'Keep entry on this phone' }).click();
    await b.page.getByTestId('entry-kept').waitFor();
    await b.page.getByLabel('Communication verified').check();
    await b.page.getByLabel('Note').fill('Checked the bus with no network in the kiln tunnel.');
    await b.page.getByRole('button', { name: 'Keep entry on this phone' }).click();
    const queued = b.page.getByTestId('queued-entry');
    await expect.poll(() => queued.count()).toBe(2);
    expect(await queued.evaluateAll((els) => els.map((e) => e.getAttribute('data-state')))).toEqual(['waiting', 'waiting']);
    await shot(b.page, 'offline-card-phone');

    // Signing out now would lose the entry: the sign-out page (kept too) says so.
    await b.page.getByRole('button', { name: 'Sign out' }).click();
    await b.page.waitForURL('**/sign-out');
    await b.page.getByTestId('unsent-warning').waitFor();
    await shot(b.page, 'offline-sign-out-warning-phone');
    await b.page.getByRole('link', { name: 'Stay signed in' }).click();
    await b.page.waitForURL('**/field/kept');
    await b.page.getByTestId('kept-scope').first().waitFor();
    await shot(b.page, 'offline-kept-list-phone');

    const writtenAt = Date.now();
    await restoreNetwork(b.context);
    // Sent in the order written: the refused one stays on the phone with the server's reason; the next one is sent.
    const states = () => b.page.getByTestId('queued-entry').evaluateAll((els) => els.map((e) => e.getAttribute('data-state')));
    await expect.poll(states, { timeout: 20_000 }).toEqual(['refused', 'sent']);
    expect(await b.page.getByTestId('queued-reason').textContent()).toContain('Describe what you found set on the device.');
    await shot(b.page, 'offline-sent-and-refused-phone');
    const log = await (await b.page.request.get(`/api/devices/${deviceId}/field-log`)).json();
    const sent = log.items.find((e: { note: string }) => e.note === 'Checked the bus with no network in the kiln tunnel.');
    expect(sent).toBeTruthy();
    expect(sent.kind).toBe('verified');
    expect(sent.clientKey).toMatch(/^ck_[0-9a-f]{32}$/);
    // Done while offline, received after: the time done is kept beside the receipt time.
    expect(new Date(sent.doneAt).getTime()).toBeLessThan(writtenAt);
    expect(new Date(sent.createdAt).getTime()).toBeGreaterThanOrEqual(new Date(sent.doneAt).getTime());

    expect(log.items.some((e: { kind: string }) => e.kind === 'found-different')).toBe(false);

    // Nothing is waiting now (a refused entry is not waiting): Sign out goes straight through and clears the phone.
    await b.page.getByRole('button', { name: 'Sign out' }).click();
    await b.page.waitForURL('**/sign-in');
    const left = await b.page.evaluate(async () => ({
      caches: await caches.keys(),
      workers: (await navigator.serviceWorker.getRegistrations()).length,
      databases: (await indexedDB.databases()).map((d) => d.name),
    }));
    expect(left).toEqual({ caches: [], workers: 0, databases: [] });
    await cutNetwork(b.context, b.page);
    await expect(b.page.goto(cardPath)).rejects.toThrow(/ERR_INTERNET_DISCONNECTED/);
    await restoreNetwork(b.context);
  });

  it('keeps the photos already in a kept card\'s field log: offline the card shows them; sign-out removes them', async () => {
    const b = await openInPool({ viewport: PHONE });
    b.allow('ERR_INTERNET_DISCONNECTED', 'net::ERR_FAILED');
    await signIn(b.page, 'technician@fernhollow.test');
    await visit(b.page, `/field/machines/${MACHINE}`);
    await workerInCharge(b.page);
    const deviceId = (await b.page.locator('[data-testid="field-card"]').first().getAttribute('data-device-id'))!;
    // A photo in the device's field log, logged before the card is kept (a 1×1 PNG).
    const origin = new URL(b.page.url()).origin;
    const up = await b.page.request.post('/api/attachments', { headers: { origin }, multipart: { ownerType: 'device', ownerId: deviceId, kind: 'photo', file: { name: 'cabinet-before.png', mimeType: 'image/png', buffer: PNG } } });
    expect(up.status(), await up.text()).toBe(201);
    const photo = await up.json();
    const entry = await b.page.request.post(`/api/devices/${deviceId}/field-log`, { headers: { origin }, data: { kind: 'verified', note: 'Photo of the cabinet before the work', photoIds: [photo.id] } });
    expect(entry.status(), await entry.text()).toBe(201);

    await b.page.getByRole('button', { name: 'Keep on this phone' }).click();
    await b.page.getByText(/^Kept on this phone, brought up to date/).waitFor();
    const kept = await b.page.evaluate(async (url) => {
      for (const name of await caches.keys()) if (name.startsWith('baudbook-kept-') && await (await caches.open(name)).match(url)) return name;
      return null;
    }, photo.url);
    expect(kept).toBe('baudbook-kept-team_demo_fernhollow');

    await cutNetwork(b.context, b.page);
    await visit(b.page, `/field/devices/${deviceId}`);
    await b.page.getByTestId('kept-copy').waitFor();
    const thumb = b.page.locator(`img[data-testid="thumb"][src="${photo.url}"]`).first();
    await thumb.scrollIntoViewIfNeeded();
    // The kept photo loads with no network: the 1×1 PNG decodes to one pixel.
    await expect.poll(() => thumb.evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth), { timeout: 10_000 }).toBe(1);
    await restoreNetwork(b.context);

    await b.page.getByRole('button', { name: 'Sign out' }).click();
    await b.page.waitForURL('**/sign-in');
    expect(await b.page.evaluate(() => caches.keys())).toEqual([]);
  });

  it('switching team on the phone drops the cards kept for the other team: offline they are not there', async () => {
    const b = await openInPool({ viewport: PHONE });
    b.allow('ERR_INTERNET_DISCONNECTED', 'net::ERR_FAILED');
    // The demo owner belongs to the integrator's team and to the customer's maintenance team.
    await signIn(b.page, 'owner@fernhollow.test');
    await visit(b.page, '/field/machines/mach_demo_press');
    await workerInCharge(b.page);
    await b.page.getByRole('button', { name: 'Keep on this phone' }).click();
    await b.page.getByText(/^Kept on this phone, brought up to date/).waitFor();
    const cardPath = `/field/devices/${await b.page.locator('[data-testid="field-card"]').first().getAttribute('data-device-id')}`;
    expect(await b.page.evaluate(() => caches.keys())).toContain('baudbook-kept-team_demo_fernhollow');

    await b.page.getByLabel('Active team').selectOption('team_demo_brackwater');
    await b.page.waitForURL((url) => url.pathname === '/');
    await expect.poll(() => b.page.evaluate(() => caches.keys())).not.toContain('baudbook-kept-team_demo_fernhollow');

    await cutNetwork(b.context, b.page);
    await visit(b.page, cardPath);
    await b.page.getByRole('heading', { level: 1, name: 'No network, and this page is not kept on this phone' }).waitFor();
    await shot(b.page, 'offline-not-kept-phone');
    await restoreNetwork(b.context);
  });
});
