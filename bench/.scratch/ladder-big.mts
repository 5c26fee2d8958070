// compare fronts with and without the ladder on the bench cases; run from base or current src via argv
const root = process.argv[2]!;
const levels = process.argv[3] === 'none' ? 0 : undefined;
const names = process.argv.slice(4);
const { recommend } = await import(`${root}/src/design/search/recommend.ts`);
const mod = await import('/work/wt-speed13/bench/.scratch/problems.mts');
for (const name of names) {
  const p = mod.CASES[name]();
  const c0 = process.cpuUsage();
  let milpEnd = NaN;
  const rec = await recommend(p, { workerUrl: null, ...(levels === 0 ? { ladderLevels: 0 } : {}), onProgress: (x: any) => { if (x.phase !== 'milp' && Number.isNaN(milpEnd)) { const u = process.cpuUsage(c0); milpEnd = (u.user + u.system) / 1e6; } } });
  const u = process.cpuUsage(c0);
  const front = rec.pareto.map((d: any) => `${d.cost}:${d.objective.toPrecision(10)}`).join(' ');
  let h = 2166136261; for (const ch of front) h = Math.imul(h ^ ch.charCodeAt(0), 16777619) >>> 0;
  console.log(name, root.split('/').pop(), process.argv[3], 'cpu', ((u.user + u.system) / 1e6).toFixed(1), 'milp', milpEnd.toFixed(1), 'evals', rec.evaluations, 'front', rec.pareto.length, h.toString(16));
}
