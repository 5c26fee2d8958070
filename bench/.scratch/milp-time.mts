import { readFileSync } from 'node:fs';
import { parseScenario } from '/work/wt-speed13/src/model/validate.ts';
import { designProblem } from '/work/wt-speed13/src/design/space/problem.ts';
import { readDesignFields } from '/work/wt-speed13/src/model/design-fields.ts';
import { cheapestStableDesign, maxMinFlowDesign, budgetLadder } from '/work/wt-speed13/src/design/search/milp.ts';
import { loadHighs } from '/work/wt-speed13/src/solvers/highs.ts';
const f = process.argv[2]!;
const sc = parseScenario(readFileSync(f, "utf8"));
const p = designProblem(sc, readDesignFields(sc));
let t = performance.now(); await loadHighs(); console.log('load', (performance.now() - t).toFixed(0));
t = performance.now(); const c = await cheapestStableDesign(p, {}); console.log('cheapest', (performance.now() - t).toFixed(0), c?.cost, c?.solves);
const total = p.toggles.reduce((s, x) => s + x.price, 0);
for (const b of budgetLadder(c!.cost, Math.min(p.budget, total), 5)) { t = performance.now(); const d = await maxMinFlowDesign(p, b, {}); console.log('ladder', b, (performance.now() - t).toFixed(0), d?.cost, d?.solves); }
