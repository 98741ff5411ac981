import type { Invoice, InvoiceLine, InvoiceRun, RateCard } from '@localis/shared';

export const ORRIN_ID = '0b6d117f-1c3a-4d1b-8a4e-9a521c0a3e0b';
export const KESTREL_ID = '5a6b7c8d-9e0f-4a1b-8c2d-3e4f5a6b7c8d';
export const INVOICE_ID = '6c1d2e3f-4a5b-4c6d-8e7f-9a0b1c2d3e4f';

/** One line: 1,234.5 core-hours at €2.50, with 21 % tax. */
export function invoiceLineFixture(overrides: Partial<InvoiceLine> = {}): InvoiceLine {
  return {
    campaignId: '3a4b5c6d-7e8f-4a0b-9c1d-2e3f4a5b6c7d',
    campaignTitle: 'Critical disorder of the 3D Anderson model',
    month: '2027-03',
    tier: null,
    description: 'Core-hours on cluster-a',
    coreHoursMilli: 1_234_500,
    unitPriceMinor: 250,
    amountMinor: 308_625,
    discountMinor: 0,
    taxMinor: 64_811,
    ...overrides,
  };
}

/** An issued invoice of the demo's paying partner, as GET /invoices/:id answers. */
export function invoiceFixture(overrides: Partial<Invoice> = {}): Invoice {
  return {
    id: INVOICE_ID,
    number: 'LOC-2027-0007',
    institutionId: ORRIN_ID,
    institutionName: 'Orrin Quantum Devices Ltd.',
    state: 'issued',
    currency: 'EUR',
    periodFrom: '2027-03-01',
    periodTo: '2027-03-31',
    lines: [invoiceLineFixture()],
    subtotalMinor: 308_625,
    discountMinor: 0,
    taxMinor: 64_811,
    totalMinor: 373_436,
    reverseCharge: false,
    taxRateBasisPoints: 2100,
    discountBasisPoints: 0,
    notes: [],
    issuedOn: '2027-04-02',
    dueOn: '2027-05-02',
    paidAt: null,
    voidReason: null,
    paymentReference: 'RF18 0000 0000 0000 0000 7',
    paymentState: null,
    overdue: false,
    creditNoteNumber: null,
    hasPdf: true,
    createdAt: '2027-04-01T08:00:00.000Z',
    ...overrides,
  };
}

/** A draft: no number, no dates, no PDF yet. */
export function draftFixture(overrides: Partial<Invoice> = {}): Invoice {
  return invoiceFixture({ number: null, state: 'draft', issuedOn: null, dueOn: null, paymentReference: null, hasPdf: false, ...overrides });
}

export function invoiceRunFixture(overrides: Partial<InvoiceRun> = {}): InvoiceRun {
  return {
    id: '1d2e3f4a-5b6c-4d7e-8f9a-0b1c2d3e4f5a',
    periodFrom: '2027-03-01',
    periodTo: '2027-03-31',
    state: 'done',
    drafted: 2,
    error: null,
    createdAt: '2027-04-01T08:00:00.000Z',
    finishedAt: '2027-04-01T08:00:05.000Z',
    ...overrides,
  };
}

export function rateCardFixture(overrides: Partial<RateCard> = {}): RateCard {
  return {
    id: '7f1c3a52-8a4e-4d1b-9a52-1c0a3e0b6d11',
    institutionId: ORRIN_ID,
    currency: 'EUR',
    unitPriceMinor: 250,
    tiers: [{ fromCoreHours: 10_000, unitPriceMinor: 200 }],
    discountBasisPoints: 500,
    taxRateBasisPoints: 2100,
    reverseCharge: false,
    paymentTermsDays: 30,
    effectiveFrom: '2027-01-01',
    effectiveTo: null,
    createdAt: '2026-12-15T09:30:00.000Z',
    createdByName: 'Maren Holt',
    ...overrides,
  };
}
