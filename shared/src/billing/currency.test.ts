import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { FUND_CODES, formatMinor, isIsoCurrency, minorUnitDigits, NO_MINOR_UNIT_CODES } from './currency';

/** ISO 4217 list one as currency-codes ships it (iso-4217-list-one.xml, published 2024-06-25). */
function listOne(): { code: string; minorUnits: string; isFund: boolean }[] {
  const packageJson = createRequire(import.meta.url).resolve('currency-codes/package.json');
  const xml = readFileSync(join(dirname(packageJson), 'iso-4217-list-one.xml'), 'utf8');
  return [...xml.matchAll(/<CcyNtry>([\s\S]*?)<\/CcyNtry>/g)].flatMap(([, entry]) => {
    const code = /<Ccy>([A-Z]{3})<\/Ccy>/.exec(entry)?.[1];
    if (!code) return []; // territories without a universal currency (Antarctica)
    return [{ code, minorUnits: /<CcyMnrUnts>([^<]*)</.exec(entry)![1], isFund: /IsFund="true"/.test(entry) }];
  });
}

describe('currency', () => {
  describe('minorUnitDigits', () => {
    it('should give 0 digits when the currency has no minor unit (ISO 4217: JPY, ISK and KRW have 0 minor units)', () => {
      expect(['JPY', 'ISK', 'KRW'].map(minorUnitDigits)).toEqual([0, 0, 0]);
    });

    it('should give 2 digits for cents and pence (ISO 4217: EUR, GBP, USD and CHF have 2 minor units)', () => {
      expect(['EUR', 'GBP', 'USD', 'CHF'].map(minorUnitDigits)).toEqual([2, 2, 2, 2]);
    });

    it('should give 3 digits for the dinars and rial (ISO 4217: BHD, KWD, JOD, OMR and TND have 3 minor units)', () => {
      expect(['BHD', 'KWD', 'JOD', 'OMR', 'TND'].map(minorUnitDigits)).toEqual([3, 3, 3, 3, 3]);
    });

    it('should refuse a code when it is not an invoicing currency', () => {
      expect(() => minorUnitDigits('XYZ')).toThrow('XYZ is not an ISO 4217 currency');
      expect(() => minorUnitDigits('XXX')).toThrow('XXX is not an ISO 4217 currency');
    });

    it('should agree with ISO 4217 list one for every currency Localis accepts', () => {
      for (const entry of listOne().filter((e) => isIsoCurrency(e.code))) expect(String(minorUnitDigits(entry.code)), entry.code).toBe(entry.minorUnits);
    });
  });

  describe('isIsoCurrency', () => {
    it('should accept the currencies partners pay in', () => {
      expect(['EUR', 'GBP', 'USD', 'CHF', 'JPY', 'BHD', 'SEK'].every(isIsoCurrency)).toBe(true);
    });

    it('should refuse codes without a real minor unit (ISO 4217: XXX "no currency", XTS testing, XAU gold, XDR SDR have N.A.)', () => {
      expect(['XXX', 'XTS', 'XAU', 'XDR'].some(isIsoCurrency)).toBe(false);
    });

    it('should refuse funds codes (ISO 4217 list one marks CLF, USN, CHE, BOV as funds)', () => {
      expect(['CLF', 'USN', 'CHE', 'BOV'].some(isIsoCurrency)).toBe(false);
    });

    it('should refuse unknown, lower-case and malformed codes', () => {
      expect(['XYZ', 'eur', 'Eur', 'EU', 'EURO', '', ' EUR'].some(isIsoCurrency)).toBe(false);
    });

    it('should exclude exactly the codes ISO 4217 list one gives N.A. minor units or marks as funds', () => {
      const entries = listOne();
      const na = [...new Set(entries.filter((e) => e.minorUnits === 'N.A.').map((e) => e.code))].sort();
      const funds = [...new Set(entries.filter((e) => e.isFund).map((e) => e.code))].sort();
      expect([...NO_MINOR_UNIT_CODES].sort()).toEqual(na);
      expect([...FUND_CODES].sort()).toEqual(funds);
      const accepted = new Set(entries.map((e) => e.code).filter((c) => !na.includes(c) && !funds.includes(c)));
      for (const c of accepted) expect(isIsoCurrency(c), c).toBe(true);
    });
  });

  describe('formatMinor', () => {
    it('should print cents with a grouping separator when the currency is EUR', () => {
      expect(formatMinor(123_456, 'EUR')).toBe('€1,234.56');
    });

    it('should print whole yen when the currency has no minor unit', () => {
      expect(formatMinor(1235, 'JPY')).toBe('¥1,235');
    });

    it('should print three decimals, trailing zeros included, when the currency is BHD', () => {
      expect(formatMinor(123_750, 'BHD')).toBe('BHD\u00a0123.750');
      expect(formatMinor(5, 'KWD')).toBe('KWD\u00a00.005');
    });

    it('should print small and negative amounts with every minor digit', () => {
      expect(formatMinor(5, 'GBP')).toBe('£0.05');
      expect(formatMinor(-123_456, 'EUR')).toBe('-€1,234.56');
      expect(formatMinor(-1, 'USD')).toBe('-$0.01');
      expect(formatMinor(0, 'EUR')).toBe('€0.00');
      expect(formatMinor(-0, 'EUR')).toBe('€0.00');
    });

    it("should follow the reader's locale when one is given", () => {
      expect(formatMinor(123_456, 'EUR', 'de')).toBe('1.234,56\u00a0€');
    });

    it('should print every digit of a bigint beyond 2^53, which a float would lose', () => {
      expect(formatMinor(12_345_678_901_234_567_891n, 'EUR')).toBe('€123,456,789,012,345,678.91');
      expect(formatMinor(9_007_199_254_740_993n, 'JPY')).toBe('¥9,007,199,254,740,993');
    });

    it('should refuse an amount when it is not a whole number of minor units', () => {
      expect(() => formatMinor(12.5, 'EUR')).toThrow('whole number');
      expect(() => formatMinor(1, 'XTS')).toThrow('XTS is not an ISO 4217 currency');
    });
  });
});
