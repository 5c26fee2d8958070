import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { evaluateCommand } from '../../src/cli/commands/evaluate.js';
import { recommendCommand } from '../../src/cli/commands/recommend.js';
import { simulateCommand } from '../../src/cli/commands/simulate.js';
import { checkCommand } from '../../src/cli/commands/check.js';
import { count, money, num, pairText, pct, perUnit, rate, setText, signed, signedPct, wait, waitScale } from '../../src/output/format.js';
import { k4MinusEdge, K4_IDS, K4_MINUS_AB_PAIRS } from '../helpers/k4-minus-edge.js';
import { runCommand, writeScenario } from '../helpers/cli.js';

// The one formatting module (src/output/format.ts): numbers, shares, money, rates with their unit,
// waits in a readable unit, pairs and sets. Expected strings are written by hand.

describe('numbers', () => {
  it('four significant digits, thousands separated, a true minus sign, exponents only at the extremes', () => {
    expect(num(0.83333)).toBe('0.8333');
    expect(num(12)).toBe('12');
    expect(num(1234.5)).toBe('1,235');
    expect(num(12345.6)).toBe('12,346');
    expect(num(-0.5)).toBe('−0.5');
    expect(num(2e-7)).toBe('2.0e−7');
    expect(num(-2e-7)).toBe('−2.0e−7'); // both minus signs
    expect(num(3e10)).toBe('3.0e10');
    expect(num(0)).toBe('0');
    expect(num(Infinity)).toBe('∞');
    expect(signed(0.42)).toBe('+0.42');
    expect(signed(-1.3)).toBe('−1.3');
    expect(signed(0)).toBe('±0');
    expect(pct(0.8197)).toBe('82.0 %');
    expect(signedPct(0.123)).toBe('+12 %');
    expect(signedPct(-0.0041)).toBe('−0.41 %');
    expect(count(6185718)).toBe('6,185,718');
    expect(money(12.5, 'credits')).toBe('12.5 credits');
    expect(money(12.5, null)).toBe('12.5');
  });
});

describe('rates always carry their unit', () => {
  it('per unit, singular, whatever the scenario writes', () => {
    expect(rate(3.2, 'hour')).toBe('3.2/hour');
    expect(rate(3.2, 'Hours')).toBe('3.2/hour');
    expect(rate(1500, 'minutes')).toBe('1,500/minute');
    expect(perUnit('day')).toBe('/day');
    expect(rate(2, 'shift')).toBe('2/shift'); // a unit edgewise does not know is kept
  });
});

describe('waits in a readable unit', () => {
  it('the largest unit in which the median wait is at least 1 (by hand)', () => {
    // 0.0009735 hour = 3.5046 s: below a minute, so seconds
    const s = waitScale('hour', [0.0009735]);
    expect(s.unit).toBe('second');
    expect(wait(0.0009735, s)).toBe('3.505 s');
    // median of 30, 90, 120 minutes is 90 min = 1.5 h
    const h = waitScale('minute', [30, 120, 90]);
    expect(h).toEqual({ unit: 'hour', factor: 1 / 60 });
    expect(wait(90, h)).toBe('1.5 h');
    // a median of 1 day stays in days (a week would be 1/7)
    expect(waitScale('day', [0.5, 1, 2]).unit).toBe('day');
    expect(waitScale('hour', [400]).unit).toBe('week'); // 400 h = 2.38 weeks
    // zeros and non-finite waits are left out of the median
    expect(waitScale('minute', [0, 0, 5, Infinity, NaN]).unit).toBe('minute');
  });

  it('--wait-unit wins; unknown scenario units are kept as they are', () => {
    expect(waitScale('hour', [0.0009735], 'minutes')).toEqual({ unit: 'minute', factor: 60 });
    expect(wait(0.5, waitScale('hour', [0.5], 'minute'))).toBe('30 min');
    expect(waitScale('shift', [0.001])).toEqual({ unit: 'shift', factor: 1 });
    expect(wait(0.25, waitScale('shift', [0.25]))).toBe('0.25 shift');
    expect(wait(Infinity, waitScale('hour', [1]))).toBe('unbounded');
  });
});

