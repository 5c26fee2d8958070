import { describe, expect, it } from 'vitest';
import { repairSpace } from '../../../src/design/repair/space.js';
import { seedCuts } from '../../../src/design/repair/seed-cuts.js';
import { randomProblem } from '../../helpers/design-problems.js';
import { Rng } from '../../helpers/random.js';
import { bruteRepairs, individuallyAllowed } from '../../helpers/repair-brute.js';

// The cuts the repair MILP starts from (src/design/repair/seed-cuts.ts, inequality derived by hand
// there) must hold for every repair: checked against every minimal repair found by brute force
// (tests/helpers/repair-brute.ts; stability by enumerating independent sets, "Stability of the
// stochastic matching model", J. Appl. Probab. 2016), on seeded random problems. A cut that holds for
// the minimal repairs holds for every repair (its coefficients are non-negative, so supersets too).

describe('seed cuts', () => {
  it('hold for every minimal repair, and "hopeless" only when there is none', async () => {
    let cuts = 0;
    let strong = 0;
    let hopeless = 0;
    for (let seed = 1; seed <= 80; seed++) {
      const rng = new Rng(3100 + seed);
      const p = randomProblem(rng, { minClasses: 6, maxClasses: 8, toggles: rng.int(2, 12), removableShare: 0.15, budgetShare: 0.4, loopProb: 0.1 });
      const space = repairSpace(p);
      const seeds = seedCuts(space.sub);
      const truth = bruteRepairs(p, individuallyAllowed(p));
      if (seeds.hopeless) {
        hopeless++;
        expect(truth).toEqual([]);
        continue;
      }
      const subIndex = new Map(Array.from(space.toggleOf, (j, i) => [j, i] as const));
      for (const cut of seeds.cuts) {
        cuts++;
        if (cut.rhs > 1) strong++;
        expect(cut.coefficients.every((c) => c > 0)).toBe(true);
        for (const r of truth) {
          const on = new Set(r.added.map((j) => subIndex.get(j)!));
          const lhs = cut.toggles.reduce((s, j, i) => s + (on.has(j) ? cut.coefficients[i]! : 0), 0);
          expect(lhs).toBeGreaterThanOrEqual(cut.rhs);
        }
      }
    }
    // the seeds exercised cuts that need more than one candidate, and hopeless cases
    expect(cuts).toBeGreaterThanOrEqual(50);
    expect(strong).toBeGreaterThanOrEqual(3);
    expect(hopeless).toBeGreaterThanOrEqual(3);
  });
});
