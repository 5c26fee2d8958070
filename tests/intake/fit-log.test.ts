import { describe, expect, it } from 'vitest';
import { InvalidTableError, UsageError } from '../../src/errors.js';
import { fitLog } from '../../src/intake/fit-log.js';
import { fitRecord } from '../../src/intake/fit-record.js';
import { fitScenario } from '../../src/intake/fit-scenario.js';
import { parseScenario } from '../../src/model/validate.js';
import { demandVariants } from '../../src/model/demand.js';
import { Rng } from '../helpers/random.js';

/** A seeded Poisson stream on [0, T): exponential gaps. */
function stream(rng: Rng, rate: number, T: number): number[] {
  const out: number[] = [];
  for (let t = -Math.log(1 - rng.next()) / rate; t < T; t += -Math.log(1 - rng.next()) / rate) out.push(t);
  return out;
}

/** A log of several classes drawn over [0, T), rows in time order. */
function poissonLog(rng: Rng, rates: readonly number[], T: number): string {
  const rows = rates.flatMap((r, k) => stream(rng, r, T).map((t) => [t, `c${k}`] as const));
  rows.sort((a, b) => a[0] - b[0]);
  return ['arrived,kind', ...rows.map(([t, c]) => `${t},${c}`)].join('\n');
}

describe('fitLog: rates', () => {
  it('counts per class, over a window extended by one mean gap at each end (worked by hand)', () => {
    // arrivals at 1, 2, 3, 5 (N = 4): mean gap (5 − 1)/3 = 4/3, window [1 − 4/3, 5 + 4/3], length 4 + 8/3 = 20/3
    const r = fitLog('t,c\n1,a\n2,b\n3,a\n5,a\n', 'log.csv', { time: 't', class: 'c' });
    expect(r.window.length).toBeCloseTo(20 / 3, 12);
    expect(r.window.estimated).toBe(true);
    expect(r.classes.map((c) => [c.id, c.count])).toEqual([['a', 3], ['b', 1]]);
    expect(r.classes[0]!.rate).toBeCloseTo(3 / (20 / 3), 12);
    expect(r.timeUnit).toBe('hour');
  });

  it('the window estimate is unbiased for the length of the interval the arrivals were drawn on', () => {
    // N uniform points on [0, L]: E[range] = L (N − 1)/(N + 1) (derived by hand from the order
    // statistics' means L k/(N + 1)), so range · (N + 1)/(N − 1) has mean L.
    const rng = new Rng(11);
    let sum = 0;
    const reps = 2000;
    for (let i = 0; i < reps; i++) {
      const times = Array.from({ length: 6 }, () => rng.uniform(0, 10));
      sum += fitLog(['t,c', ...times.map((t) => `${t},x`)].join('\n'), 'u.csv', { time: 't', class: 'c' }).window.length;
    }
    // range/L ~ Beta(5, 2) (derived by hand: the range of N uniforms is Beta(N − 1, 2)), standard deviation
    // √(10/392) ≈ 0.160; the estimate 10 · range · 7/5 has sd ≈ 2.24, its mean over 2000 about 0.05:
    // allow 3.29 of those (99.9 % two-sided)
    expect(Math.abs(sum / reps - 10)).toBeLessThan(3.29 * (2.236 / Math.sqrt(reps)));
  });

  it('on logs drawn from known Poisson rates, the 95 % intervals cover the true rates at their nominal frequency (400 seeded classes)', () => {
    const rng = new Rng(20250314);
    let covered = 0;
    let classes = 0;
    for (let log = 0; log < 40; log++) {
      // at least 10 expected arrivals per class, so that every class shows up in its log
      const rates = Array.from({ length: 10 }, () => rng.uniform(1, 6));
      const T = rng.uniform(10, 60);
      const r = fitLog(poissonLog(rng, rates, T), `log${log}.csv`, { time: 'arrived', class: 'kind' });
      for (const c of r.classes) {
        const truth = rates[Number(c.id.slice(1))]!;
        classes++;
        if (c.ci95[0] <= truth && truth <= c.ci95[1]) covered++;
      }
    }
    expect(classes).toBe(400);
    // binomial tolerance: 3.29 standard deviations of a 95 % proportion over 400 classes (99.9 % two-sided);
    // the exact interval is conservative, so coverage sits at or a little above 95 %
    const tol = 3.29 * Math.sqrt((0.95 * 0.05) / classes);
    expect(Math.abs(covered / classes - 0.95)).toBeLessThan(tol);
  });

  it('also covers at the nominal frequency with one class per log and the window given (--from/--to)', () => {
    const rng = new Rng(99);
    let covered = 0;
    for (let k = 0; k < 400; k++) {
      const rate = rng.uniform(1, 4);
      const T = rng.uniform(10, 30); // at least 10 expected arrivals
      const r = fitLog(poissonLog(rng, [rate], T), 'one.csv', { time: 'arrived', class: 'kind', from: '0', to: String(T) });
      if (r.classes[0]!.ci95[0] <= rate && rate <= r.classes[0]!.ci95[1]) covered++;
    }
    expect(Math.abs(covered / 400 - 0.95)).toBeLessThan(3.29 * Math.sqrt((0.95 * 0.05) / 400));
  });

  it('reads ISO timestamps into the chosen unit, and leaves out arrivals outside --from/--to', () => {
    const text = 'at,cls\n2025-01-01T00:00:00Z,x\n2025-01-01T00:30:00Z,y\n2025-01-01T01:00:00+01:00,x\n2025-01-01T02:00:00Z,x\n';
    const r = fitLog(text, 'iso.csv', { time: 'at', class: 'cls', timeUnit: 'minutes', from: '2025-01-01T00:00:00Z', to: '2025-01-01T01:00:00Z' });
    expect(r.timeUnit).toBe('minute');
    expect(r.window).toEqual({ from: 0, to: 60, length: 60, estimated: false });
    // 01:00+01:00 is 00:00 UTC: inside; 02:00Z is outside
    expect(r.classes.map((c) => [c.id, c.count])).toEqual([['x', 2], ['y', 1]]);
    expect(r.leftOut).toBe(1);
    expect(r.warnings).toContain('1 arrival outside the window (--from/--to) left out');
    const rec = fitRecord(r);
    expect(rec.window.from).toBe('2025-01-01T00:00:00Z');
    expect(rec.time).toEqual({ format: 'iso', origin: '2025-01-01T00:00:00Z' });
  });

  it('per hour of the day: counts by the clock time written and exposure by the hours of the window in each band', () => {
    // numeric hours, time 0 a midnight; window [6, 30] given: band 7-10 has 3 h of it (07-10 on day 0;
    // day 1 only reaches 06:00), band 10-24 has 14 h
    const text = 't,c\n7.5,a\n8,a\n12,a\n31.5,a\n29,a\n';
    const r = fitLog(text, 'h.csv', { time: 't', class: 'c', from: '6', to: '30', bandHours: '7-10,10-24' });
    const a = r.classes[0]!;
    expect(a.bands!.map((b) => [b.band, b.count, b.exposure])).toEqual([['7-10', 2, 3], ['10-24', 1, 14]]);
    // 29 → 05:00 on day 2, in no band; 31.5 is outside the window
    expect(a.count).toBe(4);
  });

  it('in N equal parts of the window, and time bands become demand variants of the scenario', () => {
    const r = fitLog('t,c\n0,a\n1,b\n2,a\n3,b\n4,a\n5,a\n', 'b.csv', { time: 't', class: 'c', bands: 2, from: '0', to: '6' });
    expect(r.classes[0]!.bands!.map((b) => [b.band, b.start, b.end, b.count])).toEqual([['1/2', 0, 3, 2], ['2/2', 3, 6, 2]]);
    expect(r.classes[1]!.bands!.map((b) => b.count)).toEqual([1, 1]);
    const s = fitScenario(r, {});
    const variants = demandVariants(s.scenario);
    expect(variants.map((v) => [v.name, [...v.rates]])).toEqual([['part 1/2', [2 / 3, 1 / 3].map((x) => Number(x.toPrecision(6)))], ['part 2/2', [2 / 3, 1 / 3].map((x) => Number(x.toPrecision(6)))]]);
  });
});

