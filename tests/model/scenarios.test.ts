import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { compileGraph, compileModel } from '../../src/model/compile.js';
import { parseScenario } from '../../src/model/validate.js';
import { pairKey, type Scenario } from '../../src/model/scenario.js';
import { readDesignFields } from '../../src/model/design-fields.js';
import { pairRules } from '../../src/usecases/context.js';
import { evaluateExact } from '../../src/exact/evaluate.js';
import { UnstableDesignError } from '../../src/errors.js';

// Checks on the shipped demo scenarios (scenarios/*.json). Everything below is computed from the
// scenario files by brute force written here, or by closed forms derived by hand (steps in the
// comments); the exact evaluator is only compared against those.

const dir = join(import.meta.dirname, '..', '..', 'scenarios');
const files = readdirSync(dir).filter((f) => f.endsWith('.json')).sort();
const load = (f: string): Scenario => parseScenario(readFileSync(join(dir, f), 'utf8'), f);
const raw = (f: string): Record<string, any> => JSON.parse(readFileSync(join(dir, f), 'utf8'));

/** Bitmask view of a scenario's graph, built from the ids and pairs (not from compileModel). */
interface Bits {
  n: number;
  ids: string[];
  rates: number[];
  /** nb[k]: neighbours of k other than k itself. */
  nb: number[];
  /** Bit k set when class k is self-looped. */
  loops: number;
}
function bits(ids: string[], rates: number[], pairs: ReadonlyArray<readonly [string, string]>): Bits {
  const at = new Map(ids.map((id, k) => [id, k]));
  const nb = ids.map(() => 0);
  let loops = 0;
  for (const [x, y] of pairs) {
    const a = at.get(x)!;
    const b = at.get(y)!;
    if (a === b) loops |= 1 << a;
    else {
      nb[a]! |= 1 << b;
      nb[b]! |= 1 << a;
    }
  }
  return { n: ids.length, ids, rates, nb, loops };
}
const bitsOf = (s: Scenario): Bits => bits(s.classes.map((c) => c.id), s.classes.map((c) => c.rate), s.compatibilities.map((c) => c.pair));
const lam = (g: Bits, mask: number): number => g.rates.reduce((sum, r, k) => ((mask >> k) & 1 ? sum + r : sum), 0);
/** N(A): neighbours of the members, a self-looped member counting as its own neighbour. */
const nbOf = (g: Bits, mask: number): number => {
  let out = 0;
  for (let k = 0; k < g.n; k++) if ((mask >> k) & 1) out |= g.nb[k]! | (g.loops & (1 << k));
  return out;
};
/** Independent in the graph without self-loops: no ordinary edge inside. */
const independent = (g: Bits, mask: number): boolean => {
  for (let k = 0; k < g.n; k++) if ((mask >> k) & 1 && g.nb[k]! & mask) return false;
  return true;
};
const members = (g: Bits, mask: number): string[] => g.ids.filter((_, k) => (mask >> k) & 1);

/**
 * Stability by brute force ("Stability of the stochastic matching model", J. Appl. Probab. 2016, and
 * its self-loop extension, 2021): stable iff λ(I) < λ(N(I)) for every non-empty independent set I
 * with no self-looped class. Returns the violated sets (empty when stable) and the smallest relative
 * margin (λ(N(I)) − λ(I)) / λ(N(I)) over the sets checked.
 */
function bruteStability(g: Bits): { violations: number[]; minMargin: number } {
  const violations: number[] = [];
  let minMargin = Infinity;
  for (let mask = 1; mask < 1 << g.n; mask++) {
    if (mask & g.loops || !independent(g, mask)) continue;
    const cap = lam(g, nbOf(g, mask));
    if (!(lam(g, mask) < cap)) violations.push(mask);
    else minMargin = Math.min(minMargin, (cap - lam(g, mask)) / cap);
  }
  return { violations, minMargin };
}

