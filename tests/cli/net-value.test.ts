import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { evaluateCommand } from '../../src/cli/commands/evaluate.js';
import { recommendCommand } from '../../src/cli/commands/recommend.js';
import { runCommand, writeScenario } from '../helpers/cli.js';
import { tooWide } from '../helpers/columns.js';
import { namesOf, otherPairSpellings } from '../helpers/pair-notation.js';
import { randomScenario } from '../helpers/random-scenario.js';
import { runAt } from '../helpers/text-runs.js';

// Value per match at the command level: the refusal of --objective net-value without values (exit
// 2), the JSON keys, the direction of the Pareto set (net value rises with cost, higher is better),
// verdict signs measured by `evaluate` on the changed designs, and the 120-column contract at 24+
// classes (widths by tests/helpers/columns.ts).

const root = join(import.meta.dirname, '..', '..');
const scenarios = join(root, 'scenarios');
const work = mkdtempSync(join(tmpdir(), 'edgewise-value-'));

const courier = {
  name: 'courier',
  timeUnit: 'hour',
  waitingCost: 2,
  costUnit: 'credits',
  classes: [
    { id: 'small', rate: 3 },
    { id: 'large', rate: 2 },
    { id: 'bike', rate: 2.4 },
    { id: 'van', rate: 2.4 },
  ],
  compatibilities: [
    { pair: ['small', 'bike'], value: 5 },
    { pair: ['small', 'van'], value: 3 },
    { pair: ['large', 'van'], value: 8 },
    ['small', 'small'],
  ],
  candidates: [
    { pair: ['large', 'bike'], cost: 4, value: -1 },
    { pair: ['bike', 'van'], cost: 2, value: 0.5 },
    { pair: ['large', 'large'], cost: 1, value: 6 },
  ],
};

describe('recommend --objective net-value', () => {
  it('is refused (exit 2) on a file without any value or waitingCost', async () => {
    const { code, err } = await runCommand(recommendCommand, { file: 'harmful-candidate.json', objective: 'net-value', json: true } as never, scenarios);
    expect(code).toBe(2);
    expect(err).toContain('--objective net-value needs values');
  });

  it('JSON: objectiveBetter "higher", net value keys, the net value rising along the set, verdicts measured by evaluate', async () => {
    const file = writeScenario(work, 'courier.json', courier);
    const { code, out } = await runCommand(recommendCommand, { file, objective: 'net-value', json: true } as never, work);
    expect(code).toBe(0);
    const r = JSON.parse(out);
    expect(r.objective).toBe('net-value');
    expect(r.objectiveLabel).toBe('net value');
    expect(r.objectiveBetter).toBe('higher');
    expect(r.waitingCost).toBe(2);
    for (const d of [...r.pareto, r.recommended, r.today]) {
      for (const key of ['valueRate', 'waitingCostRate', 'netValue', 'objective']) expect(d).toHaveProperty(key);
      expect(d.objective).toBe(d.netValue);
      expect(d.netValue).toBeCloseTo(d.valueRate - d.waitingCostRate, 6);
      expect(d.waitingCostRate).toBeCloseTo(2 * d.backlog, 6);
    }
    for (let i = 1; i < r.pareto.length; i++) {
      expect(r.pareto[i].cost).toBeGreaterThan(r.pareto[i - 1].cost);
      expect(r.pareto[i].netValue).toBeGreaterThan(r.pareto[i - 1].netValue);
    }
    // the recommended design has the highest net value of the set (no budget here)
    expect(r.recommended.netValue).toBeCloseTo(Math.max(...r.pareto.map((d: { netValue: number }) => d.netValue)), 9);
    // today's design: the closed form of tests/usecases/evaluate-value.test.ts, value rate 29.2
    expect(r.today.valueRate).toBeCloseTo(29.2, 6);
    // each verdict against the recommended design: delta = net value of the changed design (by
    // `evaluate --design`) − the recommended design's; 'raises' exactly when delta > 0; no 'take it'
    const rec = r.verdicts.filter((v: { against: string }) => v.against === 'recommended');
    expect(rec.length).toBe(3);
    for (const v of rec) {
      expect(v.advice).not.toBe('take it');
      if (v.delta === undefined) continue;
      expect(v.effect).toBe(v.delta > 0 ? 'raises' : v.delta < 0 ? 'lowers' : 'no change');
      const has = (list: string[][], p: string[]) => list.some((q) => q.join('\u0001') === p.join('\u0001'));
      const added = v.change === 'add' ? [...r.recommended.added, v.pair] : r.recommended.added.filter((p: string[]) => p.join('\u0001') !== v.pair.join('\u0001'));
      expect(has(r.recommended.added, v.pair)).toBe(v.change === 'remove');
      const design = writeScenario(work, 'changed.json', { added, removed: [] });
      const e = await runCommand(evaluateCommand, { file, design, json: true } as never, work);
      expect(e.code, e.err).toBe(0);
      const net = JSON.parse(e.out).value.net;
      expect(v.delta).toBeCloseTo(net - r.recommended.netValue, 5);
    }
  });
});

describe('value figures fit 120 columns at 24–40 classes', () => {
  // recommend at 24 classes on 8 toggles with --exhaustive (its time is in the report, not here);
  // evaluate at 24 and 40 classes
  for (const [seed, groups, perGroup, recommendToo] of [
    [71, 6, 4, true],
    [72, 8, 5, false],
  ] as const) {
    it(`seed ${seed}: ${groups * perGroup} classes, evaluate${recommendToo ? ' and recommend --objective net-value' : ''}`, async () => {
      const { doc } = randomScenario(seed, { groups, perGroup, candidates: 5, removableShare: 0.05, values: true, patience: true, budgetShare: 0.5, ids: 'hostile' });
      const file = writeScenario(work, `value-${seed}.json`, doc);
      const names = namesOf(doc as never);
      const ev = await runAt('evaluate', evaluateCommand, { file, score: 'exact' } as never, work, 120);
      expect(ev.code, ev.err).toBe(0);
      expect(ev.out).toContain('net value');
      // the default (auto) simulates a file with patience: the value figures come from the simulated match rates
      const evSim = await runAt('evaluate', evaluateCommand, { file } as never, work, 120);
      expect(evSim.code, evSim.err).toBe(0);
      expect(evSim.out).toContain('net value');
      expect(evSim.out.replace(/\s+/g, ' ')).toContain('From the simulated match rates');
      expect(evSim.err).not.toContain('ignore patience');
      expect(tooWide(evSim.out, 120)).toEqual([]);
      const runs = [ev];
      if (recommendToo) {
        const rec = await runAt('recommend', recommendCommand, { file, objective: 'net-value', exhaustive: true } as never, work, 120);
        expect(rec.code, rec.err).toBe(0);
        expect(rec.out.replace(/\s+/g, ' ')).toContain('better is a higher net value');
        runs.push(rec);
      }
      for (const r of runs) {
        expect(tooWide(r.out, 120), r.label).toEqual([]);
        expect(tooWide(r.err, 120), r.label).toEqual([]);
        expect(otherPairSpellings(r.out + r.err, names), r.label).toEqual([]);
        expect(r.err).toContain('ignore patience');
      }
    }, 300_000);
  }
});
