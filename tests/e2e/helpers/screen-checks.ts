/**
 * Checks of a screen the browser tests are looking at: axe-core's accessibility rules (a serious or critical
 * violation fails the test) and, at phone width, that the page does not scroll sideways. `shot()` checks the
 * screen it photographs (a screenshot marks a state worth looking at, such as an open conflict notice);
 * a page opened by `visit()` and not photographed is checked as the test leaves it (at the next `visit()` or
 * the end of the test), once per path and width in a run, so no page is loaded twice and re-visits cost nothing.
 */
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import type { Page } from 'playwright-core';

const require = createRequire(import.meta.url);
let axeSource: string | null = null;

/** The width of the phone the tests use (PHONE); at or below it the page must fit without sideways scrolling. */
export const PHONE_WIDTH = 390;

/** Rules that fail the test whatever their impact: every screen names itself with one top-level heading. */
const ALWAYS_FAIL = new Set(['page-has-heading-one']);

const checked = new Set<string>();
const pending = new WeakSet<Page>();

/** Marks the page's current screen as one to check before the test leaves it. */
export function checkLater(page: Page): void {
  pending.add(page);
}

/** Checks the page's screen if `visit()` opened it and nothing has checked it since. */
export async function checkPending(page: Page): Promise<void> {
  if (!pending.has(page)) return;
  pending.delete(page);
  if (!page.isClosed()) await checkScreen(page);
}

interface AxeNode { target: string[]; failureSummary?: string; html: string }
interface AxeViolation { id: string; impact: string | null; help: string; nodes: AxeNode[] }

/** Runs axe-core in the page (injected through the debugging protocol, which the page's CSP does not govern). */
export async function axeViolations(page: Page): Promise<AxeViolation[]> {
  axeSource ??= readFileSync(require.resolve('axe-core/axe.min.js'), 'utf8');
  if (!(await page.evaluate(() => 'axe' in window))) await page.evaluate(axeSource);
  return page.evaluate(async () => {
    const axe = (window as unknown as { axe: { run(ctx: unknown, opts: unknown): Promise<{ violations: AxeViolation[] }> } }).axe;
    // The label-versus-name rule is marked experimental in axe-core; WCAG 2.5.3 asks for it all the same.
    const result = await axe.run(document, { rules: { 'label-content-name-mismatch': { enabled: true } }, resultTypes: ['violations'] });
    return result.violations.map((v) => ({ id: v.id, impact: v.impact, help: v.help, nodes: v.nodes.map((n) => ({ target: n.target, failureSummary: n.failureSummary, html: n.html.slice(0, 160) })) }));
  });
}

function describe(v: AxeViolation): string {
  const nodes = v.nodes.slice(0, 5).map((n) => `    ${n.target.join(' ')}: ${n.html}\n      ${(n.failureSummary ?? '').replace(/\n/g, ' ')}`);
  return `  ${v.id} (${v.impact}): ${v.help}\n${nodes.join('\n')}${v.nodes.length > 5 ? `\n    … and ${v.nodes.length - 5} more` : ''}`;
}

/** Fails (throws) on a serious or critical axe violation, or on sideways scrolling at phone width. */
export async function checkScreen(page: Page, { always = false } = {}): Promise<void> {
  const url = new URL(page.url());
  const width = page.viewportSize()?.width ?? 0;
  const key = `${url.pathname}@${width}`;
  if (always) pending.delete(page);
  else if (checked.has(key)) return;
  checked.add(key);
  const problems: string[] = [];
  if (width <= PHONE_WIDTH) {
    const scrollWidth = await page.evaluate(() => document.documentElement.scrollWidth);
    if (scrollWidth > width) problems.push(`  the page is ${scrollWidth} px wide at ${width} px and scrolls sideways`);
  }
  const violations = (await axeViolations(page)).filter((v) => v.impact === 'serious' || v.impact === 'critical' || ALWAYS_FAIL.has(v.id));
  problems.push(...violations.map(describe));
  if (problems.length) throw new Error(`Screen check failed on ${url.pathname} at ${width} px:\n${problems.join('\n')}`);
}
