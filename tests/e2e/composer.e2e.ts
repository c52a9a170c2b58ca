/** The command composer in Chromium: the acceptance example built through the UI, copy, reply decoding, the public workbench. */
import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { browserPool, DESKTOP, PHONE, shot, signIn, visit, type Browser } from './helpers/browser';

const browser = browserPool();

const DRIVE = '/vault/devices/dev_demo_drv501/commands';
const notation = (page: Page, id: string) => page.getByTestId(`notation-${id}`).textContent();
const stamp = Date.now().toString(36).slice(-5).toUpperCase();
/** The 409 a colleague's earlier save provokes, which the browser logs as a failed resource. */
const CONFLICT_409 = 'the server responded with a status of 409';

/** A colleague's write (or the setup's), through the API with the page's session. */
async function api(page: Page, method: string, path: string, data?: unknown) {
  const res = await page.request.fetch(path, { method, data, headers: { origin: new URL(page.url()).origin } });
  expect(res.status(), await res.text()).toBeLessThan(300);
  return res.json();
}

/** A command of our own (a copy of a demo jog), so the demo jogs the other tests read stay as they are. */
const ownCommand = (page: Page, name: string) => api(page, 'POST', '/api/commands/cmd_demo_drv501_jog_fwd/copy', { deviceId: 'dev_demo_drv501', name });

async function addText(page: Page, text: string) {
  await page.locator('#req-add-kind').selectOption('text');
  await page.locator('#req-add-text').fill(text);
  await page.getByRole('group', { name: 'Add a segment' }).getByRole('button', { name: 'Add segment' }).click();
}

async function addNumber(page: Page, f: { name: string; label: string; unit: string; raw: string; spr?: number; factor?: number; sign?: 'always' }) {
  await page.locator('#req-add-kind').selectOption('integer');
  await page.getByRole('group', { name: 'Add a segment' }).getByRole('button', { name: 'Add segment' }).click();
  const seg = page.getByTestId('segments');
  await seg.getByLabel('Name (key)').fill(f.name);
  await seg.getByLabel('Label', { exact: true }).fill(f.label);
  await seg.getByLabel('Unit', { exact: true }).fill(f.unit);
  await seg.getByLabel('Raw unit').fill(f.raw);
  if (f.spr) await seg.getByLabel('Steps per revolution').fill(String(f.spr));
  if (f.factor) await seg.getByLabel('Scale factor (raw per unit)').fill(String(f.factor));
  if (f.sign) await seg.getByLabel('Sign').selectOption(f.sign);
}

/** Keystroke-to-preview time: keydown timestamp to the mutation of the PLC literal, measured inside the page. */
async function measureUpdate(page: Page, inputId: string, keys: string[]): Promise<number[]> {
  await page.evaluate(() => {
    const w = window as unknown as { __t0: number; __times: number[] };
    w.__times = [];
    document.addEventListener('keydown', () => (w.__t0 = performance.now()), { capture: true });
    const target = document.querySelector('[data-testid="notation-iecLiteral"]')!;
    new MutationObserver(() => w.__times.push(performance.now() - w.__t0)).observe(target, { subtree: true, characterData: true, childList: true });
  });
  await page.locator(`#${inputId}`).focus();
  for (const k of keys) {
    const before = await page.evaluate(() => (window as unknown as { __times: number[] }).__times.length);
    await page.keyboard.press(k);
    await page.waitForFunction((n) => (window as unknown as { __times: number[] }).__times.length > n, before);
  }
  return page.evaluate(() => (window as unknown as { __times: number[] }).__times);
}

