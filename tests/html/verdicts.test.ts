import { describe, expect, it } from 'vitest';
import type { ReportRecord } from '../../src/usecases/report.js';
import type { DesignFigures, VerdictRecord } from '../../src/usecases/designs.js';
import { curveWords, namerOf, pairWords, verdicts } from '../../src/html/verdicts.js';

// A hand-made report record for the co-op quest scenario (scenarios/harmful-candidate.json). Today's
// backlog and the recommended design's are the closed forms derived by hand in
// docs/scenario-format.md ("harmful-candidate.json"): today 15.7167, with archer ↔ mage 4.3303.
// The single changes against the recommended design are invented round numbers, so that every
// expected sentence is written by hand from the numbers given here:
//   4.3303 / 15.7167 − 1 = −0.7245 → "−72 %"; +2 / 4.3303 = 0.4619 → "46.2 %";
//   −1 / 4.3303 → "23.1 %"; spare capacity 0.3 / 6 = "5.00 %".

const classes = [
  { id: 'healer', label: 'Healer', rate: 1.5 },
  { id: 'tank', label: 'Tank', rate: 4.5 },
  { id: 'archer', label: 'Archer', rate: 2.5 },
  { id: 'mage', label: 'Mage', rate: 3.2 },
];

const fig = (o: Partial<DesignFigures>): DesignFigures => ({
  added: [],
  removed: [],
  cost: 0,
  stable: true,
  method: 'exact',
  backlog: null,
  objective: null,
  valueRate: null,
  waitingCostRate: null,
  netValue: null,
  maxWait: null,
  maxWaitClass: null,
  waits: null,
  spareCapacity: null,
  flowMargin: null,
  independentSets: null,
  ...o,
});

const verdict = (o: Partial<VerdictRecord> & Pick<VerdictRecord, 'pair' | 'change'>): VerdictRecord => ({
  kind: o.change === 'add' ? 'candidate' : 'removable',
  against: 'recommended',
  delta: null,
  backlogDelta: null,
  price: 0,
  cost: 25,
  stable: true,
  withinBudget: true,
  feasible: true,
  effect: 'no change',
  ...o,
});

const today = fig({ backlog: 15.7167, objective: 15.7167, maxWait: 2.5, maxWaitClass: 'archer' });
const recommended = { ...fig({ added: [['archer', 'mage']], cost: 25, backlog: 4.3303, objective: 4.3303, maxWait: 0.8, maxWaitClass: 'tank' }), improvements: 0, why: '' };
const against: VerdictRecord[] = [
  verdict({ pair: ['healer', 'tank'], change: 'add', delta: 2, backlogDelta: 2, price: 10, cost: 35, effect: 'raises', advice: 'harmful' }),
  verdict({ pair: ['tank', 'archer'], change: 'remove', stable: false, effect: 'breaks stability', advice: 'needed for stability' }),
  verdict({ pair: ['mage', 'mage'], change: 'add', delta: -1, backlogDelta: -1, price: 40, cost: 65, withinBudget: false, feasible: false, effect: 'lowers', advice: 'over budget' }),
  verdict({ pair: ['archer', 'mage'], change: 'remove', delta: 11.3864, backlogDelta: 11.3864, price: 25, cost: 0, effect: 'raises', advice: 'keep' }),
  // against today's design: carries an effect, never advice, and is never told in the headline
  verdict({ pair: ['healer', 'tank'], change: 'add', against: 'today', delta: 1.9284, backlogDelta: 1.9284, price: 10, cost: 10, effect: 'raises' }),
];
const outcome = (stable: boolean, backlog: number | null) => ({ stable, backlog, maxWait: null, maxWaitClass: null });

const record = {
  command: 'report',
  scenario: 'co-op',
  timeUnit: 'minute',
  warnings: [],
  classes,
  description: null,
  costUnit: 'points',
  itemWord: 'players',
  budget: 30,
  decision: { objective: 'total', objectiveLabel: 'total backlog', budget: 30, costUnit: 'points', recommended, today, verdicts: against, pareto: [], baselines: [] },
  noDecision: null,
  todayStable: true,
  bottleneck: { set: ['archer', 'mage'], neighbours: ['healer', 'tank'], demand: 5.7, capacity: 6, spareCapacity: 0.3 },
  todayInstability: null,
  matchRates: [],
  designs: [
    { role: 'today', name: "today's design", figures: today, underVariants: [outcome(false, null)] },
    { role: 'recommended', name: 'the recommended design', figures: recommended, underVariants: [outcome(true, 6.5)] },
  ],
  variants: ['rush'],
  sweep: {
    grow: ['archer', 'mage'],
    limit: { factor: 1.0526, method: '' },
    curves: [{ name: 'reference' }, { name: 'with archer~mage' }, { name: 'with archer~mage,healer~tank' }],
    crossovers: [{ variant: 'with archer~mage,healer~tank', factor: 1.02, direction: 'starts-to-hurt' }],
  },
  sweepAddition: { pair: ['healer', 'tank'], why: 'harmful' },
  simulated: [],
  inputs: { classes: [], compatibilities: [], candidates: [], demand: [] },
  notes: [],
} as unknown as ReportRecord;

const name = namerOf(record);
const v = verdicts(record, name);