/** Independent sets (∅ included) of the graph without self-loops, by enumerating all 2^n subsets. */
function bruteCount(g: Bits, within = (1 << g.n) - 1): number {
  let count = 0;
  for (let mask = 0; mask < 1 << g.n; mask++) if ((mask & ~within) === 0 && independent(g, mask)) count++;
  return count;
}

/** Connected components as masks (self-loops do not connect anything). */
function componentMasks(g: Bits): number[] {
  const out: number[] = [];
  let seen = 0;
  for (let s = 0; s < g.n; s++) {
    if ((seen >> s) & 1) continue;
    let comp = 1 << s;
    let grown = true;
    while (grown) {
      const next = comp | nbOf({ ...g, loops: 0 }, comp);
      grown = next !== comp;
      comp = next;
    }
    seen |= comp;
    out.push(comp);
  }
  return out;
}

/**
 * Mean total backlog from the product form ("A product form for the general stochastic matching
 * model", J. Appl. Probab. 2021): π(w) ∝ ∏_ℓ λ(w_ℓ) / λ(N({w_1..w_ℓ})). Summed by letter set, derived
 * by hand: a word with letter set A is (a word with letter set A∖{k}) + the new letter k + any
 * number of repeats of letters of A that may repeat (those without self-loop: a self-looped class
 * waits at most once). With S the self-looped classes, D(A) = λ(N(A)) − λ(A∖S) and a variable z
 * marking the length:
 *   Φ_A(z) = Σ_{k∈A} Φ_{A∖k}(z) · z λ_k / λ(N(A)) · Σ_j (z λ(A∖S)/λ(N(A)))^j
 *          = Σ_{k∈A} λ_k z Φ_{A∖k}(z) / (λ(N(A)) − z λ(A∖S)),       Φ_∅ = 1.
 * At z = 1: Φ_A = Σ_k λ_k Φ_{A∖k} / D(A). Differentiating at z = 1 gives Ψ_A (weight × length):
 *   Ψ_A = Σ_k λ_k [Ψ_{A∖k} + Φ_{A∖k} (1 + λ(A∖S)/D(A))] / D(A).
 * Then P(empty) = 1/ΣΦ and the mean number of waiting items is ΣΨ / ΣΦ.
 */
function productFormBacklog(g: Bits): { backlog: number; empty: number } {
  const phi = new Map<number, number>([[0, 1]]);
  const psi = new Map<number, number>([[0, 0]]);
  let sumPhi = 1;
  let sumPsi = 0;
  for (let mask = 1; mask < 1 << g.n; mask++) {
    if (!independent(g, mask)) continue;
    const repeat = lam(g, mask & ~g.loops);
    const d = lam(g, nbOf(g, mask)) - repeat;
    if (!(d > 0)) throw new Error(`saturated set ${members(g, mask).join(',')}`);
    let f = 0;
    let s = 0;
    for (let k = 0; k < g.n; k++) {
      if (!((mask >> k) & 1)) continue;
      const prev = mask & ~(1 << k);
      f += (g.rates[k]! * phi.get(prev)!) / d;
      s += (g.rates[k]! * (psi.get(prev)! + phi.get(prev)! * (1 + repeat / d))) / d;
    }
    phi.set(mask, f);
    psi.set(mask, s);
    sumPhi += f;
    sumPsi += s;
  }
  return { backlog: sumPsi / sumPhi, empty: 1 / sumPhi };
}

const relClose = (a: number, b: number, tol = 1e-9): boolean => Math.abs(a - b) <= tol * Math.max(1, Math.abs(b));