describe('pairs and sets in text', () => {
  it('a ↔ b, a class with itself a ↔ a, sets in braces', () => {
    expect(pairText(['tank', 'mage'])).toBe('tank ↔ mage');
    expect(pairText(['healer', 'healer'], (id) => id.toUpperCase())).toBe('HEALER ↔ HEALER');
    expect(setText(['archer', 'mage'])).toBe('{archer, mage}');
  });
});

describe('waits and rates in the commands', () => {
  // K4 minus a ↔ b (tests/helpers/k4-minus-edge.ts), rates per hour 0.2, 0.2, 0.4, 0.2: closed-form
  // backlogs by hand; waits by Little's law, L_k / λ_k hours.
  const dir = mkdtempSync(join(tmpdir(), 'edgewise-format-'));
  const rates = [0.2, 0.2, 0.4, 0.2];
  writeScenario(dir, 'k4.json', {
    name: 'k4',
    timeUnit: 'hour',
    classes: K4_IDS.map((id, k) => ({ id, rate: rates[k] })),
    compatibilities: K4_MINUS_AB_PAIRS.map(([x, y]) => [K4_IDS[x], K4_IDS[y]]),
    candidates: [{ pair: ['a', 'b'], cost: 5 }],
  });
  const cf = k4MinusEdge(rates);
  const waits = cf.backlog.map((l, k) => l / rates[k]!); // hours: 2.8125, 2.8125, 2.8125, 0.4167

  it('evaluate: automatic unit (hours here), and --wait-unit minute', async () => {
    const auto = await runCommand(evaluateCommand, { file: 'k4.json' }, dir);
    expect(auto.code).toBe(0);
    const line = (out: string, id: string): string => out.split('\n').find((l) => l.startsWith(`${id} `))!;
    expect(line(auto.out, 'a')).toContain(`${num(waits[0]!)} h`);
    expect(line(auto.out, 'd')).toContain(`${num(waits[3]!)} h`);
    const min = await runCommand(evaluateCommand, { file: 'k4.json', waitUnit: 'minute' }, dir);
    expect(line(min.out, 'a')).toContain(`${num(waits[0]! * 60)} min`);
    expect(line(min.out, 'd')).toContain(`${num(waits[3]! * 60)} min`);
    // rates with their unit, in the header and in the sentences
    expect(auto.out).toMatch(/rate \/hour/);
    expect(auto.out).toMatch(/of spare capacity|\d\/hour/);
    // JSON keeps the scenario's unit
    const j = JSON.parse((await runCommand(evaluateCommand, { file: 'k4.json', json: true, waitUnit: 'minute' }, dir)).out);
    expect(j.timeUnit).toBe('hour');
    expect(j.wait.byClass.a).toBeCloseTo(waits[0]!, 8);
  });

  it('check, simulate and recommend: rates carry a unit; --wait-unit is honoured and checked', async () => {
    const check = await runCommand(checkCommand, { file: 'k4.json' }, dir);
    expect(check.out).toMatch(/rate \/hour/);
    expect(check.out).toMatch(/headroom \/hour/);
    expect(check.out).toMatch(/\d\/hour of spare capacity/);
    const sim = await runCommand(simulateCommand, { file: 'k4.json', arrivals: 2000, replications: 2, jobs: 1, waitUnit: 'second' }, dir);
    expect(sim.code).toBe(0);
    expect(sim.out.split('\n').find((l) => l.startsWith('a '))).toMatch(/ s /);
    expect(sim.out).toMatch(/matches \/hour/);
    const rec = await runCommand(recommendCommand, { file: 'k4.json', waitUnit: 'minute' }, dir);
    expect(rec.code).toBe(0);
    expect(rec.out).toMatch(/\d min \(/);
    for (const command of [evaluateCommand, simulateCommand, recommendCommand] as const) {
      const bad = await runCommand(command as typeof evaluateCommand, { file: 'k4.json', waitUnit: 'fortnight' }, dir);
      expect(bad.code).toBe(2);
      expect(bad.err).toMatch(/--wait-unit must be one of second, minute, hour, day, week/);
    }
  });
});
