import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { lastRead, NumberStatus, readPlainNumber } from './plain-number';

const read = (text: string) => {
  const bytes = Buffer.from(text + '\n');
  const value = readPlainNumber(bytes, 0, bytes.length);
  return { value, status: lastRead.status, end: lastRead.end };
};

describe('readPlainNumber', () => {
  it.each([
    ['0', 0],
    ['-0', -0],
    ['42', 42],
    ['+7', 7],
    ['3.25', 3.25],
    ['.5', 0.5],
    ['5.', 5],
    ['16.5', 16.5],
    ['0.001', 0.001],
    ['1e3', 1000],
    ['2.5E-3', 0.0025],
    ['  12.75\t', 12.75],
    ['1.7976931348623157e308', 1.7976931348623157e308],
    ['4.9e-324', 5e-324],
    ['0.1234567890123456789', 0.1234567890123456789],
    ['123456789012345678901234567890', 123456789012345678901234567890],
  ])('reads %j as Number() does', (text, expected) => {
    const { value, status } = read(text);
    expect(status).toBe(NumberStatus.Ok);
    expect(Object.is(value, expected)).toBe(true);
  });

  it.each(['NaN', 'Infinity', '-Infinity', 'abc', '1.2.3', '1e', '1e+', '0x10', '1_000', '--1', '.', '-', '12 34'])('refuses %j', (text) => {
    expect(read(text).status).toBe(NumberStatus.Invalid);
  });

  it('tells an empty or quoted value apart', () => {
    expect(read('').status).toBe(NumberStatus.Empty);
    expect(read('   ').status).toBe(NumberStatus.Empty);
    expect(read('"1.5"').status).toBe(NumberStatus.Quoted);
  });

  it('a value too large for a double reads as Infinity (the table reader refuses it)', () => {
    expect(read('1e400').value).toBe(Infinity);
  });

  it('stops at the comma and says where', () => {
    const bytes = Buffer.from('6,15.25,0\n');
    expect(readPlainNumber(bytes, 0, bytes.length)).toBe(6);
    expect(lastRead.end).toBe(1);
    expect(readPlainNumber(bytes, 2, bytes.length)).toBe(15.25);
    expect(lastRead.end).toBe(7);
  });

  it('gives exactly what Number() gives for any double, printed in any of the usual ways', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), fc.integer({ min: 0, max: 3 }), (x, style) => {
        const text = style === 0 ? String(x) : style === 1 ? x.toExponential() : style === 2 ? x.toPrecision(8) : x.toFixed(Math.min(20, Math.abs(x) < 1e21 ? 6 : 0));
        if (!/^-?[\d.]+(e[+-]?\d+)?$/i.test(text)) return; // toFixed of huge values prints exponents
        const { value, status } = read(text);
        expect(status).toBe(NumberStatus.Ok);
        expect(Object.is(value, Number(text))).toBe(true);
      }),
      { numRuns: 1000 },
    );
  });
});
