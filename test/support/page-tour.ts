/**
 * Every screen of the app, in the order of the navigation, with the role that may see it, and
 * a check run in the browser for text too small to read on a control-room screen.
 */
import type { Page } from 'playwright-core';

export interface TourStop {
  /** Short name for files and messages, e.g. "alarms-limits". */
  name: string;
  path: string;
  /** Least role that sees the page. */
  role: 'lead' | 'admin';
  /** A tab to open after the page has loaded. */
  tab?: string;
}

export const TOUR: readonly TourStop[] = [
  { name: 'live', path: '/live', role: 'lead' },
  { name: 'replay', path: '/replay', role: 'lead' },
  { name: 'map', path: '/map', role: 'lead' },
  { name: 'profiles', path: '/profiles', role: 'lead' },
  { name: 'coil-x', path: '/coils/x', role: 'lead' },
  { name: 'steer', path: '/steer', role: 'lead' },
  { name: 'sequences', path: '/sequences', role: 'lead' },
  { name: 'shots', path: '/shots', role: 'lead' },
  { name: 'alarms', path: '/alarms', role: 'lead' },
  { name: 'alarms-history', path: '/alarms', role: 'lead', tab: 'History' },
  { name: 'alarms-limits', path: '/alarms', role: 'lead', tab: 'Limits' },
  { name: 'interlocks', path: '/interlocks', role: 'lead' },
  { name: 'logbook', path: '/logbook', role: 'lead' },
  { name: 'handover', path: '/handover', role: 'lead' },
  { name: 'calibration', path: '/setup/calibration', role: 'lead' },
  { name: 'users', path: '/users', role: 'admin' },
  { name: 'outbox', path: '/outbox', role: 'admin' },
];

/** The smallest font size any visible text may have, CSS px. */
export const MIN_TEXT_PX = 12;

/** Opens a stop of the tour in a signed-in page and waits until its content has drawn. */
export async function visit(page: Page, baseUrl: string, stop: TourStop): Promise<void> {
  await page.goto(`${baseUrl}${stop.path}`);
  await page.locator('main h1').first().waitFor();
  if (stop.tab) await page.getByRole('tab', { name: stop.tab }).click();
  await page.waitForLoadState('networkidle').catch(() => undefined);
  await page.waitForTimeout(800); // live values and charts a moment to draw
}

/**
 * Visible text set in less than `MIN_TEXT_PX` (SVG text by its size on screen), as
 * "tag.class “text” 10.5px"; icon ligatures are not text.
 */
export function smallText(page: Page): Promise<string[]> {
  return page.locator('body').evaluate((body, min) => {
    const view = body.ownerDocument.defaultView!;
    const found: string[] = [];
    const walker = body.ownerDocument.createTreeWalker(body, 4 /* NodeFilter.SHOW_TEXT */);
    for (let node = walker.nextNode(); node; node = walker.nextNode()) {
      const text = node.textContent?.trim() ?? '';
      const el = node.parentElement;
      if (text === '' || !el || el.closest('mat-icon, .material-symbols-outlined, .material-icons, script, style')) continue;
      if (!el.checkVisibility({ opacityProperty: true, visibilityProperty: true })) continue;
      const box = el.getBoundingClientRect();
      if (box.width <= 1 || box.height <= 1) continue; // visually hidden for screen readers
      let size = parseFloat(view.getComputedStyle(el).fontSize);
      const svgText = el as unknown as { getScreenCTM?: () => { a: number; d: number } | null; ownerSVGElement?: unknown };
      if (svgText.ownerSVGElement && svgText.getScreenCTM) {
        const m = svgText.getScreenCTM();
        if (m) size *= Math.abs(m.d);
      }
      if (size < min - 0.05) found.push(`${el.tagName.toLowerCase()}.${[...el.classList].join('.')} “${text.slice(0, 40)}” ${size.toFixed(1)}px`);
    }
    return found;
  }, MIN_TEXT_PX);
}
