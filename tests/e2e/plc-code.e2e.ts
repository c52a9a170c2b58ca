/**
 * The composer's PLC code panel in Chromium: the name prefix, Copy and the .st download, on the demo jog. The code
 * is run in the test evaluator (tests/plc/st-eval.ts); the jog's bytes are the demo syntax worked by hand
 * (1° × 100 = 100 steps: "1!JOG:+100" then CR).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { browserPool, shot, signIn, visit } from './helpers/browser';
import { runSt } from '../plc/st-eval';

const openInPool = browserPool();

describe('PLC code panel', () => {
  it('names the POU with the prefix, copies the code and downloads it as a .st file that builds the jog', async () => {
    const b = await openInPool();
    const { page } = b;
    await signIn(page, 'technician@fernhollow.test');
    await visit(page, '/vault/devices/dev_demo_drv501/commands/cmd_demo_drv501_jog_fwd');
    const panel = page.getByTestId('plc-code');
    await panel.getByText('Structured Text that builds this command from its fields at run time').click();
    const code = panel.getByTestId('plc-code-text');
    await code.waitFor();
    expect(await code.textContent()).toMatch(/FUNCTION Jog_Plus_1 : STRING\(/);

    await panel.getByLabel('Name prefix').fill('DRV_');
    await expect.poll(() => code.textContent()).toMatch(/FUNCTION DRV_Jog_Plus_1 : STRING\(/);
    const text = (await code.textContent())!;
    expect(text).toMatch(/^\(\* CAUTION: the commands this code builds move machinery/);
    const run = runSt(text, { address: 1, angle: 100 });
    expect([run.outputs.ERROR, run.result]).toEqual([0, '1!JOG:+100\r']);

    await panel.getByRole('button', { name: 'Copy PLC code' }).click();
    await panel.getByText('Copied').waitFor();
    expect(await page.evaluate(() => navigator.clipboard.readText())).toBe(text);

    const [download] = await Promise.all([page.waitForEvent('download'), panel.getByRole('link', { name: 'Download .st' }).click()]);
    expect(download.suggestedFilename()).toBe('DRV_Jog_Plus_1.st');
    expect(readFileSync((await download.path())!, 'utf8')).toBe(text);

    // A prefix that starts no IEC identifier: the reason, and no code to copy or download.
    await panel.getByLabel('Name prefix').fill('1X');
    await panel.getByRole('alert').waitFor();
    expect(await panel.getByRole('alert').textContent()).toMatch(/prefix/i);
    expect(await panel.getByRole('link', { name: 'Download .st' }).count()).toBe(0);
    await shot(page, 'plc-code-panel');
  });
});
