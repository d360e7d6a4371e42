// Headless Debian chromium driven by playwright-core, in a fresh profile per session,
// with every call home cut off, and screenshots under test-results/e2e/.
import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import * as os from 'node:os';
import * as path from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { repoRoot } from '../support/paths';
import { e2eTools } from './tools';

export const screenshotDir = path.join(repoRoot, 'test-results', 'e2e');

/** Readable screenshots for the README as well as for a failing run. */
export const viewport = { width: 1400, height: 900 };

const chromiumArgs = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  // A dead proxy stops chromium's own calls home; loopback bypasses proxies.
  '--proxy-server=http://127.0.0.1:9',
];

export interface BrowserSession {
  context: BrowserContext;
  page: Page;
  close(): Promise<void>;
}

/** A fresh profile each time: Workspace Trust lives in the browser profile, so a new one starts untrusted. */
export async function openBrowser(): Promise<BrowserSession> {
  const profileDir = mkdtempSync(path.join(os.tmpdir(), 'slopecheck-chromium-'));
  const context = await chromium.launchPersistentContext(profileDir, {
    executablePath: e2eTools.chromium,
    headless: true,
    args: chromiumArgs,
    viewport,
  });
  const page = context.pages()[0] ?? (await context.newPage());
  return {
    context,
    page,
    async close() {
      await context.close();
      rmSync(profileDir, { recursive: true, force: true });
    },
  };
}

/** Saves test-results/e2e/<name>.png and returns its path. */
export async function screenshot(page: Page, name: string): Promise<string> {
  mkdirSync(screenshotDir, { recursive: true });
  const file = path.join(screenshotDir, `${name}.png`);
  await page.screenshot({ path: file, animations: 'disabled' });
  return file;
}
