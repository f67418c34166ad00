import { describe, expect, it } from 'vitest';
import { openSignedIn, useBrowserStack } from '../support/browser-stack.js';
import { TOUR, smallText, visit } from '../support/page-tour.js';

/** No screen sets visible text under 12 px on a laptop-size screen, for the lead and the admin. */
describe('Legibility in Chromium', () => {
  const env = useBrowserStack();

  it.each(['lead', 'admin'] as const)('every page the %s sees has no text under 12 px at 1366×768', async (role) => {
    const page = await openSignedIn(env, role, { viewport: { width: 1366, height: 768 } });
    const small: string[] = [];
    for (const stop of TOUR.filter((s) => s.role === 'lead' || role === 'admin')) {
      await visit(page, env.stack.server.url, stop);
      small.push(...(await smallText(page)).map((s) => `${stop.name}: ${s}`));
    }
    expect(small).toEqual([]);
    await page.close();
  });
});
