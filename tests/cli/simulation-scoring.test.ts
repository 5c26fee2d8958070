/**
 * Scoring by simulation (`--score simulation|auto`): evaluate past the exact guard, the recommender
 * scored by simulation, determinism, patience. References, each named beside its check: the exact
 * FCFM recursion `evaluateExact` (itself checked against the plain set recursion of
 * tests/helpers/set-recursion-oracle.ts and the closed forms of tests/exact/), run here with a guard
 * large enough, on designs built from the file alone (tests/helpers/scenario-design.ts); the exact
 * front from `recommend --exhaustive --score exact` (every design enumerated).
 */
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { evaluateCommand } from '../../src/cli/commands/evaluate.js';
import { recommendCommand } from '../../src/cli/commands/recommend.js';
import { evaluateExact } from '../../src/exact/evaluate.js';
import { parseScenario } from '../../src/model/validate.js';
import { runCommand, writeScenario } from '../helpers/cli.js';
import { randomScenario } from '../helpers/random-scenario.js';
import { scenarioDesign, type Pair } from '../helpers/scenario-design.js';
import { tooWide } from '../helpers/columns.js';

const dir = mkdtempSync(join(tmpdir(), 'edgewise-simscore-'));

interface Entry {
  cost: number;
  method: string;
  backlog: number;
  backlogCi95?: [number, number];
  added: Pair[];
  removed: Pair[];
}

describe('evaluate past the exact guard', () => {
  const { doc } = randomScenario(21, { groups: 3, perGroup: 4, candidates: 4 });
  const file = writeScenario(dir, 'e12.json', doc);
  const scenario = parseScenario(JSON.stringify(doc), 'e12.json');

  it('auto gives simulated figures with an interval that covers the exact value; --score exact keeps exit 4', async () => {
    const r = await runCommand(evaluateCommand, { file, maxSets: 20, json: true }, dir);
    expect(r.code).toBe(0);
    const rec = JSON.parse(r.out);
    expect(rec.method).toBe('simulation');
    // reference: the exact recursion with its default guard, on today's design built from the file
    const exact = evaluateExact(scenarioDesign(scenario, [], []));
    expect(exact.independentSets).toBeGreaterThan(20); // the design is really past the guard given
    const [lo, hi] = rec.backlogCi95;
    expect(lo).toBeLessThanOrEqual(exact.backlogTotal);
    expect(hi).toBeGreaterThanOrEqual(exact.backlogTotal);
    // per-class intervals: most cover the exact class backlog (95 % each; 12 classes)
    const covered = scenario.classes.filter((c, k) => {
      const ci = rec.backlogByClassCi95[c.id];
      return ci && ci[0] <= exact.backlog[k]! && exact.backlog[k]! <= ci[1];
    }).length;
    expect(covered).toBeGreaterThanOrEqual(9);
    const exit4 = await runCommand(evaluateCommand, { file, maxSets: 20, score: 'exact' }, dir);
    expect(exit4.code).toBe(4);
    const text = await runCommand(evaluateCommand, { file, maxSets: 20 }, dir);
    expect(text.out).toMatch(/simulated \(95 % interval/);
    expect(tooWide(text.out, 120)).toEqual([]);
  });
});

describe('recommend --score simulation', () => {
  const { doc } = randomScenario(7, { groups: 2, perGroup: 5, candidates: 6, removableShare: 0.25, budgetShare: 0.7 });
  const file = writeScenario(dir, 'r10.json', doc);
  const scenario = parseScenario(JSON.stringify(doc), 'r10.json');

  it('the intervals cover the exact backlogs, the designs are within 2 % of the exhaustive exact front, and --jobs does not change a byte', async () => {
    const sim = await runCommand(recommendCommand, { file, score: 'simulation', seed: 3, json: true }, dir);
    expect(sim.code).toBe(0);
    const rec = JSON.parse(sim.out);
    const pareto = rec.pareto as Entry[];
    expect(pareto.length).toBeGreaterThan(0);
    // reference: every design enumerated and scored exactly
    const ex = JSON.parse((await runCommand(recommendCommand, { file, score: 'exact', exhaustive: true, json: true }, dir)).out);
    const front = ex.pareto as Entry[];
    const frontAt = (cost: number): number => Math.min(...front.filter((f) => f.cost <= cost + 1e-9).map((f) => f.backlog));
    let covered = 0;
    for (const p of pareto) {
      expect(p.method).toBe('simulation');
      const exact = evaluateExact(scenarioDesign(scenario, p.added, p.removed)).backlogTotal;
      if (p.backlogCi95![0] <= exact && exact <= p.backlogCi95![1]) covered++;
      expect(exact).toBeLessThanOrEqual(frontAt(p.cost) * 1.02);
    }
    expect(covered / pareto.length).toBeGreaterThanOrEqual(0.9);
    expect(rec.warnings.join(' ')).toMatch(/simulation/);
    // sequential allocation: a comparison along the set that is neither significant nor negligible
    // has both designs at the most replications; a significant "lower"/"higher" agrees in sign with
    // the exact difference (reference: the exact recursion) for at least 90 % of the claims
    const a = rec.search.allocation;
    expect(a.initialReplications).toBe(10);
    let claims = 0;
    let right = 0;
    (rec.pareto as Array<Entry & { replications: number; vsCheaper?: { backlogDifference: number; significant: boolean; negligible: boolean } }>).forEach((p, i, all) => {
      expect(p.replications).toBeGreaterThanOrEqual(10);
      expect(p.replications).toBeLessThanOrEqual(a.maxReplications);
      const v = p.vsCheaper;
      if (!v) return;
      if (!v.significant && !v.negligible) {
        expect(p.replications).toBe(a.maxReplications);
        expect(all[i - 1]!.replications).toBe(a.maxReplications);
      }
      if (v.significant) {
        claims++;
        const prev = all[i - 1]!;
        const d = evaluateExact(scenarioDesign(scenario, p.added, p.removed)).backlogTotal - evaluateExact(scenarioDesign(scenario, prev.added, prev.removed)).backlogTotal;
        if (Math.sign(d) === Math.sign(v.backlogDifference)) right++;
      }
    });
    if (claims > 0) expect(right / claims).toBeGreaterThanOrEqual(0.9);
    // replications added to designs off the set (dominated after the re-score) count too
    expect(a.extraReplications).toBeGreaterThanOrEqual((rec.pareto as Array<{ replications: number }>).reduce((s, p) => s + p.replications - 10, 0));
    const two = await runCommand(recommendCommand, { file, score: 'simulation', seed: 3, json: true, jobs: 2 }, dir);
    expect(two.out).toBe(sim.out);
  }, 240_000);

  it('with patience in the file, auto scores with abandonment and says so', async () => {
    const { doc: pdoc } = randomScenario(8, { groups: 2, perGroup: 4, candidates: 4, patience: true, budgetShare: 0.7 });
    const pfile = writeScenario(dir, 'p8.json', pdoc);
    const r = await runCommand(recommendCommand, { file: pfile, json: true }, dir);
    expect(r.code).toBe(0);
    const rec = JSON.parse(r.out);
    for (const p of rec.pareto as Entry[]) {
      expect(p.method).toBe('simulation');
      expect(p.backlogCi95![0]).toBeLessThanOrEqual(p.backlog);
    }
    expect(rec.warnings.join(' ')).toMatch(/simulation with abandonment/);
    expect(r.err).toMatch(/simulation with abandonment/);
  }, 240_000);
});