describe('verdicts', () => {
  it("first says what today's design does, with the bottleneck and its spare capacity (0.3 / 6 = 5 %)", () => {
    expect(v[0]).toBe(
      "Today's design keeps up with demand: on average 15.72 players wait, and the longest mean wait is 2.5 minutes (Archer). The tightest group is Archer and Mage: it brings 5.7 per minute and only Healer and Tank can serve it, with 6 per minute (5.00 % to spare).",
    );
  });

  it('then what to fund within the budget, with the exact change in waiting (−72 %)', () => {
    expect(v[1]).toBe(
      'Within the budget of 30 points: fund Archer ↔ Mage. It costs 25 points; waiting goes from 15.72 to 4.33 players (−72 %), and the longest mean wait from 2.5 to 0.8 minutes.',
    );
  });

  it('every sentence about a single change is measured against the recommended design', () => {
    expect(v).toContain('Do not pay for Healer ↔ Tank (10 points): added to the recommended design it raises waiting by 46.2 %. More flexibility is not always better.');
    expect(v).toContain('Keep Tank ↔ Archer: without it the recommended design can no longer keep up.');
    expect(v).toContain('Beyond the budget, adding Mage ↔ Mage (40 points) to the recommended design would lower waiting by 23.1 %.');
    // the verdict against today's design (+1.9284) is not told: +1.9284 / 15.7167 = 12.3 %
    expect(v.join(' ')).not.toContain('12.3 %');
  });

  it('reports demand futures: today fails under "rush", the recommendation\'s worst case is 6.5 there', () => {
    expect(v).toContain('Under “rush” demand today\'s design cannot keep up.');
    expect(v).toContain('The recommended design\'s worst case is 6.5 players waiting (“rush” demand).');
  });

  it('ends with the load sweep: stability limit and crossover, the curve named in words', () => {
    expect(v[v.length - 1]).toBe("Today's design stays stable until the demand of Archer and Mage reaches ×1.05 of today's; the recommended design with Healer ↔ Tank added starts to hurt at ×1.02.");
    expect(curveWords(record, 'reference', name)).toBe("today's design");
    expect(curveWords(record, 'with archer~mage', name)).toBe('the recommended design');
  });

  it('says to keep today when nothing helps', () => {
    const keep = { ...record, decision: { ...record.decision!, recommended: { ...today, improvements: 0, why: '' }, verdicts: [] }, variants: [], designs: [], sweep: null } as ReportRecord;
    expect(verdicts(keep, name)).toEqual([v[0], "Within the budget of 30 points, no change lowers waiting: keep today's design."]);
  });

  it('explains an unstable today with its cheapest repair, and a stable recommendation', () => {
    const unstable = {
      ...record,
      todayStable: false,
      bottleneck: null,
      todayInstability: { message: 'unstable: items from archer and mage (5.7/minute) can only be matched with healer (1.5/minute)', repairs: [{ added: [['archer', 'mage']], cost: 25 }] },
      decision: { ...record.decision!, today: fig({ stable: false }), verdicts: [] },
      variants: [],
      sweep: null,
    } as unknown as ReportRecord;
    const u = verdicts(unstable, name);
    expect(u[0]).toBe(
      "Today's design cannot keep up: items from archer and mage (5.7/minute) can only be matched with healer (1.5/minute). Waiting grows without bound until the design changes. The cheapest way out is to add Archer ↔ Mage (25 points).",
    );
    expect(u[1]).toBe('Within the budget of 30 points: fund Archer ↔ Mage. It costs 25 points and makes the design stable, with 4.33 players waiting on average.');
    const none = verdicts({ ...unstable, decision: null, noDecision: 'no stable design exists' } as ReportRecord, name);
    expect(none[1]).toBe('No recommendation: no stable design exists.');
  });

  it('with patience, gives the simulated figures with abandonment beside the exact ones', () => {
    const sim = { ...record, simulated: [{ role: 'recommended', seed: 1, replications: 4, arrivals: 1000, backlog: { mean: 3.1, ci95: [3, 3.2] }, abandonShare: { mean: 0.27, ci95: [0.26, 0.28] }, byClass: {} }] } as unknown as ReportRecord;
    expect(verdicts(sim, name).at(-1)).toBe(
      'With the patience given in the file, items give up: simulation of the recommended design gives 3.1 players waiting on average and 27.0 % of arrivals giving up (the exact figures above ignore patience).',
    );
  });
});

describe('namerOf and pairWords', () => {
  it('names pairs with labels, in the one pair notation', () => {
    expect(pairWords(['healer', 'tank'], name)).toBe('Healer ↔ Tank');
    expect(pairWords(['healer', 'healer'], name)).toBe('Healer ↔ Healer');
  });
  it('falls back to ids when a label is missing or shared', () => {
    const shared = namerOf({ classes: [{ id: 'a', label: 'Same', rate: 1 }, { id: 'b', label: 'Same', rate: 1 }] });
    expect(pairWords(['a', 'b'], shared)).toBe('a ↔ b');
    const missing = namerOf({ classes: [{ id: 'a', label: 'A', rate: 1 }, { id: 'b', label: null, rate: 1 }] });
    expect(missing('a')).toBe('a');
  });
});
