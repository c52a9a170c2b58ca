/** The live link in Chromium, against a fake Web Serial whose far end is the simulated demo drive (tests/e2e/helpers/fake-serial-page.ts). */
import { buildSync } from 'esbuild';
import { describe, expect, it } from 'vitest';
import { browserPool, shot, signIn, visit } from './helpers/browser';
import type { SimulatorSettings } from '../../src/lib/live/simulator';

const DRIVE = 'dev_demo_drv501';
const openInPool = browserPool();

const FAKE_SERIAL = buildSync({ entryPoints: ['tests/e2e/helpers/fake-serial-page.ts'], bundle: true, format: 'iife', platform: 'browser', write: false, target: 'es2022' }).outputFiles[0]!.text;
const ascii = (s: string) => [...s].map((c) => c.charCodeAt(0));

async function driveWithFakeSerial(sim: Partial<SimulatorSettings> = {}, email = 'technician@fernhollow.test') {
  const b = await openInPool();
  await b.context.addInitScript(`window.__liveLinkSim = ${JSON.stringify(sim)};`);
  await b.context.addInitScript({ content: FAKE_SERIAL });
  await signIn(b.page, email);
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
const text = (w: number[]) => String.fromCharCode(...w);

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

  it('sends the demo sequence separately and as one string after the machinery caution; each step\'s reply decoded with a good checksum', async () => {
    const b = await driveWithFakeSerial();
    const { live, page } = b;
    // The demo drive's "Index and report": the index move as saved, then the status query (demo syntax, worked by hand
    // in tests/live/sequence-send.test.ts), saved as separate sends 50 ms apart.
    const INDEX = '1!IDX:+4500/R180000/F180000/S18000\r';
    const STATUS = '1?STA*48\r';
    const hex = (s: string) => ascii(s).map((c) => c.toString(16).toUpperCase().padStart(2, '0')).join(' ');
    const form = live.getByTestId('live-sequence');
    await form.getByLabel('Sequence', { exact: true }).selectOption({ label: 'Index and report (moves machinery)' });
    expect(await form.getByTestId('live-sequence-steps').locator('li').allTextContents()).toEqual([
      `Index 45° (moves machinery), expects a reply (waits 500 ms): ${hex(INDEX)}`,
      `Status query, expects a reply: ${hex(STATUS)}`,
    ]);
    expect(await form.getByLabel('Send the steps').inputValue()).toBe('separate');
    await form.getByRole('button', { name: 'Send the sequence', exact: true }).click();
    await form.getByTestId('live-sequence-confirm').getByRole('note').waitFor();
    expect(await form.getByTestId('live-sequence-confirm').textContent()).toContain('"Index and report" moves machinery (Index 45°)');
    expect((await evidence(b)).written).toEqual([]);
    await form.getByRole('button', { name: 'Send the sequence: the machine is safe to move' }).click();
    let run = live.locator('[data-testid="live-sequence-run"][data-mode="separate"]');
    await expect.poll(() => run.getAttribute('data-running')).toBe('false');
    const outcomes = (r: typeof run) => r.getByTestId('live-sequence-step').evaluateAll((els) => els.map((e) => e.getAttribute('data-outcome')));
    expect(await outcomes(run)).toEqual(['answered', 'answered']);
    // "1=IDX:OK*67" CR and "1=STA:+0004500,R*14" CR: XOR-8 checks worked by hand in tests/live/simulator.test.ts.
    expect(await run.getByTestId('live-reply').locator('[data-notation="hex"]').allTextContents()).toEqual([hex('1=IDX:OK*67\r'), hex('1=STA:+0004500,R*14\r')]);
    expect(await run.getByTestId('live-checksum').evaluateAll((els) => els.map((e) => e.getAttribute('data-ok')))).toEqual(['true', 'true']);
    expect((await evidence(b)).written.map(text)).toEqual([INDEX, STATUS]);
    await shot(page, 'live-link-sequence-separate');

    await form.getByLabel('Send the steps').selectOption('one-string');
    await form.getByRole('button', { name: 'Send the sequence', exact: true }).click();
    await form.getByRole('button', { name: 'Send the sequence: the machine is safe to move' }).click();
    run = live.locator('[data-testid="live-sequence-run"][data-mode="one-string"]');
    await expect.poll(() => run.getAttribute('data-running')).toBe('false');
    expect(await outcomes(run)).toEqual(['answered', 'answered']);
    // The whole reply, split per step: each step's checksum verdict and fields.
    expect(await run.getByTestId('live-checksum').evaluateAll((els) => els.map((e) => e.getAttribute('data-ok')))).toEqual(['true', 'true']);
    expect(await run.getByTestId('live-fields').allTextContents()).toEqual([expect.stringContaining('accepted'), expect.stringContaining('ready')]);
    expect(await run.getByTestId('live-reply').locator('[data-notation="hex"]').textContent()).toBe(hex('1=IDX:OK*67\r1=STA:+0004500,R*14\r'));
    // 44 characters out and 32 back, 10 bits each at 9600 bit/s: 79.167 ms on the wire.
    expect(await run.getByTestId('live-round-trip').textContent()).toMatch(/Round trip measured \d+\.\d+ ms; on the wire alone 79\.167 ms/);
    expect((await evidence(b)).written.map(text)).toEqual([INDEX, STATUS, INDEX + STATUS]);
    // Every byte is in the exchange log, so the communication-verified evidence includes the sequence.
    const log = await live.getByTestId('live-exchange-log').textContent();
    expect(log).toContain(hex(INDEX + STATUS));
    expect(log).toContain('Sequence "Index and report" (one string): step 1 answered, step 2 answered.');
    await shot(page, 'live-link-sequence-one-string');
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
    // The demo marks only the status query safe to repeat: the index move and jogs move machinery, the setup command is not marked.
    expect(await search.getByLabel('Query to repeat').locator('option').allTextContents()).toEqual(['Status query']);
    await search.getByRole('button', { name: 'Search' }).click();
    const answered = search.getByTestId('live-search-answered');
    await answered.waitFor({ timeout: 45_000 });
    expect(await answered.textContent()).toMatch(/^Answered at 19200 8-E-1, 19200 8-E-2\./);
    let seen = await evidence(b);
    // Only the status query went out, never a command that moves machinery; the port reopened at 9600 after the search.
    expect(seen.written.every((w) => text(w) === '1?STA*48\r')).toBe(true);
    expect((seen.opened.at(-1) as { baudRate: number }).baudRate).toBe(9600);
    const searched = seen.written.length;
    await shot(page, 'live-link-framing-search');

    // The demo library's setup command, with the stored 9600 8-N-1 in its fields, offered at the framing found.
    const setup = live.getByTestId('live-setup');
    expect(await setup.getByTestId('live-setup-list').textContent()).toBe(`Set service line: ${ascii('1!LIN:9600,N,8,1\r').map((c) => c.toString(16).toUpperCase().padStart(2, '0')).join(' ')}`);
    await setup.getByRole('button', { name: 'Send the setup commands at 19200 8-E-1' }).click();
    await setup.getByTestId('live-setup-confirm').getByRole('note').waitFor();
    expect(await setup.getByTestId('live-setup-confirm').textContent()).toContain('Setup commands change the device\'s settings');
    expect((await evidence(b)).written).toHaveLength(searched);
    await setup.getByRole('button', { name: 'Send them: the machine is in a safe state' }).click();
    const verified = setup.getByTestId('live-setup-verified');
    await verified.waitFor({ timeout: 10_000 });
    expect(await verified.getAttribute('data-verified')).toBe('true');
    expect(await verified.textContent()).toBe('Verified: "Status query" answered at the stored 9600 8-N-1.');
    expect(await setup.getByTestId('live-setup-steps').locator('tbody tr').getAttribute('data-outcome')).toBe('acknowledged');
    seen = await evidence(b);
    // The setup command went out at the framing found, then the query at the stored framing; then the link reopened there.
    expect(seen.written.slice(searched).map(text)).toEqual(['1!LIN:9600,N,8,1\r', '1?STA*48\r']);
    expect(seen.opened.slice(-3).map((o) => { const x = o as { baudRate: number; parity: string }; return `${x.baudRate} ${x.parity}`; })).toEqual(['19200 even', '9600 none', '9600 none']);
    // And the reopened link now talks to the unit at the stored settings.
    await live.getByLabel('Command', { exact: true }).selectOption({ label: 'Status query' });
    await live.getByRole('button', { name: 'Send', exact: true }).click();
    await live.getByTestId('live-checksum').first().waitFor();
    expect(await live.getByTestId('live-checksum').first().getAttribute('data-ok')).toBe('true');
    await shot(page, 'live-link-setup');
  });

  it('offers as the query only what an engineer marked safe to repeat', async () => {
    const b = await openInPool();
    await signIn(b.page, 'engineer@fernhollow.test');
    const origin = new URL(b.page.url()).origin;
    const name = `Status again ${Date.now().toString(36)}`;
    const copy = await (await b.page.request.fetch('/api/commands/cmd_demo_drv501_status/copy', { method: 'POST', headers: { origin }, data: { deviceId: DRIVE, name } })).json();
    expect(copy).toMatchObject({ name, safeToRepeat: true });
    await visit(b.page, `/vault/devices/${DRIVE}/commands/${copy.id}`);
    const safe = b.page.getByLabel('Safe to repeat: it only reads');
    expect(await safe.isChecked()).toBe(true);
    await safe.uncheck();
    await b.page.getByRole('button', { name: 'Save changes' }).click();
    await b.page.getByText('Saved · version 2').waitFor();
    // A command that moves machinery cannot be marked.
    await visit(b.page, `/vault/devices/${DRIVE}/commands/cmd_demo_drv501_index`);
    expect(await b.page.getByLabel('Safe to repeat: it only reads').isDisabled()).toBe(true);
    expect(await b.page.getByText('A command that moves machinery is never safe to repeat.').count()).toBe(1);
    await visit(b.page, `/vault/devices/${DRIVE}/commands/cmd_demo_drv501_line`);
    expect(await b.page.getByLabel('Setup command: it writes the device\'s settings').isChecked()).toBe(true);

    const { live } = await driveWithFakeSerial({}, 'engineer@fernhollow.test');
    const options = await live.getByTestId('live-search').getByLabel('Query to repeat').locator('option').allTextContents();
    expect(options).toEqual(['Status query']);
  });

  it('opens from the workbench, signed out, loaded only when asked: a port and the simulated device answer the command composed there', async () => {
    const b = await openInPool();
    await b.context.addInitScript('window.__liveLinkSim = {};');
    await b.context.addInitScript({ content: FAKE_SERIAL });
    const { page } = b;
    const scripts: string[] = [];
    page.on('request', (r) => { if (r.resourceType() === 'script') scripts.push(r.url()); });
    await visit(page, '/workbench');
    await page.locator('#req-add-kind').selectOption('text');
    await page.locator('#req-add-text').fill('PING');
    await page.getByRole('group', { name: 'Add a segment' }).getByRole('button', { name: 'Add segment' }).click();
    await page.getByLabel('The device answers this command').check();
    await page.locator('#reply-add-kind').selectOption('text');
    await page.locator('#reply-add-text').fill('PONG');
    await page.getByTestId('reply').getByRole('button', { name: 'Add segment' }).click();
    const live = page.getByTestId('live-link');
    // The live link's code is fetched only when it is opened: the composer's first load carries none of it.
    expect(scripts.filter((u) => /LivePanel|LinkPanel/.test(u))).toEqual([]);
    await live.getByRole('button', { name: 'Open the live link' }).click();
    await live.getByRole('button', { name: 'Connect to a serial port' }).waitFor();
    expect(scripts.filter((u) => /WorkbenchLivePanel/.test(u))).toHaveLength(1);

    // Through the port (the fake adapter's far end is the demo drive, which does not know PING): the bytes and options sent.
    await live.getByRole('button', { name: 'Connect to a serial port' }).click();
    await live.getByTestId('live-connected').waitFor();
    await live.getByRole('button', { name: 'Send', exact: true }).click();
    await live.getByTestId('live-timeout').waitFor({ timeout: 5000 });
    const seen = await evidence(b);
    expect(seen.opened).toEqual([{ baudRate: 9600, dataBits: 8, stopBits: 1, parity: 'none', flowControl: 'none', bufferSize: 4096 }]);
    expect(seen.written.map(text)).toEqual(['PING\r']);
    await live.getByRole('button', { name: 'Disconnect' }).click();

    // Without hardware: the simulated device answers the composed command with its reply template.
    await live.getByRole('button', { name: 'Try it without hardware' }).click();
    expect(await live.getByTestId('live-connected').textContent()).toContain('the simulated device (no hardware) at 9600 8-N-1');
    await live.getByRole('button', { name: 'Send', exact: true }).click();
    const x = live.getByTestId('live-exchange').first();
    await expect.poll(() => x.getAttribute('data-ended')).toBe('terminator');
    expect(await x.getByTestId('live-reply').locator('[data-notation="hex"]').textContent()).toBe('50 4F 4E 47 0D');
    // No device here: the exchange log downloads, nothing goes to a field log.
    expect(await live.getByRole('button', { name: 'Download the exchange log' }).count()).toBe(1);
    expect(await live.getByRole('button', { name: /field log/ }).count()).toBe(0);
    await shot(page, 'live-link-workbench');
  });
});
