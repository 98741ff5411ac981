import { describe, expect, it } from 'vitest';
import type { Invoice, InvoiceRun, Run } from '@localis/shared';
import type { Page } from 'playwright-core';
import { CAMPAIGNS } from '../../seeds/src/campaigns-scenario';
import { callApi, demoPerson, eventually, portalUrl, screenshot, signIn, useBrowser } from './browser';

/** The demo partner's billing contact, and the office. */
const FELIX = demoPerson('felix.marlow@orrin-qd.example');
const DANA = demoPerson('dana.whitfield@coldwater-network.example');
const DEVICES = CAMPAIGNS.find((c) => c.input.title === 'Disorder-limited density of states in nanowire channels')!;

/**
 * An issued invoice of the partner to pay: the office records a small run of the partner's
 * campaign in a month no other test uses, runs that month and issues its invoice. So the test
 * pays a fresh invoice on every run, against a fresh test stack or a long-lived demo alike.
 */
async function freshIssuedInvoice(page: Page): Promise<Invoice> {
  const month = new Date(Date.UTC(2032 + Math.floor(Math.random() * 60), Math.floor(Math.random() * 12), 1));
  const from = month.toISOString().slice(0, 10);
  const to = new Date(Date.UTC(month.getUTCFullYear(), month.getUTCMonth() + 1, 0)).toISOString().slice(0, 10);
  const started = new Date(month.getTime() + 9 * 86_400_000);
  await callApi<Run>(page, 'POST', `/campaigns/${DEVICES.id}/runs`, {
    externalJobId: `e2e-billing-${Date.now()}`, machine: DEVICES.input.machine, startedAt: started.toISOString(), endedAt: new Date(started.getTime() + 3_600_000).toISOString(),
    cores: 16, codeName: 'kpm-dos', codeVersion: 'e2e', parameters: { sizes: [64], disorder: [1], energies: [], seeds: [1] },
  });
  const run = await callApi<InvoiceRun>(page, 'POST', '/invoice-runs', { from, to });
  const draft = await eventually('the draft of the month', async () => {
    const r = await callApi<{ items: InvoiceRun[] }>(page, 'GET', '/invoice-runs');
    if (r.items.find((x) => x.id === run.id)?.state !== 'done') return undefined;
    const { items } = await callApi<{ items: Invoice[] }>(page, 'GET', `/invoices?state=draft&institutionId=${FELIX.institutionId}`);
    return items.find((i) => i.periodFrom === from);
  }, 60_000);
  return callApi<Invoice>(page, 'POST', `/invoices/${draft.id}/issue`);
}

describe('paying an invoice', () => {
  const browser = useBrowser();

  it('should let the partner’s billing contact pay an issued invoice on the payment page and see it paid', async () => {
    const page = browser.page;
    await signIn(page, DANA.email);
    const invoice = await freshIssuedInvoice(page);
    expect(invoice.state).toBe('issued');
    await page.context().clearCookies();

    await signIn(page, FELIX.email);
    await page.getByTestId('nav-invoices').click();
    await page.getByTestId(`invoice-link-${invoice.id}`).waitFor({ state: 'visible' });
    await screenshot(page, 'billing-invoices-list');
    await page.getByTestId(`invoice-link-${invoice.id}`).click();
    await expect.poll(() => page.getByTestId('invoice-title').textContent()).toContain(invoice.number!);
    await expect.poll(() => page.getByTestId('invoice-caution').textContent()).toMatch(/not tax advice/);
    await screenshot(page, 'billing-invoice-issued');

    // The declined test card is answered 402 by the payment page, on purpose.
    browser.session.expectFailure(/\/pay\/in_/, 402);
    await page.getByTestId('invoice-pay').click();
    await page.waitForURL((url) => url.pathname.startsWith('/pay/'));
    await page.getByLabel('Card number').fill('4000 0000 0000 0002');
    await page.getByRole('button', { name: /^Pay / }).click();
    await expect.poll(() => page.getByRole('alert').textContent()).toMatch(/declined/i);
    await screenshot(page, 'billing-payment-declined');
    await page.getByLabel('Card number').fill('4242 4242 4242 4242');
    await page.getByRole('button', { name: /^Pay / }).click();
    await page.getByRole('link', { name: /^Return to / }).click();

    await page.waitForURL((url) => url.pathname === `/invoices/${invoice.id}`);
    await expect.poll(() => page.getByTestId('invoice-state').textContent(), { timeout: 30_000 }).toMatch(/Paid/);
    await screenshot(page, 'billing-invoice-paid');
  });
});
