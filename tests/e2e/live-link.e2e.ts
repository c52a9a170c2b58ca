/** The live link in Chromium, against a fake Web Serial whose far end is the simulated demo drive (tests/e2e/helpers/fake-serial-page.ts). */
import { buildSync } from 'esbuild';
import { describe, expect, it } from 'vitest';
import { browserPool, shot, signIn, visit } from './helpers/browser';
import type { SimulatorSettings } from '../../src/lib/live/simulator';

const DRIVE = 'dev_demo_drv501';
const openInPool = browserPool();

const FAKE_SERIAL = buildSync({ entryPoints: ['tests/e2e/helpers/fake-serial-page.ts'], bundle: true, format: 'iife', platform: 'browser', write: false, target: 'es2022' }).outputFiles[0]!.text;
const ascii = (s: string) => [...s].map((c) => c.charCodeAt(0));

async function driveWithFakeSerial(sim: Partial<SimulatorSettings> = {}) {
  const b = await openInPool();
  await b.context.addInitScript(`window.__liveLinkSim = ${JSON.stringify(sim)};`);
  await b.context.addInitScript({ content: FAKE_SERIAL });
  await signIn(b.page, 'technician@fernhollow.test');
  await visit(b.page, `/vault/devices/${DRIVE}`);
  const live = b.page.getByTestId('live-link');
  await live.getByRole('button', { name: 'Open the live link' }).click();
  await live.getByLabel('Port').selectOption('Service RS-232');
  await live.getByRole('button', { name: 'Connect to a serial port' }).click();
  await live.getByTestId('live-connected').waitFor();
  return { ...b, live };
}

const evidence = (b: { page: import('playwright-core').Page }) =>
  b.page.evaluate(() => (window as unknown as { __fakeSerial: { evidence: { opened: unknown[]; written: number[][] } } }).__fakeSerial.evidence);

describe('live link', () => {
  it('sends the index preset after the machinery caution, shows the acknowledgement decoded and the round trip, and saves the exchange log as communication verified', async () => {
    const b = await driveWithFakeSerial();
    const { live, page } = b;
    await live.getByLabel('Command', { exact: true }).selectOption({ label: 'Index 45° (moves machinery)' });
    await live.getByLabel('Values', { exact: true }).selectOption('Index one station');
    await live.getByRole('button', { name: 'Send', exact: true }).click();
    await live.getByTestId('live-confirm').getByText('moves machinery').first().waitFor();
    expect((await evidence(b)).written).toEqual([]);
    await live.getByRole('button', { name: 'Send it: the machine is safe to move' }).click();
    const x = live.getByTestId('live-exchange').first();
    await x.waitFor();
    expect(await x.getAttribute('data-ended')).toBe('terminator');
    // "1=IDX:OK*67" CR: XOR-8 of "1=IDX:OK" worked by hand in tests/live/simulator.test.ts.
    expect(await x.getByTestId('live-reply').locator('[data-notation="hex"]').textContent()).toBe('31 3D 49 44 58 3A 4F 4B 2A 36 37 0D');
    expect(await x.getByTestId('live-checksum').getAttribute('data-ok')).toBe('true');
    expect(await x.getByTestId('live-fields').textContent()).toContain('accepted');
    // 35 + 12 characters of 10 bits at 9600 bit/s = 48.958 ms on the wire.
    expect(await x.getByTestId('live-round-trip').textContent()).toMatch(/Round trip measured \d+\.\d+ ms; on the wire alone 48\.958 ms/);
    const seen = await evidence(b);
    expect(seen.opened).toEqual([{ baudRate: 9600, dataBits: 8, stopBits: 1, parity: 'none', flowControl: 'none', bufferSize: 4096 }]);
    expect(seen.written).toEqual([ascii('1!IDX:+4500/R180000/F180000/S18000\r')]);
    await shot(page, 'live-link-index-ack');

    await live.getByLabel('Note for the field log').fill('Index acknowledged through the live link');
    await live.getByRole('button', { name: 'Save to the field log as communication verified' }).click();
    await live.getByText('Saved to the field log with the exchange log attached.').waitFor();
    await visit(page, `/field/devices/${DRIVE}/log`);
    const entry = page.locator('[data-testid="log-entry"][data-kind="verified"]').first();
    await entry.getByText('Index acknowledged through the live link').waitFor();
    const href = await entry.getByTestId('log-file').getAttribute('href');
    const file = await page.request.get(href!);
    expect(file.status()).toBe(200);
    const text = await file.text();
    expect(text).toContain('with baudRate 9600, dataBits 8, parity none, stopBits 1');
    expect(text).toMatch(/TX {3}31 21 49 44 58 3A/);
    expect(text).toMatch(/RX {3}31 3D 49 44 58 3A 4F 4B 2A 36 37 0D/);
  });

  it('says when nothing comes back within the response timeout, with the causes to check', async () => {
    const { live } = await driveWithFakeSerial({ fault: 'no-reply' });
    await live.getByLabel('Command', { exact: true }).selectOption({ label: 'Status query' });
    await live.getByRole('button', { name: 'Send', exact: true }).click();
    const timeout = live.getByTestId('live-timeout');
    await timeout.waitFor({ timeout: 5000 });
    expect(await timeout.textContent()).toMatch(/No reply within the response timeout \(1000 ms\)/);
    expect(await timeout.locator('li').count()).toBe(6);
  });

  it('shows garbage with framing errors from a device at 19200 8-E-1, and the framing search finds it', async () => {
    const b = await driveWithFakeSerial({ line: { baud: 19200, dataBits: 8, parity: 'even', stopBits: 1 } });
    const { live, page } = b;
    await live.getByLabel('Command', { exact: true }).selectOption({ label: 'Status query' });
    await live.getByRole('button', { name: 'Send', exact: true }).click();
    await live.getByTestId('live-line-error').waitFor();
    expect(await live.getByTestId('live-line-error').textContent()).toContain('Bytes arrived with framing errors: check baud and parity.');
    const search = live.getByTestId('live-search');
    await search.getByLabel('Query to repeat').selectOption({ label: 'Status query' });
    await search.getByLabel(/safe to send it/).check();
    await search.getByRole('button', { name: 'Search' }).click();
    const answered = search.getByTestId('live-search-answered');
    await answered.waitFor({ timeout: 45_000 });
    expect(await answered.textContent()).toMatch(/^Answered at 19200 8-E-1, 19200 8-E-2\./);
    const seen = await evidence(b);
    // Only the status query went out, never a command that moves machinery; the port reopened at 9600 after the search.
    expect(seen.written.every((w) => String.fromCharCode(...w) === '1?STA*48\r')).toBe(true);
    expect((seen.opened.at(-1) as { baudRate: number }).baudRate).toBe(9600);
    await shot(page, 'live-link-framing-search');
  });
});
