import { existsSync, readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { sensitivity as sensitivityOf, type SensitivityEntry, type SensitivityResult } from '../../src/design/sensitivity/sensitivity.js';
import { scenarioContext } from '../../src/usecases/context.js';
import { changesOf } from '../../src/usecases/sensitivity.js';
import { UnstableDesignError } from '../../src/errors.js';
import { evaluateExact } from '../../src/exact/evaluate.js';
import { compileGraph, compileModel, edgePairs, type CompiledModel } from '../../src/model/compile.js';
import type { Scenario } from '../../src/model/scenario.js';
import { parseScenario } from '../../src/model/validate.js';
import { isIndependent, neighbourhood, rateOf, toBitGraph } from '../helpers/bitgraph.js';
import { randomStableDesign, toModel } from '../helpers/designs.js';
import { k4, k4MinusEdge, K4_IDS, K4_MINUS_AB_PAIRS } from '../helpers/k4-minus-edge.js';
import { permutationOracle } from '../helpers/permutation-oracle.js';
import { Rng } from '../helpers/random.js';

/** A scenario of the K4-minus-{a, b} family with {a, b} as the only candidate (cost 5). */
function k4Scenario(rates: readonly number[]): Scenario {
  return parseScenario(
    JSON.stringify({
      name: 'K4 minus one edge',
      timeUnit: 'minute',
      classes: K4_IDS.map((id, k) => ({ id, rate: rates[k] })),
      compatibilities: K4_MINUS_AB_PAIRS.map(([x, y]) => ({ pair: [K4_IDS[x], K4_IDS[y]], removable: true, saving: 1 })),
      candidates: [{ pair: ['a', 'b'], cost: 5 }],
    }),
  );
}

/**
 * The design layer's sensitivity of a scenario's design, with the changes (and the rules that allow
 * them) built by the use case from the scenario, as `edgewise sensitivity` does.
 */
function sensitivity(sc: Scenario, model: CompiledModel, o: { allPairs?: boolean } = {}): SensitivityResult {
  return sensitivityOf(model, changesOf(scenarioContext(sc, { source: 'test' }), o.allPairs === true));
}

const rel = (x: number, y: number): number => Math.abs(x - y) / Math.max(Math.abs(x), Math.abs(y));

describe('sensitivity on K4 minus one edge (closed forms derived by hand in tests/helpers/k4-minus-edge.ts)', () => {
  it('rates 0.1, 0.1, 0.4, 0.4: adding {a, b} raises the backlog from 7/3 to 131/56 — harmful, and predicted', () => {
    const rates = [0.1, 0.1, 0.4, 0.4];
    const sc = k4Scenario(rates);
    const r = sensitivity(sc, compileModel(sc));
    expect(rel(r.base.backlog, 7 / 3)).toBeLessThan(1e-12);
    const base = k4MinusEdge(rates);
    for (let k = 0; k < 4; k++) expect(rel(r.base.backlogByClass[k]!, base.backlog[k]!)).toBeLessThan(1e-12);
    expect(r.additions).toHaveLength(1);
    const add = r.additions[0]!;
    expect([add.a, add.b]).toEqual([0, 1]);
    expect(rel(add.backlog, 131 / 56)).toBeLessThan(1e-12);
    expect(rel(add.delta, 131 / 56 - 7 / 3)).toBeLessThan(1e-9);
    expect(add.harmful).toBe(true);
    // the bottlenecks are {c} and {d} (slack 0.6 − 0.4 = 0.2, by hand); a and b neighbour both
    const sets = r.base.bottlenecks.map((b) => Array.from(b.set)).sort();
    expect(sets).toEqual([[2], [3]]);
    expect(r.base.bottlenecks[0]!.slack).toBeCloseTo(0.2, 12);
    expect(add.relation).toBe('joins-neighbours');
    expect(add.predicted).toBe(true);
    // per-class wait changes: K4 waits minus K4-minus-edge waits (Little's law on the closed forms)
    const after = k4(rates);
    for (let k = 0; k < 4; k++) {
      const want = (after.backlog[k]! - base.backlog[k]!) / rates[k]!;
      expect(Math.abs(add.waitDelta[k]! - want)).toBeLessThan(1e-10 * Math.max(1, Math.abs(want)));
    }
    expect(add.perUnit).toBeCloseTo((131 / 56 - 7 / 3) / 5, 12);
  });

  it('rates 0.2, 0.2, 0.4, 0.2: the same addition lowers it from 7/3 to 11/6 — helpful, not predicted', () => {
    const rates = [0.2, 0.2, 0.4, 0.2];
    const sc = k4Scenario(rates);
    const r = sensitivity(sc, compileModel(sc));
    expect(rel(r.base.backlog, 7 / 3)).toBeLessThan(1e-12);
    const add = r.additions[0]!;
    expect(rel(add.backlog, 11 / 6)).toBeLessThan(1e-12);
    expect(add.harmful).toBe(false);
    expect(add.delta).toBeLessThan(0);
    // bottlenecks by hand: {c} (0.6 − 0.4) and {a, b} (0.6 − 0.4) tie at 0.2; {a, b} is touched
    const sets = r.base.bottlenecks.map((b) => Array.from(b.set).join(',')).sort();
    expect(sets).toEqual(['0,1', '2']);
    expect(add.relation).toBe('touches');
    expect(add.predicted).toBe(false);
  });

  it('removals that break stability say so, with a certificate that holds by the definition of stability', () => {
    // rates 0.1, 0.1, 0.4, 0.4: dropping {c, d} makes {c, d} independent with demand 0.8 against N = {a, b}
    // (0.2); dropping {a, c} makes {a, c} independent with demand 0.5 against N = {b, d} (0.5): both unstable
    const sc = k4Scenario([0.1, 0.1, 0.4, 0.4]);
    const model = compileModel(sc);
    const r = sensitivity(sc, model);
    expect(r.removals).toHaveLength(5);
    for (const e of r.removals) {
      expect(e.stable).toBe(false);
      expect(e.backlog).toBe(Infinity);
      expect(e.beneficial).toBe(false);
      const c = e.certificate!;
      const changed = compileGraph(model.ids, model.rates, edgePairs(model).filter(([x, y]) => !(x === e.a && y === e.b)));
      const g = toBitGraph(changed);
      const mask = c.set.reduce((m, id) => m | (1 << model.index.get(id)!), 0);
      expect(isIndependent(g, mask)).toBe(true);
      expect(rateOf(g, mask)).toBeGreaterThanOrEqual(rateOf(g, neighbourhood(g, mask)) - 1e-12);
    }
    const cd = r.removals.find((e) => e.a === 2 && e.b === 3)!;
    expect([...cd.certificate!.set].sort()).toEqual(['c', 'd']);
  });
});

describe('every sensitivity entry equals a fresh exact evaluation (seeded random designs)', () => {
  function scenarioOf(model: CompiledModel, rng: Rng): Scenario {
    const pairs = edgePairs(model);
    const present = new Set(pairs.map(([a, b]) => `${a},${b}`));
    const absent: Array<[number, number]> = [];
    for (let a = 0; a < model.n; a++) for (let b = a; b < model.n; b++) if (!present.has(`${a},${b}`)) absent.push([a, b]);
    const cands = rng.shuffled(absent).slice(0, 3);
    return parseScenario(
      JSON.stringify({
        name: 'random',
        classes: model.ids.map((id, k) => ({ id, rate: model.rates[k] })),
        compatibilities: pairs.map(([a, b]) => ({ pair: [model.ids[a], model.ids[b]], removable: rng.chance(0.5), saving: rng.chance(0.3) ? 0 : rng.int(1, 9) })),
        candidates: cands.map(([a, b]) => ({ pair: [model.ids[a], model.ids[b]], cost: rng.chance(0.2) ? 0 : rng.int(1, 20) })),
      }),
    );
  }

  it('backlog, delta, wait deltas and flags (all pairs, 1e-10 relative)', () => {
    const rng = new Rng(4242);
    let entries = 0;
    let harmful = 0;
    for (let d = 0; d < 12; d++) {
      const model0 = toModel(randomStableDesign(rng, { minClasses: 4, maxClasses: 9, edgeProb: 0.35, loopProb: 0.2, components: d % 4 === 0 ? 2 : 1, minSlack: 0 }));
      const sc = scenarioOf(model0, rng);
      const model = compileModel(sc);
      const r = sensitivity(sc, model, { allPairs: true });
      const base = evaluateExact(model);
      expect(rel(r.base.backlog, base.backlogTotal)).toBeLessThan(1e-10);
      // --all-pairs: every absent pair once, self-pairs included
      const absent = model.n * (model.n + 1) / 2 - model.m;
      expect(r.additions).toHaveLength(absent);
      expect(r.removals).toHaveLength(model.m);
      const check = (e: SensitivityEntry): void => {
        entries++;
        const pairs = edgePairs(model).filter(([x, y]) => !(e.kind === 'remove' && x === e.a && y === e.b));
        if (e.kind === 'add') pairs.push([e.a, e.b]);
        let fresh;
        try {
          fresh = evaluateExact(compileGraph(model.ids, model.rates, pairs));
        } catch (err) {
          if (!(err instanceof UnstableDesignError)) throw err;
          expect(e.stable).toBe(false);
          expect(e.certificate).toBeDefined();
          return;
        }
        expect(e.stable).toBe(true);
        expect(rel(e.backlog, fresh.backlogTotal)).toBeLessThan(1e-10);
        expect(Math.abs(e.delta - (fresh.backlogTotal - base.backlogTotal))).toBeLessThan(1e-10 * Math.max(fresh.backlogTotal, base.backlogTotal));
        for (let k = 0; k < model.n; k++) {
          const want = fresh.wait[k]! - base.wait[k]!;
          expect(Math.abs(e.waitDelta[k]! - want)).toBeLessThan(1e-10 * Math.max(fresh.wait[k]!, base.wait[k]!));
        }
        const up = fresh.backlogTotal - base.backlogTotal > 1e-9 * base.backlogTotal;
        const down = fresh.backlogTotal - base.backlogTotal < -1e-9 * base.backlogTotal;
        if (e.kind === 'add') {
          expect(e.harmful).toBe(up);
          if (up) harmful++;
        } else expect(e.beneficial).toBe(down || (!up && (e.price ?? 0) > 0));
      };
      r.additions.forEach(check);
      r.removals.forEach(check);
    }
    expect(entries).toBeGreaterThan(300);
    expect(harmful).toBeGreaterThan(0); // the paradox does show up among random single additions
  });

  it('the prediction follows the bottleneck found by brute force over every independent set', () => {
    // brute force: the independent self-loop-free sets of least slack λ(N(I)) − λ(I) (derived from the
    // stability condition of "Stability of the stochastic matching model", J. Appl. Probab. 2016)
    const rng = new Rng(777);
    let joins = 0;
    for (let d = 0; d < 12; d++) {
      const model0 = toModel(randomStableDesign(rng, { minClasses: 4, maxClasses: 9, edgeProb: 0.35, loopProb: 0.2, components: 1, minSlack: 0 }));
      const sc = scenarioOf(model0, rng);
      const model = compileModel(sc);
      const g = toBitGraph(model);
      let least = Infinity;
      let best: number[] = [];
      for (let mask = 1; mask < 1 << g.n; mask++) {
        if (!isIndependent(g, mask) || mask & g.loopMask) continue;
        const slack = rateOf(g, neighbourhood(g, mask)) - rateOf(g, mask);
        if (slack < least - 1e-9) {
          least = slack;
          best = [mask];
        } else if (slack <= least + 1e-9) best.push(mask);
      }
      const r = sensitivity(sc, model, { allPairs: true });
      for (const e of r.additions) {
        const inI = (k: number): boolean => best.some((m) => (m >> k) & 1);
        const touches = inI(e.a) || inI(e.b);
        const joined = best.some((m) => (neighbourhood(g, m) >> e.a) & 1 && (neighbourhood(g, m) >> e.b) & 1);
        const want = touches ? 'touches' : joined ? 'joins-neighbours' : 'elsewhere';
        // with continuous random rates the least slack is attained once, so both views agree
        if (best.length === 1) {
          expect(e.relation).toBe(want);
          expect(e.predicted).toBe(want === 'joins-neighbours');
          if (want === 'joins-neighbours') joins++;
        }
      }
    }
    expect(joins).toBeGreaterThan(0);
  });

  it('allowed changes first, each group sorted by backlog change per unit of money, unpriced pairs after priced ones', () => {
    const rng = new Rng(99);
    for (let d = 0; d < 6; d++) {
      const sc = scenarioOf(toModel(randomStableDesign(rng, { minClasses: 4, maxClasses: 8, edgeProb: 0.4, loopProb: 0.2, components: 1, minSlack: 0 })), rng);
      const r = sensitivity(sc, compileModel(sc), { allPairs: true });
      for (const list of [r.additions, r.removals]) {
        // changes the rules allow first (here, non-removable compatibilities are 'fixed'), then by money
        const key = (e: SensitivityEntry): [number, number] => [(e.allowed ? 0 : 2) + (e.price === undefined ? 1 : 0), e.price === undefined ? e.delta : e.perUnit!];
        for (let i = 1; i < list.length; i++) {
          const [ta, ka] = key(list[i - 1]!);
          const [tb, kb] = key(list[i]!);
          expect(ta <= tb).toBe(true);
          if (ta === tb && Number.isFinite(ka) && Number.isFinite(kb)) expect(ka).toBeLessThanOrEqual(kb + 1e-12 * Math.max(1, Math.abs(kb)));
        }
        expect(list.filter((e) => e.price !== undefined).every((e) => e.perUnit !== undefined)).toBe(true);
      }
    }
  });
});

describe('scenarios/harmful-candidate.json (invented co-op quest party finder)', () => {
  const path = new URL('../../scenarios/harmful-candidate.json', import.meta.url);
  // if the shipped file is missing, the same data inline
  const text = existsSync(path)
    ? readFileSync(path, 'utf8')
    : JSON.stringify({
        name: 'co-op quest',
        timeUnit: 'minute',
        classes: [
          { id: 'healer', rate: 1.5 },
          { id: 'tank', rate: 4.5 },
          { id: 'archer', rate: 2.5 },
          { id: 'mage', rate: 3.2 },
        ],
        compatibilities: [['healer', 'healer'], ['healer', 'archer'], ['healer', 'mage'], ['tank', 'archer'], ['tank', 'mage']],
        candidates: [
          { pair: ['healer', 'tank'], cost: 10 },
          { pair: ['archer', 'mage'], cost: 25 },
        ],
      });
  const sc = parseScenario(text);
  const model = compileModel(sc);
  const r = sensitivity(sc, model);
  const find = (list: readonly SensitivityEntry[], x: string, y: string): SensitivityEntry =>
    list.find((e) => [model.ids[e.a], model.ids[e.b]].sort().join() === [x, y].sort().join())!;

  it('figures match the permutation-sum product form (an oracle sharing no code with the evaluator)', () => {
    expect(rel(r.base.backlog, permutationOracle(model).backlogTotal)).toBeLessThan(1e-10);
    for (const e of r.additions) {
      const changed = compileGraph(model.ids, model.rates, [...edgePairs(model), [e.a, e.b]]);
      expect(rel(e.backlog, permutationOracle(changed).backlogTotal)).toBeLessThan(1e-10);
    }
  });

  it('healer ↔ tank joins two neighbours of the bottleneck {archer, mage}: harmful, and predicted', () => {
    // bottleneck by hand: {archer, mage} demands 2.5 + 3.2 = 5.7 against healer + tank = 6.0 (slack 0.3);
    // {tank} has slack 5.7 − 4.5 = 1.2, {archer} 6.0 − 2.5, {mage} 6.0 − 3.2 (healer is self-looped)
    expect(r.base.bottlenecks).toHaveLength(1);
    expect(Array.from(r.base.bottlenecks[0]!.set, (k) => model.ids[k]).sort()).toEqual(['archer', 'mage']);
    expect(r.base.bottlenecks[0]!.slack).toBeCloseTo(0.3, 12);
    const e = find(r.additions, 'healer', 'tank');
    expect(e.harmful).toBe(true);
    expect(e.relation).toBe('joins-neighbours');
    expect(e.predicted).toBe(true);
  });

  it('archer ↔ mage touches the bottleneck: helps, no harm predicted; it ranks first', () => {
    const e = find(r.additions, 'archer', 'mage');
    expect(e.harmful).toBe(false);
    expect(e.delta).toBeLessThan(0);
    expect(e.relation).toBe('touches');
    expect(e.predicted).toBe(false);
    expect(r.additions[0]).toBe(e);
  });

  it('removing tank ↔ archer breaks stability: {tank, archer} (7.0) against {healer, mage} (4.7), by hand', () => {
    const e = find(r.removals, 'tank', 'archer');
    expect(e.stable).toBe(false);
    expect([...e.certificate!.set].sort()).toEqual(['archer', 'tank']);
    expect(e.certificate!.demand).toBeCloseTo(7.0, 12);
    expect(e.certificate!.capacity).toBeCloseTo(4.7, 12);
    // unstable removals go last
    expect(r.removals.slice(-3).every((x) => x.stable === false)).toBe(true);
  });
});
