import { describe, expect, it } from 'vitest';
import { evaluateExact } from '../../src/exact/evaluate.js';
import type { CompiledModel } from '../../src/model/compile.js';
import { designComponents, randomStableDesign, subDesign, toModel, type Design, type DesignOptions } from '../helpers/designs.js';
import type { Metrics } from '../helpers/metrics.js';
import { permutationOracle } from '../helpers/permutation-oracle.js';
import { Rng } from '../helpers/random.js';

/*
 * Identities every stationary FCFM result must satisfy, each derived by hand:
 *  (1) Flow balance per class: in steady state (stable design) items of class k arrive at rate λ_k and
 *      every one eventually leaves in a match. A match on an edge {k, j}, j ≠ k, removes one k-item; a match
 *      on the self-loop {k, k} removes two. Hence Σ_{j≠k} r_{kj} + 2 r_{kk} = λ_k.
 *  (2) Summing (1) over k counts every match twice (each removes two items): Σ_e r_e = Λ/2.
 *  (3) Every match is triggered by exactly one arrival, the one that finds a compatible item waiting; by
 *      PASTA an arrival of k does so with probability immediateMatch_k, so Σ_k λ_k immediateMatch_k = Σ_e r_e = Λ/2.
 *  (4) Little's law per class: wait_k = backlog_k / λ_k.
 *  (5) 0 < P(empty) ≤ 1; 0 ≤ immediateMatch_k ≤ 1; backlog_k ≥ 0; backlogTotal = Σ_k backlog_k.
 *  (6) Disconnected designs: components see independent arrival streams and never interact, so they are
 *      independent processes: P(empty) is the product of the components' P(empty), and each class's
 *      backlog equals its backlog in its component evaluated alone.
 */
function checkIdentities(model: CompiledModel, r: Metrics, tol: number): void {
  const { n, m, rates, edgeA, edgeB, totalRate } = model;
  const close = (x: number, y: number, what: string): void => {
    expect(Math.abs(x - y), `${what}: ${x} vs ${y}`).toBeLessThanOrEqual(tol * Math.max(Math.abs(x), Math.abs(y), 1e-300));
  };
  const perClass = new Array<number>(n).fill(0);
  let edgeSum = 0;
  for (let e = 0; e < m; e++) {
    const x = r.matchRates[e]!;
    expect(x, `match rate of edge ${e}`).toBeGreaterThan(0);
    edgeSum += x;
    perClass[edgeA[e]!] += x;
    perClass[edgeB[e]!] += x; // a self-loop adds twice
  }
  for (let k = 0; k < n; k++) close(perClass[k]!, rates[k]!, `flow balance of class ${k}`);
  close(edgeSum, totalRate / 2, 'Σ match rates');
  let triggered = 0;
  for (let k = 0; k < n; k++) triggered += rates[k]! * r.immediateMatch[k]!;
  close(triggered, totalRate / 2, 'Σ λ_k immediateMatch_k');
  let total = 0;
  for (let k = 0; k < n; k++) {
    close(r.wait[k]! * rates[k]!, r.backlog[k]!, `Little's law for class ${k}`);
    expect(r.backlog[k]).toBeGreaterThanOrEqual(0);
    expect(r.immediateMatch[k]).toBeGreaterThanOrEqual(0);
    expect(r.immediateMatch[k]).toBeLessThanOrEqual(1);
    total += r.backlog[k]!;
  }
  close(r.backlogTotal, total, 'backlogTotal');
  expect(r.emptyProbability).toBeGreaterThan(0);
  expect(r.emptyProbability).toBeLessThanOrEqual(1);
}

function checkComponents(design: Design, r: Metrics, tol: number): void {
  const parts = designComponents(design);
  let product = 1;
  for (const members of parts) {
    const alone = evaluateExact(toModel(subDesign(design, members)));
    product *= alone.emptyProbability;
    members.forEach((k, i) =>
      expect(Math.abs(r.backlog[k]! - alone.backlog[i]!), `class ${k} alone`).toBeLessThanOrEqual(tol * Math.max(r.backlog[k]!, 1e-300)),
    );
  }
  expect(Math.abs(r.emptyProbability - product)).toBeLessThanOrEqual(tol * product);
}

const rng = new Rng(99173);
const small: Design[] = [];
const kinds: Array<Omit<DesignOptions, 'minClasses' | 'maxClasses'>> = [
  { edgeProb: 0.4, loopProb: 0.3, components: 1, minSlack: 0.02 },
  { edgeProb: 0.5, loopProb: 0.3, components: 2, minSlack: 0.02 },
  { edgeProb: 0.2, loopProb: 0.5, components: 1, minSlack: 0.02 },
  { edgeProb: 0.4, loopProb: 0.2, components: 1, minSlack: 0.01, maxSlack: 0.08 },
];
for (let i = 0; i < 48; i++) small.push(randomStableDesign(rng, { ...kinds[i % kinds.length]!, minClasses: 3, maxClasses: 8 }));

const large: Design[] = [
  randomStableDesign(rng, { edgeProb: 0.45, loopProb: 0.2, components: 1, minSlack: 0.02, minClasses: 12, maxClasses: 12 }),
  randomStableDesign(rng, { edgeProb: 0.4, loopProb: 0.3, components: 1, minSlack: 0.02, minClasses: 14, maxClasses: 14 }),
  randomStableDesign(rng, { edgeProb: 0.5, loopProb: 0.2, components: 1, minSlack: 0.02, minClasses: 16, maxClasses: 16 }),
  randomStableDesign(rng, { edgeProb: 0.35, loopProb: 0.4, components: 1, minSlack: 0.02, minClasses: 15, maxClasses: 15 }),
  randomStableDesign(rng, { edgeProb: 0.5, loopProb: 0.3, components: 2, minSlack: 0.02, minClasses: 13, maxClasses: 13 }),
  randomStableDesign(rng, { edgeProb: 0.5, loopProb: 0.3, components: 3, minSlack: 0.02, minClasses: 16, maxClasses: 16 }),
  // sparse ones: thousands of independent sets
  randomStableDesign(rng, { edgeProb: 0.12, loopProb: 0.4, components: 1, minSlack: 0.02, minClasses: 16, maxClasses: 16 }),
  randomStableDesign(rng, { edgeProb: 0, loopProb: 0.5, components: 1, minSlack: 0.02, minClasses: 14, maxClasses: 14 }),
];

describe('invariants of the exact result (identities derived by hand above)', () => {
  it.each(small.map((design, i) => ({ design, label: `small design #${i} (${design.ids.length} classes)` })))('$label', ({ design }) => {
    const model = toModel(design);
    checkIdentities(model, evaluateExact(model), 1e-9);
    checkIdentities(model, permutationOracle(model), 1e-9); // the oracle obeys them too
    if (designComponents(design).length > 1) checkComponents(design, evaluateExact(model), 1e-9);
  });

  it.each(large.map((design, i) => ({ design, label: `large design #${i} (${design.ids.length} classes, ${designComponents(design).length} components)` })))(
    '$label',
    ({ design }) => {
      const model = toModel(design);
      const r = evaluateExact(model);
      expect(r.independentSets).toBeGreaterThan(design.ids.length);
      checkIdentities(model, r, 1e-9);
      if (designComponents(design).length > 1) checkComponents(design, r, 1e-9);
    },
  );
});
