import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { parseHTML } from 'linkedom';
import { beforeAll, describe, expect, it } from 'vitest';
import { compileModel } from '../../src/model/compile.js';
import { parseScenario } from '../../src/model/validate.js';
import { pairKey, type Scenario } from '../../src/model/scenario.js';
import { scenarioContext } from '../../src/usecases/context.js';
import { reportUseCase, type ReportRecord } from '../../src/usecases/report.js';
import { renderReport } from '../../src/html/report-html.js';
import { num, pct } from '../../src/output/format.js';
import { permutationOracle } from '../helpers/permutation-oracle.js';
import { scenarioDesign, type Pair } from '../helpers/scenario-design.js';

// The whole report on a shipped scenario and on a hostile one. Numbers are checked against the
// permutation-sum closed form of the product form ("A product form for the general stochastic
// matching model", J. Appl. Probab. 2021; tests/helpers/permutation-oracle.ts); the markup is read
// back with linkedom (npm HTML parser).

const root = join(import.meta.dirname, '..', '..');
const load = (f: string): Scenario => parseScenario(readFileSync(join(root, 'scenarios', f), 'utf8'), f);
const meta = { generator: 'edgewise test' };

/** The report record of a scenario, as `edgewise report` computes it. */
async function reportOf(s: Scenario, source: string): Promise<ReportRecord> {
  return reportUseCase(scenarioContext(s, { source }), { jobs: 1, seed: 1, simulationArrivals: 20_000 });
}

/** |a − b| within 1e-9 relative (in-process records are not rounded). */
const close = (a: number | null | undefined, b: number): void => {
  expect(typeof a).toBe('number');
  expect(Math.abs(a! - b)).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(b)));
};

/** Backlog of a design (today's pairs, plus `added`, minus `removed`) by the permutation oracle. */
function oracleBacklog(s: Scenario, added: readonly Pair[], removed: readonly Pair[]): number {
  return permutationOracle(scenarioDesign(s, added, removed)).backlogTotal;
}

