import { recommend, type Recommendation } from '../../src/design/search/recommend.ts';
import { randomProblem } from '../../tests/helpers/design-problems.ts';
import { Rng } from '../../tests/helpers/random.ts';
const front = (r: Recommendation): string => r.pareto.map((d) => `${d.cost}:${d.objective.toPrecision(10)}`).join(' ');
const key = (d: Uint8Array) => d.join('');
let same = 0, n = 0, onFront = 0, milpDesigns = 0, evA = 0, evB = 0, tA = 0, tB = 0, ex = 0;
const seeds = Number(process.argv[2] ?? 40);
const withEx = process.argv[3] === 'ex';
for (let seed = 100; seed < 100 + seeds; seed++) {
  const rng = new Rng(seed);
  const p = randomProblem(rng, { minClasses: 7, maxClasses: 14, toggles: rng.int(10, 13), removableShare: rng.uniform(0, 0.4), budgetShare: rng.uniform(0.2, 0.9), loopProb: rng.uniform(0.1, 0.4) });
  let a: Recommendation, b: Recommendation;
  try {
    let t = performance.now(); a = await recommend(p, { workerUrl: null }); tA += performance.now() - t;
    t = performance.now(); b = await recommend(p, { workerUrl: null, ladderLevels: 0 }); tB += performance.now() - t;
  } catch (e) { continue; }
  n++;
  const keys = new Set([key(a.milp.cheapest.design), ...a.milp.ladder.flatMap((l) => l.design ? [key(l.design.design)] : [])]);
  const fk = new Set(a.pareto.map((d) => key(d.design)));
  milpDesigns += keys.size; onFront += [...keys].filter((k) => fk.has(k)).length;
  evA += a.evaluations; evB += b.evaluations;
  if (front(a) === front(b)) same++; else console.log('DIFF seed', seed, p.n, p.toggles.length);
  if (withEx) { const e = await recommend(p, { workerUrl: null, exhaustive: true }); if (front(e) !== front(b)) console.log('EXDIFF no-ladder', seed); if (front(e) !== front(a)) console.log('EXDIFF default', seed); ex++; }
}
console.log({ n, same, milpDesigns, onFront, evA, evB, tA: Math.round(tA), tB: Math.round(tB), ex });