describe('fitLog: patience', () => {
  it('from outcomes and waits, per class (abandonments over time at risk)', () => {
    const text = 't,c,outcome,wait\n0,a,matched,0.5\n1,a,Abandoned,2\n2,a,waiting,1.5\n3,b,matched,0\n4,b,,\n';
    const r = fitLog(text, 'p.csv', { time: 't', class: 'c', outcome: 'outcome', wait: 'wait' });
    const [a, b] = r.classes;
    expect(a!.patience!.abandoned).toBe(1);
    expect(a!.patience!.timeAtRisk).toBe(4);
    expect(a!.patience!.mean).toBe(4);
    expect(b!.patience!.abandoned).toBe(0);
    expect(b!.patience!.censored).toBe(1); // the row without an outcome is not in the patience fit
    expect(b!.patience!.mean).toBe(Infinity);
    const s = fitScenario(r, {});
    expect(s.scenario.classes[0]!.patience).toBe(4);
    expect(s.scenario.classes[1]!.patience).toBeUndefined();
    // the fragment is a scenario file the project's validator reads back unchanged
    expect(parseScenario(JSON.stringify(s.document))).toEqual(s.scenario);
    expect(s.document['compatibilities']).toEqual([]);
  });
});

describe('fitLog: problems', () => {
  const problems = (f: () => unknown) => {
    try {
      f();
    } catch (e) {
      if (e instanceof InvalidTableError) return e.problems.map((p) => `${p.row ?? ''}|${p.column ?? ''}|${p.message}`);
      if (e instanceof UsageError) return [e.message];
      throw e;
    }
    throw new Error('expected a problem');
  };
  it('names the missing column with a suggestion, and every bad cell at once', () => {
    expect(problems(() => fitLog('Time,Class\n1,a\n', 'l.csv', { time: 'time', class: 'clas' }))[0]).toMatch(/no column "clas" \(--class\) \(did you mean "Class"\?\)/);
    const p = problems(() => fitLog('t,c,o,w\n1,a,matched,0.2\nsoon,a,,\n3,,gone,1\n4,a,abandoned,\n', 'l.csv', { time: 't', class: 'c', outcome: 'o', wait: 'w' }));
    expect(p).toEqual([
      expect.stringMatching(/^3\|t\|must be a number/),
      expect.stringMatching(/^4\|c\|empty/),
      expect.stringMatching(/^4\|o\|must be one of matched, abandoned, waiting/),
      expect.stringMatching(/^5\|w\|empty: a wait is needed/),
    ]);
  });
  it('refuses option mistakes', () => {
    const log = 't,c\n1,a\n2,a\n';
    expect(problems(() => fitLog(log, 'l.csv', { time: 't', class: 'c', outcome: 'o' }))[0]).toMatch(/no column "o"/);
    expect(problems(() => fitLog('t,c,o\n1,a,matched\n2,a,matched\n', 'l.csv', { time: 't', class: 'c', outcome: 'o' }))[0]).toMatch(/both --outcome and --wait/);
    expect(problems(() => fitLog(log, 'l.csv', { time: 't', class: 'c', bandHours: '7-10', timeUnit: 'shift' }))[0]).toMatch(/--band-hours needs --time-unit/);
    expect(problems(() => fitLog('t,c\n2025-01-01,a\n2025-01-02,a\n', 'l.csv', { time: 't', class: 'c', timeUnit: 'shift' }))[0]).toMatch(/timestamps/);
    expect(problems(() => fitLog('t,c\n1,a\n', 'l.csv', { time: 't', class: 'c' }))[0]).toMatch(/--from and --to/);
    expect(problems(() => fitLog(log, 'l.csv', { time: 't', class: 'c', from: 'x' }))[0]).toMatch(/--from must be written like/);
    expect(problems(() => fitLog(log, 'l.csv', { time: 't', class: 'c', bands: 0 }))[0]).toMatch(/--bands/);
  });
});
