/**
 * Debian's Chromium driven by playwright-core. No test tool downloads a browser of its own:
 * `CHROMIUM_PATH` overrides the default `/usr/bin/chromium`.
 */
import { mkdtemp, rm, mkdir } from 'node:fs/promises';
import { existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';

export const ARTIFACT_DIR = resolve('test-artifacts');

export interface TestBrowser {
  browser: BrowserContext;
  close(): Promise<void>;
}

export async function launchBrowser(): Promise<TestBrowser> {
  const executablePath = process.env['CHROMIUM_PATH'] ?? '/usr/bin/chromium';
  if (!existsSync(executablePath)) {
    throw new Error(`Chromium not found at ${executablePath}: run 'apt-get install -y chromium' or set CHROMIUM_PATH`);
  }
  const profile = await mkdtemp(join(tmpdir(), 'tiltwatch-chromium-'));
  // launchPersistentContext takes the fresh profile folder the flags below need on this machine.
  const browser = await chromium.launchPersistentContext(profile, {
    executablePath,
    headless: true,
    viewport: { width: 1440, height: 900 },
    args: [
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
  });
  await mkdir(ARTIFACT_DIR, { recursive: true });
  return {
    browser,
    async close() {
      await browser.close();
      await rm(profile, { recursive: true, force: true });
    },
  };
}

export type { Browser };

/** Signs in on the sign-in screen that `page` shows, as a person would type it. */
export async function signInOnPage(page: Page, email: string, password: string): Promise<void> {
  await page.getByLabel('Email').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
}
