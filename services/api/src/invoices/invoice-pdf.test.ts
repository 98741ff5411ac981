import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { formatMinor, type Invoice, REVERSE_CHARGE_NOTE } from '@localis/shared';
import { describe, expect, it } from 'vitest';
import { renderInvoicePdf } from './invoice-pdf';
import { DEMO_ISSUER, DEMO_PARTNER, demoInvoice } from './invoice-pdf-fixture';
import { DRAWABLE_CHARACTERS } from './invoice-pdf-fonts';
import { readGlyphCodes, readPdfInfo, readPdfText } from './invoice-pdf-reader';
import { type InvoicePdfInput, ROUNDING_RULE, TAX_CAUTION } from './invoice-pdf-view';

/** The text of every page, lines joined and runs of white space made one, as a reader would quote it. */
const flat = (pages: string[]) => pages.join('\n').replace(/\s+/g, ' ');

const input = (invoice: Invoice, extra: Partial<InvoicePdfInput> = {}): InvoicePdfInput => ({ invoice, issuer: DEMO_ISSUER, partner: DEMO_PARTNER, ...extra });

const textOf = async (i: InvoicePdfInput) => readPdfText(await renderInvoicePdf(i, { compress: false }));

const voided = (invoice: Invoice): Invoice => ({
  ...invoice,
  state: 'void',
  creditNoteNumber: 'CN-2027-0007',
  voidReason: 'Usage was recorded against the wrong institution.',
});

const hasPdftotext = (() => {
  try {
    execFileSync('pdftotext', ['-v'], { stdio: 'ignore' });
    return true;
  } catch {
    return false;
  }
})();

