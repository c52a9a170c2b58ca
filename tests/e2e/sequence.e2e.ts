/**
 * A saved sequence in Chromium: the demo drive's four-command string (acceleration, deceleration, velocity and
 * distance, in the demo data's invented syntax of src/lib/composer/demo.ts) built from library commands, its
 * preview, copy of the PLC literal, saving, the library and the field card, at 1280 px and 390 px.
 * Expected string, 56 bytes and 58.333 ms at 9600 8-N-1 as in tests/frame/sequence.test.ts (worked out with
 * Python: len(s) * 10 / 9600 * 1000).
 */
import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { browserPool, DESKTOP, hydrated, PHONE, shot, signIn, visit } from './helpers/browser';
import { runSt } from '../plc/st-eval';

const browser = browserPool();
const DEVICE = 'dev_demo_drv501';
const DRIVE = `/vault/devices/${DEVICE}/commands`;
const PORT = 'Service RS-232';
const MOVE = '1!SET:/R180000$0D1!SET:/F144000$0D1!SET:/S18000$0D1!IDX:+4500$0D';

const hex = (text: string) => [...text].map((c) => c.charCodeAt(0).toString(16).toUpperCase().padStart(2, '0')).join(' ');
const address = { type: 'integer', id: 'addr', name: 'address', label: 'Drive address', default: 1, min: 1, max: 31, pad: 'zero', sign: 'negative' };
const cr = { type: 'terminator', id: 'cr', bytes: '0D' };
const perRev = { factor: 36000, offset: 0 };
const setting = (arg: string, name: string, label: string, unit: string, max: number) => ({
  version: 1,
  segments: [address, { type: 'literal', id: 'verb', bytes: hex(`!SET:/${arg}`) }, { type: 'integer', id: name, name, label, unit, scale: perRev, sign: 'negative', pad: 'zero', min: 0.01, max }, cr],
});
/** 36,000 steps per revolution: 100 steps per degree, so 45° → 4500 steps. */
const distance = {
  version: 1,
  segments: [address, { type: 'literal', id: 'verb', bytes: hex('!IDX:') }, { type: 'integer', id: 'angle', name: 'angle', label: 'Distance', unit: '°', scale: { factor: 100, offset: 0 }, sign: 'always', pad: 'zero', min: -360, max: 360 }, cr],
};

async function noOverflow(page: Page, what: string) {
  const { scroll, width } = await page.evaluate(() => ({ scroll: document.documentElement.scrollWidth, width: window.innerWidth }));
  expect(scroll, `${what}: page ${scroll} px wide in a ${width} px window`).toBeLessThanOrEqual(width);
}

/** Through the API: a velocity command and a two-step sequence of it and an inline 45° distance, sent as one string. */
async function twoStep(page: Page, run: string) {
  const origin = new URL(page.url()).origin;
  const post = async (data: object) => {
    const res = await page.request.fetch('/api/commands', { method: 'POST', headers: { origin }, data: { deviceId: DEVICE, portName: PORT, ...data } });
    expect(res.status(), await res.text()).toBe(201);
    return (await res.json()) as { id: string };
  };
  const speed = await post({ name: `Velocity ${run}`, template: setting('S', 'speed', 'Velocity', 'rev/s', 10), fieldValues: { address: 1, speed: 0.5 } });
  const steps = [{ commandId: speed.id, values: {} }, { template: distance, values: { address: 1, angle: 45 } }];
  const seq = await post({ name: `Two-step ${run}`, template: { version: 1, segments: [] }, sequence: { mode: 'one-string', delayMs: 0, steps } });
  return { speed, steps, seq };
}

