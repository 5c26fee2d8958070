/**
 * The simulated abandonment share (sim-score.ts, the timed engine) against a closed form derived by
 * hand (the steps below), for a two-class model where only class a has a patience.
 *
 * Model: classes a (rate λa, exponential patience of mean θa) and b (rate λb, a short patience θb:
 * b never waits long), one compatibility a ↔ b, FCFM. At most one class waits at a time (an arrival
 * matches any waiting partner), so the state is one integer n: n > 0 items of a wait, or −n of b.
 * Derivation by hand:
 *   1. Transitions: an a arrives → n + 1 (rate λa: it waits, or takes a waiting b); a b arrives →
 *      n − 1 (rate λb); at n > 0 each waiting a leaves at rate 1/θa → n − 1 (rate n/θa); at n < 0
 *      each waiting b leaves at rate 1/θb → n + 1 (rate |n|/θb). A birth–death chain on ℤ.
 *   2. Balance across the cut {n, n + 1}: for n ≥ 0, π(n + 1) (λb + (n + 1)/θa) = π(n) λa; for
 *      n ≤ 0, π(n − 1) (λa + |n − 1|/θb) = π(n) λb. Both sides are products from π(0) = 1 (then
 *      normalised) and decay like a factorial: 200 terms a side are exact to rounding.
 *   3. a's abandonments per time unit: Σ_{n>0} π(n) n / θa; the share of a's arrivals that abandon
 *      is that divided by λa. (Check of the algebra, also asserted: with b patient the chain gives
 *      (λa − λb)/λa, the conservation law "every b is matched, so λb of a's items are".)
 * The design is bipartite, which the recommender refuses (unstable without patience); the simulator
 * itself is run here, as the scorer would run it.
 */
import { describe, expect, it } from 'vitest';
import { compileGraph } from '../../src/model/compile.js';
import { simulateDesign } from '../../src/design/scoring/sim-score.js';

function closedFormShare(la: number, lb: number, thetaA: number, thetaB: number): number {
  const up = [1];
  for (let n = 0; n < 200; n++) up.push((up[n]! * la) / (lb + (n + 1) / thetaA));
  let down = 1;
  let mass = up.reduce((s, x) => s + x, 0);
  for (let m = 1; m < 100_000; m++) {
    down = (down * lb) / (la + m / thetaB); // π(−m), from π(−m + 1)
    mass += down;
    if (down < 1e-300 || (thetaB === Infinity && down < 1e-18 * mass)) break;
  }
  let abandon = 0;
  for (let n = 1; n < up.length; n++) abandon += (up[n]! * n) / thetaA;
  return abandon / mass / la;
}

describe('abandonment share: simulation against the birth–death closed form', () => {
  it('the algebra: with b patient (λb < λa) the chain gives the conservation law (λa − λb)/λa', () => {
    expect(closedFormShare(1, 0.6, 2, Infinity)).toBeCloseTo(0.4, 10);
    expect(closedFormShare(2, 1.5, 0.5, Infinity)).toBeCloseTo(0.25, 10);
  });
  for (const [la, lb, thetaA, thetaB] of [
    [1, 1, 2, 0.2],
    [1.5, 1, 0.8, 0.1],
  ] as const) {
    it(`λa ${la}, λb ${lb}, patience a ${thetaA}, b ${thetaB}`, () => {
      const expected = closedFormShare(la, lb, thetaA, thetaB);
      const model = compileGraph(['a', 'b'], [la, lb], [[0, 1]]);
      const f = simulateDesign(model, { arrivals: 200_000, warmup: 20_000, replications: 10, seed: 11, maxWaiting: 1_000_000 }, [thetaA, thetaB]);
      expect(f.impatient).toBe(true);
      expect(f.abandonShareLo[0]).toBeLessThanOrEqual(expected);
      expect(f.abandonShareHi[0]).toBeGreaterThanOrEqual(expected);
      expect(f.abandonShareHi[0]! - f.abandonShareLo[0]!).toBeLessThan(0.02);
    });
  }
});
