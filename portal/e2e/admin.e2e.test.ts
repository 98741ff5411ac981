import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { demoPerson, eventually, MAIL_INBOX_URL, screenshot, signIn, tableSettled, useBrowser } from './browser';

const ADMIN = demoPerson('dana.whitfield@coldwater-network.example');
const PRIYA = demoPerson('priya.raman@kestrel.example');
const GRANTED = { role: 'committee', label: 'Committee' } as const;

/** Opens the people page filtered to one person by the URL-kept search box and returns their row. */
async function filterPeopleTo(page: Page, email: string) {
  await page.getByTestId('nav-people').click();
  await page.waitForURL((url) => url.pathname === '/admin/people');
  const table = page.getByTestId('people-table');
  await tableSettled(table);
  await page.getByLabel('Name or e-mail').fill(email);
  await page.waitForURL((url) => url.searchParams.get('q') === email);
  const rows = table.locator('tbody tr');
  await expect.poll(() => rows.count()).toBe(1);
  await expect.poll(() => rows.first().textContent()).toContain(email);
  return rows.first();
}

/**
 * Gives `person` the role through the person dialog. When they hold it already (a re-run on the
 * same database), it is revoked first, through the dialog and its confirmation.
 */
async function grantThroughDialog(page: Page, person: { id: string; name: string }, role: string, label: string) {
  await page.getByTestId(`edit-person-${person.id}`).click();
  const dialog = page.getByRole('dialog', { name: person.name });
  await dialog.waitFor();
  await dialog.getByRole('heading', { name: 'Roles' }).waitFor();

  const revoke = dialog.getByTestId(`revoke-role-${role}`);
  if (await revoke.isVisible()) {
    await revoke.click();
    const confirm = page.getByRole('alertdialog', { name: `Revoke ${label}?` });
    await confirm.getByRole('button', { name: 'Revoke role' }).click();
    await page.getByRole('alert').filter({ hasText: 'Role revoked' }).first().waitFor();
    await revoke.waitFor({ state: 'detached' });
  }

  const startedAt = Date.now();
  await dialog.getByRole('combobox', { name: 'Role to grant' }).click();
  await page.getByRole('listbox').getByRole('option', { name: label, exact: true }).click();
  await expect.poll(() => dialog.getByRole('combobox', { name: 'Role to grant' }).textContent()).toBe(label);
  await dialog.getByTestId('grant-role').click();

  const toast = page.getByRole('alert').filter({ hasText: 'Role granted' });
  await toast.waitFor();
  expect(await toast.textContent()).toContain(`${person.name} is now ${label}.`);
  await dialog.getByTestId(`revoke-role-${role}`).waitFor();
  await dialog.locator('.held').getByText(label, { exact: true }).waitFor();
  return { dialog, startedAt };
}

interface InboxEntry {
  id: string;
  subject: string;
  time: string;
  to: { address: string }[];
}

async function inbox(): Promise<InboxEntry[]> {
  const res = await fetch(`${MAIL_INBOX_URL}/api/email`);
  if (!res.ok) throw new Error(`mail inbox answered ${res.status}`);
  return (await res.json()) as InboxEntry[];
}

