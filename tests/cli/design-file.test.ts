import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { checkCommand } from '../../src/cli/commands/check.js';
import { evaluateCommand } from '../../src/cli/commands/evaluate.js';
import { recommendCommand } from '../../src/cli/commands/recommend.js';
import { sensitivityCommand } from '../../src/cli/commands/sensitivity.js';
import { simulateCommand } from '../../src/cli/commands/simulate.js';
import { sweepCommand } from '../../src/cli/commands/sweep.js';
import { evaluateExact } from '../../src/exact/evaluate.js';
import { loadContext } from '../../src/cli/load.js';
import { evaluateUseCase } from '../../src/usecases/evaluate.js';
import { expectRounded } from '../helpers/machine.js';
import { parseScenario } from '../../src/model/validate.js';
import { runCommand, writeScenario } from '../helpers/cli.js';
import { randomScenario } from '../helpers/random-scenario.js';
import { scenarioDesign, type Pair } from '../helpers/scenario-design.js';

// Design files (`recommend --save`, `--design FILE` on every scenario command) and demand variants
// (`--demand NAME`). References: evaluateExact on a model built here from the file's pairs
// (tests/helpers/scenario-design.ts, no product code between the file and the evaluator), and a
// copy of the scenario with the variant's rates written into its classes.

const dir = mkdtempSync(join(tmpdir(), 'edgewise-design-file-'));
const rel = (a: number, b: number): number => Math.abs(a - b) / Math.max(1e-300, Math.abs(b));

const { doc } = randomScenario(77, { groups: 3, perGroup: 4, candidates: 6, removableShare: 0.4, budgetShare: 0.6, demand: true });
writeScenario(dir, 'sites.json', doc);
const scenario = parseScenario(JSON.stringify(doc), 'sites.json');
const oracle = (added: readonly Pair[], removed: readonly Pair[], rates?: ArrayLike<number>): number => evaluateExact(scenarioDesign(scenario, added, removed, rates)).backlogTotal;
/** What `evaluate FILE [--design D] [--demand N]` computes, before its JSON is rounded. */
const evaluated = (flags: { design?: string; demand?: string; file?: string }) => evaluateUseCase(loadContext({ file: 'sites.json', ...flags }, dir));

describe('recommend --save, then --design', () => {
  it('evaluate --design gives the backlog recommend reported, and an independent evaluation agrees (1e-9)', async () => {
    const rec = await runCommand(recommendCommand, { file: 'sites.json', json: true, save: 'chosen.json' }, dir);
    expect(rec.code, rec.err).toBe(0);
    expect(rec.err).toMatch(/saved the recommended design to chosen\.json/);
    const r = JSON.parse(rec.out);
    const saved = JSON.parse(readFileSync(join(dir, 'chosen.json'), 'utf8'));
    expect(saved.kind).toBe('edgewise design');
    expect(saved.added).toEqual(r.recommended.added);
    expect(saved.cost).toBe(r.recommended.cost);
    expect(r.recommended.added.length + r.recommended.removed.length).toBeGreaterThan(0);
    const ev = await runCommand(evaluateCommand, { file: 'sites.json', design: 'chosen.json', json: true }, dir);
    expect(ev.code, ev.err).toBe(0);
    const e = JSON.parse(ev.out);
    expect(e.reference).toMatchObject({ kind: 'design', name: 'the design in chosen.json', added: saved.added, removed: saved.removed });
    // the figure evaluate computes is the one recommend reported (its JSON: that figure to nine digits),
    // and an evaluation of the pairs by hand agrees to 1e-9
    const exact = (await evaluated({ design: 'chosen.json' })).backlog!.total;
    expectRounded(r.recommended.backlog, exact, 9, 'recommend');
    expectRounded(saved.backlog, exact, 9, 'saved file');
    expectRounded(e.backlog.total, exact, 9, 'evaluate --json');
    expect(rel(exact, oracle(saved.added, saved.removed))).toBeLessThanOrEqual(1e-9);
  });

  it('--pick K saves the K-th Pareto design (cheapest first)', async () => {
    const r = JSON.parse((await runCommand(recommendCommand, { file: 'sites.json', json: true, save: 'first.json', pick: 1 }, dir)).out);
    const saved = JSON.parse(readFileSync(join(dir, 'first.json'), 'utf8'));
    expect(saved.chosen).toBe(`Pareto design 1 of ${r.pareto.length}`);
    expect(saved.cost).toBe(r.pareto[0].cost);
    const e = JSON.parse((await runCommand(evaluateCommand, { file: 'sites.json', design: 'first.json', json: true }, dir)).out);
    const exact = (await evaluated({ design: 'first.json' })).backlog!.total;
    expectRounded(r.pareto[0].backlog, exact, 9, 'Pareto design 1');
    expectRounded(e.backlog.total, exact, 9, 'evaluate --json');
    expect(rel(exact, oracle(saved.added, saved.removed))).toBeLessThanOrEqual(1e-9);
    // bad picks
    expect((await runCommand(recommendCommand, { file: 'sites.json', save: 'x.json', pick: 0 }, dir)).code).toBe(2);
    expect((await runCommand(recommendCommand, { file: 'sites.json', pick: 1 }, dir)).err).toMatch(/give --save FILE too/);
    const beyond = await runCommand(recommendCommand, { file: 'sites.json', save: 'x.json', pick: r.pareto.length + 1 }, dir);
    expect(beyond.code).toBe(2);
    expect(beyond.err).toMatch(/the Pareto set has \d+ design/);
  });
});