describe('shipped scenarios', () => {
  it('are the six demo files', () => {
    expect(files).toEqual([
      'game-matchmaking-ladder.json',
      'harmful-candidate.json',
      'regional-shift-swap.json',
      'ride-pooling-hub.json',
      'shift-swap-marketplace.json',
      'unstable-example.json',
    ]);
  });

  for (const f of files) {
    it(`${f}: validates and carries name, timeUnit, description, labels, candidates with costs, budget`, () => {
      const s = load(f); // throws InvalidScenarioError if anything is wrong
      const doc = raw(f);
      expect(typeof doc.name).toBe('string');
      expect(typeof doc.timeUnit).toBe('string');
      expect(typeof s.description).toBe('string');
      expect(String(s.description)).toMatch(/invented/i);
      expect(typeof s.costUnit).toBe('string');
      expect(s.classes.every((c) => typeof c.label === 'string' && c.label.length > 0)).toBe(true);
      expect(s.compatibilities.length).toBeGreaterThan(0);
      expect(s.candidates.length).toBeGreaterThan(0);
      expect(doc.candidates.every((c: { cost?: unknown }) => typeof c.cost === 'number')).toBe(true);
      expect(typeof s.budget).toBe('number');
    });
  }

  for (const f of files) {
    const unstable = f === 'unstable-example.json';
    it(`${f}: ${unstable ? 'unstable' : 'stable'} by the brute-force independent-set condition`, () => {
      const { violations } = bruteStability(bitsOf(load(f)));
      if (unstable) expect(violations.length).toBeGreaterThan(0);
      else expect(violations).toEqual([]);
    });
  }

  for (const f of files) {
    it(`${f}: the exact evaluator's independent-set count is the brute-force count summed over components`, () => {
      const s = load(f);
      const g = bitsOf(s);
      const perComponent = componentMasks(g).reduce((sum, c) => sum + bruteCount(g, c), 0);
      // global count = product of the component counts (a set is independent iff each part is)
      const product = componentMasks(g).reduce((p, c) => p * bruteCount(g, c), 1);
      expect(bruteCount(g)).toBe(product);
      if (f === 'unstable-example.json') {
        expect(() => evaluateExact(compileModel(s))).toThrow(UnstableDesignError);
      } else {
        expect(evaluateExact(compileModel(s)).independentSets).toBe(perComponent);
      }
    });
  }
});

describe('ride-pooling-hub.json', () => {
  const s = load('ride-pooling-hub.json');
  const g = bitsOf(s);

  it('has 10 zone classes, self-compatible zones, removable pairs with savings, rates per hour', () => {
    expect(s.classes).toHaveLength(10);
    expect(s.timeUnit).toBe('hour');
    expect(s.compatibilities.some((c) => c.pair[0] === c.pair[1])).toBe(true);
    expect(s.compatibilities.some((c) => c.removable && c.saving > 0)).toBe(true);
  });

  it('is small enough for exact evaluation (≤ 100k independent sets, by brute force)', () => {
    expect(bruteCount(g)).toBeLessThanOrEqual(100_000);
  });

  it('has a moderate load: mean backlog between 3 and 40 riders (product form), matching evaluateExact', () => {
    const pf = productFormBacklog(g);
    expect(pf.backlog).toBeGreaterThan(3);
    expect(pf.backlog).toBeLessThan(40);
    const ex = evaluateExact(compileModel(s));
    expect(relClose(ex.backlogTotal, pf.backlog)).toBe(true);
    expect(relClose(ex.emptyProbability, pf.empty)).toBe(true);
  });
});

describe('game-matchmaking-ladder.json', () => {
  const s = load('game-matchmaking-ladder.json');

  it('is 4 tiers × 3 regions, every tier-in-region self-compatible; cross-region and adjacent-tier candidates', () => {
    expect(s.classes).toHaveLength(12);
    for (const c of s.classes) expect(s.compatibilities.some((e) => e.pair[0] === c.id && e.pair[1] === c.id)).toBe(true);
    const region = (id: string): string => id.split('-')[1]!;
    expect(s.candidates.some((c) => region(c.pair[0]) !== region(c.pair[1]))).toBe(true);
    expect(s.candidates.some((c) => region(c.pair[0]) === region(c.pair[1]))).toBe(true);
  });

  it('independent-set count = 2^6 · 3^3 = 1728 (derived by hand)', () => {
    // Derived by hand: the compatibilities are 12 self-loops plus silver–gold in each region, so the
    // graph without self-loops has 3 edges and 6 isolated classes. Each isolated class gives 2 choices
    // (in or out of the set), each silver–gold edge gives 3 (neither, silver, gold): 2^6 · 3^3 = 1728.
    expect(bruteCount(bitsOf(s))).toBe(2 ** 6 * 3 ** 3);
  });
});

