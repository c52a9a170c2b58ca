/** Launches Debian's Chromium through playwright-core (never a downloaded browser). */
import { TEST_OUTBOX_KEY } from '../../helpers/server';
import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { afterEach, inject } from 'vitest';

export const CHROMIUM = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
export const DEMO_PASSWORD = 'baudbook-demo';
export const ARTIFACTS = 'tests/e2e/.artifacts';

export const PHONE = { width: 390, height: 844 };
export const DESKTOP = { width: 1280, height: 860 };

export interface Browser {
  context: BrowserContext;
  page: Page;
  baseUrl: string;
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
  const page = context.pages()[0] ?? (await context.newPage());
  return {
    context,
    page,
    baseUrl,
    async close() {
      await context.close();
      rmSync(userDataDir, { recursive: true, force: true });
    },
  };
}

/** Waits until every React island on the page has hydrated (Astro drops the `ssr` attribute then). */
export async function hydrated(page: Page): Promise<void> {
  await page.waitForFunction(() => !document.querySelector('astro-island[ssr]'));
}

/** Navigates and waits for the islands to hydrate, so clicks reach React handlers. */
export async function visit(page: Page, path: string): Promise<void> {
  await page.goto(path);
  await hydrated(page);
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

/** For one test file: opens browsers on demand and closes every one of them after each test. */
export function browserPool(): (options?: Parameters<typeof openBrowser>[0]) => Promise<Browser> {
  let open: Browser[] = [];
  afterEach(async () => {
    await Promise.all(open.map((b) => b.close()));
    open = [];
  });
  return async (options) => {
    const b = await openBrowser(options);
    open.push(b);
    return b;
  };
}