describe('--design FILE with {added, removed} only', () => {
  const cand = doc['candidates'] as Array<{ pair: Pair }>;
  const removable = (doc['compatibilities'] as Array<{ pair: Pair; removable?: boolean }>).filter((c) => c.removable);
  const design = { added: [cand[0]!.pair, cand[3]!.pair], removed: [removable[0]!.pair] };
  writeFileSync(join(dir, 'hand.json'), JSON.stringify(design));

  it('evaluate: the hand-built design, evaluated from its pairs (1e-9)', async () => {
    const e = JSON.parse((await runCommand(evaluateCommand, { file: 'sites.json', design: 'hand.json', json: true }, dir)).out);
    const want = oracle(design.added, design.removed);
    expectRounded(e.backlog.total, want, 9, 'evaluate --json');
    expect(rel((await evaluated({ design: 'hand.json' })).backlog!.total, want)).toBeLessThanOrEqual(1e-9);
  });

  it('check, sensitivity, sweep and simulate look at that design too', async () => {
    const model = scenarioDesign(scenario, design.added, design.removed);
    const c = JSON.parse((await runCommand(checkCommand, { file: 'sites.json', design: 'hand.json', json: true }, dir)).out);
    expect(c.reference.kind).toBe('design');
    const s = JSON.parse((await runCommand(sensitivityCommand, { file: 'sites.json', design: 'hand.json', json: true }, dir)).out);
    expectRounded(s.base.backlog, evaluateExact(model).backlogTotal, s.precision, 'sensitivity base');
    // the design's own pairs are the removals: every added candidate can be taken back
    for (const p of design.added) expect(s.removals.some((x: { pair: Pair }) => x.pair.join() === [...p].sort().join() || x.pair.join() === p.join())).toBe(true);
    const w = JSON.parse((await runCommand(sweepCommand, { file: 'sites.json', design: 'hand.json', json: true, grow: scenario.classes[0]!.id, steps: 1 }, dir)).out);
    expectRounded(w.curves[0].points[0].backlog, evaluateExact(model).backlogTotal, w.precision ?? 9, 'sweep at today');
    const sim = JSON.parse((await runCommand(simulateCommand, { file: 'sites.json', design: 'hand.json', json: true, arrivals: 500, replications: 1, jobs: 1 }, dir)).out);
    expect(sim.matchRates.map((m: { pair: Pair }) => m.pair.join())).toEqual(expect.arrayContaining(design.added.map((p) => [...p].sort().join())));
  });
});

