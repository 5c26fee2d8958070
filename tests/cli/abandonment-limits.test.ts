/**
 * maxAbandonment: the cross-check, recommend honouring the limit on simulated figures (a design over
 * the limit is not in the Pareto set), the warning when the figures cannot check it, and
 * `--objective abandonment` refused where there is no abandonment.
 */
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { recommendCommand } from '../../src/cli/commands/recommend.js';
import { evaluateCommand } from '../../src/cli/commands/evaluate.js';
import { sensitivityCommand } from '../../src/cli/commands/sensitivity.js';
import { sweepCommand } from '../../src/cli/commands/sweep.js';
import { reportCommand } from '../../src/cli/commands/report.js';
import { runCommand, writeScenario } from '../helpers/cli.js';
import { randomScenario } from '../helpers/random-scenario.js';

const dir = mkdtempSync(join(tmpdir(), 'edgewise-abandon-'));

/**
 * Four classes; a (patience 0.5) is matched by b and c today; a ↔ b is removable with a saving of 5.
 * Both designs are stable (independent sets counted by hand: {a,b} → N = {c,d}, 2 > 1.5; {a,d} →
 * N = {b,c}, 2 > 1.5; single classes have a neighbour of larger rate). Dropping a ↔ b leaves a one
 * partner, so more of a's items give up: the limit decides whether the cheaper design is allowed.
 */
function doc(limit?: number): unknown {
  return {
    name: 'abandon-limit',
    classes: [
      { id: 'a', rate: 0.5, patience: 0.5, ...(limit === undefined ? {} : { maxAbandonment: limit }) },
      { id: 'b', rate: 1 },
      { id: 'c', rate: 1 },
      { id: 'd', rate: 1 },
    ],
    compatibilities: [{ pair: ['a', 'b'], removable: true, saving: 5 }, ['a', 'c'], ['b', 'c'], ['b', 'd'], ['c', 'd']],
  };
}

const dropped = (p: { removed: string[][] }): boolean => p.removed.some((x) => x.join() === 'a,b');

