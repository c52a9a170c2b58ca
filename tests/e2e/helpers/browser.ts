/**
 * Launches Debian's Chromium through playwright-core (never a downloaded browser) and watches every page it
 * opens: a console error or an uncaught page error fails the test unless the test allowed it (`allow`); `visit`
 * and `shot` check the screen with axe-core and, at phone width, that the page does not scroll sideways.
 */
import { TEST_OUTBOX_KEY } from '../../helpers/server';
import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { afterEach, inject } from 'vitest';
import { checkLater, checkPending, checkScreen } from './screen-checks';

export const CHROMIUM = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
export const DEMO_PASSWORD = 'baudbook-demo';
export const ARTIFACTS = 'tests/e2e/.artifacts';

export const PHONE = { width: 390, height: 844 };
export const DESKTOP = { width: 1280, height: 860 };

/**
 * The browser's time zone and language differ from the test server's (UTC, en-US) on purpose, as a
 * colleague's phone abroad would: text the server renders one way and the browser another shows up as a
 * hydration error.
 */
export const BROWSER_TIME_ZONE = 'Pacific/Auckland';
export const BROWSER_LOCALE = 'de-DE';

export interface Browser {
  context: BrowserContext;
  page: Page;
  baseUrl: string;
  /**
   * Allows console errors this test provokes on purpose (a 404 or 409 it asks for logs "Failed to load
   * resource: … 404"). Each pattern is matched against the message text; a string matches as a substring.
   */
  allow(...patterns: (string | RegExp)[]): void;
  /** Console and page errors seen so far that no `allow` pattern matched. */
  unexpectedErrors(): string[];
  close(): Promise<void>;
}

export async function openBrowser(options: { viewport?: { width: number; height: number } } = {}): Promise<Browser> {
  const baseUrl = inject('baseUrl');
  const userDataDir = mkdtempSync(join(tmpdir(), 'baudbook-chromium-'));
  const context = await chromium.launchPersistentContext(userDataDir, {
    executablePath: CHROMIUM,
    headless: true,
    viewport: options.viewport ?? DESKTOP,
    baseURL: baseUrl,
    locale: BROWSER_LOCALE,
    timezoneId: BROWSER_TIME_ZONE,
    permissions: ['clipboard-read', 'clipboard-write'],
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
  });
  const allowed: (string | RegExp)[] = [];
  const errors: string[] = [];
  const where = (url: string | undefined) => (url ? new URL(url, baseUrl).pathname : '?');
  context.on('console', (m) => {
    if (m.type() === 'error') errors.push(`console error on ${where(m.page()?.url())}: ${m.text()}`);
  });
  context.on('weberror', (e) => errors.push(`uncaught error on ${where(e.page()?.url())}: ${e.error().message}`));
  const page = context.pages()[0] ?? (await context.newPage());
  let closed = false;
  return {
    context,
    page,
    baseUrl,
    allow(...patterns) {
      allowed.push(...patterns);
    },
    unexpectedErrors() {
      return errors.filter((e) => !allowed.some((p) => (typeof p === 'string' ? e.includes(p) : p.test(e))));
    },
    async close() {
      if (closed) return;
      closed = true;
      await context.close();
      rmSync(userDataDir, { recursive: true, force: true });
    },
  };
}

/**
 * Waits until every React island on the page has hydrated (Astro drops the `ssr` attribute then), and every part
 * an island loads after it is interactive has hydrated too (`data-later="ready"`, src/components/composer/Later.tsx).
 */
export async function hydrated(page: Page): Promise<void> {
  await page.waitForFunction(() => !document.querySelector('astro-island[ssr]') && !document.querySelector('[data-later="loading"]'));
}

/** Navigates and waits for the islands to hydrate, so clicks reach React handlers. */
export async function visit(page: Page, path: string): Promise<void> {
  await checkPending(page);
  await page.goto(path);
  await hydrated(page);
  checkLater(page);
}

export async function signIn(page: Page, email: string, password = DEMO_PASSWORD): Promise<void> {
  await visit(page, '/sign-in');
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'));
  await hydrated(page);
}

/** Saves a screenshot under tests/e2e/.artifacts/ (git-ignored) for people to look at. */
export async function shot(page: Page, name: string, fullPage = true): Promise<string> {
  await checkScreen(page, { always: true });
  mkdirSync(ARTIFACTS, { recursive: true });
  const path = join(ARTIFACTS, `${name}.png`);
  await page.screenshot({ path, fullPage });
  return path;
}

/** The newest outbox message to `to` and its first link, read through the development outbox page. */
export async function outboxLink(page: Page, to: string): Promise<string> {
  await page.goto(`/dev/outbox?key=${TEST_OUTBOX_KEY}`);
  const link = page.locator(`li[data-to="${to}"]`).first().locator('a').first();
  return (await link.getAttribute('href'))!;
}

/**
 * For one test file: opens browsers on demand and closes every one of them after each test; the test fails
 * if any of its pages logged a console error or threw an error it did not `allow`.
 */
export function browserPool(): (options?: Parameters<typeof openBrowser>[0]) => Promise<Browser> {
  let open: Browser[] = [];
  afterEach(async () => {
    const problems: string[] = [];
    for (const b of open) {
      for (const p of b.context.pages()) await checkPending(p).catch((e: Error) => problems.push(e.message));
      const unexpected = b.unexpectedErrors();
      if (unexpected.length) problems.push(`The browser reported errors this test did not allow:\n${unexpected.join('\n')}`);
    }
    await Promise.all(open.map((b) => b.close()));
    open = [];
    if (problems.length) throw new Error(problems.join('\n\n'));
  });
  return async (options) => {
    const b = await openBrowser(options);
    open.push(b);
    return b;
  };
}