describe('admin', () => {
  describe('roles', () => {
    const browser = useBrowser();

    it('should show the toast, the role tag and an audit entry when the admin grants a role', async () => {
      const page = browser.page;
      await signIn(page, ADMIN.email);

      const row = await filterPeopleTo(page, PRIYA.email);
      expect(await row.textContent()).toContain(PRIYA.name);

      const { dialog } = await grantThroughDialog(page, PRIYA, GRANTED.role, GRANTED.label);
      await screenshot(page, 'admin-person-dialog-granted');
      // The footer's Close, not the header's icon button of the same name.
      await dialog.locator('.p-dialog-footer').getByRole('button', { name: 'Close', exact: true }).click();
      await dialog.waitFor({ state: 'hidden' });

      // The table shows the new tag too, and the filter lives in the address.
      await row.getByText(GRANTED.label, { exact: true }).waitFor();
      expect(new URL(page.url()).searchParams.get('q')).toBe(PRIYA.email);
      await screenshot(page, 'admin-people-filtered');

      await page.reload();
      await expect.poll(() => page.getByLabel('Name or e-mail').inputValue()).toBe(PRIYA.email);
      const rows = page.getByTestId('people-table').locator('tbody tr');
      await expect.poll(() => rows.count()).toBe(1);
      await expect.poll(() => rows.first().textContent()).toContain(PRIYA.email);
      await rows.first().getByText(GRANTED.label, { exact: true }).waitFor();

      // One filter after the other, each once the table shows its answer (see 'audit log' below
      // for what happens when the second comes while the first still loads).
      await page.getByTestId('nav-audit').click();
      await page.waitForURL((url) => url.pathname === '/admin/audit');
      const audit = page.getByTestId('audit-table');
      await tableSettled(audit);
      await page.getByLabel('Action').fill('role.granted');
      await page.waitForURL((url) => url.searchParams.get('action') === 'role.granted');
      await expect.poll(async () => new Set(await audit.locator('tbody tr td:nth-child(4)').allTextContents())).toEqual(new Set(['role.granted']));
      await tableSettled(audit);
      await page.getByLabel('Target id').fill(PRIYA.id);
      await page.waitForURL((url) => url.searchParams.get('action') === 'role.granted' && url.searchParams.get('targetId') === PRIYA.id);
      const newest = audit.locator('tbody tr').first();
      await expect.poll(() => newest.locator('td').nth(4).locator('code').getAttribute('title')).toBe(PRIYA.id);
      await tableSettled(audit);
      expect(await newest.textContent()).toContain('role.granted');
      expect(await newest.textContent()).toContain(ADMIN.name);
      const details = Object.fromEntries(
        await newest.locator('dl > div').evaluateAll((rows) => rows.map((r) => [r.querySelector('dt')?.textContent, r.querySelector('dd')?.textContent])),
      );
      expect(details).toEqual({ role: GRANTED.role, email: PRIYA.email });
      await screenshot(page, 'admin-audit-role-granted');
    });

    it('should e-mail the person when the admin grants them a role', async () => {
      const page = browser.page;
      await signIn(page, ADMIN.email);
      await filterPeopleTo(page, PRIYA.email);
      const { startedAt } = await grantThroughDialog(page, PRIYA, GRANTED.role, GRANTED.label);

      // The worker delivers the outbox mail within seconds.
      const mail = await eventually('the access e-mail', async () => {
        for (const entry of await inbox()) {
          if (entry.subject !== 'Your Localis access changed') continue;
          if (!entry.to.some((a) => a.address === PRIYA.email)) continue;
          if (new Date(entry.time).getTime() < startedAt - 2_000) continue;
          const full = (await (await fetch(`${MAIL_INBOX_URL}/api/email/${entry.id}`)).json()) as { text?: string };
          if (full.text?.includes(`You now hold the ${GRANTED.label} role`)) return full;
        }
        return undefined;
      });
      expect(mail.text).toContain(`Hello ${PRIYA.name}`);
    });
  });

  describe('audit log', () => {
    const browser = useBrowser();

    it('should show no error when a second filter is typed while the first one still loads', async () => {
      const page = browser.page;
      await signIn(page, ADMIN.email);
      await page.getByTestId('nav-audit').click();
      await page.waitForURL((url) => url.pathname === '/admin/audit');
      const audit = page.getByTestId('audit-table');
      await tableSettled(audit);

      // As fast as someone pasting into two boxes: the second load aborts the first.
      await page.getByLabel('Action').fill('session.signed-in');
      await page.getByLabel('Done by (person id)').fill(ADMIN.id);
      await page.waitForURL((url) => url.searchParams.get('action') === 'session.signed-in' && url.searchParams.get('actorPersonId') === ADMIN.id);
      await expect.poll(async () => new Set(await audit.locator('tbody tr td:nth-child(4)').allTextContents())).toEqual(new Set(['session.signed-in']));
      await tableSettled(audit);
      await page.waitForLoadState('networkidle');

      // The abandoned load is nobody's error: no error toast. (Fails while the portal's
      // http-client turns an abort during `response.json()` into a 'malformed' ApiError.)
      expect(await page.locator('.p-toast-message-error').allTextContents()).toEqual([]);
    });
  });

  describe('profile tokens', () => {
    const browser = useBrowser();

    it('should show the secret once, list the token and revoke it when a token is created and revoked', async () => {
      const page = browser.page;
      await signIn(page, ADMIN.email);
      await page.getByTestId('nav-profile').click();
      await page.waitForURL((url) => url.pathname === '/profile');
      await page.getByRole('heading', { name: 'API tokens' }).waitFor();

      const name = `e2e token ${Date.now().toString(36)}`;
      await page.getByTestId('new-token').click();
      const form = page.getByRole('dialog', { name: 'New API token' });
      await form.getByLabel('Name').fill(name);
      await form.locator('#scope-runs').check();
      expect(await form.locator('#scope-read').isChecked()).toBe(true);
      await form.getByTestId('create-token').click();

      const created = page.getByRole('dialog', { name: 'Your new API token' });
      await created.waitFor();
      const secret = await created.getByTestId('token-secret').inputValue();
      expect(secret.length).toBeGreaterThan(20);
      await created.getByTestId('token-secret-warning').waitFor();
      await screenshot(page, 'profile-token-secret');
      await created.getByTestId('token-created-done').click();
      await created.waitFor({ state: 'detached' });
      await page.getByRole('alert').filter({ hasText: 'Token created' }).waitFor();

      // Gone from the page for good: neither the field nor the text remains.
      expect(await page.getByTestId('token-secret').count()).toBe(0);
      expect(await page.content()).not.toContain(secret);

      const row = page.getByTestId('token-table').locator('tbody tr').filter({ hasText: name });
      await row.waitFor();
      expect(await row.textContent()).toContain('runs');
      await row.getByText('Active', { exact: true }).waitFor();
      expect(secret.startsWith(((await row.locator('code').textContent()) ?? '').replace('…', ''))).toBe(true);
      await screenshot(page, 'profile-token-listed');

      await row.getByRole('button', { name: `Revoke token ${name}` }).click();
      const confirm = page.getByRole('alertdialog', { name: 'Revoke this token?' });
      await confirm.getByRole('button', { name: 'Revoke token' }).click();
      await confirm.waitFor({ state: 'hidden' });
      await page.getByRole('alert').filter({ hasText: 'Token revoked' }).waitFor();
      await row.getByText('Revoked', { exact: true }).waitFor();
      expect(await row.getByRole('button', { name: `Revoke token ${name}` }).count()).toBe(0);
    });
  });

  describe('narrow screens', () => {
    const browser = useBrowser({ viewport: { width: 768, height: 1024 } });

    it('should still offer the whole navigation when the window is 768 px wide', async () => {
      const page = browser.page;
      await signIn(page, ADMIN.email);
      const nav = page.getByRole('navigation', { name: 'Main' });
      for (const id of ['nav-home', 'nav-profile', 'nav-people', 'nav-institutions', 'nav-audit']) {
        const link = nav.getByTestId(id);
        await link.scrollIntoViewIfNeeded();
        expect(await link.isVisible(), id).toBe(true);
      }
      // Nothing spills sideways out of the page.
      expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(768);
      await screenshot(page, 'home-admin-768');

      await nav.getByTestId('nav-people').click();
      await page.waitForURL((url) => url.pathname === '/admin/people');
      await page.getByTestId('people-table').locator('tbody tr').first().waitFor();
      await screenshot(page, 'admin-people-768');
    });
  });
});
