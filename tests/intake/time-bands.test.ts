import { describe, expect, it } from 'vitest';
import { clockExposureHours, equalBands, inClockBand, parseBandHours } from '../../src/intake/bands.js';
import { formatTimestamp, knownUnit, readTimestamp } from '../../src/intake/time-values.js';

describe('readTimestamp', () => {
  it('reads UTC, offsets and dates, keeping the written clock time', () => {
    expect(readTimestamp('2025-03-14T08:30:00Z')).toEqual({ utcMs: Date.UTC(2025, 2, 14, 8, 30), clockHour: 8.5 });
    // +02:00 is two hours ahead of UTC: 10:15 there is 08:15 UTC
    expect(readTimestamp('2025-03-14T10:15:00+02:00')).toEqual({ utcMs: Date.UTC(2025, 2, 14, 8, 15), clockHour: 10.25 });
    expect(readTimestamp('2025-03-14 23:00-0130')!.utcMs).toBe(Date.UTC(2025, 2, 15, 0, 30));
    expect(readTimestamp('2025-03-14')).toEqual({ utcMs: Date.UTC(2025, 2, 14), clockHour: 0 });
    expect(readTimestamp('2025-03-14T08:30:15.5')!.utcMs).toBe(Date.UTC(2025, 2, 14, 8, 30, 15, 500));
  });
  it('refuses what is not a real date-time', () => {
    for (const bad of ['2025-02-30T00:00Z', '2025-13-01', '2025-01-01T24:10Z', '14/03/2025 08:30', '1741941000', '']) expect(readTimestamp(bad)).toBeUndefined();
  });
  it('formats back in UTC', () => {
    expect(formatTimestamp(Date.UTC(2025, 0, 2, 3, 4, 5))).toBe('2025-01-02T03:04:05Z');
  });
  it('knows the time units, singular or plural', () => {
    expect(knownUnit('Hours')).toBe('hour');
    expect(knownUnit('minute')).toBe('minute');
    expect(knownUnit('shift')).toBeUndefined();
  });
});

describe('bands', () => {
  it('reads hours of the day, wrapping past midnight, and refuses overlaps and nonsense', () => {
    const r = parseBandHours('7-10, 10-16,22-6');
    expect('bands' in r && r.bands.map((b) => [b.name, b.start, b.end])).toEqual([['7-10', 7, 10], ['10-16', 10, 16], ['22-6', 22, 6]]);
    expect(parseBandHours('0-24')).toEqual({ bands: [{ name: '0-24', start: 0, end: 24, kind: 'clock' }] });
    const bad = parseBandHours('7-10,9-12,23-1,0-2,x');
    expect('problems' in bad && bad.problems).toEqual([
      '"x" is not a band of hours such as 7-10 (hours 0 to 24; 22-6 wraps past midnight)',
      'bands 7-10 and 9-12 overlap',
      'bands 23-1 and 0-2 overlap',
    ]);
  });
  it('measures the exposure of a clock band over a stretch of hours (worked by hand)', () => {
    const r = parseBandHours('7-10,22-6');
    if (!('bands' in r)) throw new Error('parse');
    const [morning, night] = r.bands;
    // from 08:00 on day 0 to 09:00 on day 2: 2 h (day 0) + 3 h (day 1) + 2 h (day 2) = 7 h
    expect(clockExposureHours(morning!, 8, 48 + 9)).toBeCloseTo(7, 12);
    // from 20:00 to 07:00 next day: 22-24 and 0-6 = 8 h
    expect(clockExposureHours(night!, 20, 31)).toBeCloseTo(8, 12);
    // a window before "hour 0" works the same: from −3 (21:00 the day before) to 2: 22-24 and 0-2 = 4 h
    expect(clockExposureHours(night!, -3, 2)).toBeCloseTo(4, 12);
    expect(inClockBand(night!, 23.5)).toBe(true);
    expect(inClockBand(night!, 6)).toBe(false);
  });
  it('cuts a window into equal parts that cover it exactly', () => {
    const b = equalBands(2, 14, 3);
    expect(b.map((x) => [x.name, x.start, x.end])).toEqual([['1/3', 2, 6], ['2/3', 6, 10], ['3/3', 10, 14]]);
  });
});
