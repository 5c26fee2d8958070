import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { parseHTML } from 'linkedom';
import { beforeAll, describe, expect, it } from 'vitest';
import { compileGraph, compileModel } from '../../src/model/compile.js';
import { parseScenario } from '../../src/model/validate.js';
import { pairKey, type Scenario } from '../../src/model/scenario.js';
import { gatherReport } from '../../src/report/gather-report.js';
import type { ReportData } from '../../src/report/report-data.js';
import { renderReport } from '../../src/html/report-html.js';
import { permutationOracle } from '../helpers/permutation-oracle.js';

// The whole report on a shipped scenario and on a hostile one. Numbers are checked against the
// permutation-sum closed form of the product form ("A product form for the general stochastic
// matching model", J. Appl. Probab. 2021; tests/helpers/permutation-oracle.ts); the markup is read
// back with linkedom (npm HTML parser).

const root = join(import.meta.dirname, '..', '..');
const load = (f: string): Scenario => parseScenario(readFileSync(join(root, 'scenarios', f), 'utf8'), f);
const meta = { generator: 'edgewise test' };

/** Backlog of a design (today's pairs, plus `added`, minus `removed`) by the permutation oracle. */
function oracleBacklog(s: Scenario, added: ReadonlyArray<readonly [string, string]>, removed: ReadonlyArray<readonly [string, string]>, rates?: ArrayLike<number>): number {
  const ids = s.classes.map((c) => c.id);
  const at = new Map(ids.map((id, k) => [id, k]));
  const drop = new Set(removed.map((p) => pairKey(p[0], p[1])));
  const pairs = [...s.compatibilities.map((c) => c.pair).filter((p) => !drop.has(pairKey(p[0], p[1]))), ...added].map((p) => [at.get(p[0])!, at.get(p[1])!] as [number, number]);
  return permutationOracle(compileGraph(ids, rates ?? s.classes.map((c) => c.rate), pairs)).backlogTotal;
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
  let data: ReportData;
  let page: string;
  let scenario: Scenario;
  beforeAll(async () => {
    scenario = load('harmful-candidate.json');
    data = await gatherReport(scenario, { source: 'harmful-candidate.json' });
    page = renderReport(data, meta);
  });

  it("today's figures equal the product-form closed form", () => {
    const ref = permutationOracle(compileModel(scenario));
    expect(data.today.backlog).toBeCloseTo(ref.backlogTotal, 9);
    data.today.waits!.forEach((w, k) => expect(w).toBeCloseTo(ref.wait[k]!, 9));
  });

  it('the recommended design (fund archer–mage) re-evaluates to its backlog by the closed form', () => {
    const best = data.designs[0]!;
    expect(best.added.map((p) => pairKey(p[0], p[1]))).toEqual([pairKey('archer', 'mage')]);
    expect(best.backlog).toBeCloseTo(oracleBacklog(scenario, best.added, best.removed), 9);
    expect(best.backlog).toBeLessThan(data.today.backlog);
  });

  it('single changes: healer–tank is harmful and predicted, archer–mage helps (closed forms)', () => {
    // docs/scenario-format.md derives by hand 17.6451 with healer–tank and 4.3303 with archer–mage;
    // N({archer, mage}) = {healer, tank}, so healer–tank joins two neighbours of the bottleneck.
    const row = (a: string, b: string) => data.sensitivity.find((r) => r.kind === 'add' && pairKey(r.pair[0], r.pair[1]) === pairKey(a, b))!;
    const ht = row('healer', 'tank');
    expect(ht.backlog).toBeCloseTo(17.6451, 3);
    expect(ht.backlog).toBeCloseTo(oracleBacklog(scenario, [['healer', 'tank']], []), 9);
    expect(ht.flagged).toBe(true);
    expect(ht.predicted).toBe(true);
    const am = row('archer', 'mage');
    expect(am.backlog).toBeCloseTo(4.3303, 3);
    expect(am.flagged).toBe(false);
    const { document } = parseHTML(page);
    const verdicts = [...document.querySelectorAll('.verdicts li')].map((li) => li.textContent!);
    expect(verdicts.some((v) => v.startsWith('Do not pay for Healer – Tank'))).toBe(true);
    expect(document.querySelectorAll('table.changes tr.flag-bad').length).toBe(1);
  });

  it('the load sweep grows the bottleneck classes, and its first point is today (exact backlog)', () => {
    const s = data.sweep!;
    expect([...s.grow].sort()).toEqual(['archer', 'mage']);
    const today = s.curves.find((c) => c.role === 'today')!;
    expect(today.points[0]!.load).toBe(1);
    expect(today.points[0]!.backlog).toBeCloseTo(data.today.backlog, 9);
    // stability limit: {archer, mage} saturates when 5.7·s = 6, i.e. s = 6/5.7 (derived by hand)
    expect(s.limit).toBeCloseTo(6 / 5.7, 7);
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
    expect(first).toContain(Number(data.today.backlog.toPrecision(3)).toString());
  });
});

describe('report of an unstable design', () => {
  it('renders without waits for today, explains why, and still recommends a stable design', async () => {
    const s = load('unstable-example.json');
    const data = await gatherReport(s, { source: 'unstable-example.json' });
    expect(data.today.stable).toBe(false);
    expect(data.today.instability).toMatch(/east-village and west-village/);
    const best = data.designs[0]!;
    expect(best.stable).toBe(true);
    expect(best.backlog).toBeCloseTo(oracleBacklog(s, best.added, best.removed), 9);
    const page = renderReport(data, meta);
    selfContained(page);
    expect(page).toContain('cannot keep up');
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
    page = renderReport(await gatherReport(s, { source: 'hostile.json' }), meta);
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
