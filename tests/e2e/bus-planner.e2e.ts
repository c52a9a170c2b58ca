/** The bus planner on the demo drive bus: the poll cycle panel at phone width, its finding, an edit, print. */
import { describe, expect, it } from 'vitest';
import { ARTIFACTS, browserPool, DESKTOP, PHONE, shot, signIn, visit } from './helpers/browser';

const openInPool = browserPool();

describe('poll cycle panel', () => {
  it('finds the short response timeout on the demo bus, clears it after an edit, and fits 390 px and print', { timeout: 120_000 }, async () => {
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
    // A technician reads the saved plan (role matrix: link:update is engineer and above): no save button, fields read-only.
    expect(await panel.getByRole('button', { name: 'Save the plan' }).count()).toBe(0);
    expect(await rows.nth(2).getByLabel('Response time (ms)').isDisabled()).toBe(true);

    // An engineer at the same width tries figures.
    const edit = (await openInPool({ viewport: PHONE })).page;
    await signIn(edit, 'engineer@fernhollow.test');
    await visit(edit, '/vault/links/link_demo_churn_bus');
    const editPanel = edit.getByTestId('poll-cycle');
    const editFindings = editPanel.getByTestId('cycle-findings');
    const editRows = editPanel.getByTestId('poll-row');
    await editRows.nth(2).getByLabel('Response time (ms)').fill('30');
    await expect.poll(() => editFindings.locator('[data-code="response-timeout-too-short"]').count()).toBe(0);
    await editPanel.getByLabel('Target cycle (ms)').fill('100');
    await expect.poll(() => editFindings.locator('[data-code="cycle-over-target"]').count()).toBe(1);

    await edit.emulateMedia({ media: 'print' });
    expect(await editPanel.getByTestId('bus-timeline').isVisible()).toBe(true);
    await shot(edit, 'bus-planner-print');
    await editPanel.getByTestId('bus-timeline').screenshot({ path: `${ARTIFACTS}/bus-planner-timeline-print.png` });

    const desktop = (await openInPool({ viewport: DESKTOP })).page;
    await signIn(desktop, 'engineer@fernhollow.test');
    await visit(desktop, '/vault/links/link_demo_churn_bus');
    await desktop.getByTestId('poll-cycle').scrollIntoViewIfNeeded();
    await shot(desktop, 'bus-planner-desktop');
    await desktop.getByTestId('poll-cycle').screenshot({ path: `${ARTIFACTS}/bus-planner-panel-desktop.png` });
  });

  it('saves the plan and loads it again after a reload', async () => {
    const { page } = await openInPool({ viewport: DESKTOP });
    await signIn(page, 'engineer@fernhollow.test');
    await visit(page, '/vault/links/link_demo_churn_bus');
    const panel = page.getByTestId('poll-cycle');
    expect(await panel.getByTestId('plan-state').textContent()).toContain('The saved plan of this bus');
    expect(await panel.getByLabel('Target cycle (ms)').inputValue()).toBe('250');
    await panel.getByLabel('Target cycle (ms)').fill('300');
    await panel.getByText('Cable layout (drops)').click();
    await panel.getByLabel('Drop (m)').nth(2).fill('4');
    await panel.getByRole('button', { name: 'Save the plan' }).click();
    await panel.getByText('Nothing to save.').waitFor();
    await shot(page, 'bus-planner-saved');

    await visit(page, '/vault/links/link_demo_churn_bus');
    expect(await panel.getByLabel('Target cycle (ms)').inputValue()).toBe('300');
    await panel.getByText('Cable layout (drops)').click();
    expect(await panel.getByLabel('Drop (m)').nth(2).inputValue()).toBe('4');
    // The saved plan still keeps PLC-200's 50 ms timeout: DRV-203's 60 ms reply is still found.
    expect(await panel.getByTestId('cycle-findings').locator('[data-code="response-timeout-too-short"]').count()).toBe(1);
    // The history names the change.
    await page.getByRole('heading', { name: 'History' }).scrollIntoViewIfNeeded();
    await page.getByRole('cell', { name: 'busPlan.targetCycleMs', exact: true }).first().waitFor({ state: 'attached' });
  });
});
