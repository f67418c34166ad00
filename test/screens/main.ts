/**
 * `npm run screens`: screenshots of every page at laptop size (1366×768) and wall size
 * (1920×1080), as the lead and (for the admin pages) the admin, against the real stack with
 * the simulated controller, written to a fresh temporary folder that the script names. It
 * also lists any visible text under 12 px. For looking at the screens; nothing is committed.
 */
import { mkdtemp } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { launchBrowser } from '../support/browser.js';
import { signInFresh } from '../support/browser-stack.js';
import { TOUR, smallText, visit } from '../support/page-tour.js';
import { startStack } from '../support/stack.js';

const SIZES = [
  { name: 'laptop', width: 1366, height: 768 },
  { name: 'wall', width: 1920, height: 1080 },
] as const;

const out = await mkdtemp(join(tmpdir(), 'tiltwatch-screens-'));
const stack = await startStack();
const chrome = await launchBrowser();
try {
  const page = await chrome.browser.newPage();
  for (const role of ['lead', 'admin'] as const) {
    await signInFresh(page, stack.server.url, role);
    for (const size of SIZES) {
      await page.setViewportSize(size);
      for (const stop of TOUR.filter((s) => s.role === role)) {
        await visit(page, stack.server.url, stop);
        await page.screenshot({ path: join(out, `${stop.name}-${size.name}.png`), fullPage: true });
        for (const small of await smallText(page)) console.log(`${stop.name} (${size.name}): text under 12 px: ${small}`);
      }
    }
  }
  console.log(`Screenshots in ${out}`);
} finally {
  await chrome.close();
  await stack.close();
}
