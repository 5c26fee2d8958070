import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { simulateCommand, type SimulateOptions } from '../../src/cli/commands/simulate.js';
import { compileModel } from '../../src/model/compile.js';
import { parseScenario } from '../../src/model/validate.js';
import { permutationOracle } from '../helpers/permutation-oracle.js';
import { runCommand, writeScenario } from '../helpers/cli.js';
import { expectRounded } from '../helpers/machine.js';
import { MACHINE_DIGITS, num } from '../../src/output/format.js';

/** Text with its line breaks turned into spaces (paragraphs wrap to the width). */
const flat = (s: string): string => s.replace(/\s+/g, ' ');

const dir = mkdtempSync(join(tmpdir(), 'edgewise-simulate-'));
function scenarioFile(name: string, doc: unknown): string {
  return writeScenario(dir, name, doc);
}

// invented: a matchmaking ladder where neighbouring tiers play each other and the top tier plays itself
const ladder = {
  name: 'Ladder matchmaking (invented)',
  timeUnit: 'minute',
  classes: [
    { id: 'bronze', rate: 3 },
    { id: 'silver', rate: 2.5 },
    { id: 'gold', rate: 2 },
    { id: 'master', rate: 1 },
  ],
  compatibilities: [['bronze', 'silver'], ['silver', 'gold'], ['bronze', 'gold'], ['gold', 'master'], ['master', 'master']],
};
const ladderFile = scenarioFile('ladder.json', ladder);

// invented and unstable: two suburbs can only share rides through one small station zone
const unstableFile = scenarioFile('unstable.json', {
  name: 'Suburb shuttles (invented, unstable)',
  timeUnit: 'hour',
  classes: [
    { id: 'station', rate: 2 },
    { id: 'east', rate: 1.5 },
    { id: 'west', rate: 1.5 },
  ],
  compatibilities: [['station', 'station'], ['station', 'east'], ['station', 'west']],
});

const impatientFile = scenarioFile('impatient.json', {
  ...ladder,
  classes: ladder.classes.map((c) => (c.id === 'master' ? { ...c, patience: 3 } : c)),
});

const quick = { arrivals: 20_000, replications: 4, seed: 2, jobs: 1 } as const;

async function run(opts: Partial<SimulateOptions> & { file: string }) {
  return runCommand(simulateCommand, { ...quick, ...opts }, dir);
}

describe('edgewise simulate --json', () => {
  it('has the documented shape, ids at the boundary, and nothing on stderr', async () => {
    const r = await run({ file: ladderFile, json: true });
    expect(r.code).toBe(0);
    expect(r.err).toBe('');
    const doc = JSON.parse(r.out);
    expect(doc).toMatchObject({ policy: 'fcfm', replications: 4, arrivals: 20_000, seed: 2, engine: 'arrival-chain' });
    expect(Object.keys(doc.backlog.byClass)).toEqual(['bronze', 'silver', 'gold', 'master']);
    expect(doc.backlog.total.ci95).toHaveLength(2);
    expect(doc.backlog.total.ci95[0]).toBeLessThanOrEqual(doc.backlog.total.mean);
    for (const key of ['mean', 'ci95', 'p50', 'p90', 'p99', 'p99Ci95']) expect(doc.wait.byClass.gold).toHaveProperty(key);
    expect(doc.warnings).toEqual([]);
    expect(doc.reference.kind).toBe('today');
    expect(doc.matchRates.map((m: { pair: string[] }) => m.pair)).toEqual(ladder.compatibilities);
    expect(doc.abandonment.byClass.bronze.rate.mean).toBe(0);
    expect(doc.abandonment.byClass.bronze.patience).toBeUndefined(); // infinite patience: no figure, so the key is left out
    expect(doc.stability.stable).toBe(true);
  });

  it('the exact column carries the FCFM product-form values of the right classes and pairs', async () => {
    // reference: permutation-sum form of "A product form for the general stochastic matching model"
    // (J. Appl. Probab. 2021), tests/helpers/permutation-oracle.ts
    const oracle = permutationOracle(compileModel(parseScenario(JSON.stringify(ladder))));
    const doc = JSON.parse((await run({ file: ladderFile, json: true })).out);
    expect(doc.exact.available).toBe(true);
    // exact figures in JSON are rounded to the record's significant digits
    const digits = doc.precision ?? MACHINE_DIGITS;
    ladder.classes.forEach((c, k) => {
      expectRounded(doc.backlog.byClass[c.id].exact, oracle.backlog[k]!, digits, `backlog ${c.id}`);
      expectRounded(doc.wait.byClass[c.id].exact, oracle.wait[k]!, digits, `wait ${c.id}`);
      expectRounded(doc.matchedAtOnce.byClass[c.id].exact, oracle.immediateMatch[k]!, digits, `matched at once ${c.id}`);
    });
    expectRounded(doc.backlog.total.exact, oracle.backlogTotal, digits, 'backlog total');
    doc.matchRates.forEach((m: { rate: { exact: number } }, e: number) => expectRounded(m.rate.exact, oracle.matchRates[e]!, digits, `match rate ${e}`));
  });

  it('no exact column for other policies, impatient classes, or beyond --max-sets', async () => {
    const longest = JSON.parse((await run({ file: ladderFile, json: true, policy: 'most-waiting' })).out);
    expect(longest.exact).toEqual({ available: false, reason: 'exact values exist for FCFM only' });
    expect(longest.backlog.total.exact).toBeUndefined();
    const impatient = JSON.parse((await run({ file: impatientFile, json: true })).out);
    expect(impatient.exact.available).toBe(false);
    expect(impatient.engine).toBe('timed');
    expect(impatient.abandonment.byClass.master.patience).toBe(3);
    expect(impatient.abandonment.byClass.master.rate.mean).toBeGreaterThan(0);
    // simulation handles patience: no warning that figures ignore it
    expect(impatient.warnings.some((w: string) => /patience/.test(w))).toBe(false);
    const tooLarge = JSON.parse((await run({ file: ladderFile, json: true, maxSets: 2 })).out);
    expect(tooLarge.exact.available).toBe(false);
    expect(tooLarge.exact.reason).toMatch(/independent sets/);
  });

  it('rankings are echoed and matter only where a choice exists', async () => {
    // bronze and gold are compatible, so they never wait together: ranking them changes nothing
    const a = JSON.parse((await run({ file: ladderFile, json: true, policy: 'ranked', rank: 'bronze,gold' })).out);
    const b = JSON.parse((await run({ file: ladderFile, json: true, policy: 'ranked', rank: 'gold,bronze' })).out);
    expect(a.ranking).toEqual(['bronze', 'gold']);
    expect(b.backlog).toEqual(a.backlog);
    // silver and master can wait together, and a gold arrival must choose between them
    const c = JSON.parse((await run({ file: ladderFile, json: true, policy: 'ranked', rank: 'silver,master' })).out);
    const d = JSON.parse((await run({ file: ladderFile, json: true, policy: 'ranked', rank: 'master,silver' })).out);
    expect(c.backlog.byClass.master.mean).not.toBe(d.backlog.byClass.master.mean);
  });

  it('unstable designs: simulated, with the certificate in the JSON and the warning in both places', async () => {
    const r = await run({ file: unstableFile, json: true, arrivals: 5_000 });
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.out);
    expect(doc.warnings.some((w: string) => /unstable/.test(w))).toBe(true);
    for (const w of doc.warnings) expect(flat(r.err)).toContain(flat(`warning: ${w}`)); // wrapped to the width on stderr
    expect(doc.stability.stable).toBe(false);
    expect(doc.stability.certificate.set).toEqual(['east', 'west']);
    expect(doc.stability.certificate.neighbours).toEqual(['station']);
    expect(doc.exact.available).toBe(false);
  });
});

