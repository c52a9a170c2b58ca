/** The bus planner on the demo drive bus: the poll cycle panel at phone width, its finding, an edit, print. */
import { describe, expect, it } from 'vitest';
import { ARTIFACTS, browserPool, DESKTOP, PHONE, shot, signIn, visit } from './helpers/browser';

const openInPool = browserPool();

describe('poll cycle panel', () => {
  it('finds the short response timeout on the demo bus, clears it after an edit, and fits 390 px and print', async () => {
    const { page } = await openInPool({ viewport: PHONE });
    await signIn(page, 'technician@fernhollow.test');
    await visit(page, '/vault/links/link_demo_churn_bus');
    const panel = page.getByTestId('poll-cycle');
    await panel.scrollIntoViewIfNeeded();
    const findings = panel.getByTestId('cycle-findings');
    // DRV-203 answers 60 ms after the 3.5-character interval (Modbus over Serial Line V1.02 §2.5.1.1); PLC-200 waits 50 ms
    expect(await findings.locator('[data-code="response-timeout-too-short"]').count()).toBe(1);
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(PHONE.width);
    await shot(page, 'bus-planner-phone');
    await panel.screenshot({ path: `${ARTIFACTS}/bus-planner-panel-phone.png` });

    const rows = panel.getByTestId('poll-row');
    expect(await rows.count()).toBe(3);
    await rows.nth(2).getByLabel('Response time (ms)').fill('30');
    await expect.poll(() => findings.locator('[data-code="response-timeout-too-short"]').count()).toBe(0);
    await panel.getByLabel('Target cycle (ms)').fill('100');
    await expect.poll(() => findings.locator('[data-code="cycle-over-target"]').count()).toBe(1);

    await page.emulateMedia({ media: 'print' });
    expect(await panel.getByTestId('bus-timeline').isVisible()).toBe(true);
    await shot(page, 'bus-planner-print');
    await panel.getByTestId('bus-timeline').screenshot({ path: `${ARTIFACTS}/bus-planner-timeline-print.png` });

    const desktop = (await openInPool({ viewport: DESKTOP })).page;
    await signIn(desktop, 'engineer@fernhollow.test');
    await visit(desktop, '/vault/links/link_demo_churn_bus');
    await desktop.getByTestId('poll-cycle').scrollIntoViewIfNeeded();
    await shot(desktop, 'bus-planner-desktop');
    await desktop.getByTestId('poll-cycle').screenshot({ path: `${ARTIFACTS}/bus-planner-panel-desktop.png` });
  });
});
