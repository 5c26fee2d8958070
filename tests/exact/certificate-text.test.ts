import { describe, expect, it } from 'vitest';
import { describeCertificate, formatRate } from '../../src/errors.js';

// The certificate sentence (src/errors.ts). Expected strings are written by hand from the rule
// stated beside formatRate: whole numbers below a million with one decimal, others with four
// significant digits, trailing zeros of the mantissa dropped, the exponent kept whole.

describe('formatRate', () => {
  it('keeps every exponent digit (2e-10 was once printed "2.000e-1")', () => {
    expect(formatRate(2e-10)).toBe('2e-10');
    expect(formatRate(2.5e-10)).toBe('2.5e-10');
    expect(formatRate(1.23456e300)).toBe('1.235e+300');
    expect(formatRate(1e300)).toBe('1e+300');
    expect(formatRate(4.5e307)).toBe('4.5e+307');
    expect(formatRate(1e-300)).toBe('1e-300');
  });

  it('plain numbers as before', () => {
    expect(formatRate(4)).toBe('4.0');
    expect(formatRate(5.5)).toBe('5.5');
    expect(formatRate(0.1 + 0.2)).toBe('0.3');
    expect(formatRate(17.25)).toBe('17.25');
    expect(formatRate(120)).toBe('120.0');
    expect(formatRate(2_000_000)).toBe('2e+6');
  });

  it('the certificate sentence carries the whole exponent', () => {
    const text = describeCertificate({ set: ['a'], neighbours: ['b'], demand: 3e-10, capacity: 2e-10, reason: 'overloaded' }, 'hour');
    expect(text).toBe('unstable: items from a (3e-10/hour) can only be matched with b (2e-10/hour)');
  });
});
