/**
 * Where does reusing the single-change evaluator pay in the recommender? (figures printed, never
 * asserted; skipped by bench/run.ts — run it alone: npx tsx bench/_incremental-crossover.ts [k [total|per-class]])
 *
 * The penalty check of one design with k paid toggles needs the k designs "design minus one paid
 * toggle" (and the add/remove moves of the local search are the same kind of batch). Two ways:
 *   (a) k fresh scorings (scoreDesign: evaluateBacklog for the total backlog, evaluateExact when
 *       per-class figures are needed: weighted or max-wait objective, or wait targets);
 *   (b) one scoreFlips call (src/design/score-flips.ts): one single-change base preparation, then per
 *       flip: compile, count the sets (the memory guard), toggle.
 * Printed per design: how many of the k flipped designs are stable (an unstable one is cheap to
 * refuse afresh: the recursion stops at the first saturated set), the time of one fresh scoring, of
 * the base preparation and of one flip of (b), the break-even k = base / (fresh − flip) above which
 * (b) wins, and (b)/(a) at the given k (default 8).
 *
 * Designs (invented, seeded; rates from positive flows on every pair of the base design, which is
 * therefore stable; dropping a chord may leave a flipped design unstable):
 *   ring   — a ring of n classes with a self-pair at class 0, plus k random chords (the paid toggles);
 *   meshed — the same with n/3 more random fixed chords (denser: fewer sets for the same n).
 * n is chosen for about 500 to 1M independent sets. CPU time of the process, best of a few
 * repetitions, (a) and (b) interleaved so that load from other processes hits both alike.
 */
import { flipped, scoreFlips } from '../src/design/scoring/score-flips.js';
import { scoreDesign, specModel, type Score } from '../src/design/scoring/score.js';
import { singleChangeEvaluator } from '../src/exact/single-change.js';
import { ringWithChords } from './_ring-with-chords.js';

function cpu(): number {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1000;
}

function best(f: () => unknown, reps: number): number {
  let t = Infinity;
  for (let r = 0; r < reps; r++) {
    const c0 = cpu();
    f();
    t = Math.min(t, cpu() - c0);
  }
  return t;
}

const k = Number(process.argv[2] ?? 8);
const families: Array<{ name: string; sizes: number[]; extra: (n: number) => number }> = [
  { name: 'ring', sizes: [14, 17, 20, 22, 24, 26, 28, 30], extra: () => 0 },
  { name: 'meshed', sizes: [18, 22, 26, 30, 32], extra: (n) => Math.round(n / 3) },
];
console.log(`penalty check of one design with k = ${k} paid toggles: (a) k fresh scorings vs (b) scoreFlips (base + k flips); CPU ms`);
console.log('scoring    family  classes       sets  stable  fresh/design   base  per flip  break-even k  (a) k fresh  (b) reuse  (b)/(a)  max rel diff');
const only = process.argv[3]; // 'total' or 'per-class': one kind of scoring only
for (const perClass of [false, true].filter((x) => !only || only === (x ? 'per-class' : 'total'))) {
  for (const fam of families) {
    for (const n of fam.sizes) {
      const { spec, design } = ringWithChords(n, fam.extra(n), k, 1000 + n, perClass);
      const flips = Array.from({ length: k }, (_, j) => j);
      const fresh = (): Score[] => flips.map((j) => scoreDesign(spec, flipped(design, j)));
      const reuse = (): Score[] => scoreFlips(spec, design, flips);
      const a0 = fresh();
      const b0 = reuse();
      let diff = 0;
      const stable = a0.filter((x) => x.stable).length;
      a0.forEach((s, i) => {
        const t = b0[i]!;
        if (s.stable !== t.stable || s.independentSets !== t.independentSets) throw new Error(`flip ${i}: verdicts differ`);
        if (s.stable) diff = Math.max(diff, Math.abs(s.backlogTotal - t.backlogTotal) / s.backlogTotal);
      });
      const sets = scoreDesign(spec, design).independentSets;
      const reps = sets > 300_000 ? 3 : sets > 30_000 ? 5 : 9;
      let ta = Infinity;
      let tb = Infinity;
      for (let r = 0; r < reps; r++) {
        ta = Math.min(ta, best(fresh, 1));
        tb = Math.min(tb, best(reuse, 1));
      }
      const model = specModel(spec, design);
      const tBase = best(() => singleChangeEvaluator(model), reps);
      const perFresh = ta / k;
      const perFlip = Math.max(0, tb - tBase) / k;
      const breakEven = perFresh > perFlip ? (tBase / (perFresh - perFlip)).toFixed(1) : 'never';
      console.log(
        `${(perClass ? 'per-class' : 'total').padEnd(9)}${fam.name.padStart(8)}${String(n).padStart(9)}${String(sets).padStart(11)}${`${stable}/${k}`.padStart(8)}` +
          `${perFresh.toFixed(2).padStart(14)}${tBase.toFixed(1).padStart(7)}${perFlip.toFixed(2).padStart(10)}${breakEven.padStart(14)}` +
          `${ta.toFixed(1).padStart(13)}${tb.toFixed(1).padStart(11)}${(tb / ta).toFixed(2).padStart(9)}${diff.toExponential(1).padStart(14)}`,
      );
    }
  }
}
