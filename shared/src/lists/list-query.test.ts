import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { csvCell, listQuery, parseSort, toCsv } from './list-query';

describe('listQuery', () => {
  const Q = listQuery(['name', 'createdAt'], { q: z.string().optional() }, 'name');

  describe('defaults', () => {
    it('should page 25 from 0 sorted by the default when nothing is given', () => {
      expect(Q.parse({})).toEqual({ limit: 25, offset: 0, sort: 'name', format: 'json' });
    });
  });

  describe('validation', () => {
    it('should coerce query-string numbers and accept a descending sort', () => {
      expect(Q.parse({ limit: '10', offset: '20', sort: '-createdAt' })).toMatchObject({ limit: 10, offset: 20, sort: '-createdAt' });
    });

    it('should refuse a page larger than 200 or a sort on an unknown field', () => {
      expect(Q.safeParse({ limit: '201' }).success).toBe(false);
      const r = Q.safeParse({ sort: 'password' });
      expect(r.success).toBe(false);
      expect(r.error?.issues[0].message).toContain('name, -name, createdAt, -createdAt');
    });
  });

  describe('parseSort', () => {
    it('should split the direction from the field', () => {
      expect(parseSort('-createdAt')).toEqual({ field: 'createdAt', direction: 'DESC' });
      expect(parseSort('name')).toEqual({ field: 'name', direction: 'ASC' });
    });
  });
});

describe('CSV', () => {
  describe('csvCell', () => {
    it('should quote commas, quotes and line breaks as RFC 4180 says', () => {
      expect(csvCell('a,b')).toBe('"a,b"');
      expect(csvCell('say "hi"')).toBe('"say ""hi"""');
      expect(csvCell('two\nlines')).toBe('"two\nlines"');
    });

    it('should defuse spreadsheet formulas when a cell starts with = + - or @', () => {
      expect(csvCell('=HYPERLINK("x")')).toBe(`"'=HYPERLINK(""x"")"`);
      expect(csvCell('@SUM(A1)')).toBe("'@SUM(A1)");
    });

    it('should write arrays, dates, objects and nulls readably', () => {
      expect(csvCell(['pi', 'researcher'])).toBe('pi researcher');
      expect(csvCell(new Date('2027-02-01T08:00:00Z'))).toBe('2027-02-01T08:00:00.000Z');
      expect(csvCell({ role: 'pi' })).toBe('"{""role"":""pi""}"');
      expect(csvCell(null)).toBe('');
    });
  });

  describe('toCsv', () => {
    it('should write a header and one CRLF line per row', () => {
      expect(toCsv([{ a: 1, b: 'x' }], ['a', 'b'])).toBe('a,b\r\n1,x\r\n');
    });
  });
});
