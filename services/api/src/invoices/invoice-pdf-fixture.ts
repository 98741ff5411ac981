import { computeInvoice, type CampaignMonthUsage, type Invoice, type InvoicePricing } from '@localis/shared';
import type { InvoicePdfInput } from './invoice-pdf-view';

/** The demo scenario's consortium office, as it appears on every invoice. */
export const DEMO_ISSUER: InvoicePdfInput['issuer'] = {
  name: 'Coldwater Localization Network — consortium office',
  address: ['Harbour Lane 12', '4021 Coldwater'],
  email: 'finance@coldwater-localization.example',
  vatId: 'CW 104 552 871',
};

export const DEMO_PARTNER: InvoicePdfInput['partner'] = {
  name: 'Orrin Quantum Devices Ltd.',
  country: 'GB',
  billingEmail: 'accounts@orrin-quantum.example',
};

const CAMPAIGNS = [
  'Anderson transition, 3D orthogonal class, L up to 96',
  'Chalker-Coddington network, plateau transition',
  'Metal-insulator transition, 3D unitary class',
  'Disordered Chern insulator, level statistics',
  'Spin-orbit (symplectic) class, 2D critical point',
];

const uuid = (n: number) => `00000000-0000-4000-8000-${n.toString(16).padStart(12, '0')}`;

/**
 * A priced invoice of Orrin Quantum Devices over a quarter, built by the shared invoice
 * arithmetic from made-up usage: `campaigns` campaigns in each of the three months, with one
 * credit line, tiers, a discount and tax (or reverse charge).
 */
export function demoInvoice(options: { campaigns?: number; currency?: string; unitPriceMinor?: number; reverseCharge?: boolean } = {}): Invoice {
  const campaigns = options.campaigns ?? 3;
  const pricing: InvoicePricing = {
    currency: options.currency ?? 'EUR',
    unitPriceMinor: options.unitPriceMinor ?? 4,
    tiers: [{ fromCoreHours: 150_000, unitPriceMinor: Math.max(1, Math.round((options.unitPriceMinor ?? 4) * 0.75)) }],
    discountBasisPoints: 500,
    taxRateBasisPoints: options.reverseCharge ? 0 : 2000,
    reverseCharge: options.reverseCharge ?? false,
  };
  const usage: CampaignMonthUsage[] = [];
  for (const [m, month] of ['2027-01', '2027-02', '2027-03'].entries()) {
    for (let c = 0; c < campaigns; c++) {
      const title = `${CAMPAIGNS[c % CAMPAIGNS.length]}${c >= CAMPAIGNS.length ? ` (${Math.floor(c / CAMPAIGNS.length) + 1})` : ''}`;
      // Deterministic, uneven figures with milli-core-hours, so rounding matters.
      const netMilli = m === 1 && c === 1 ? -4_250_500 : 20_000_000 + ((c * 7919 + m * 104_729) % 60_000) * 1000 + 375;
      usage.push({ month, campaignId: uuid(100 + c), campaignTitle: title, netMilli });
    }
  }
  const computed = computeInvoice(pricing, usage);
  return {
    id: uuid(1),
    number: '2027-0042',
    institutionId: uuid(2),
    institutionName: DEMO_PARTNER.name,
    state: 'issued',
    periodFrom: '2027-01-01',
    periodTo: '2027-03-31',
    ...computed,
    issuedOn: '2027-04-05',
    dueOn: '2027-05-05',
    paidAt: null,
    voidReason: null,
    paymentReference: 'LCS-2027-0042',
    paymentState: null,
    overdue: false,
    creditNoteNumber: null,
    hasPdf: true,
    createdAt: '2027-04-03T09:30:00.000Z',
  };
}