describe('edgewise simulate (tables)', () => {
  it('prints per-class and per-compatibility tables with the exact column', async () => {
    const r = await run({ file: ladderFile });
    expect(r.code).toBe(0);
    expect(r.err).toBe('');
    expect(r.out).toContain("Ladder matchmaking (invented): today's design simulated under FCFM");
    expect(r.out).toMatch(/^class\s+backlog\s+exact\s+mean wait\s+exact/m);
    // waits of about a minute or less read in seconds (the exact column too): the oracle's gold wait
    const oracle = permutationOracle(compileModel(parseScenario(JSON.stringify(ladder))));
    const gold = r.out.split('\n').find((l) => l.startsWith('gold '))!;
    expect(gold).toContain(`${num(oracle.wait[2]! * 60)} s`);
    expect(r.out).toMatch(/^master ↔ master\s/m);
    expect(r.out).toMatch(/matches \/minute/);
    expect(flat(r.out)).toContain('Student t, 3 degrees of freedom');
  });

  it('abandonment columns appear when a class has patience', async () => {
    const r = await run({ file: impatientFile });
    expect(r.out).toContain('abandon /minute');
    expect(flat(r.out)).toContain('No exact column: exact values assume patient items.');
  });

  it('warns on stderr about an unstable design, with its certificate', async () => {
    const r = await run({ file: unstableFile, arrivals: 5_000 });
    expect(r.code).toBe(0);
    expect(r.err).toMatch(/^warning: unstable: items from east and west \(3\.0\/hour\) can only be matched with station \(2\.0\/hour\)/);
  });
});

describe('edgewise simulate: errors and exit codes', () => {
  it('stops cleanly at the memory cap (exit 4, clear message)', async () => {
    const r = await run({ file: unstableFile, arrivals: 200_000, maxWaiting: 1_000 });
    expect(r.code).toBe(4);
    expect(r.out).toBe('');
    expect(r.err).toMatch(/edgewise: simulation stopped: more than 1,000 items were waiting at once .* of class (east|west)\)/);
    expect(r.err).not.toMatch(/internal error/);
  });

  it('usage errors exit 2', async () => {
    for (const [opts, message] of [
      [{ policy: 'ranked' }, /needs --rank/],
      [{ rank: 'gold' }, /only applies with --policy ranked/],
      [{ policy: 'oldest-first' }, /--policy must be one of fcfm, most-waiting, ranked, random-class/],
      [{ policy: 'priority' }, /--policy must be one of/],
      [{ policy: 'ranked', rank: 'gold,platinum' }, /unknown class "platinum"/],
      [{ arrivals: 0 }, /--arrivals must be a whole number >= 1/],
      [{ replications: Number.NaN }, /--replications must be a whole number/],
      [{ maxSets: -3 }, /--max-sets must be a positive integer/],
    ] as const) {
      const r = await run({ file: ladderFile, ...(opts as Partial<SimulateOptions>) });
      expect(r.code, JSON.stringify(opts)).toBe(2);
      expect(r.err).toMatch(message);
    }
  });

  it('a missing scenario file exits 2', async () => {
    const r = await run({ file: join(dir, 'nope.json') });
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/nope\.json: no such scenario file/);
  });
});