describe('renderInvoicePdf', () => {
  describe('file', () => {
    it('should be a whole PDF when rendered with defaults', async () => {
      const pdf = await renderInvoicePdf(input(demoInvoice()));
      expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-');
      expect(pdf.toString('latin1').trimEnd().endsWith('%%EOF')).toBe(true);
    });

    it('should embed Lato regular and bold and no other font when rendered', async () => {
      const pdf = (await renderInvoicePdf(input(demoInvoice()), { compress: false })).toString('latin1');
      const fontNames = new Set([...pdf.matchAll(/\/BaseFont \/([^\s/]+)/g)].map((m) => m[1].replace(/^[A-Z]{6}\+/, '')));
      expect(fontNames).toEqual(new Set(['Lato-Regular', 'Lato-Bold']));
      expect(pdf.match(/\/FontFile2 /g)).toHaveLength(2);
    });

    it('should take its dates and title from the invoice when it is issued', async () => {
      const info = readPdfInfo(await renderInvoicePdf(input(demoInvoice()), { compress: false }));
      expect(info).toMatchObject({
        CreationDate: 'D:20270405000000Z',
        ModDate: 'D:20270405000000Z',
        Title: 'Invoice 2027-0042',
        Author: DEMO_ISSUER.name,
        Creator: 'Localis',
        Producer: 'Localis',
      });
    });
  });

  describe('determinism', () => {
    it('should give the same bytes when the same invoice is rendered twice', async () => {
      const first = await renderInvoicePdf(input(demoInvoice({ campaigns: 8 })));
      await new Promise((resolve) => setTimeout(resolve, 1100)); // a clock read anywhere would now differ by a second
      const second = await renderInvoicePdf(input(demoInvoice({ campaigns: 8 })));
      expect(second.equals(first)).toBe(true);
    });

    it('should give other bytes when the issue day differs', async () => {
      const invoice = demoInvoice();
      const first = await renderInvoicePdf(input(invoice));
      const second = await renderInvoicePdf(input({ ...invoice, issuedOn: '2027-04-06' }));
      expect(second.equals(first)).toBe(false);
    });
  });

  describe('content', () => {
    it('should show the number, the partner, every total, the rounding rule and the caution when rendered', async () => {
      const invoice = demoInvoice();
      const text = flat(await textOf(input(invoice)));
      expect(text).toContain('Invoice 2027-0042');
      expect(text).toContain(DEMO_PARTNER.name);
      expect(text).toContain(DEMO_PARTNER.billingEmail);
      expect(text).toContain('United Kingdom (GB)');
      expect(text).toContain(DEMO_ISSUER.name);
      expect(text).toContain('Payment reference LCS-2027-0042');
      expect(text).toContain('Issue date 5 April 2027');
      expect(text).toContain('Due date 5 May 2027');
      expect(text).toContain('Period 1 January 2027 – 31 March 2027');
      expect(text).toContain(`Subtotal ${formatMinor(invoice.subtotalMinor, 'EUR')}`);
      expect(text).toContain(`Discount (5%) ${formatMinor(-invoice.discountMinor, 'EUR')}`);
      expect(text).toContain(`Tax (20%) ${formatMinor(invoice.taxMinor, 'EUR')}`);
      expect(text).toContain(`Total (EUR) ${formatMinor(invoice.totalMinor, 'EUR')}`);
      expect(text).toContain(TAX_CAUTION);
      expect(text).toContain(ROUNDING_RULE);
      expect(text).toContain('amounts per line rounded half away from zero to the minor unit');
      for (const note of invoice.notes) expect(text).toContain(note);
    });

    it('should show each line with three decimals of core-hours and its amount when rendered', async () => {
      const invoice = demoInvoice();
      const text = flat(await textOf(input(invoice)));
      // The demo's first line: 20,000.375 core-hours at €0.04.
      expect(text).toContain('Anderson transition, 3D orthogonal class, L up to 96 Jan 2027 Core-hours at the base price 20,000.375 €0.04 €800.02');
      const credit = invoice.lines.find((l) => l.coreHoursMilli < 0)!;
      expect(text).toContain(`Credit for core-hours returned, at the base price -4,250.500 €0.04 ${formatMinor(credit.amountMinor, 'EUR')}`);
      expect(formatMinor(credit.amountMinor, 'EUR')).toMatch(/^-€/);
      expect(text).toContain('(tier 1)');
    });

    it('should name the reverse charge instead of a rate when tax is reverse-charged', async () => {
      const invoice = demoInvoice({ reverseCharge: true });
      const text = flat(await textOf(input(invoice)));
      expect(text).toContain(`Tax: reverse charge, see notes ${formatMinor(0, 'EUR')}`);
      expect(text).toContain(REVERSE_CHARGE_NOTE);
      expect(text).not.toContain('Tax (');
    });

    it('should show amounts without decimals when the currency is JPY', async () => {
      const invoice = demoInvoice({ currency: 'JPY', unitPriceMinor: 6 });
      const pages = await textOf(input(invoice));
      const amounts = pages.join('\n').match(/-?¥[\d,.]+/g) ?? [];
      expect(amounts.length).toBeGreaterThan(invoice.lines.length);
      for (const amount of amounts) expect(amount).toMatch(/^-?¥\d{1,3}(,\d{3})*$/);
      expect(flat(pages)).toContain(`Total (JPY) ${formatMinor(invoice.totalMinor, 'JPY')}`);
    });

    it('should mark a draft and take its dates from its creation when the invoice is not issued', async () => {
      const draft: Invoice = { ...demoInvoice(), state: 'draft', number: null, issuedOn: null, dueOn: null, paymentReference: null };
      const pdf = await renderInvoicePdf(input(draft), { compress: false });
      const text = flat(readPdfText(pdf));
      expect(text).toContain('Invoice (draft)');
      expect(text).toContain('Issue date not issued yet');
      expect(readPdfInfo(pdf).CreationDate).toBe('D:20270403000000Z');
    });
  });

  describe('credit note', () => {
    it('should say credit note, its number and the invoice it cancels when kind is credit-note', async () => {
      const invoice = voided(demoInvoice());
      const text = flat(await textOf(input(invoice, { kind: 'credit-note', creditNoteIssuedOn: '2027-04-20' })));
      expect(text).toContain('Credit note CN-2027-0007');
      expect(text).toContain('Cancels invoice 2027-0042 of 5 April 2027');
      expect(text).toContain('Credit note date 20 April 2027');
      expect(text).toContain(`Total credited (EUR) ${formatMinor(invoice.totalMinor, 'EUR')}`);
      expect(text).toContain('Reason: Usage was recorded against the wrong institution.');
      expect(text).not.toContain('Invoice 2027-0042');
    });

    it('should date the PDF on the credit note day when it is given', async () => {
      const pdf = await renderInvoicePdf(input(voided(demoInvoice()), { kind: 'credit-note', creditNoteIssuedOn: '2027-04-20' }), { compress: false });
      expect(readPdfInfo(pdf)).toMatchObject({ CreationDate: 'D:20270420000000Z', Title: 'Credit note CN-2027-0007' });
    });

    it('should refuse when the invoice has no credit note', async () => {
      await expect(renderInvoicePdf(input(demoInvoice(), { kind: 'credit-note' }))).rejects.toThrow(/has no credit note/);
    });
  });

  describe('pages', () => {
    it('should fit on one page without page numbers when the invoice has ten lines', async () => {
      const pages = await textOf(input(demoInvoice()));
      expect(pages).toHaveLength(1);
      expect(pages[0]).not.toMatch(/Page \d+ of/);
    });

    it('should continue the table with its header and number the pages when the invoice has 60 lines', async () => {
      const invoice = demoInvoice({ campaigns: 20 });
      expect(invoice.lines.length).toBeGreaterThanOrEqual(60);
      const pages = await textOf(input(invoice));
      expect(pages.length).toBeGreaterThan(1);
      pages.forEach((page, i) => {
        expect(page).toContain(`Page ${i + 1} of ${pages.length}`);
        expect(flat([page])).toContain(TAX_CAUTION);
      });
      for (const page of pages.slice(1)) expect(page).toContain('Localis · Invoice 2027-0042 (continued)');
      const tablePages = pages.filter((p) => /Campaign\nMonth\nDescription/.test(p));
      expect(tablePages.length).toBeGreaterThan(1);
      // Every line is printed once, across the pages.
      const amounts = flat(pages).match(/-?€[\d,]+\.\d{2}/g) ?? [];
      for (const line of invoice.lines) expect(amounts).toContain(formatMinor(line.amountMinor, 'EUR'));
      expect(flat(pages)).toContain(`Total (EUR) ${formatMinor(invoice.totalMinor, 'EUR')}`);
    });
  });

  describe('characters', () => {
    it('should draw every character of the drawable set in both weights', async () => {
      // The partner name is set in bold, the billing e-mail in regular; both carry the whole set.
      const all = DRAWABLE_CHARACTERS.replace(/\u00ad/, ''); // a soft hyphen is only drawn where a line breaks
      const partner = { ...DEMO_PARTNER, name: all, billingEmail: all };
      const pdf = await renderInvoicePdf(input(demoInvoice(), { partner }), { compress: false });
      expect(readGlyphCodes(pdf)).not.toContain(0);
      // Long runs without a space wrap anywhere, so spaces are left out of the comparison.
      const letters = (s: string) => s.replace(/\s+/g, '');
      expect(letters(readPdfText(pdf).join('')).split(letters(all))).toHaveLength(3);
    });

    it('should draw every character without a missing glyph when the partner name has letters beyond latin-1', async () => {
      const partner = { ...DEMO_PARTNER, name: 'Politechnika Łódzka — Zakład Fizyki Teoretycznej, Ústí' };
      const pdf = await renderInvoicePdf(input(demoInvoice(), { partner }), { compress: false });
      expect(readGlyphCodes(pdf)).not.toContain(0);
      expect(flat(readPdfText(pdf))).toContain('Politechnika Lódzka — Zaklad Fizyki Teoretycznej, Ústí');
    });

    it('should print the ISO code when the currency sign is not in the font', async () => {
      const invoice = demoInvoice({ currency: 'INR' });
      const pdf = await renderInvoicePdf(input(invoice), { compress: false });
      expect(readGlyphCodes(pdf)).not.toContain(0);
      expect(flat(readPdfText(pdf))).toContain(`Total (INR) ${formatMinor(invoice.totalMinor, 'INR').replace('₹', 'INR ')}`);
    });
  });

  describe.skipIf(!hasPdftotext)('reader', () => {
    // -raw keeps the content stream's order; spaces differ (letter-spaced labels), so they are left out.
    it('should read the same text as pdftotext when both read a rendered invoice', async () => {
      const pdf = await renderInvoicePdf(input(demoInvoice({ campaigns: 20 })), { compress: false });
      const dir = mkdtempSync(join(tmpdir(), 'invoice-pdf-'));
      try {
        writeFileSync(join(dir, 'invoice.pdf'), pdf);
        const poppler = execFileSync('pdftotext', ['-raw', join(dir, 'invoice.pdf'), '-'], { encoding: 'utf8' });
        const letters = (s: string) => s.replace(/\s+/g, '');
        expect(letters(readPdfText(pdf).join('\n'))).toBe(letters(poppler));
      } finally {
        rmSync(dir, { recursive: true, force: true });
      }
    });
  });
});
