import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import type { AppSettings } from '../../scripts/lib/app';

/** The app under test; the server serves both the web app and /api on it. */
export const baseUrl = (process.env.E2E_BASE_URL ?? 'http://127.0.0.1:3000').replace(/\/+$/, '');

/** Password of the seeded demo accounts. */
export const demoPassword = process.env.DEMO_PASSWORD ?? 'dialsheet-demo';

/**
 * The browser step's app settings (database, storage, mail, demo videos), for a test that starts
 * servers of its own on the same database and storage (restart and scale-out drills).
 */
export function browserStepSettings(): AppSettings {
  const raw = process.env.E2E_APP_SETTINGS;
  if (!raw) throw new Error('E2E_APP_SETTINGS is not set: run these tests through `npm test -- browser-tests`, which starts the app and passes its settings');
  return JSON.parse(raw) as AppSettings;
}

// The distribution's Chromium; we never download a browser.
const executablePath = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';

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

const repoRoot = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..', '..');
export const resultsDir = path.join(repoRoot, 'test-results');

export interface BrowserSession {
  context: BrowserContext;
  page: Page;
  close: () => Promise<void>;
}

/** Starts Chromium with a fresh profile (no cookies, no storage) and one page. */
export async function launchBrowser(): Promise<BrowserSession> {
  const userDataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'dialsheet-e2e-profile-'));
  const context = await chromium.launchPersistentContext(userDataDir, {
    executablePath,
    headless: true,
    args: CHROMIUM_FLAGS,
    baseURL: baseUrl,
    viewport: { width: 1360, height: 860 },
    locale: 'en-GB',
  });
  context.setDefaultTimeout(15_000);
  const page = context.pages()[0] ?? (await context.newPage());
  return {
    context,
    page,
    close: async () => {
      await context.close();
      fs.rmSync(userDataDir, { recursive: true, force: true });
    },
  };
}

/** Runs the steps; if one fails, saves a full-page screenshot under test-results/ and rethrows. */
export async function withFailureScreenshot(page: Page, name: string, steps: () => Promise<void>): Promise<void> {
  try {
    await steps();
  } catch (error) {
    fs.mkdirSync(resultsDir, { recursive: true });
    const file = path.join(resultsDir, `${name}-${new Date().toISOString().replace(/[:.]/g, '-')}.png`);
    await page.screenshot({ path: file, fullPage: true }).catch(() => undefined);
    console.error(`Screenshot of the failure: ${path.relative(repoRoot, file)} (at ${page.url()})`);
    throw error;
  }
}

/** Fails fast with a clear message when nothing answers at the base URL. */
export async function assertServerUp(): Promise<void> {
  const response = await fetch(`${baseUrl}/api/health`).catch((cause: unknown) => {
    throw new Error(`No server at ${baseUrl} (set E2E_BASE_URL): ${String(cause)}`);
  });
  if (!response.ok) throw new Error(`The server at ${baseUrl} is not healthy: HTTP ${response.status}`);
}
