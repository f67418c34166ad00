/**
 * The set-up every browser test file shares: the whole stack and Chromium started before the
 * file's tests and closed after them, pages signed in as a person would, and the simulated
 * controller's control API for faults.
 */
import type { Page } from 'playwright-core';
import { afterAll, beforeAll } from 'vitest';
import { launchBrowser, signInOnPage, type TestBrowser } from './browser.js';
import { DEMO_PASSWORD, startStack, type Stack, type StackOptions } from './stack.js';

export interface BrowserStack {
  readonly stack: Stack;
  readonly chrome: TestBrowser;
}

/** Starts the stack and Chromium before the tests of the calling file; closes both after them. */
export function useBrowserStack(options: StackOptions = {}): BrowserStack {
  const started: { stack?: Stack; chrome?: TestBrowser } = {};
  beforeAll(async () => {
    started.stack = await startStack(options);
    started.chrome = await launchBrowser();
  });
  afterAll(async () => {
    await started.chrome?.close();
    await started.stack?.close();
  });
  return {
    get stack() {
      if (!started.stack) throw new Error('the stack is not started yet: use it inside a test');
      return started.stack;
    },
    get chrome() {
      if (!started.chrome) throw new Error('Chromium is not started yet: use it inside a test');
      return started.chrome;
    },
  };
}

/** A demo account's e-mail address for a role name; an address is taken as it is. */
const emailOf = (who: string) => (who.includes('@') ? who : `${who}@tiltwatch.example`);

/**
 * Signs `page` in as `who` (a role of the demo accounts or an e-mail address). The pages of one
 * browser share the stored session, so the previous person's is forgotten first. Resolves once
 * the page navigation shows.
 */
export async function signInFresh(page: Page, baseUrl: string, who: string, password = DEMO_PASSWORD): Promise<void> {
  await page.goto(baseUrl);
  await page.evaluate('localStorage.clear()');
  await page.goto(baseUrl);
  await page.getByLabel('Email').waitFor({ timeout: 60_000 });
  await signInOnPage(page, emailOf(who), password);
  await page.getByRole('navigation', { name: 'Pages' }).waitFor();
}

/** A new page of the shared browser, signed in as `who`; optionally at a given screen size. */
export async function openSignedIn(
  env: BrowserStack,
  who: string,
  options: { password?: string; viewport?: { width: number; height: number } } = {},
): Promise<Page> {
  const page = await env.chrome.browser.newPage();
  if (options.viewport) await page.setViewportSize(options.viewport);
  await signInFresh(page, env.stack.server.url, who, options.password);
  return page;
}

/** Calls the simulated controller's control API (faults, front panel), JSON in and out. */
export function controlSimulator(stack: Stack, method: 'GET' | 'POST' | 'DELETE', path: string, body?: unknown): Promise<Response> {
  if (!stack.simulator) throw new Error('this stack runs without the simulated controller');
  return fetch(`${stack.simulator.controlUrl}${path}`, {
    method,
    headers: body === undefined ? undefined : { 'content-type': 'application/json' },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
}

/** Goes to a page through the navigation, as a person would. */
export function openPage(page: Page, name: string | RegExp): Promise<void> {
  return page.getByRole('navigation', { name: 'Pages' }).getByRole('link', { name }).click();
}
