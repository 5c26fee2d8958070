import { describe, expect, it } from 'vitest';
import type { DesignView, ReportData, SensitivityRow } from '../../src/report/report-data.js';
import { namerOf, pairWords, rowAdvice, verdicts, worstCase } from '../../src/report/verdicts.js';

// Hand-made report data for the co-op quest scenario (scenarios/harmful-candidate.json). The
// backlogs are the closed forms derived by hand in docs/scenario-format.md ("harmful-candidate.json"):
// today 414.745370 / 26.388889 = 15.7167, with healer–tank 17.6451, with archer–mage 4.3303.
// Expected sentences are written from those numbers: 4.3303 / 15.7167 − 1 = −0.7245 → "−72 %",
// 17.6451 / 15.7167 − 1 = +0.1227 → "12 %".

const classes = [
  { id: 'healer', label: 'Healer', rate: 1.5 },
  { id: 'tank', label: 'Tank', rate: 4.5 },
  { id: 'archer', label: 'Archer', rate: 2.5 },
  { id: 'mage', label: 'Mage', rate: 3.2 },
];
const today: DesignView = { name: "today's design", role: 'today', cost: 0, added: [], removed: [], stable: true, backlog: 15.7167, waits: [0.1, 0.2, 2.5, 2.4], underVariants: [{ stable: false, backlog: NaN, maxWait: NaN, maxWaitClass: '' }] };
const best: DesignView = { name: 'recommended (cost 25)', role: 'recommended', cost: 25, added: [['archer', 'mage']], removed: [], stable: true, backlog: 4.3303, waits: [0.2, 0.8, 0.03, 0.04], underVariants: [{ stable: true, backlog: 6.5, maxWait: 1, maxWaitClass: 'tank' }] };
const rows: SensitivityRow[] = [
  { kind: 'add', pair: ['healer', 'tank'], money: 10, stable: true, backlog: 17.6451, delta: 17.6451 - 15.7167, flagged: true, predicted: true },
  { kind: 'add', pair: ['archer', 'mage'], money: 25, stable: true, backlog: 4.3303, delta: 4.3303 - 15.7167, flagged: false, predicted: false },
  { kind: 'remove', pair: ['healer', 'healer'], money: 3, stable: true, backlog: 15.7167, delta: 0, flagged: true, predicted: null },
  { kind: 'remove', pair: ['tank', 'archer'], money: 0, stable: false, backlog: NaN, delta: NaN, flagged: false, predicted: null, instability: 'items from archer …' },
];
const data: Omit<ReportData, 'verdicts'> = {
  scenario: 'co-op',
  description: null,
  timeUnit: 'minute',
  costUnit: 'points',
  itemWord: 'players',
  budget: 30,
  classes,
  compatibilityCount: 5,
  candidateCount: 2,
  graph: { nodes: [], edges: [], timeUnit: 'minute', title: '' },
  bottleneck: { set: ['archer', 'mage'], neighbours: ['healer', 'tank'], demand: 5.7, capacity: 6, slack: 0.3 },
  today,
  designs: [best],
  front: [],
  baselines: [],
  sensitivity: rows,
  sweep: { grow: ['archer', 'mage'], curves: [], crossovers: [{ load: 1.02, label: 'Healer – Tank starts to hurt' }], limit: 1.0526 },
  variants: ['rush'],
  notes: [],
};
const name = namerOf(data);

describe('verdicts', () => {
  const v = verdicts(data, name);

  it("first says what today's design does, with the bottleneck and its spare capacity (0.3 / 6 = 5 %)", () => {
    expect(v[0]).toBe(
      "Today's design keeps up with demand: on average 15.7 players wait, and the longest mean wait is 2.5 minutes (Archer). The tightest group is Archer and Mage: it brings 5.7 per minute and only Healer and Tank can serve it, with 6 per minute (5\u00a0% to spare).",
    );
  });

  it('then what to fund within the budget, with the exact change in waiting (−72 %)', () => {
    expect(v[1]).toBe(
      'Within the budget of 30 points: fund Archer – Mage (25). It costs 25 points; waiting goes from 15.7 to 4.33 players (−72\u00a0%), and the longest mean wait from 2.5 to 0.8 minutes.',
    );
  });

  it('warns against the harmful candidate (+12 %) and names removals that save money or break stability', () => {
    expect(v.some((s) => s.startsWith('Do not pay for Healer – Tank (10 points): on its own it raises waiting by 12\u00a0%.'))).toBe(true);
    expect(v).toContain('On its own, dropping Healer with itself (saves 3, waiting unchanged) would save money without adding waiting (savings in points).');
    expect(v).toContain('Keep Tank – Archer: without it the design can no longer keep up.');
  });

  it('reports demand futures: today fails under "rush", the recommendation\'s worst case is 6.5 there', () => {
    expect(v).toContain('Under “rush” demand today\'s design cannot keep up.');
    expect(v).toContain('The recommended design\'s worst case is 6.5 players waiting (“rush” demand).');
  });

  it('ends with the load sweep: stability limit and crossover', () => {
    expect(v[v.length - 1]).toBe("Today's design stays stable until the demand of Archer and Mage reaches ×1.05 of today's; Healer – Tank starts to hurt at ×1.02.");
  });

  it('says to keep today when nothing helps, and explains an unstable today', () => {
    const front = [{ cost: 0, backlog: 15.7167, maxWait: 2.5, added: [], removed: [] }];
    const none = verdicts({ ...data, designs: [], front, sensitivity: [], variants: [], sweep: null }, name);
    expect(none).toEqual([v[0], "Within the budget of 30 points, no change lowers waiting: keep today's design."]);
    const unstable = verdicts({ ...data, today: { ...today, stable: false, backlog: NaN, waits: null, instability: 'items from archer and mage (5.7/minute) can only be matched with healer (1.5/minute)' }, sensitivity: [], variants: [], sweep: null }, name);
    expect(unstable[0]).toBe("Today's design cannot keep up: items from archer and mage (5.7/minute) can only be matched with healer (1.5/minute). Waiting grows without bound until the design changes.");
    // without sensitivity rows the price of each change is not repeated
    expect(unstable[1]).toBe('Within the budget of 30 points: fund Archer – Mage. It costs 25 points and makes the design stable, with 4.33 players waiting on average.');
  });
});

describe('rowAdvice', () => {
  it('gives one plain instruction per kind of row', () => {
    expect(rowAdvice(rows[0]!, 15.7167)).toBe("Don't fund: waiting goes up (+12\u00a0%).");
    expect(rowAdvice(rows[1]!, 15.7167)).toBe('Helps: waiting goes down (−72\u00a0%).');
    expect(rowAdvice(rows[2]!, 15.7167)).toBe('Drop it: saves money, waiting unchanged.');
    expect(rowAdvice(rows[3]!, 15.7167)).toBe('Keep: without it the queue grows without bound.');
  });
});

describe('worstCase and pairWords', () => {
  it('takes the largest backlog over today and the variants; unstable counts as unbounded', () => {
    expect(worstCase(best, ['rush'])).toEqual({ backlog: 6.5, where: 'rush' });
    expect(worstCase(today, ['rush'])).toEqual({ backlog: Infinity, where: 'rush' });
  });
  it('names pairs with labels', () => {
    expect(pairWords(['healer', 'tank'], name)).toBe('Healer – Tank');
    expect(pairWords(['healer', 'healer'], name)).toBe('Healer with itself');
  });
});
