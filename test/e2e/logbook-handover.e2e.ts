import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { ARTIFACT_DIR } from '../support/browser.js';
import { openPage, openSignedIn, useBrowserStack } from '../support/browser-stack.js';
import { pngBytes } from '../support/sample-files.js';

/**
 * The Logbook and Handover screens in Chromium against the real stack: writing with a file and a
 * pasted image, raw HTML shown as text, search, a correction beside the original; then a handover
 * prepared and submitted by the operator and accepted by the lead after reading every section.
 */
describe('Logbook and Handover in Chromium', () => {
  const env = useBrowserStack({ env: { TILTWATCH_STALE_TRIP_MS: '2000' } });

  it('writes entries with files, shows raw HTML as text, searches, and keeps a correction beside the original', async () => {
    const page = await openSignedIn(env, 'operator');
    await openPage(page, 'Logbook');
    const composer = page.getByRole('form', { name: 'Write an entry' });
    await composer.waitFor();

    await composer.getByLabel('Entry').fill('Chiller **restarted** after the supply alarm. <img src=x onerror="document.title=\'owned\'">');
    await composer.getByLabel('Tags').fill('cooling, facilities');
    await composer.getByLabel('Files to attach').setInputFiles({ name: 'chiller-panel.png', mimeType: 'image/png', buffer: pngBytes(24) });
    // A screenshot pasted from the clipboard becomes an attachment as well.
    await composer.getByLabel('Entry').evaluate((box, b64) => {
      // Runs in the page: its DOM classes, typed here because the Node compilation has no DOM library.
      const dom = globalThis as unknown as { DataTransfer: new () => { items: { add(file: File): void } }; ClipboardEvent: new (type: string, init: object) => Event };
      const data = new dom.DataTransfer();
      data.items.add(new File([Uint8Array.from(atob(b64), (c) => c.charCodeAt(0))], 'image.png', { type: 'image/png' }));
      box.dispatchEvent(new dom.ClipboardEvent('paste', { clipboardData: data, bubbles: true, cancelable: true }));
    }, pngBytes(12).toString('base64'));
    const files = composer.getByRole('list', { name: 'Files to attach' });
    await expect.poll(() => files.getByRole('listitem').count()).toBe(2);
    expect(await files.innerText()).toMatch(/chiller-panel\.png[\s\S]*pasted-.*\.png/);
    await composer.getByRole('button', { name: 'Add to logbook' }).click();

    const timeline = page.getByRole('region', { name: 'Entries, newest first' });
    const first = timeline.getByRole('article').first();
    await expect.poll(() => first.innerText(), { timeout: 10_000 }).toMatch(/Chiller restarted after the supply alarm/);
    expect(await first.locator('strong', { hasText: 'restarted' }).count()).toBe(1);
    // The raw HTML is text on the page, never an element, and ran nothing.
    expect(await first.innerText()).toContain('<img src=x onerror=');
    expect(await first.locator('.text img').count()).toBe(0);
    expect(await page.title()).not.toBe('owned');
    await expect.poll(() => first.getByRole('img').count(), { timeout: 10_000 }).toBe(2);

    await composer.getByLabel('Entry').fill('Night shift quiet; **no** alarms after midnight.');
    await composer.getByRole('button', { name: 'Add to logbook' }).click();
    await expect.poll(() => timeline.getByRole('article').count()).toBe(2);

    const search = page.getByRole('search', { name: 'Search the logbook' });
    await search.getByLabel('Search').fill('chillers');
    await search.getByRole('button', { name: 'Search' }).click();
    await expect.poll(() => timeline.getByRole('article').count()).toBe(1);
    expect(await timeline.getByRole('article').first().innerText()).toMatch(/Chiller/);

    await timeline.getByRole('article').first().getByRole('button', { name: 'Write a correction' }).click();
    expect(await composer.getByRole('status').innerText()).toMatch(/Writing a correction of entry #1/);
    await composer.getByLabel('Entry').fill('Correction: facilities restarted the **second** chiller, not the first.');
    await composer.getByRole('button', { name: 'Add correction' }).click();
    await search.getByRole('button', { name: 'Show all' }).click();
    await expect.poll(() => timeline.getByRole('article').count()).toBe(3);
    const original = timeline.getByRole('article', { name: 'Entry 1' });
    expect(await original.getByRole('note').innerText()).toMatch(/Corrected later by entry #3/);
    expect(await timeline.getByRole('article', { name: 'Entry 3' }).innerText()).toMatch(/Correction of entry #1/);
    await page.screenshot({ path: join(ARTIFACT_DIR, 'logbook.png'), fullPage: true });
    await page.close();
  });

  it('hands a shift over: prepared and submitted by the operator, read and accepted by the lead', async () => {
    const outgoing = await openSignedIn(env, 'operator');
    await openPage(outgoing, 'Handover');
    await outgoing.getByRole('button', { name: 'Start handover' }).click();
    const sheet = outgoing.getByRole('article', { name: 'Handover 1' });
    await sheet.waitFor();
    expect(await sheet.innerText()).toMatch(/Handover 1 — Draft/);
    const logbookSection = sheet.getByRole('region', { name: 'Logbook entries of the shift' });
    expect(await logbookSection.innerText()).toMatch(/Chiller restarted/);
    expect(await sheet.getByRole('region', { name: 'Runs and shots' }).innerText()).toMatch(/No run in this shift/);
    await sheet.getByRole('region', { name: 'Summary' }).getByLabel('Summary').fill('Chiller restarted; keep an eye on coil x temperature.');
    await sheet.getByRole('region', { name: 'Interlock trips and resets' }).getByLabel('Your notes on this').fill('None tonight.');
    const items = sheet.getByRole('region', { name: 'Open items' });
    await items.getByRole('button', { name: 'Add an open item' }).click();
    await items.getByLabel('New open item').fill('Facilities to check the chiller pump on Monday.');
    await sheet.getByRole('button', { name: 'Submit for acceptance' }).click();
    await expect.poll(() => sheet.innerText(), { timeout: 10_000 }).toMatch(/Waiting for acceptance/);
    expect(await sheet.innerText()).toMatch(/You handed this shift over/);
    expect(await sheet.getByRole('button', { name: 'Accept handover' }).count()).toBe(0);
    await outgoing.screenshot({ path: join(ARTIFACT_DIR, 'handover-submitted.png'), fullPage: true });
    await outgoing.close();

    const incoming = await openSignedIn(env, 'lead');
    await openPage(incoming, 'Handover');
    const same = incoming.getByRole('article', { name: 'Handover 1' });
    await same.waitFor();
    expect(await same.innerText()).toMatch(/Handed over by\s*operator@tiltwatch\.example/);
    expect(await same.getByRole('region', { name: 'Open items' }).innerText()).toMatch(/Facilities to check the chiller pump/);
    const accept = same.getByRole('button', { name: 'Accept handover' });
    expect(await accept.isDisabled()).toBe(true);
    for (const box of await same.getByRole('checkbox', { name: 'Read' }).all()) await box.check();
    await same.getByLabel('Comment (optional)').fill('Read and talked through.');
    await accept.click();
    await expect.poll(() => same.innerText(), { timeout: 10_000 }).toMatch(/Handover 1 — Accepted/);
    const text = await same.innerText();
    expect(text).toMatch(/Handed over by\s*operator@tiltwatch\.example/);
    expect(text).toMatch(/Accepted by\s*lead@tiltwatch\.example/);
    expect(text).toMatch(/frozen/);
    expect(await incoming.getByRole('region', { name: 'Handover history' }).innerText()).toMatch(/Accepted/);
    await incoming.screenshot({ path: join(ARTIFACT_DIR, 'handover-accepted.png'), fullPage: true });
    await incoming.close();
  });
});