describe('command composer in the browser', () => {
  it('builds the 45° index move from an empty command, shows every notation, copies the PLC literal and saves', async () => {
    const b = await browser({ viewport: DESKTOP });
    await signIn(b.page, 'engineer@fernhollow.test');
    await visit(b.page, `${DRIVE}/new`);
    const page = b.page;
    await page.getByLabel('Command name').fill('Index 45° (built in test)');
    await page.getByLabel('This command moves machinery').check();
    await page.getByTestId('machinery-caution').waitFor();
    await page.getByLabel('Sent on port').selectOption('Service RS-232');

    await addText(page, '1!idx:');
    await addNumber(page, { name: 'angle', label: 'Index angle', unit: '°', raw: 'steps', spr: 36000, sign: 'always' });
    await addText(page, '/R');
    await addNumber(page, { name: 'accel', label: 'Acceleration', unit: 'rev/s²', raw: 'steps/s²', factor: 36000 });
    await addText(page, '/F');
    await addNumber(page, { name: 'decel', label: 'Deceleration', unit: 'rev/s²', raw: 'steps/s²', factor: 36000 });
    await addText(page, '/S');
    await addNumber(page, { name: 'speed', label: 'Velocity', unit: 'rev/s', raw: 'steps/s', factor: 36000 });

    await page.getByLabel('Index angle (°)').fill('45');
    await page.getByLabel('Acceleration (rev/s²)').fill('5');
    await page.getByLabel('Deceleration (rev/s²)').fill('5');
    await page.getByLabel('Velocity (rev/s)').fill('0.5');
    await expect.poll(() => page.getByTestId('both-angle').textContent()).toBe('45 ° = 4500 steps');

    const text = '1!IDX:+4500/R180000/F180000/S18000';
    expect(await notation(page, 'iecLiteral')).toBe(`'${text}$0D'`);
    expect(await notation(page, 'iec')).toBe(`${text}$0D`);
    expect(await notation(page, 'escaped')).toBe(`${text}\\r`);
    expect(await notation(page, 'mnemonic')).toBe(`${text}<CR>`);
    expect(await notation(page, 'hex')).toBe([...`${text}\r`].map((c) => c.charCodeAt(0).toString(16).toUpperCase().padStart(2, '0')).join(' '));
    expect(await notation(page, 'decimal')).toBe([...`${text}\r`].map((c) => c.charCodeAt(0)).join(' '));
    expect((await notation(page, 'wordsHex'))!.split(' ')).toHaveLength(18);
    expect(await page.getByTestId('byte-count').textContent()).toBe('35');
    expect(await page.getByTestId('char-count').textContent()).toBe(String(text.length + 5));
    expect(await page.locator('[data-timing="frame"] td').first().textContent()).toBe('36.458 ms');
    expect(await page.getByTestId('no-findings').count()).toBe(1);

    await page.getByTestId('byte-cells').getByRole('button').nth(7).focus();
    expect(await page.getByTestId('byte-detail').textContent()).toContain('Field Index angle');

    await page.getByRole('button', { name: 'Copy PLC string literal' }).click();
    await page.getByTestId('notation-iecLiteral').locator('..').getByText('Copied').waitFor();
    expect(await page.evaluate(() => navigator.clipboard.readText())).toBe(`'${text}$0D'`);
    await shot(page, 'composer-index-move-desktop');

    const times = await measureUpdate(page, 'value-angle', ['Backspace', 'Backspace', '9', '0', 'Backspace', 'Backspace', '4', '5']);
    const sorted = [...times].sort((a, b) => a - b);
    console.log(`[composer] keystroke → preview update (ms): ${times.map((t) => t.toFixed(1)).join(', ')}; median ${sorted[Math.floor(sorted.length / 2)]!.toFixed(1)} ms, max ${sorted.at(-1)!.toFixed(1)} ms`);
    expect(await notation(page, 'iecLiteral')).toBe(`'${text}$0D'`);

    await page.getByRole('button', { name: 'Save command' }).click();
    await page.waitForURL(/\/commands\/cmd_/);
    await page.getByText('Saved · version 1').waitFor();
    expect(await notation(page, 'iecLiteral')).toBe(`'${text}$0D'`);

    // Signed in, the workbench offers this team's devices to save to, without a hydration error.
    await visit(page, '/workbench');
    await page.getByLabel('Device', { exact: true }).locator('option', { hasText: 'DRV-501' }).first().waitFor({ state: 'attached' });
  });

  it('asks before saving a command with error findings, and its history says it was saved with them', async () => {
    const b = await browser({ viewport: DESKTOP });
    await signIn(b.page, 'engineer@fernhollow.test');
    await visit(b.page, `${DRIVE}/new`);
    const page = b.page;
    await page.getByLabel('Command name').fill('Too long for the port (test)');
    await page.getByLabel('Sent on port').selectOption('Service RS-232');
    // The service port's frame rules allow 64 bytes a frame: 70 letters and the CR are too many.
    await addText(page, 'A'.repeat(70));
    await expect.poll(() => page.getByTestId('byte-count').textContent()).toBe('71');
    await page.getByRole('button', { name: 'Save command' }).click();
    const ask = page.getByTestId('save-with-findings');
    await ask.waitFor();
    expect(await ask.textContent()).toMatch(/error finding/);
    await shot(page, 'composer-save-with-findings', false);
    await ask.getByRole('button', { name: /^Save with/ }).click();
    await page.waitForURL(/\/commands\/cmd_/);
    const id = page.url().split('/').pop()!;
    const history = await page.request.get(`/api/commands/${id}/revisions`);
    expect((await history.json()).items[0].summary).toMatch(/ · saved with an error finding \(/);
  });

  it('shows a colleague\'s save beside mine and re-applies only my changes, at phone width', async () => {
    const a = await browser({ viewport: PHONE });
    const b = await browser({ viewport: PHONE });
    b.allow(CONFLICT_409);
    for (const x of [a, b]) await signIn(x.page, 'engineer@fernhollow.test');
    const origin = new URL(a.page.url()).origin;
    // a command of our own, so the demo jogs the other tests read stay as they are
    const copy = await a.page.request.fetch('/api/commands/cmd_demo_drv501_jog_fwd/copy', { method: 'POST', data: { deviceId: 'dev_demo_drv501', name: 'Jog conflict' }, headers: { origin } });
    expect(copy.status(), await copy.text()).toBeLessThan(300);
    const { id } = await copy.json();
    for (const x of [a, b]) await visit(x.page, `${DRIVE}/${id}`);
    await a.page.getByLabel('Command name').fill('Jog conflict (theirs)');
    await a.page.getByLabel('Purpose').fill('their purpose');
    await a.page.getByRole('button', { name: 'Save changes' }).click();
    await a.page.getByText('Saved · version 2').waitFor();

    const page = b.page;
    await page.getByLabel('Purpose').fill('my purpose');
    await page.getByLabel('Notes').fill('my notes');
    await page.getByRole('button', { name: 'Move segment 2 down' }).first().click();
    await page.getByRole('button', { name: 'Save changes' }).click();
    const conflict = page.getByTestId('conflict');
    await conflict.waitFor();
    expect(await conflict.locator('li', { hasText: 'Command name' }).textContent()).toContain('their change');
    expect(await conflict.locator('li', { hasText: 'Purpose' }).textContent()).toContain('both changed');
    expect(await conflict.locator('li', { hasText: 'Order of the request segments' }).textContent()).toContain('your change');
    expect(await page.getByText('Save mine over version').count()).toBe(0);
    await shot(page, 'composer-conflict-phone');
    await conflict.getByRole('button', { name: 'Apply my changes on version 2' }).click();
    await page.getByText('Saved · version 3').waitFor();
    const saved = await (await page.request.get(`/api/commands/${id}`)).json();
    expect(saved).toMatchObject({ name: 'Jog conflict (theirs)', purpose: 'my purpose', notes: 'my notes', version: 3 });
    expect(saved.template.segments.map((s: { type: string }) => s.type)).toEqual(['integer', 'integer', 'literal', 'terminator']);
    expect(await page.getByLabel('Command name').inputValue()).toBe('Jog conflict (theirs)');
  });

  it('moving a command someone saved meanwhile shows their change first; "Keep it" writes nothing, the next ask moves it', async () => {
    const b = await browser({ viewport: DESKTOP });
    b.allow(CONFLICT_409);
    const { page } = b;
    page.on('dialog', (d) => d.accept());
    await signIn(page, 'engineer@fernhollow.test');
    const name = `Trash conflict ${stamp}`;
    const { id } = await ownCommand(page, name);
    await visit(page, DRIVE);
    const row = page.locator(`li[data-command="${name}"]`);
    await row.waitFor();
    await page.waitForLoadState('networkidle');
    // A colleague saves the command after the library was listed.
    await api(page, 'PATCH', `/api/commands/${id}`, { version: 1, purpose: `their purpose ${stamp}` });
    await row.getByRole('button', { name: 'Move to trash' }).click();
    const conflict = row.getByTestId('conflict');
    await conflict.waitFor();
    expect(await conflict.textContent()).toContain('Nothing was moved to the trash');
    const purpose = conflict.locator('li', { hasText: 'Purpose' });
    expect(await purpose.textContent()).toContain('their change');
    expect(await purpose.locator('[data-side="theirs"]').textContent()).toBe(`their purpose ${stamp}`);
    expect(await purpose.locator('[data-side="mine"]').textContent()).toBe('not changed by you');
    await conflict.scrollIntoViewIfNeeded();
    await shot(page, 'composer-library-trash-conflict-desktop', false);
    await page.setViewportSize(PHONE);
    await conflict.scrollIntoViewIfNeeded();
    await shot(page, 'composer-library-trash-conflict-phone', false);
    await page.setViewportSize(DESKTOP);

    // "Keep it": nothing is written, the command stays at their version.
    await conflict.getByRole('button', { name: 'Keep it' }).click();
    await conflict.waitFor({ state: 'detached' });
    expect(await api(page, 'GET', `/api/commands/${id}`)).toMatchObject({ version: 2, purpose: `their purpose ${stamp}` });
    await page.waitForLoadState('networkidle');

    // They save once more; this time the move goes ahead over the version the notice names.
    await api(page, 'PATCH', `/api/commands/${id}`, { version: 2, notes: `their notes ${stamp}` });
    await row.getByRole('button', { name: 'Move to trash' }).click();
    await conflict.waitFor();
    expect(await conflict.locator('li', { hasText: 'Notes' }).locator('[data-side="theirs"]').textContent()).toBe(`their notes ${stamp}`);
    await conflict.getByRole('button', { name: 'Move version 3 to the trash' }).click();
    await row.waitFor({ state: 'detached' });
    const gone = await page.request.get(`/api/commands/${id}`);
    expect(gone.status()).toBe(404);
    const trashed = await api(page, 'GET', '/api/commands?deviceId=dev_demo_drv501&trashed=true');
    expect(trashed.items.find((c: { id: string }) => c.id === id)).toMatchObject({ version: 4, notes: `their notes ${stamp}` });
  });

  it('restoring a revision after someone saved shows their change first; "Keep" writes nothing, the next ask restores', async () => {
    const b = await browser({ viewport: DESKTOP });
    b.allow(CONFLICT_409);
    const { page } = b;
    await signIn(page, 'engineer@fernhollow.test');
    const { id } = await ownCommand(page, `Restore conflict ${stamp}`);
    const v1 = await api(page, 'GET', `/api/commands/${id}`);
    await api(page, 'PATCH', `/api/commands/${id}`, { version: 1, purpose: 'second purpose' });
    await visit(page, `${DRIVE}/${id}`);
    await page.getByRole('button', { name: 'Show history (version 2)' }).click();
    const history = page.getByTestId('history');
    await history.getByRole('button', { name: 'Restore v1' }).waitFor();
    await page.waitForLoadState('networkidle');
    // A colleague saves while I look at version 2.
    await api(page, 'PATCH', `/api/commands/${id}`, { version: 2, notes: `their notes ${stamp}` });
    await history.getByRole('button', { name: 'Restore v1' }).click();
    const conflict = page.getByTestId('conflict');
    await conflict.waitFor();
    expect(await conflict.textContent()).toContain('while you were looking at version 2; it is now at version 3');
    expect(await conflict.textContent()).toContain('Nothing was restored');
    const notes = conflict.locator('li', { hasText: 'Notes' });
    expect(await notes.textContent()).toContain('their change');
    expect(await notes.locator('[data-side="theirs"]').textContent()).toBe(`their notes ${stamp}`);
    expect(await conflict.locator('li').count()).toBe(1);
    await conflict.scrollIntoViewIfNeeded();
    await shot(page, 'composer-restore-conflict-desktop', false);
    await page.setViewportSize(PHONE);
    await conflict.scrollIntoViewIfNeeded();
    await shot(page, 'composer-restore-conflict-phone', false);
    await page.setViewportSize(DESKTOP);

    // "Keep version 3": nothing is written and the composer shows their version.
    await conflict.getByRole('button', { name: 'Keep version 3' }).click();
    await page.getByText('Saved · version 3').waitFor();
    expect(await page.getByLabel('Notes').inputValue()).toBe(`their notes ${stamp}`);
    expect(await api(page, 'GET', `/api/commands/${id}`)).toMatchObject({ version: 3, purpose: 'second purpose', notes: `their notes ${stamp}` });
    await history.getByRole('button', { name: 'Restore v1' }).waitFor();
    await page.waitForLoadState('networkidle');

    // They save again; restoring version 1 over the version the notice names puts it back whole.
    await api(page, 'PATCH', `/api/commands/${id}`, { version: 3, purpose: `their purpose ${stamp}` });
    await history.getByRole('button', { name: 'Restore v1' }).click();
    await conflict.waitFor();
    expect(await conflict.locator('li', { hasText: 'Purpose' }).locator('[data-side="theirs"]').textContent()).toBe(`their purpose ${stamp}`);
    await conflict.getByRole('button', { name: 'Restore revision 1 over version 4' }).click();
    await page.getByText('Saved · version 5').waitFor();
    expect(await api(page, 'GET', `/api/commands/${id}`)).toMatchObject({ version: 5, purpose: v1.purpose, notes: v1.notes });
    expect(await page.getByLabel('Purpose').inputValue()).toBe(v1.purpose);
  });

  it('shows the jogs as PLC literals and decodes a reply with a bad checksum, at phone width', async () => {
    const b = await browser({ viewport: PHONE });
    await signIn(b.page, 'engineer@fernhollow.test');
    const page = b.page;
    await visit(page, DRIVE);
    await page.getByTestId('command-list').getByRole('link', { name: 'Jog +1°' }).waitFor();
    await shot(page, 'composer-library-phone');
    for (const [id, literal] of [['cmd_demo_drv501_jog_fwd', "'1!JOG:+100$0D'"], ['cmd_demo_drv501_jog_rev', "'1!JOG:-100$0D'"]]) {
      await visit(page, `${DRIVE}/${id}`);
      expect(await notation(page, 'iecLiteral')).toBe(literal);
      expect(await page.getByTestId('byte-count').textContent()).toBe('11');
      expect(await page.locator('[data-timing="frame"] td').first().textContent()).toBe('11.458 ms');
    }
    await shot(page, 'composer-jog-phone');

    await visit(page, `${DRIVE}/cmd_demo_drv501_status`);
    expect(await notation(page, 'iecLiteral')).toBe("'1?STA*48$0D'");
    await page.getByLabel('Received reply').fill('1=STA:+0004500,R*15$0D');
    const verdict = page.getByTestId('checksum-verdict');
    await expect.poll(() => verdict.getAttribute('data-ok')).toBe('false');
    expect(await verdict.textContent()).toContain('expected 0x14, received 0x15');
    expect(await page.getByTestId('reply-result').locator('[data-code="checksum-mismatch"]').count()).toBe(1);
    expect(await page.getByTestId('reply-fields').textContent()).toContain('45');
    await page.getByLabel('Received reply').fill('31 3D 53 54 41 3A 2B 30 30 30 34 35 30 30 2C 52 2A 31 34 0D');
    await expect.poll(() => verdict.getAttribute('data-ok')).toBe('true');
    expect(await page.locator('[data-timing="reply"] td').first().textContent()).toBe('20.833 ms');
    await page.getByLabel('Received reply').fill('1=STA:+0004500,R*15$0D');
    await shot(page, 'composer-reply-phone');
  });

  it('works signed out on the public workbench and asks to sign in to save', async () => {
    for (const [name, viewport] of [['phone', PHONE], ['desktop', DESKTOP]] as const) {
      const b = await browser({ viewport });
      const page = b.page;
      await visit(page, '/workbench');
      await page.locator('#req-add-kind').selectOption('text');
      await page.locator('#req-add-text').fill('HELLO');
      await page.getByRole('button', { name: 'Add segment' }).click();
      expect(await notation(page, 'iecLiteral')).toBe("'HELLO$0D'");
      await page.getByLabel('Baud').selectOption('19200');
      expect(await page.locator('[data-timing="char"] td').first().textContent()).toBe('0.521 ms');
      await page.getByLabel('Bytes, in any notation').fill('02 41 42 03');
      expect(await page.getByTestId('checksums').locator('tr[data-algorithm="XOR-8"]').textContent()).toContain('0x02');
      const link = page.getByTestId('sign-in-to-save');
      expect(await link.getAttribute('href')).toBe('/sign-in?next=%2Fworkbench');
      await shot(page, `workbench-${name}`);
      await b.close();
    }
  });
});