describe('saved sequences in the browser', () => {
  it('builds the four-command string from library commands, copies its PLC literal, saves it and lists it', async () => {
    const b = await browser({ viewport: DESKTOP });
    const page = b.page;
    await signIn(page, 'engineer@fernhollow.test');
    const origin = new URL(page.url()).origin;
    const run = Date.now().toString(36);
    const make = async (name: string, template: object, fieldValues: object, movesMachinery = false) => {
      const res = await page.request.fetch('/api/commands', { method: 'POST', headers: { origin }, data: { deviceId: DEVICE, name, template, fieldValues, portName: PORT, movesMachinery } });
      expect(res.status(), await res.text()).toBe(201);
    };
    await make(`Acceleration ${run}`, setting('R', 'accel', 'Acceleration', 'rev/s²', 50), { address: 1, accel: 5 });
    await make(`Deceleration ${run}`, setting('F', 'decel', 'Deceleration', 'rev/s²', 50), { address: 1, decel: 5 });
    await make(`Velocity ${run}`, setting('S', 'speed', 'Velocity', 'rev/s', 10), { address: 1, speed: 0.5 });
    await make(`Distance ${run}`, distance, { address: 1, angle: 10 }, true);

    await visit(page, `${DRIVE}/new?kind=sequence`);
    await page.getByLabel('Command name').fill(`Four-move ${run}`);
    await page.getByLabel('Sent on port').selectOption(PORT);
    for (const name of ['Acceleration', 'Deceleration', 'Velocity', 'Distance']) {
      await page.getByTestId('add-step-command').selectOption({ label: `${name} ${run}` });
      await page.getByRole('button', { name: 'Add step', exact: true }).click();
    }
    await expect.poll(() => page.getByTestId('sequence-step').count()).toBe(4);
    // the step's own values: deceleration 4 rev/s² instead of the command's 5, distance 45° instead of 10°
    await page.locator('[data-step="2"]').getByLabel('Deceleration (rev/s²)').fill('4');
    await page.locator('[data-step="4"]').getByLabel('Distance (°)').fill('45');
    await page.getByTestId('machinery-caution').waitFor();

    await expect.poll(() => page.getByTestId('notation-iecLiteral').textContent()).toBe(`'${MOVE}'`);
    expect(await page.getByTestId('sequence-byte-count').textContent()).toBe('56');
    expect(await page.getByTestId('step-span').evaluateAll((els) => els.map((e) => [Number(e.getAttribute('data-start')), Number(e.getAttribute('data-end'))]))).toEqual([[0, 15], [15, 30], [30, 44], [44, 56]]);
    expect(await page.getByTestId('step-bytes').allTextContents()).toEqual(['15 bytes · 15.625 ms', '15 bytes · 15.625 ms', '14 bytes · 14.583 ms', '12 bytes · 12.500 ms']);
    expect(await page.getByTestId('sequence-wire-ms').textContent()).toBe('58.333 ms');
    expect(await page.getByTestId('sequence-total-ms').textContent()).toBe('58.333 ms');
    expect(await page.getByTestId('no-findings').count()).toBe(1);

    await page.getByRole('button', { name: 'Copy PLC string literal' }).click();
    await page.getByTestId('notation-iecLiteral').locator('..').getByText('Copied').waitFor();
    const copied = await page.evaluate(() => navigator.clipboard.readText());
    expect(copied).toBe(`'${MOVE}'`);
    expect(copied.split('$0D').length - 1).toBe(4);
    await noOverflow(page, 'new sequence at 1280 px');
    await shot(page, 'sequence-four-move-desktop');

    await page.getByRole('button', { name: 'Save sequence' }).click();
    await page.waitForURL(/\/commands\/cmd_/);
    await page.getByText('Saved · version 1').waitFor();
    const url = page.url();
    expect(await page.getByTestId('notation-iecLiteral').textContent()).toBe(`'${MOVE}'`);
    // Its PLC code: one FUNCTION joining the four steps; with the steps' values written as constants it builds
    // exactly the string above (run in the test evaluator, tests/plc/st-eval.ts).
    const plc = page.getByTestId('plc-code');
    await plc.getByText('Structured Text that builds this sequence from its fields at run time').click();
    await plc.getByLabel("Write each step's values as constants (otherwise every field is an input)").check();
    await expect.poll(() => plc.getByTestId('plc-code-text').textContent()).toMatch(new RegExp(`FUNCTION Four_move_${run} : STRING\\(`, 'i'));
    expect(runSt((await plc.getByTestId('plc-code-text').textContent())!, {}).result).toBe(MOVE.replaceAll('$0D', '\r'));
    // sent separately with a 5 ms pause: python3: 58.333 + 3 × 5 = 73.333 ms from the first byte to the last
    await page.getByLabel('As separate sends, one per step').check();
    await page.getByLabel('Pause between sends').fill('5');
    await expect.poll(() => page.getByTestId('sequence-total-ms').textContent()).toBe('73.333 ms');
    await page.getByRole('button', { name: 'Save changes' }).click();
    await page.getByText('Saved · version 2').waitFor();
    // sent separately, the PLC builds each send on its own: one FUNCTION per step
    expect(await plc.getByTestId('plc-code-text').textContent()).toMatch(/separate sends: send what each function below builds, in order, pausing 5 ms between sends[\s\S]*_step_4 : STRING\(/);

    await visit(page, DRIVE);
    const item = page.locator(`[data-command="Four-move ${run}"]`);
    await item.getByTestId('sequence-badge').waitFor();
    expect(await item.getByTestId('library-sequence-steps').locator('li').allTextContents()).toEqual([`Acceleration ${run}`, `Deceleration ${run}`, `Velocity ${run}`, `Distance ${run}`]);
    await noOverflow(page, 'library at 1280 px');

    await visit(page, `/field/devices/${DEVICE}`);
    const card = page.locator('[data-testid="card-command"]', { hasText: `Four-move ${run}` });
    expect(await card.getByTestId('card-sequence-steps').textContent()).toContain(`4. Distance ${run}`);
    // sent separately: each step's own string on the card
    expect(await card.locator('.fcmd-code').first().textContent()).toBe("'1!SET:/R180000$0D'");

    const phone = await browser({ viewport: PHONE });
    await signIn(phone.page, 'engineer@fernhollow.test');
    for (const path of [new URL(url).pathname, DRIVE, `${DRIVE}/new?kind=sequence`]) {
      await visit(phone.page, path);
      await noOverflow(phone.page, `${path} at 390 px`);
    }
    await visit(phone.page, new URL(url).pathname);
    await phone.page.getByTestId('sequence-spans').waitFor();
    await noOverflow(phone.page, 'saved sequence at 390 px');
    await shot(phone.page, 'sequence-four-move-phone');
  }, 120_000);

  it('shows a colleague\'s save of a sequence beside mine and re-applies only my changes', async () => {
    const b = await browser({ viewport: PHONE });
    // The first save meets the colleague's version: the 409 is the point of the test.
    b.allow('the server responded with a status of 409');
    const page = b.page;
    await signIn(page, 'engineer@fernhollow.test');
    const origin = new URL(page.url()).origin;
    const run = Date.now().toString(36);
    const { speed, steps, seq } = await twoStep(page, run);

    await visit(page, `${DRIVE}/${seq.id}`);
    await page.getByText('Saved · version 1').waitFor();
    // Meanwhile a colleague renames it and sends its steps separately, 5 ms apart.
    const theirs = await page.request.fetch(`/api/commands/${seq.id}`, { method: 'PATCH', headers: { origin }, data: { version: 1, name: `Two-step ${run} (theirs)`, sequence: { mode: 'separate', delayMs: 5, steps } } });
    expect(theirs.status(), await theirs.text()).toBe(200);

    await page.getByLabel('Notes').fill('my notes');
    await page.locator('[data-step="2"]').getByLabel('Distance (°)').fill('90');
    await page.getByRole('button', { name: 'Save changes' }).click();
    const conflict = page.getByTestId('conflict');
    await conflict.waitFor();
    const row = (name: string) => conflict.locator('li', { has: page.getByText(name, { exact: true }) });
    expect(await row('Sequence name').textContent()).toContain('their change');
    expect(await row('How it is sent').locator('[data-side="theirs"]').textContent()).toBe('As separate sends');
    expect(await row('Pause between sends').textContent()).toContain('their change');
    expect(await row('Notes').textContent()).toContain('your change');
    expect(await row('Steps').textContent()).toContain('your change');
    expect(await row('Steps').locator('[data-side="mine"]').textContent()).toBe(`1. Velocity ${run} · 2. Inline step (address 1, angle 90)`);
    expect(await conflict.textContent()).not.toMatch(/reload/i);
    await shot(page, 'sequence-conflict-phone');

    await conflict.getByRole('button', { name: 'Apply my changes on version 2' }).click();
    await page.getByText('Saved · version 3').waitFor();
    const saved = await (await page.request.get(`/api/commands/${seq.id}`)).json();
    // Theirs where only they changed (name, send mode, pause), mine where only I did (notes, the steps).
    expect(saved).toMatchObject({ name: `Two-step ${run} (theirs)`, notes: 'my notes', version: 3 });
    expect(saved.sequence).toMatchObject({ mode: 'separate', delayMs: 5 });
    expect(saved.sequence.steps.map((s: { commandId?: string; values: Record<string, unknown> }) => [s.commandId ?? 'inline', String(s.values.angle ?? '')])).toEqual([[speed.id, ''], ['inline', '90']]);
    // The composer now shows version 3 as saved: their name and mode, my notes.
    expect(await page.getByLabel('Command name').inputValue()).toBe(`Two-step ${run} (theirs)`);
    expect(await page.getByLabel('As separate sends, one per step').isChecked()).toBe(true);
    expect(await page.getByLabel('Notes').inputValue()).toBe('my notes');
    expect(await conflict.count()).toBe(0);
  });

  it('asks before trashing a command a sequence uses, shows the gap, and mends when it is restored', async () => {
    const b = await browser({ viewport: DESKTOP });
    const page = b.page;
    await signIn(page, 'engineer@fernhollow.test');
    const run = Date.now().toString(36);
    const { seq } = await twoStep(page, run);

    await visit(page, DRIVE);
    // The server's first answer to the move is the 409 naming the sequences (the question that follows is the point).
    b.allow('the server responded with a status of 409');
    const questions: string[] = [];
    page.on('dialog', (d) => { questions.push(d.message()); void d.accept(); });
    await page.locator(`[data-command="Velocity ${run}"]`).getByRole('button', { name: 'Move to trash' }).click();
    const steps = page.locator(`[data-command="Two-step ${run}"]`).getByTestId('library-sequence-steps');
    await expect.poll(() => steps.locator('li').first().textContent()).toBe(`Step 1: the command "Velocity ${run}" is in the trash; restore it or replace the step.`);
    expect(questions).toEqual([`Move "Velocity ${run}" to the trash?`, expect.stringContaining(`is a step of "Two-step ${run}" (step 1)`)]);

    await visit(page, `${DRIVE}/${seq.id}`);
    await page.getByTestId('step-gap').waitFor();
    expect(await page.getByTestId('findings').locator('[data-code="step-command-missing"]').count()).toBe(1);
    expect(await page.getByTestId('step-span').count()).toBe(2);
    await shot(page, 'sequence-gap-desktop', false);

    await visit(page, DRIVE);
    await page.getByText('In the trash (', { exact: false }).click();
    await page.getByRole('listitem').filter({ hasText: `Velocity ${run}` }).getByRole('button', { name: 'Restore' }).click();
    await expect.poll(() => steps.locator('li').first().textContent()).toBe(`Velocity ${run}`);
  });

  it('keeps what was typed into the name and purpose before the page became interactive', async () => {
    const b = await browser({ viewport: PHONE });
    const page = b.page;
    await signIn(page, 'engineer@fernhollow.test');
    const run = Date.now().toString(36);
    // Hold the page's scripts (as a slow phone on plant Wi-Fi would) until the fields are filled.
    let release!: () => void;
    const held = new Promise<void>((r) => { release = r; });
    await page.route('**/_astro/**/*.js', async (route) => { await held; await route.continue(); });
    await page.goto(`${DRIVE}/new?kind=sequence`, { waitUntil: 'commit' });
    await page.getByLabel('Purpose').waitFor();
    expect(await page.locator('astro-island[ssr]').count()).toBeGreaterThan(0);
    await page.getByLabel('Command name').fill(`Typed early ${run}`);
    await page.getByLabel('Purpose').fill('before the scripts came');
    release();
    await hydrated(page);
    await page.getByTestId('add-step-command').selectOption({ index: 1 });
    await page.getByRole('button', { name: 'Add step', exact: true }).click();
    await page.getByTestId('sequence-step').first().waitFor();
    expect(await page.getByLabel('Command name').inputValue()).toBe(`Typed early ${run}`);
    expect(await page.getByLabel('Purpose').inputValue()).toBe('before the scripts came');
    await page.unroute('**/_astro/**/*.js');
  });
});
