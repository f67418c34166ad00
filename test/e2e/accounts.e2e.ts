import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { ARTIFACT_DIR } from '../support/browser.js';
import { openSignedIn, useBrowserStack } from '../support/browser-stack.js';
import { DEMO_PASSWORD } from '../support/stack.js';

describe('Accounts in Chromium', () => {
  const env = useBrowserStack({ simulator: false });

  it('an admin adds an account and disables another on the Users page; sign-in delays show there', async () => {
    // Three wrong guesses and one more put a delay on the lead account: a security event.
    for (let i = 0; i < 4; i++) {
      await fetch(`${env.stack.server.url}/api/auth/login`, {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({ email: 'lead@tiltwatch.example', password: `wrong guess ${i}` }),
      });
    }
    const page = await openSignedIn(env, 'admin');
    await page.getByRole('navigation', { name: 'Pages' }).getByRole('link', { name: 'Users' }).click();
    await page.getByRole('heading', { name: 'Accounts' }).waitFor();

    await page.getByRole('button', { name: 'Add account' }).click();
    const add = page.getByRole('dialog');
    await add.getByLabel('E-mail').fill('night.operator@lindqvist-hall.example');
    await add.getByRole('combobox', { name: 'Role' }).click();
    await page.getByRole('option', { name: /^operator/ }).click();
    await add.getByLabel('First password').fill('night shift pass phrase');
    await add.getByLabel('Note for the audit trail (optional)').fill('joins the night shift');
    await add.getByRole('button', { name: 'Add account' }).click();
    await add.waitFor({ state: 'detached' });
    const row = page.getByRole('row', { name: /night\.operator@lindqvist-hall\.example/ });
    await row.waitFor();

    await page.getByRole('button', { name: 'Disable viewer@tiltwatch.example' }).click();
    const disable = page.getByRole('dialog');
    await disable.getByLabel('Reason').fill('account not used on this apparatus');
    await disable.getByRole('button', { name: 'Disable' }).click();
    await disable.waitFor({ state: 'detached' });
    await expect.poll(() => page.getByRole('row', { name: /viewer@tiltwatch\.example/ }).innerText()).toMatch(/Disabled/);

    await page.getByRole('button', { name: 'Refresh' }).click();
    await expect.poll(() => page.getByRole('region', { name: 'Sign-in security' }).innerText()).toMatch(/Account lead@tiltwatch\.example/);
    await page.screenshot({ path: join(ARTIFACT_DIR, 'users-page.png'), fullPage: true });
    expect((await row.innerText()).toLowerCase()).toContain('operator');
  });

  it('a signed-in operator changes their own password from the account menu and stays signed in', async () => {
    const page = await openSignedIn(env, 'operator');
    await page.getByRole('button', { name: /Your account/ }).click();
    await page.getByRole('menuitem', { name: /Change password/ }).click();
    const dialog = page.getByRole('dialog');
    // A refusal names the field as the dialog labels it, and stands next to that field.
    await dialog.getByLabel('Current password').fill('not the password at all');
    await dialog.getByLabel('New password', { exact: true }).fill('operator night pass phrase');
    await dialog.getByLabel('New password again').fill('operator night pass phrase');
    await dialog.getByRole('button', { name: 'Change password' }).click();
    const current = dialog.locator('mat-form-field', { has: page.getByLabel('Current password') });
    await expect.poll(() => current.innerText()).toMatch(/Current password: is not your current password/);
    expect(await dialog.innerText()).not.toMatch(/currentPassword/);
    await page.screenshot({ path: join(ARTIFACT_DIR, 'change-password-refused.png') });
    await dialog.getByLabel('Current password').fill(DEMO_PASSWORD);
    await dialog.getByLabel('New password', { exact: true }).fill('operator night pass phrase');
    await dialog.getByLabel('New password again').fill('operator night pass phrase');
    await page.screenshot({ path: join(ARTIFACT_DIR, 'change-password.png') });
    await dialog.getByRole('button', { name: 'Change password' }).click();
    await dialog.waitFor({ state: 'detached' });
    await page.getByText('Password changed. Your other sign-ins have ended.').waitFor();
    await page.screenshot({ path: join(ARTIFACT_DIR, 'change-password-done.png') });
    expect(page.url()).not.toMatch(/sign-in/);
    const res = await fetch(`${env.stack.server.url}/api/auth/login`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ email: 'operator@tiltwatch.example', password: 'operator night pass phrase' }),
    });
    expect(res.status).toBe(200);
  });
});
