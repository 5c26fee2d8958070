/**
 * `--score exact|simulation|auto` on sensitivity, sweep, compare and report. References, each named
 * beside its check: a hand-derived closed form of the paired-difference interval (steps below); the
 * independent (unpaired) estimates of the two designs it compares; the exact FCFM recursion
 * `evaluateExact` run with a guard large enough (itself checked against the plain set recursion of
 * tests/helpers/set-recursion-oracle.ts and the closed forms of tests/exact/).
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { compareCommand } from '../../src/cli/commands/compare.js';
import { reportCommand } from '../../src/cli/commands/report.js';
import { sensitivityCommand } from '../../src/cli/commands/sensitivity.js';
import { sweepCommand } from '../../src/cli/commands/sweep.js';
import { pairedDifference, reportPlan, simulateDesign } from '../../src/design/scoring/sim-score.js';
import { evaluateExact } from '../../src/exact/evaluate.js';
import { compileGraph } from '../../src/model/compile.js';
import { parseScenario } from '../../src/model/validate.js';
import { estimate } from '../../src/sim/summary.js';
import { t975 } from '../../src/sim/student-t.js';
import { runCommand, writeScenario } from '../helpers/cli.js';
import { tooWide } from '../helpers/columns.js';
import { randomScenario } from '../helpers/random-scenario.js';
import { scenarioDesign } from '../helpers/scenario-design.js';

const dir = mkdtempSync(join(tmpdir(), 'edgewise-scorecmds-'));
const root = join(import.meta.dirname, '..', '..');

describe('the paired difference of two designs', () => {
  it('matches the hand-derived closed form', () => {
    // hand-derived: a = (3, 5, 4), b = (1, 2, 2): d = (2, 3, 2), mean 7/3; deviations (−1/3, 2/3, −1/3),
    // Σ dev² = 6/9 = 2/3, s² = (2/3)/(3 − 1) = 1/3, half-width = t(0.975; 2) · √(1/3) / √3 = t / 3.
    const d = pairedDifference([3, 5, 4], [1, 2, 2]);
    expect(d.mean).toBeCloseTo(7 / 3, 12);
    const half = t975(3) / 3;
    expect(d.ci95![0]).toBeCloseTo(7 / 3 - half, 12);
    expect(d.ci95![1]).toBeCloseTo(7 / 3 + half, 12);
    // t(0.975; 2) = 4.303 (published t tables, from memory): the interval [−2.01, 6.68] holds 0 → not significant
    expect(t975(3)).toBeCloseTo(4.303, 3);
    expect(d.significant).toBe(7 / 3 - half > 0);
    // a constant shift c: every d equals c, so the interval is the point c (closed form: s = 0)
    const s = pairedDifference([1.5, 2.5, 7], [1, 2, 6.5]);
    expect(s.ci95![0]).toBeCloseTo(0.5, 12);
    expect(s.ci95![1]).toBeCloseTo(0.5, 12);
    expect(s.significant).toBe(true);
  });

  it('under common random numbers: its mean is the difference of the two independent estimates, its interval far narrower than theirs', () => {
    const { doc } = randomScenario(21, { groups: 3, perGroup: 4, candidates: 4 });
    const scenario = parseScenario(JSON.stringify(doc), 'p.json');
    const base = scenarioDesign(scenario, [], []);
    const pairs = Array.from({ length: base.m }, (_, e) => [base.edgeA[e]!, base.edgeB[e]!] as [number, number]);
    const other = compileGraph(base.ids, base.rates, [...pairs, [0, 5]]);
    const plan = reportPlan(4, base.n);
    const a = simulateDesign(other, plan);
    const b = simulateDesign(base, plan);
    const d = pairedDifference(a.perReplication, b.perReplication);
    // reference: the unpaired estimates of each design alone (src/sim/summary.ts, Student t)
    const ea = estimate(a.perReplication);
    const eb = estimate(b.perReplication);
    expect(d.mean).toBeCloseTo(ea.mean - eb.mean, 10);
    const unpairedHalf = Math.hypot(ea.ci95![1] - ea.mean, eb.ci95![1] - eb.mean);
    expect((d.ci95![1] - d.ci95![0]) / 2).toBeLessThan(unpairedHalf / 2);
    // and the exact difference (evaluateExact) lies in the paired interval
    const exact = evaluateExact(other).backlogTotal - evaluateExact(base).backlogTotal;
    expect(d.ci95![0]).toBeLessThanOrEqual(exact);
    expect(d.ci95![1]).toBeGreaterThanOrEqual(exact);
  });
});

describe('sensitivity, sweep, compare and report past the exact guard', () => {
  const { doc, ids } = randomScenario(21, { groups: 3, perGroup: 4, candidates: 4, removableShare: 0.3, budgetShare: 0.6 });
  const file = writeScenario(dir, 'past-guard.json', doc);
  const scenario = parseScenario(JSON.stringify(doc), 'past-guard.json');
  const exactToday = evaluateExact(scenarioDesign(scenario, [], []));

  it('sensitivity: simulated, every change a paired difference; "not distinguishable" exactly when the interval holds 0; exact keeps exit 4', async () => {
    expect(exactToday.independentSets).toBeGreaterThan(20); // really past the guard given
    const r = await runCommand(sensitivityCommand, { file, maxSets: 20, json: true }, dir);
    expect(r.code).toBe(0);
    const rec = JSON.parse(r.out);
    expect(rec.method).toBe('simulation');
    const [lo, hi] = rec.base.backlogCi95;
    expect(lo).toBeLessThanOrEqual(exactToday.backlogTotal);
    expect(hi).toBeGreaterThanOrEqual(exactToday.backlogTotal);
    const changes = [...rec.additions, ...rec.removals];
    expect(changes.length).toBeGreaterThan(3);
    for (const c of changes) {
      expect(c.method).toBe('simulation');
      if (!c.stable) continue;
      const holds0 = c.deltaCi95[0] <= 0 && c.deltaCi95[1] >= 0;
      expect(c.significant).toBe(!holds0);
      if (holds0) expect(c.verdict).toBe('not distinguishable');
      else expect(['helps', 'harmful', 'worth dropping', 'raises backlog']).toContain(c.verdict);
      if (c.verdict === 'harmful') expect(c.deltaCi95[0]).toBeGreaterThan(0);
    }
    // reference: the exact recursion on one changed design; its exact delta lies in the simulated interval
    const c = changes.find((x: { stable: boolean; change: string }) => x.stable && x.change === 'add');
    const exactChanged = evaluateExact(scenarioDesign(scenario, [c.pair], [])).backlogTotal - exactToday.backlogTotal;
    expect(c.deltaCi95[0]).toBeLessThanOrEqual(exactChanged);
    expect(c.deltaCi95[1]).toBeGreaterThanOrEqual(exactChanged);
    expect((await runCommand(sensitivityCommand, { file, maxSets: 20, score: 'exact' }, dir)).code).toBe(4);
    const text = await runCommand(sensitivityCommand, { file, maxSets: 20 }, dir);
    expect(text.out).toMatch(/simulated effect of single changes/);
    expect(text.out).toMatch(/Δ 95 % interval/);
    expect(tooWide(text.out, 120)).toEqual([]);
  }, 120_000);

  it('sweep: every step simulated with an interval, variants paired against the reference; exact keeps exit 4', async () => {
    const opts = { file, maxSets: 20, grow: ids[0]!, with: [`${ids[0]}~${ids[5]}`], steps: 4 };
    const r = await runCommand(sweepCommand, { ...opts, json: true }, dir);
    expect(r.code).toBe(0);
    const rec = JSON.parse(r.out);
    expect(rec.method).toBe('simulation');
    for (const c of rec.curves) {
      for (const p of c.points) {
        expect(p.method).toBe('simulation');
        if (p.stable) expect(p.backlogCi95[0]).toBeLessThanOrEqual(p.backlogCi95[1]);
        if (c.name !== 'reference' && p.stable) {
          const v = p.vsReference;
          expect(v.significant).toBe(!(v.ci95[0] <= 0 && v.ci95[1] >= 0));
        }
      }
    }
    // step 0 is today's rates: its interval covers the exact backlog (reference: evaluateExact)
    const [lo, hi] = rec.curves[0].points[0].backlogCi95;
    expect(lo).toBeLessThanOrEqual(exactToday.backlogTotal);
    expect(hi).toBeGreaterThanOrEqual(exactToday.backlogTotal);
    for (const x of rec.crossovers) expect(['bracketed', 'unresolved']).toContain(x.how);
    expect((await runCommand(sweepCommand, { ...opts, score: 'exact' }, dir)).code).toBe(4);
    const text = await runCommand(sweepCommand, opts, dir);
    expect(text.out).toMatch(/simulated FCFM backlog/);
    expect(tooWide(text.out, 120)).toEqual([]);
  }, 120_000);

  it('compare: the column and its recommended design say how they were scored', async () => {
    const r = await runCommand(compareCommand, { files: [file], maxSets: 20, score: 'simulation', maxDesigns: 60, json: true }, dir);
    expect(r.code).toBe(0);
    const col = JSON.parse(r.out).columns[0];
    expect(col.method).toBe('simulation');
    expect(col.backlogCi95[0]).toBeLessThanOrEqual(exactToday.backlogTotal);
    expect(col.backlogCi95[1]).toBeGreaterThanOrEqual(exactToday.backlogTotal);
    expect(col.recommended.method).toBe('simulation');
    const text = await runCommand(compareCommand, { files: [file], maxSets: 20, score: 'simulation', maxDesigns: 60 }, dir);
    expect(text.out).toMatch(/\(simulated\)/);
    expect(tooWide(text.out, 120)).toEqual([]);
  }, 180_000);

  it('report: simulated, with a note per simulated section; --score exact keeps exit 4', async () => {
    const out = join(dir, 'r.html');
    const r = await runCommand(reportCommand, { file, maxSets: 20, score: 'simulation', maxDesigns: 60, output: out, json: true }, dir);
    expect(r.code).toBe(0);
    const rec = JSON.parse(r.out);
    expect(rec.recommended.method).toBe('simulation');
    const page = readFileSync(out, 'utf8');
    expect(page).toMatch(/Simulated figures \(seed 1/);
    expect((await runCommand(reportCommand, { file, maxSets: 20, score: 'exact', output: join(dir, 'x.html') }, dir)).code).toBe(4);
  }, 180_000);

  it('the same bytes with --jobs 1 and --jobs 2 (built CLI, worker threads)', () => {
    const run = (cmd: string[], jobs: number): string => {
      const p = spawnSync(process.execPath, [join(root, 'dist', 'cli', 'main.js'), ...cmd, '--json', '--max-sets', '20', '--jobs', String(jobs)], { encoding: 'utf8' });
      expect(p.status).toBe(0);
      return p.stdout;
    };
    for (const cmd of [['sensitivity', file], ['sweep', file, '--grow', ids[0]!, '--with', `${ids[0]}~${ids[5]}`, '--steps', '3']]) {
      const one = run(cmd, 1);
      expect(JSON.parse(one).method).toBe('simulation');
      expect(run(cmd, 2)).toBe(one);
    }
  }, 120_000);
});