describe('shift-swap-marketplace.json', () => {
  it('carries the caution in its description', () => {
    const s = load('shift-swap-marketplace.json');
    expect(String(s.description)).toContain('a model to inform decisions, not a substitute for professional judgement and local rules');
    expect(s.mustKeep.map((r) => r.pair)).toEqual(raw('shift-swap-marketplace.json').mustKeep);
  });
});

describe('harmful-candidate.json', () => {
  const s = load('harmful-candidate.json');
  const rate = (id: string): number => s.classes.find((c) => c.id === id)!.rate;
  const [h, t, a, m] = ['healer', 'tank', 'archer', 'mage'].map(rate) as [number, number, number, number];

  /*
   * Closed forms, derived by hand from the product form (J. Appl. Probab. 2021) with the letter-set
   * sums of productFormBacklog above. Design: healer (h, self-looped) and tank (t) each match archer
   * (a) and mage (m). Notation: Φ_A, Ψ_A for letter set A; D = λ(N(A)) − λ(A without self-loops).
   *  {h}: h waits at most once: Φ = Ψ = h/(h+a+m).
   *  {x} without self-loop, N(x) of rate U: words x^j, j ≥ 1, ratio r = x/U:
   *       Φ = Σ r^j = x/(U−x),  Ψ = Σ j r^j = xU/(U−x)².
   *  {x,y}, U = λ(N{x,y}): a run of the first letter, then the second, then any mix:
   *       Φ = (yΦ_x + xΦ_y)/D,  Ψ = (yΨ_x + xΨ_y)/D + Φ·U/D, with D = U − (x+y) for two plain
   *       classes and D = U − t for {h,t} (h cannot repeat).
   * Base: independent sets ∅, {h}, {t}, {a}, {m}, {a,m} (U = h+t), {h,t} (U = h+a+m).
   * Adding healer–tank removes {h,t} and makes N(h) = {h,t,a,m}, N(t) = {h,a,m}.
   * Adding archer–mage removes {a,m} and makes N(a) = {h,t,m}, N(m) = {h,t,a}.
   * Mean backlog = ΣΨ / ΣΦ (Φ_∅ = 1, Ψ_∅ = 0).
   */
  const single = (x: number, u: number): [number, number] => [x / (u - x), (x * u) / (u - x) ** 2];
  const pair = (x: number, fx: [number, number], y: number, fy: [number, number], u: number, d: number): [number, number] => {
    const phi = (y * fx[0] + x * fy[0]) / d;
    return [phi, (y * fx[1] + x * fy[1]) / d + (phi * u) / d];
  };
  const mean = (parts: Array<[number, number]>): number =>
    parts.reduce((s2, p) => s2 + p[1], 0) / (1 + parts.reduce((s2, p) => s2 + p[0], 0));

  const H: [number, number] = [h / (h + a + m), h / (h + a + m)];
  const T = single(t, a + m);
  const A = single(a, h + t);
  const M = single(m, h + t);
  const AM = pair(a, A, m, M, h + t, h + t - a - m);
  const HT = pair(h, H, t, T, h + a + m, h + a + m - t);
  const base = mean([H, T, A, M, AM, HT]);

  const H1: [number, number] = [h / (h + t + a + m), h / (h + t + a + m)];
  const T1 = single(t, h + a + m);
  const withHealerTank = mean([H1, T1, A, M, AM]);

  const A2 = single(a, h + t + m);
  const M2 = single(m, h + t + a);
  const withArcherMage = mean([H, T, A2, M2, HT]);

  it('is near saturation: the bottleneck {archer, mage} uses more than 90 % of {healer, tank}', () => {
    expect(s.classes).toHaveLength(4);
    expect((a + m) / (h + t)).toBeGreaterThan(0.9);
    expect(a + m).toBeLessThan(h + t);
  });

  it('has one harmful and one helpful candidate (closed forms): healer–tank raises the backlog, archer–mage lowers it', () => {
    const pairs = s.candidates.map((c) => [...c.pair].sort().join('+'));
    expect(pairs).toEqual(['healer+tank', 'archer+mage']);
    expect(withHealerTank).toBeGreaterThan(base * 1.05);
    expect(withArcherMage).toBeLessThan(base * 0.5);
    // both endpoints of the harmful candidate neighbour the bottleneck set {archer, mage}
    const g = bitsOf(s);
    const bottleneck = (1 << 2) | (1 << 3);
    expect(members(g, nbOf(g, bottleneck)).sort()).toEqual(['healer', 'tank']);
  });

  it('the closed forms agree with the generic product-form sum and with evaluateExact', () => {
    const ids = s.classes.map((c) => c.id);
    const rates = s.classes.map((c) => c.rate);
    const edges = s.compatibilities.map((c) => c.pair);
    const idx = (id: string): number => ids.indexOf(id);
    for (const [extra, closed] of [
      [[], base],
      [[['healer', 'tank']], withHealerTank],
      [[['archer', 'mage']], withArcherMage],
    ] as Array<[Array<[string, string]>, number]>) {
      const all = [...edges, ...extra];
      expect(relClose(productFormBacklog(bits(ids, rates, all)).backlog, closed)).toBe(true);
      const model = compileGraph(ids, rates, all.map(([x, y]) => [idx(x), idx(y)] as const));
      expect(relClose(evaluateExact(model).backlogTotal, closed)).toBe(true);
    }
  });
});

