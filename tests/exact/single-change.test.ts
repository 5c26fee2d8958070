import { describe, expect, it } from 'vitest';
import { UnstableDesignError } from '../../src/errors.js';
import { evaluateExact } from '../../src/exact/evaluate.js';
import { singleChangeEvaluator } from '../../src/exact/single-change.js';
import { compileGraph, edgePairs, findEdge, type CompiledModel } from '../../src/model/compile.js';
import { randomPairs } from '../../src/model/generators.js';
import { bruteStability } from '../helpers/brute-stability.js';
import { randomStableDesign, toModel, type DesignOptions } from '../helpers/designs.js';
import { Rng } from '../helpers/random.js';

/*
 * Reference: a fresh evaluateExact of the changed design (the full trie, prefix and tail passes, no
 * reuse), itself checked against the permutation-sum product form and truncated chains in
 * tests/exact/. The incremental evaluator must agree to 1e-10 relative on every figure, and on the
 * stability verdict; the verdict is also checked against the brute-force definition of stability
 * ("Stability of the stochastic matching model", J. Appl. Probab. 2016, self-loop extension 2021,
 * venue from memory) where the design is small enough.
 */

const REL = 1e-10;

function toggled(model: CompiledModel, a: number, b: number): CompiledModel {
  const lo = Math.min(a, b);
  const hi = Math.max(a, b);
  const present = findEdge(model, lo, hi) >= 0;
  const pairs = edgePairs(model).filter(([x, y]) => !(present && x === lo && y === hi));
  if (!present) pairs.push([lo, hi]);
  return compileGraph(model.ids, model.rates, pairs);
}

function fresh(model: CompiledModel) {
  try {
    return evaluateExact(model);
  } catch (e) {
    if (e instanceof UnstableDesignError) return null;
    throw e;
  }
}

const close = (x: number, y: number, what: string): void => {
  expect(Math.abs(x - y), `${what}: ${x} vs ${y}`).toBeLessThanOrEqual(REL * Math.max(Math.abs(x), Math.abs(y)));
};

/** Every pair (or a sample of them) toggled: incremental vs fresh. Returns how many were unstable. */
function checkAllToggles(model: CompiledModel, rng: Rng, sample = 1, brute = model.n <= 14): { checked: number; unstable: number; methods: Set<string> } {
  const ev = singleChangeEvaluator(model);
  const base = fresh(model)!;
  close(ev.base.backlogTotal, base.backlogTotal, 'base total');
  for (let k = 0; k < model.n; k++) close(ev.base.backlog[k]!, base.backlog[k]!, `base class ${k}`);
  let checked = 0;
  let unstable = 0;
  const methods = new Set<string>();
  for (let a = 0; a < model.n; a++) {
    for (let b = a; b < model.n; b++) {
      if (sample < 1 && !rng.chance(sample)) continue;
      const changed = toggled(model, a, b);
      const want = fresh(changed);
      const got = ev.toggle(a, b);
      checked++;
      methods.add(got.method);
      if (brute) expect(got.stable, `verdict vs brute force, pair ${a}-${b}`).toBe(bruteStability(changed).stable);
      if (!want) {
        unstable++;
        expect(got.stable, `pair ${a}-${b} should be unstable`).toBe(false);
        expect(got.backlogTotal).toBe(Infinity);
        // the certificate is a genuine overloaded independent set of the changed design
        const c = got.certificate!;
        expect(c.demand).toBeGreaterThanOrEqual(c.capacity * (1 - 1e-9));
        continue;
      }
      expect(got.stable, `pair ${a}-${b} should be stable`).toBe(true);
      close(got.backlogTotal, want.backlogTotal, `total backlog, pair ${a}-${b}`);
      close(got.emptyProbability, want.emptyProbability, `P(empty), pair ${a}-${b}`);
      for (let k = 0; k < model.n; k++) {
        close(got.backlog[k]!, want.backlog[k]!, `backlog of class ${k}, pair ${a}-${b}`);
        close(got.wait[k]!, want.wait[k]!, `wait of class ${k}, pair ${a}-${b}`);
      }
    }
  }
  return { checked, unstable, methods };
}

describe('single-change evaluation (incremental) against fresh exact evaluations', () => {
  const cases: Array<[string, number, Omit<DesignOptions, 'minSlack'> & { minSlack?: number }]> = [
    ['connected, some self-loops', 101, { minClasses: 3, maxClasses: 9, edgeProb: 0.35, loopProb: 0.2, components: 1 }],
    ['two components (additions across them are evaluated afresh)', 202, { minClasses: 4, maxClasses: 9, edgeProb: 0.4, loopProb: 0.25, components: 2 }],
    ['three components, sparse', 303, { minClasses: 6, maxClasses: 11, edgeProb: 0.15, loopProb: 0.3, components: 3 }],
    ['near saturation (slack at most 2 %)', 404, { minClasses: 4, maxClasses: 10, edgeProb: 0.4, loopProb: 0.15, components: 1, maxSlack: 0.02 }],
  ];
  for (const [name, seed, o] of cases) {
    it(`every pair toggled on seeded random designs: ${name}`, () => {
      const rng = new Rng(seed);
      let checked = 0;
      let unstable = 0;
      const methods = new Set<string>();
      for (let d = 0; d < 8; d++) {
        const model = toModel(randomStableDesign(rng, { minSlack: 0, ...o }));
        const r = checkAllToggles(model, rng);
        checked += r.checked;
        unstable += r.unstable;
        r.methods.forEach((m) => methods.add(m));
      }
      expect(checked).toBeGreaterThan(100);
      expect(methods.has('incremental')).toBe(true);
      if (o.components > 1) expect(methods.has('fresh')).toBe(true);
      // removals that break stability occur, so the unstable branch is exercised
      if (name.startsWith('near')) expect(unstable).toBeGreaterThan(0);
    });
  }

  it('designs of 36–40 classes (sets spanning both mask words)', () => {
    const rng = new Rng(505);
    for (const n of [36, 40]) {
      // dense random graph (few independent sets), a few self-loops; rates from positive edge flows
      const pairs = randomPairs(n, 0.45, () => rng.next(), 0.1);
      const rates = new Array<number>(n).fill(0);
      for (const [a, b] of pairs) {
        const mu = rng.uniform(0.1, 1);
        rates[a]! += mu;
        rates[b]! += mu;
      }
      if (rates.some((r) => r === 0)) continue;
      const model = compileGraph(Array.from({ length: n }, (_, k) => `c${k}`), rates, pairs);
      const r = checkAllToggles(model, rng, 0.08, false);
      expect(r.checked).toBeGreaterThan(20);
    }
  });
});
