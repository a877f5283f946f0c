// Headless Chromium for the benchmarks that measure what a person sees: the distribution's
// Chromium (never a downloaded one) with the same flags as the browser tests (e2e/support), a
// fresh profile in the benchmark's scratch directory, closed at the end.
import fs from 'node:fs';
import path from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import type { Scratch } from './harness';

const executablePath = process.env.CHROMIUM_PATH || '/usr/bin/chromium';

const CHROMIUM_FLAGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];

export interface BenchBrowser {
  context: BrowserContext;
  page: Page;
  /** Chromium's version, for the record. */
  version: string;
}

export async function launchBrowser(scratch: Scratch, root: string, baseURL?: string): Promise<BenchBrowser> {
  if (!fs.existsSync(executablePath)) throw new Error(`Chromium not found at ${executablePath} (set CHROMIUM_PATH)`);
  const userDataDir = path.join(root, 'chromium-profile');
  fs.mkdirSync(userDataDir, { recursive: true });
  const context = await chromium.launchPersistentContext(userDataDir, {
    executablePath,
    headless: true,
    args: CHROMIUM_FLAGS,
    baseURL,
    viewport: { width: 1360, height: 860 },
    locale: 'en-GB',
  });
  scratch.add('close Chromium', () => context.close());
  context.setDefaultTimeout(20_000);
  const page = context.pages()[0] ?? (await context.newPage());
  return { context, page, version: context.browser()?.version() ?? (await page.evaluate(() => navigator.userAgent)) };
}

/** Signs in through the sign-in form, as a person would; the session is kept in the page's storage. */
export async function signInThroughForm(page: Page, email: string, password: string): Promise<void> {
  await page.goto('/sign-in');
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.getByRole('heading', { name: 'Campaigns', exact: true }).waitFor();
}

/** A short description of what a page shows, for a message when an expected screen is missing. */
export async function pageSummary(page: Page): Promise<string> {
  const text = await page
    .evaluate(() => (document.body?.innerText ?? '').replace(/\s+/g, ' ').trim().slice(0, 200))
    .catch(() => '(unreadable)');
  return `${page.url()} shows "${text}"`;
}