function selfContained(page: string): void {
  const { document } = parseHTML(page);
  for (const el of document.querySelectorAll('[src], [href], [srcset], [xlink\\:href]')) {
    for (const attr of ['src', 'href', 'srcset', 'xlink:href']) {
      const v = el.getAttribute(attr);
      if (v !== null) expect(v, `${el.tagName} ${attr}`).not.toMatch(/^\s*(https?:)?\/\//i);
    }
  }
  expect(page).not.toMatch(/(src|href)\s*=\s*["']?\s*(https?:)?\/\//i);
  expect(document.querySelectorAll('script, link, iframe, img, object, embed').length).toBe(0);
  expect(page).not.toMatch(/@import|url\(\s*['"]?(https?:)?\/\//i);
  expect(page).not.toMatch(/@font-face/i);
}

describe('report of harmful-candidate.json', () => {
  let data: ReportRecord;
  let page: string;
  let scenario: Scenario;
  beforeAll(async () => {
    scenario = load('harmful-candidate.json');
    data = await reportOf(scenario, 'harmful-candidate.json');
    page = renderReport(data, meta);
  });

  it("today's figures equal the product-form closed form", () => {
    const ref = permutationOracle(compileModel(scenario));
    close(data.decision!.today.backlog, ref.backlogTotal);
    scenario.classes.forEach((c, k) => close(data.decision!.today.waits![c.id], ref.wait[k]!));
    // match rates of today's design, in the scenario's compatibility order
    data.matchRates.forEach((m, e) => close(m.rate, ref.matchRates[e]!));
  });

  it('the recommended design (fund archer ↔ mage) re-evaluates to its backlog by the closed form', () => {
    const best = data.decision!.recommended;
    expect(best.added.map((p) => pairKey(p[0], p[1]))).toEqual([pairKey('archer', 'mage')]);
    close(best.backlog, oracleBacklog(scenario, best.added, best.removed));
    expect(best.backlog!).toBeLessThan(data.decision!.today.backlog!);
    expect(data.designs.map((d) => d.role)).toEqual(['today', 'recommended']);
  });

  it('single changes: healer ↔ tank raises waiting from today (closed forms), and against the recommended design it is only over budget', () => {
    // docs/scenario-format.md derives by hand 17.6451 with healer ↔ tank and 4.3303 with archer ↔ mage.
    const v = (against: string, a: string, b: string) => data.decision!.verdicts.find((x) => x.against === against && pairKey(x.pair[0], x.pair[1]) === pairKey(a, b))!;
    const today = oracleBacklog(scenario, [], []);
    const ht = v('today', 'healer', 'tank');
    expect(today + ht.delta!).toBeCloseTo(17.6451, 3);
    close(ht.delta, oracleBacklog(scenario, [['healer', 'tank']], []) - today);
    expect(ht.effect).toBe('raises');
    const am = v('today', 'archer', 'mage');
    expect(today + am.delta!).toBeCloseTo(4.3303, 3);
    // against the recommended design (archer ↔ mage in it), healer ↔ tank lowers waiting but costs 35 > 30
    const rht = v('recommended', 'healer', 'tank');
    close(rht.delta, oracleBacklog(scenario, [['archer', 'mage'], ['healer', 'tank']], []) - oracleBacklog(scenario, [['archer', 'mage']], []));
    expect(rht.delta!).toBeLessThan(0);
    expect(rht.advice).toBe('over budget');
    expect(v('recommended', 'archer', 'mage').advice).toBe('keep');
    const { document } = parseHTML(page);
    const verdicts = [...document.querySelectorAll('.verdicts li')].map((li) => li.textContent!);
    const lower = pct(-rht.delta! / oracleBacklog(scenario, [['archer', 'mage']], []));
    expect(verdicts).toContain(`Beyond the budget, adding Healer ↔ Tank (10 balance-patch points) to the recommended design would lower waiting by ${lower}.`);
    // one story: nothing on the page tells to fund and not to fund the same pair
    expect(verdicts.some((s) => s.includes('Do not pay for'))).toBe(false);
    expect(document.querySelectorAll('table.changes tr.flag-bad').length).toBe(0);
    expect(document.querySelectorAll('table.changes tbody tr').length).toBe(data.decision!.verdicts.filter((x) => x.against === 'recommended').length);
  });

  it('the load sweep grows the bottleneck classes, and its first point is today (exact backlog)', () => {
    const s = data.sweep!;
    expect([...s.grow].sort()).toEqual(['archer', 'mage']);
    const today = s.curves[0]!;
    expect(today.points[0]!.factor).toBe(1);
    close(today.points[0]!.backlog, data.decision!.today.backlog!);
    // stability limit: {archer, mage} saturates when 5.7·s = 6, i.e. s = 6/5.7 (derived by hand)
    expect(s.limit.factor!).toBeCloseTo(6 / 5.7, 7);
  });

  it('is self-contained: no script, no external link, font or image, no network URL in src/href', () => {
    selfContained(page);
  });

  it('has every chart, each an SVG with a viewBox and a size', () => {
    const { document } = parseHTML(page);
    const ids = [...document.querySelectorAll('figure[data-chart]')].map((f) => f.id);
    expect(ids).toEqual(['chart-graph', 'chart-pareto', 'chart-waits', 'chart-sweep']);
    for (const f of document.querySelectorAll('figure[data-chart]')) {
      const svgs = [...f.querySelectorAll('svg')].filter((s) => Number(s.getAttribute('width')) > 100);
      expect(svgs.length, f.id).toBe(1);
      expect(svgs[0]!.getAttribute('viewBox'), f.id).toMatch(/^0 0 \d+(\.\d+)? \d+(\.\d+)?$/);
      expect(Number(svgs[0]!.getAttribute('height')), f.id).toBeGreaterThan(100);
    }
  });

  it('prints: has print CSS and an A4 page rule', () => {
    expect(page).toMatch(/@media print/);
    expect(page).toMatch(/@page \{ size: A4/);
  });

  it('opens with verdicts that quote the exact numbers', () => {
    const { document } = parseHTML(page);
    const first = document.querySelector('.verdicts li')!.textContent!;
    expect(first).toContain(num(oracleBacklog(scenario, [], [])));
  });

  it('has an appendix with the inputs: every class, compatibility and candidate', () => {
    const { document } = parseHTML(page);
    const appendix = document.querySelector('#inputs')!.textContent!;
    for (const c of scenario.classes) expect(appendix).toContain(c.id);
    for (const c of [...scenario.compatibilities, ...scenario.candidates]) expect(appendix).toContain(`${c.pair[0][0]!.toUpperCase()}${c.pair[0].slice(1)} ↔ ${c.pair[1][0]!.toUpperCase()}${c.pair[1].slice(1)}`);
  });

  it('says nothing of where formulas come from in client-facing text', () => {
    expect(page).not.toMatch(/from memory|J\. Appl\. Probab|SIGMETRICS/i);
  });
});

describe('report of an unstable design', () => {
  it('renders without waits for today, explains why, lists the repairs and still recommends a stable design', async () => {
    const s = load('unstable-example.json');
    const data = await reportOf(s, 'unstable-example.json');
    expect(data.todayStable).toBe(false);
    expect(data.todayInstability!.message).toMatch(/east-village and west-village/);
    expect(data.todayInstability!.repairs[0]).toEqual({ added: [['west-village', 'west-village']], cost: 6 });
    const best = data.decision!.recommended;
    expect(best.stable).toBe(true);
    close(best.backlog, oracleBacklog(s, best.added, best.removed));
    const page = renderReport(data, meta);
    selfContained(page);
    expect(page).toContain('cannot keep up');
    expect(page).toContain('The cheapest way out is to add West village ↔ West village');
  });
});

describe('escaping of user text', () => {
  const evil = '<script>alert("x")</script>';
  const hostile = {
    name: `Q&A "night" ${evil}`,
    timeUnit: 'min<ute>',
    description: `Tom & Jerry's <img src=x onerror=alert(1)> "quoted" <a href="https://example.invalid/">link</a>`,
    costUnit: `credits & "points" <b>`,
    classes: [
      { id: evil, label: `<i>italic</i> & 'single'`, rate: 1.5 },
      { id: 'b"q', label: 'B & "co"', rate: 1 },
      { id: "c'q", rate: 1.2 },
      { id: 'd&amp;', rate: 0.8 },
    ],
    compatibilities: [[evil, 'b"q'], ['b"q', "c'q"], ["c'q", 'd&amp;'], ['d&amp;', evil], [evil, evil]],
    candidates: [{ pair: [evil, "c'q"], cost: 3 }, { pair: ['b"q', 'd&amp;'], cost: 2 }],
    budget: 4,
    demand: { [`peak ${evil}`]: { [evil]: 2 } },
  };
  let page: string;
  beforeAll(async () => {
    const s = parseScenario(JSON.stringify(hostile), 'hostile.json');
    page = renderReport(await reportOf(s, 'hostile.json'), meta);
  });

  it('never lets user text become markup', () => {
    expect(page).not.toContain('<script');
    expect(page).not.toContain('<img');
    expect(page).not.toContain('<i>italic');
    expect(page).not.toContain('"points" <b>');
    expect(page).not.toContain('<ute>');
    const { document } = parseHTML(page);
    expect(document.querySelectorAll('script, img, a, i').length).toBe(0);
    selfContained(page);
  });

  it('shows the text as written (read back by an HTML parser)', () => {
    const { document } = parseHTML(page);
    expect(document.querySelector('h1')!.textContent).toBe(hostile.name);
    expect(document.querySelector('title')!.textContent).toBe(`Design report: ${hostile.name}`);
    expect(document.querySelector('.lede')!.textContent).toBe(hostile.description);
    const text = document.body.textContent!;
    expect(text).toContain(hostile.costUnit);
    expect(text).toContain(`peak ${evil}`);
    expect(text).toContain(`<i>italic</i> & 'single'`);
  });
});
