import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { CAMPAIGNS } from '../../seeds/src/campaigns-scenario';
import { PILOT_3D_CAMPAIGN, STRIPS_2D_CAMPAIGN } from '../../seeds/src/results-scenario';
import { demoPerson, portalUrl, screenshot, SCREENSHOT_DIR, signIn, useBrowser } from './browser';

/** A member of the Disordered Lattices group, whose two granted campaigns hold the demo's computed results. */
const INES = demoPerson('ines.albrecht@brennmoor.example');
const titleOf = (id: string) => CAMPAIGNS.find((c) => c.id === id)!.input.title;

/**
 * The test stack's worker checks, analyses and spot-checks the demo archives after start-up:
 * reload the page until all of it is there (a few minutes at most on a busy machine).
 */
async function openWhenReady(page: Page, campaignId: string, ready: (page: Page) => Promise<boolean>): Promise<void> {
  const deadline = Date.now() + 240_000;
  for (;;) {
    await page.goto(portalUrl(`/campaigns/${campaignId}/analysis`));
    await page.getByTestId('spot-checks').waitFor({ state: 'visible' });
    if (await ready(page)) return;
    if (Date.now() > deadline) throw new Error(`the analysis page of ${campaignId} was not ready in time`);
    await page.waitForTimeout(3000);
  }
}

const doneSpotChecks = (page: Page) => page.locator('[data-testid^="spot-check-state-"]', { hasText: /^Done$/ }).count();

describe('the analysis page on the demo results', () => {
  const browser = useBrowser();

  it('should show the 3D pilot’s critical point, its charts and both archives spot-checked within 3 standard errors', async () => {
    const page = browser.page;
    await signIn(page, INES.email);
    await openWhenReady(page, PILOT_3D_CAMPAIGN, async (p) => (await p.getByTestId('parameter-Wc').count()) > 0 && (await doneSpotChecks(p)) === 2);
    await expect.poll(() => page.locator('main').textContent()).toContain(titleOf(PILOT_3D_CAMPAIGN));
    // W_c = 16.54 (Slevin & Ohtsuki 1999, REFERENCES.md); small bars put a screening fit within 1 of it.
    const wc = Number((await page.getByTestId('parameter-Wc').locator('td.value').textContent())?.match(/\d+(\.\d+)?/)?.[0]);
    expect(Math.abs(wc - 16.54)).toBeLessThan(1);
    await expect.poll(() => page.getByTestId('analysis-screening').textContent()).toMatch(/screening/i);
    for (const chart of ['data', 'collapse', 'beta']) await page.getByTestId(`chart-${chart}`).waitFor({ state: 'visible' });
    await expect.poll(() => page.getByTestId('spot-checks-summary').textContent()).toMatch(/6 of 6 points within 3 standard errors/);
    await expect.poll(() => page.getByTestId('spot-check-command').first().textContent()).toMatch(/^localis tmm --dim 3 --width [48] --disorder 15 --energy 0 --precision 0\.\d+ --seed \d+$/);
    await screenshot(page, 'analysis-pilot-3d');
    await page.getByTestId('spot-checks').screenshot({ path: join(SCREENSHOT_DIR, 'analysis-pilot-3d-spot-checks.png') });
  });

  it('should show the 2D strips localizing, spot-checked', async () => {
    const page = browser.page;
    await signIn(page, INES.email);
    await openWhenReady(page, STRIPS_2D_CAMPAIGN, async (p) => (await doneSpotChecks(p)) === 1 && ((await p.getByTestId('parameter-Wc').count()) > 0 || (await p.getByTestId('analysis-failed').count()) > 0));
    await expect.poll(() => page.getByTestId('spot-checks-summary').textContent()).toMatch(/3 of 3 points within 3 standard errors/);
    await screenshot(page, 'analysis-strips-2d');
  });
});
