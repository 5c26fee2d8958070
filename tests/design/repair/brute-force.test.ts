import { describe, expect, it } from 'vitest';
import type { DesignProblem } from '../../../src/design/space/problem.js';
import { repairs, type ForbiddenCandidate, type RepairResult } from '../../../src/design/repair/index.js';
import { maskOf, neighbourhood, toBitGraph } from '../../helpers/bitgraph.js';
import { bruteStability, certificateProblem } from '../../helpers/brute-stability.js';
import { randomProblem } from '../../helpers/design-problems.js';
import { Rng } from '../../helpers/random.js';
import { bruteRepairs, compareBrute, individuallyAllowed, modelWith, todayDegree, type BruteRepair } from '../../helpers/repair-brute.js';

// Repairs against brute force over every subset of the candidates (tests/helpers/repair-brute.ts),
// stability of each subset decided by enumerating independent sets ("Stability of the stochastic
// matching model", J. Appl. Probab. 2016), on seeded random problems of 6–8 classes and at most 12
// candidates, with removable compatibilities (kept), self-pairs, forbidden candidates and
// maxCompatibilities on some.

interface Case {
  readonly p: DesignProblem;
  /** Candidates the rules forbid, left out of the problem as problem.ts does. */
  readonly forbidden: ForbiddenCandidate[];
}

function caseOf(seed: number, limitShare: number, slack: number): Case {
  const rng = new Rng(seed);
  const base = randomProblem(rng, { minClasses: 6, maxClasses: 8, toggles: rng.int(6, 13), removableShare: 0.15, budgetShare: 0.4, loopProb: 0.08 });
  // on a quarter of the problems one or two candidates are forbidden (taken out of the toggles)
  const forbidden: ForbiddenCandidate[] = [];
  let toggles = base.toggles;
  if (rng.chance(0.25)) {
    const out = new Set(rng.shuffled(toggles.filter((t) => t.kind === 'candidate')).slice(0, rng.int(1, 2)));
    for (const t of out) forbidden.push({ a: t.a, b: t.b, source: t.source });
    toggles = toggles.filter((t) => !out.has(t));
  }
  let p: DesignProblem = { ...base, toggles, today: Uint8Array.from(toggles, (t) => (t.kind === 'removable' ? 1 : 0)) };
  expect(toggles.filter((t) => t.kind === 'candidate').length).toBeLessThanOrEqual(12);
  // on some, limits of today's degree + 0..slack on part of the classes
  if (rng.chance(limitShare)) {
    const deg = todayDegree(p);
    p = { ...p, maxDegree: Float64Array.from(deg, (d) => (rng.chance(0.6) ? d + rng.int(0, slack) : Infinity)) };
  }
  return { p, forbidden };
}

/** Comparison key: cost, size, Σ positions (the sets themselves are compared separately). */
const key = (r: { added: readonly number[]; cost: number }): string => `${r.cost.toFixed(6)}|${r.added.length}|${r.added.reduce((a, b) => a + b, 0)}`;

function expectRepairsMatch(p: DesignProblem, got: RepairResult, truth: BruteRepair[], count: number): void {
  expect(got.status).toBe('repairs');
  if (got.status !== 'repairs') return;
  expect(got.complete).toBe(true);
  const want = truth.slice(0, count);
  expect(got.repairs.map(key)).toEqual(want.map(key));
  for (const r of got.repairs) {
    // each repair is one of the minimal repairs with its key (a tie in the key may straddle `count`)
    expect(truth.some((t) => key(t) === key(r) && t.added.join() === r.added.join())).toBe(true);
    expect(r.withinBudget).toBe(p.costOffset + r.cost <= p.budget + 1e-9);
  }
  expect(new Set(got.repairs.map((r) => r.added.join())).size).toBe(got.repairs.length);
  for (let i = 1; i < got.repairs.length; i++) {
    const [x, y] = [got.repairs[i - 1]!, got.repairs[i]!];
    expect(compareBrute({ added: [...x.added], cost: x.cost }, { added: [...y.added], cost: y.cost })).toBeLessThan(0);
  }
  // keys that do not straddle the cut: exactly the brute-force sets
  const last = want.length > 0 ? key(want[want.length - 1]!) : '';
  const straddles = truth.filter((t) => key(t) === last).length !== want.filter((t) => key(t) === last).length;
  for (const w of want) if (!(straddles && key(w) === last)) expect(got.repairs.some((r) => r.added.join() === w.added.join())).toBe(true);
}