describe('bad design files exit 2 and name the file (and the place in it)', () => {
  const cases: Array<[string, string, RegExp]> = [
    ['malformed.json', '{"added": [["a", "b"],]}', /malformed\.json.*line 1, column/s],
    ['unknown-key.json', '{"added": [], "removd": []}', /unknown-key\.json.*removd.*did you mean `removed`/s],
    ['not-array.json', '{"added": "a~b"}', /not-array\.json.*added: must be an array of pairs/s],
    ['bad-pair.json', '{"added": [["a"]]}', /bad-pair\.json.*added\[0\]: a pair is two class ids/s],
    ['unknown-class.json', '{"added": [["nowhere", "g0-0"]]}', /unknown-class\.json: unknown class "nowhere"/],
    ['not-candidate.json', JSON.stringify({ added: [(doc['compatibilities'] as Array<{ pair: Pair }>)[0]!.pair] }), /not-candidate\.json: .* cannot be added: it is already compatible today/],
    ['fixed.json', JSON.stringify({ removed: [(doc['compatibilities'] as Array<{ pair: Pair; removable?: boolean }>).find((c) => !c.removable)!.pair] }), /fixed\.json: .* cannot be removed/],
  ];
  it.each(cases)('%s', async (name, text, message) => {
    writeFileSync(join(dir, name), text);
    for (const command of [evaluateCommand, checkCommand] as const) {
      const r = await runCommand(command as typeof evaluateCommand, { file: 'sites.json', design: name }, dir);
      expect(r.code).toBe(2);
      expect(r.err).toMatch(message);
      expect(r.err).not.toMatch(/internal error/);
    }
  });

  it('a missing design file', async () => {
    const r = await runCommand(evaluateCommand, { file: 'sites.json', design: 'nope.json' }, dir);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/nope\.json: no such design file/);
  });
});

describe('--demand NAME', () => {
  const variant = (doc['demand'] as Record<string, Record<string, number>>)['peak']!;
  const copy = { ...doc, classes: (doc['classes'] as Array<{ id: string; rate: number }>).map((c) => ({ ...c, rate: variant[c.id] ?? c.rate })) };
  delete (copy as Record<string, unknown>)['demand'];
  writeScenario(dir, 'peak-copy.json', copy);

  it('evaluate --demand equals evaluating a copy of the file with those rates, and says which rates', async () => {
    const a = JSON.parse((await runCommand(evaluateCommand, { file: 'sites.json', demand: 'peak', json: true }, dir)).out);
    const b = JSON.parse((await runCommand(evaluateCommand, { file: 'peak-copy.json', json: true }, dir)).out);
    expect(a.backlog).toEqual(b.backlog);
    expect(a.wait).toEqual(b.wait);
    expect(a.matchRates).toEqual(b.matchRates);
    expect(a.classes.map((c: { rate: number }) => c.rate)).toEqual(copy.classes.map((c) => c.rate));
    expect(a.reference.demand).toBe('peak');
    expect(a.warnings.some((w: string) => /demand variant "peak"/.test(w))).toBe(true);
    const rates = copy.classes.map((c) => c.rate);
    expect(rel((await evaluated({ demand: 'peak' })).backlog!.total, oracle([], [], rates))).toBeLessThanOrEqual(1e-9);
  });

  it('check and sensitivity too; an unknown variant exits 2 naming the known ones', async () => {
    const c1 = JSON.parse((await runCommand(checkCommand, { file: 'sites.json', demand: 'peak', json: true }, dir)).out);
    const c2 = JSON.parse((await runCommand(checkCommand, { file: 'peak-copy.json', json: true }, dir)).out);
    expect(c1.headroom).toEqual(c2.headroom);
    expect(c1.bottleneck).toEqual(c2.bottleneck);
    const s1 = JSON.parse((await runCommand(sensitivityCommand, { file: 'sites.json', demand: 'peak', json: true }, dir)).out);
    const s2 = JSON.parse((await runCommand(sensitivityCommand, { file: 'peak-copy.json', json: true }, dir)).out);
    expect(s1.additions.map((x: { backlog: number }) => x.backlog)).toEqual(s2.additions.map((x: { backlog: number }) => x.backlog));
    const bad = await runCommand(evaluateCommand, { file: 'sites.json', demand: 'rush' }, dir);
    expect(bad.code).toBe(2);
    expect(bad.err).toMatch(/--demand rush: the scenario has no such demand variant \(known: peak\)/);
  });
});
