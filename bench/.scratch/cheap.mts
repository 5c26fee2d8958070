import { cheapestByCuts, solveFlowMilp, stableFlowFloor } from '../../src/design/search/milp.ts';
const mod = await import('/work/wt-speed13/bench/.scratch/problems.mts');
for (const name of Object.keys(mod.CASES)) {
  const p = mod.CASES[name]();
  let t = performance.now(); const a = cheapestByCuts(p); const ta = performance.now() - t;
  t = performance.now(); const b = await solveFlowMilp(p, { goal: 'min-cost', minFlow: stableFlowFloor(p) }); const tb = performance.now() - t;
  console.log(name, 'cuts', a?.cost, ta.toFixed(0), 'ms; HiGHS', b?.cost, tb.toFixed(0), 'ms');
}