/** Checks one case against brute force; returns the outcome and what it exercised. */
async function checkCase({ p, forbidden }: Case, count: number): Promise<{ status: RepairResult['status']; multi: boolean; blocked: number }> {
  const got = await repairs(p, { count, forbiddenCandidates: forbidden });
  const none = { status: got.status, multi: false, blocked: 0 };
  if (bruteStability(modelWith(p, [])).stable) {
    expect(got.status).toBe('stable-today');
    return none;
  }
  const pool = individuallyAllowed(p);
  const truth = bruteRepairs(p, pool);
  if (truth.length > 0) {
    expectRepairsMatch(p, got, truth, count);
    return { ...none, multi: got.status === 'repairs' && got.repairs.some((r) => r.added.length > 1) };
  }
  const all = modelWith(p, pool);
  if (!bruteStability(all).stable) {
    expect(got.status).toBe('overloaded');
    if (got.status !== 'overloaded') return none;
    const o = got.overload;
    const g = toBitGraph(all);
    const I = maskOf(o.set);
    const nI = neighbourhood(g, I);
    // I is overloaded in the all-allowed design (checked from the definition)
    expect(certificateProblem(g, I, { neighbours: maskOf(o.neighbours), demand: o.demand, capacity: o.capacity })).toBeUndefined();
    expect(o.deficit).toBeCloseTo(Math.max(0, o.demand - o.capacity), 12);
    const partners = Array.from({ length: p.n }, (_, k) => k).filter((k) => !((I | nI) & (1 << k)));
    expect(o.partners.map((x) => x.class).sort((a, b) => a - b)).toEqual(partners);
    for (let i = 1; i < o.partners.length; i++) expect(o.partners[i - 1]!.rate).toBeGreaterThanOrEqual(o.partners[i]!.rate);
    // blocked: exactly the forbidden or limit-blocked candidates that would join I to a class outside N(I)
    const relieves = (a: number, b: number): boolean => (!!(I & (1 << a)) && !(nI & (1 << b))) || (!!(I & (1 << b)) && !(nI & (1 << a)));
    const byLimit = p.toggles.filter((t, j) => t.kind === 'candidate' && !pool.includes(j));
    const want = [
      ...forbidden.filter((f) => relieves(f.a, f.b)).map((f) => `forbidden:${f.source}`),
      ...byLimit.filter((t) => relieves(t.a, t.b)).map((t) => `limit:${t.source}`),
    ].sort();
    expect(o.blocked.map((b) => `${b.rule}:${b.source}`).sort()).toEqual(want);
    const deg = todayDegree(p);
    for (const b of o.blocked) {
      expect(b.relief).toBe(I & (1 << b.a) && I & (1 << b.b) ? 'within' : 'outside');
      if (b.rule === 'limit') expect(b.full.length > 0 && b.full.every((k) => deg[k]! >= p.maxDegree[k]!)).toBe(true);
    }
    return { ...none, blocked: o.blocked.length };
  }
  // every allowed candidate together is stable, so the limits are what blocks
  expect(got.status).toBe('limits');
  if (got.status !== 'limits') return none;
  const candidates = p.toggles.flatMap((t, j) => (t.kind === 'candidate' ? [j] : []));
  const free = bruteRepairs(p, candidates, false);
  expect(got.withoutLimits).toBeDefined();
  expect(key(got.withoutLimits!)).toBe(key(free[0]!));
  expect(free.some((f) => f.added.join() === got.withoutLimits!.added.join())).toBe(true);
  const deg = todayDegree(p);
  for (const j of got.withoutLimits!.added) {
    const t = p.toggles[j]!;
    deg[t.a]++;
    if (t.b !== t.a) deg[t.b]++;
  }
  expect(got.overLimit.map((x) => x.class)).toEqual(deg.flatMap((d, k) => (d > p.maxDegree[k]! ? [k] : [])));
  expect(got.overLimit.length).toBeGreaterThan(0);
  return none;
}

describe('repairs against brute force over every subset of candidates', () => {
  it('are the cheapest minimal stabilising sets, in order; otherwise the overloaded set is named', async () => {
    const seen = { 'stable-today': 0, repairs: 0, overloaded: 0, limits: 0 };
    let multi = 0;
    let blocked = 0;
    for (let seed = 1; seed <= 60; seed++) {
      const r = await checkCase(caseOf(7000 + seed, 0.5, 2), 1 + (seed % 6));
      seen[r.status]++;
      if (r.multi) multi++;
      blocked += r.blocked;
    }
    // the seeds cover every outcome, repairs of more than one pair, and blocked relieving pairs
    expect(seen.repairs).toBeGreaterThanOrEqual(20);
    expect(seen.overloaded).toBeGreaterThanOrEqual(5);
    expect(seen['stable-today']).toBeGreaterThanOrEqual(1);
    expect(multi).toBeGreaterThanOrEqual(5);
    expect(blocked).toBeGreaterThanOrEqual(3);
  });

  it('when only the limits block: the cheapest repair without them and the classes it takes over', async () => {
    // tight limits on every problem; brute force picks out the cases where the limits alone block
    let limits = 0;
    for (let seed = 1; seed <= 400 && limits < 4; seed++) {
      const c = caseOf(9000 + seed, 1, 1);
      const { p } = c;
      if (bruteStability(modelWith(p, [])).stable) continue;
      const pool = individuallyAllowed(p);
      if (bruteRepairs(p, pool).length > 0 || !bruteStability(modelWith(p, pool)).stable) continue;
      expect((await checkCase(c, 3)).status).toBe('limits');
      limits++;
    }
    expect(limits).toBe(4);
  });
});