describe('unstable-example.json', () => {
  const s = load('unstable-example.json');
  const g = bitsOf(s);

  it('is not bipartite (it has self-loops) and is unstable because {east, west} is overloaded', () => {
    expect(g.loops).not.toBe(0);
    const { violations } = bruteStability(g);
    expect(violations.map((v) => members(g, v))).toEqual([['east-village', 'west-village']]);
    const v = violations[0]!;
    expect(members(g, nbOf(g, v))).toEqual(['north-village']);
    expect(lam(g, v)).toBeGreaterThan(lam(g, nbOf(g, v)));
  });

  it('the east–west candidate makes it stable (brute force)', () => {
    const fixed = bits(g.ids, g.rates, [...s.compatibilities.map((c) => c.pair), ['east-village', 'west-village']]);
    expect(bruteStability(fixed).violations).toEqual([]);
  });
});

describe('regional-shift-swap.json', () => {
  const s = load('regional-shift-swap.json');

  it('has 16 classes and carries the caution in its description (shift cover)', () => {
    expect(s.classes).toHaveLength(16);
    expect(String(s.description)).toContain('a model to inform decisions, not a substitute for professional judgement and local rules');
  });

  it('states its rules with their reasons ({pair, reason} entries), read as rules of the design', () => {
    const doc = raw('regional-shift-swap.json');
    const fields = readDesignFields(s, 'regional-shift-swap.json');
    expect(fields.forbidden.map((p) => [...p])).toEqual(doc.forbidden.map((e: { pair: string[] }) => e.pair));
    expect(fields.mustKeep.map((p) => [...p])).toEqual(doc.mustKeep.map((e: { pair: string[] }) => e.pair));
    const rules = pairRules(s);
    for (const e of doc.forbidden) expect(rules.get(pairKey(e.pair[0], e.pair[1]))).toEqual({ kind: 'forbidden', reason: e.reason });
  });
});
