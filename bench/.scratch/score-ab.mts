import { scoreDesign as newScore } from '../../src/design/scoring/score.ts';
import { scoreSpecOf } from '../../src/design/scoring/evaluator.ts';
const { scoreDesign: oldScore } = await import('/tmp/s13/base/src/design/scoring/score.ts');
const mod = await import('/work/wt-speed13/bench/.scratch/problems.mts');
const { seededRandom } = await import('../../src/random.ts');
for (const name of ['12-classes-30-candidates', '20-classes-40-candidates']) {
  const p = mod.CASES[name]();
  const spec = scoreSpecOf(p, 'total');
  const rnd = seededRandom(5);
  const designs = Array.from({ length: name.startsWith('20') ? 300 : 3000 }, () => Uint8Array.from(p.toggles, () => (rnd() < 0.25 ? 1 : 0)));
  const cpu = () => { const u = process.cpuUsage(); return (u.user + u.system) / 1000; };
  let a = Infinity, b = Infinity;
  for (let r = 0; r < 4; r++) {
    let c = cpu(); for (const d of designs) oldScore(spec, d); a = Math.min(a, cpu() - c);
    c = cpu(); for (const d of designs) newScore(spec, d); b = Math.min(b, cpu() - c);
  }
  let same = true; for (const d of designs.slice(0, 200)) { const x = oldScore(spec, d), y = newScore(spec, d); if (x.stable !== y.stable || (x.stable && x.backlogTotal !== y.backlogTotal) || x.independentSets !== y.independentSets) same = false; }
  console.log(name, 'old', a.toFixed(0), 'ms new', b.toFixed(0), 'ms ratio', (b / a).toFixed(2), 'identical', same);
}