describe('maxAbandonment', () => {
  it('a limit on a class without patience is refused at its JSON location (exit 2)', async () => {
    const file = writeScenario(dir, 'no-patience.json', { classes: [{ id: 'a', rate: 1, maxAbandonment: 0.1 }, { id: 'b', rate: 2 }], compatibilities: [['a', 'b'], ['b', 'b']] });
    const { code, err } = await runCommand(evaluateCommand, { file } as never, dir);
    expect(code).toBe(2);
    expect(err).toMatch(/classes\[0\]\.maxAbandonment|classes\/0\/maxAbandonment|classes\[0\]/);
    expect(err).toMatch(/never bind/);
    expect(err).toMatch(/patience/);
  });

  it('recommend: a design whose simulated share of a limited class is over the limit is not in the Pareto set', async () => {
    // the shares of a under both designs, from evaluate (simulated with abandonment)
    const share = async (removeAB: boolean): Promise<number> => {
      const d = doc() as { compatibilities: unknown[] };
      const file = writeScenario(dir, `share-${removeAB}.json`, removeAB ? { ...d, compatibilities: d.compatibilities.slice(1) } : d);
      const { code, out } = await runCommand(evaluateCommand, { file, json: true, score: 'auto' } as never, dir);
      expect(code).toBe(0);
      return JSON.parse(out).abandonShare.byClass.a as number;
    };
    const both = await share(false);
    const one = await share(true);
    expect(one).toBeGreaterThan(both * 1.2); // one partner fewer: clearly more give up
    // without a limit the cheaper design (a ↔ b dropped) is on the front
    const free = await runCommand(recommendCommand, { file: writeScenario(dir, 'free.json', doc()), json: true } as never, dir);
    expect(free.code).toBe(0);
    expect(JSON.parse(free.out).pareto.some(dropped)).toBe(true);
    // a limit between the two shares keeps it out; every design shown is within the limit
    const limit = (both + one) / 2;
    const lim = await runCommand(recommendCommand, { file: writeScenario(dir, 'limited.json', doc(limit)), json: true } as never, dir);
    expect(lim.code).toBe(0);
    const r = JSON.parse(lim.out);
    expect(r.pareto.some(dropped)).toBe(false);
    expect(r.pareto.length).toBeGreaterThan(0);
    for (const p of r.pareto) {
      expect(p.abandonmentLimits).toHaveLength(1);
      expect(p.abandonmentLimits[0].class).toBe('a');
      expect(p.abandonmentLimits[0].limit).toBeCloseTo(limit, 6);
      expect(p.abandonmentLimits[0].within).toBe(true);
      expect(p.abandonmentLimits[0].share).toBeLessThanOrEqual(limit);
      expect(p.abandonmentLimits[0].shareCi95[0]).toBeLessThanOrEqual(p.abandonmentLimits[0].share);
    }
    expect(typeof r.search.overLimitAfterRescore).toBe('number');
    expect(r.warnings.join(' ')).toMatch(/Abandonment limits .* checked/);
    // CSV carries the columns
    const csv = await runCommand(recommendCommand, { file: join(dir, 'limited.json'), csv: true } as never, dir);
    expect(csv.out.split('\n')[0]).toMatch(/abandonShare,overAbandonmentLimit,abandonmentWithinNoise/);
    // a rule of thumb without a gap says why; one over a limit says so
    for (const b of r.baselines) {
      expect(b.gap === undefined).toBe(b.noGap !== undefined); // the JSON leaves out null fields
      if (b.stable && b.withinBudget && b.withinLimits && b.abandonmentLimits?.some((x: { within: boolean }) => !x.within)) expect(b.noGap).toBe('over an abandonment limit');
    }
    // the report's table of the best designs shows each design's standing against the limit, as the JSON does
    const page = join(dir, 'limited.html');
    const rep = await runCommand(reportCommand, { file: join(dir, 'limited.json'), output: page } as never, dir);
    expect(rep.code).toBe(0);
    const html = readFileSync(page, 'utf8');
    expect(html).toMatch(/<th>abandonment limits<\/th>/);
    expect(html).toMatch(/<th class="n">giving up<\/th>/);
    expect(html).toMatch(/within every limit|within noise: a/);
    expect(html).not.toMatch(/over: a/);
  });

  it('recommend: a design whose short-run interval holds a limit is not kept out of the search by noise', async () => {
    // seeded file where today's share of a limited class sits about 4 % under its limit: judged on the
    // short run's point estimate, every design was over it by noise and the command failed (exit 3)
    const { doc: pdoc } = randomScenario(5, { groups: 6, perGroup: 4, candidates: 14, removableShare: 0.3, budgetShare: 0.6, patience: true, abandonmentLimits: true });
    const file = writeScenario(dir, 'near-limit.json', pdoc);
    const r = await runCommand(recommendCommand, { file, json: true, maxDesigns: '300' } as never, dir);
    expect(r.code, r.err).toBe(0);
    const rec = JSON.parse(r.out);
    expect(rec.pareto.length).toBeGreaterThan(0);
    // the longer re-score still keeps every design over a limit (point estimate) out of the set
    for (const p of rec.pareto) for (const l of p.abandonmentLimits) expect(l.share).toBeLessThanOrEqual(l.limit);
  }, 120_000);

  it('recommend --score exact: a warning says the limits were not checked', async () => {
    const file = writeScenario(dir, 'exact.json', doc(0.01));
    const { code, out } = await runCommand(recommendCommand, { file, json: true, score: 'exact' } as never, dir);
    expect(code).toBe(0);
    const r = JSON.parse(out);
    expect(r.warnings.join(' ')).toMatch(/abandonment limits \(maxAbandonment of class a\) were not checked/);
    expect(r.pareto.every((p: { abandonmentLimits?: unknown }) => p.abandonmentLimits === undefined)).toBe(true);
    const ev = await runCommand(evaluateCommand, { file, json: true, score: 'exact' } as never, dir);
    expect(JSON.parse(ev.out).warnings.join(' ')).toMatch(/do not check the abandonment limits/);
  });

  it('--objective abandonment: refused with --score exact and without patience (exit 2); otherwise the share is the objective', async () => {
    const withP = writeScenario(dir, 'obj.json', doc());
    const exact = await runCommand(recommendCommand, { file: withP, objective: 'abandonment', score: 'exact' } as never, dir);
    expect(exact.code).toBe(2);
    expect(exact.err).toMatch(/--score exact has no abandonment/);
    const none = writeScenario(dir, 'none.json', { classes: [{ id: 'a', rate: 1 }, { id: 'b', rate: 2 }], compatibilities: [['a', 'b'], ['b', 'b']] });
    const noP = await runCommand(recommendCommand, { file: none, objective: 'abandonment' } as never, dir);
    expect(noP.code).toBe(2);
    expect(noP.err).toMatch(/needs a "patience"/);
    const ok = await runCommand(recommendCommand, { file: withP, objective: 'abandonment', json: true } as never, dir);
    expect(ok.code).toBe(0);
    const r = JSON.parse(ok.out);
    for (const p of r.pareto) expect(p.objective).toBeCloseTo(p.abandonShare ?? 0, 12);
    // along the front (cheapest first) the share falls
    for (let i = 1; i < r.pareto.length; i++) expect(r.pareto[i].objective).toBeLessThan(r.pareto[i - 1].objective);
  });

  it('sensitivity and sweep say that their figures do not compare the shares with the limits, exact or simulated', async () => {
    const file = writeScenario(dir, 'limits-other.json', doc(0.3));
    for (const score of ['auto', 'exact'] as const) {
      const sens = await runCommand(sensitivityCommand, { file, json: true, score } as never, dir);
      expect(sens.code).toBe(0);
      const sw = await runCommand(sweepCommand, { file, json: true, score, grow: 'b', steps: '3' } as never, dir);
      expect(sw.code).toBe(0);
      for (const r of [JSON.parse(sens.out), JSON.parse(sw.out)]) {
        expect(r.method).toBe(score === 'exact' ? 'exact' : 'simulation');
        const said = (r.warnings as string[]).filter((w) => /maxAbandonment of class a/.test(w));
        expect(said).toHaveLength(1);
        expect(said[0]).toMatch(score === 'exact' ? /do not check the abandonment limits/ : /do not compare the abandonment shares with the limits/);
      }
    }
    // without a limit, nothing is said about limits
    const none = await runCommand(sensitivityCommand, { file: writeScenario(dir, 'no-limits.json', doc()), json: true } as never, dir);
    expect((JSON.parse(none.out).warnings as string[]).some((w) => /maxAbandonment/.test(w))).toBe(false);
  });
});
