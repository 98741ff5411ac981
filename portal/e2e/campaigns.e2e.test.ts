import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { demoPerson, portalUrl, screenshot, signIn, tableSettled, useBrowser } from './browser';

const INES = demoPerson('ines.albrecht@brennmoor.example');
const TOBIAS = demoPerson('tobias.wendt@brennmoor.example');

/** Picks an option of a PrimeVue Select by its visible label. */
async function choose(page: Page, testId: string, label: string | RegExp) {
  await page.getByTestId(testId).click();
  await page.getByRole('listbox').getByRole('option', { name: label }).first().click();
}

/** Types into a text box as a person does: select what is there, then type over it. */
async function retype(page: Page, testId: string, text: string) {
  const box = page.getByTestId(testId);
  await box.fill('');
  await box.pressSequentially(text);
}

const liveTotal = (page: Page) => page.getByTestId('live-total').first().textContent();
const criticalNotice = (page: Page) => page.getByTestId('notice-grid-misses-critical-disorder');

describe('campaigns', () => {
  describe('proposal form', () => {
    const browser = useBrowser();

    it('should update the estimate and the notices as the grid changes, save the draft, and let the PI submit it', async () => {
      const page = browser.page;
      const title = `Finite-size scaling of the orthogonal class ${Date.now().toString(36)}`;
      await signIn(page, INES.email);

      await page.getByTestId('nav-campaigns').click();
      await page.waitForURL((url) => url.pathname === '/campaigns');
      await tableSettled(page.getByTestId('campaigns-table'));
      await page.getByTestId('new-campaign').click();
      await page.waitForURL((url) => url.pathname === '/campaigns/new');
      // The open round is the only one, so the form picks it once its lists have loaded.
      await expect.poll(() => page.getByTestId('campaign-round').textContent()).toContain('Coldwater allocation round 2');

      await page.getByTestId('campaign-title').fill(title);
      await page.getByTestId('campaign-abstract').fill('Transfer-matrix study of Lambda around the critical disorder of the 3D Anderson model.');
      await page.getByTestId('campaign-justification').fill('## Plan\nBars of **L = 6 … 16** at 0.5 % precision.');
      await choose(page, 'campaign-machine', /fjell/);

      // The typical plan brackets W_c: an estimate and no critical-disorder notice.
      await expect.poll(() => liveTotal(page)).toMatch(/\d/);
      expect(await criticalNotice(page).count()).toBe(0);
      const before = await liveTotal(page);

      // A grid below W_c = 16.54: the notice appears and the estimate follows the new grid.
      await retype(page, 'disorder-from', '12');
      await retype(page, 'disorder-to', '14');
      await criticalNotice(page).first().waitFor();
      expect(await criticalNotice(page).first().textContent()).toContain('16.54');
      await expect.poll(() => liveTotal(page)).not.toBe(before);
      await screenshot(page, 'campaign-form-notice');

      // Back across W_c: the notice goes away again.
      await retype(page, 'disorder-from', '15');
      await retype(page, 'disorder-to', '18');
      await expect.poll(() => criticalNotice(page).count()).toBe(0);
      await expect.poll(() => liveTotal(page)).toBe(before);
      await screenshot(page, 'campaign-form');

      await page.getByTestId('save-campaign').click();
      await page.waitForURL((url) => /^\/campaigns\/[0-9a-f-]{36}$/.test(url.pathname));
      const detailPath = new URL(page.url()).pathname;
      await expect.poll(() => page.getByTestId('campaign-state').first().textContent()).toContain('Draft');
      await page.getByTestId('estimate-table').waitFor();
      // A researcher drafts; only the group's PI submits.
      expect(await page.getByTestId('submit-campaign').count()).toBe(0);
      await screenshot(page, 'campaign-detail-draft');

      await page.getByTestId('sign-out').click();
      await page.waitForURL(portalUrl('/signed-out'));

      await signIn(page, TOBIAS.email);
      await page.goto(portalUrl(detailPath));
      await page.getByRole('heading', { level: 1, name: title }).waitFor();
      await page.getByTestId('submit-campaign').click();
      const dialog = page.getByTestId('transition-dialog');
      await dialog.waitFor();
      await dialog.getByTestId('transition-note').fill('Checked the grid with Ines.');
      await dialog.getByTestId('transition-confirm').click();
      await expect.poll(() => page.getByTestId('campaign-state').first().textContent()).toContain('Submitted');
      await expect.poll(() => page.getByTestId('campaign-history').textContent()).toContain('Checked the grid with Ines.');
      expect(await page.getByTestId('edit-campaign').count()).toBe(0);
      await screenshot(page, 'campaign-detail-submitted');
    });
  });

  describe('lists and rounds', () => {
    const browser = useBrowser();

    it('should show the demo campaigns with filters kept in the address, and the rounds to the office', async () => {
      const page = browser.page;
      await signIn(page, demoPerson('dana.whitfield@coldwater-network.example').email);
      await page.goto(portalUrl('/campaigns?state=granted'));
      const table = page.getByTestId('campaigns-table');
      await tableSettled(table);
      await expect.poll(() => table.locator('tbody tr').count()).toBeGreaterThan(0);
      expect(await table.textContent()).toContain('Conductance at the 3D unitary critical point');
      expect(await table.textContent()).not.toContain('Level statistics across the 3D transition');
      await screenshot(page, 'campaigns-granted');

      await page.getByTestId('nav-rounds').click();
      await page.waitForURL((url) => url.pathname === '/admin/rounds');
      const rounds = page.getByTestId('rounds-table');
      await tableSettled(rounds);
      await expect.poll(() => rounds.textContent()).toContain('Coldwater allocation round 2');
      await screenshot(page, 'rounds');
    });
  });

  describe('pilot timings, withdrawal and print', () => {
    const browser = useBrowser();

    it('should fit pasted pilot timings into the estimate, refuse a bad CSV beside the field, and withdraw and print a draft', async () => {
      const page = browser.page;
      const title = `Pilot-calibrated bars ${Date.now().toString(36)}`;
      await signIn(page, INES.email);
      await page.goto(portalUrl('/campaigns/new'));
      await expect.poll(() => page.getByTestId('campaign-round').textContent()).toContain('Coldwater allocation round 2');
      await page.getByTestId('campaign-title').fill(title);
      await page.getByTestId('campaign-abstract').fill('Transfer-matrix bars whose cost comes from pilot jobs timed on fjell.');
      await choose(page, 'campaign-machine', /fjell/);

      // A CSV without its cores column is refused where it was pasted, and the default rate stays.
      await page.getByTestId('pilot-csv').fill('size,seconds\n6,40\n8,230');
      await page.getByTestId('pilot-read').click();
      await expect.poll(() => page.getByTestId('pilot-problems').textContent()).toContain('missing: cores');
      expect(await page.getByTestId('estimate-rate').textContent()).toContain('Default rate');

      await page.getByTestId('pilot-csv').fill('size,seconds,cores\n6,41,1\n8,228,1\n10,890,1\n12,2630,1');
      await page.getByTestId('pilot-read').click();
      await page.getByTestId('pilot-fit').waitFor();
      expect(Number(await page.getByTestId('pilot-r2').textContent())).toBeGreaterThan(0.99);
      await expect.poll(() => page.getByTestId('estimate-rate').textContent()).toContain('4 pilot timings');
      await screenshot(page, 'campaign-form-pilots');

      await page.getByTestId('save-campaign').click();
      await page.waitForURL((url) => /^\/campaigns\/[0-9a-f-]{36}$/.test(url.pathname));
      const detailPath = new URL(page.url()).pathname;
      await expect.poll(() => page.getByTestId('estimate-rate').textContent()).toContain('4 pilot timings');

      await page.getByTestId('withdraw-campaign').click();
      const dialog = page.getByTestId('transition-dialog');
      await dialog.getByTestId('transition-note').fill('Folded into the larger campaign.');
      await dialog.getByTestId('transition-confirm').click();
      await expect.poll(() => page.getByTestId('campaign-state').first().textContent()).toContain('Withdrawn');
      expect(await page.getByTestId('withdraw-campaign').count()).toBe(0);

      await page.goto(portalUrl(`${detailPath}/print`));
      const sheet = page.getByTestId('campaign-print');
      await expect.poll(() => sheet.textContent()).toContain(title);
      expect(await sheet.textContent()).toContain('Folded into the larger campaign.');
      expect(await page.getByTestId('nav-campaigns').count()).toBe(0);
      await screenshot(page, 'campaign-print');
    });
  });

  describe('rounds', () => {
    const browser = useBrowser();

    it('should show errors beside the fields of an empty round and open a round once they are filled', async () => {
      const page = browser.page;
      const name = `Round e2e ${Date.now().toString(36)}`;
      await signIn(page, demoPerson('dana.whitfield@coldwater-network.example').email);
      await page.goto(portalUrl('/admin/rounds'));
      await tableSettled(page.getByTestId('rounds-table'));
      await page.getByTestId('add-round').click();
      const dialog = page.getByTestId('round-dialog');
      await dialog.waitFor();

      await dialog.getByRole('button', { name: 'Open round' }).click();
      await expect.poll(() => dialog.getByRole('alert').count()).toBeGreaterThan(1);
      expect(await dialog.textContent()).toContain('Name needs at least 3 characters');

      await dialog.getByTestId('round-name').fill(name);
      // Dates typed into the boxes (local time), as a person types them.
      for (const [id, text] of [['round-opens', '2026-11-01T00:00'], ['round-closes', '2027-06-30T23:59']] as const) {
        await page.locator(`#${id}`).fill(text);
        await page.locator(`#${id}`).press('Tab');
        await expect.poll(() => page.locator(`#${id}`).inputValue()).toBe(text);
      }
      await dialog.getByTestId('pool-machine-0').fill('tarn-gpu');
      await page.locator('#pool-0-hours').fill('250000');
      await dialog.getByTestId('round-name').click();
      await dialog.getByRole('button', { name: 'Open round' }).click();

      await page.getByRole('alert').filter({ hasText: 'Round opened' }).first().waitFor();
      await expect.poll(() => page.getByTestId('rounds-table').textContent()).toContain(name);
      expect(await page.getByTestId('rounds-table').textContent()).toContain('tarn-gpu');
    });
  });

  describe('narrow window', () => {
    const browser = useBrowser({ viewport: { width: 768, height: 1000 } });

    it('should show the form and its live estimate at 768 px without sideways scrolling', async () => {
      const page = browser.page;
      await signIn(page, INES.email);
      await page.goto(portalUrl('/campaigns/new'));
      await expect.poll(() => liveTotal(page)).toMatch(/\d/);
      const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
      expect(overflow).toBeLessThanOrEqual(0);
      await screenshot(page, 'campaign-form-768');
    });
  });
});
