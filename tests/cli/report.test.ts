import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parseHTML } from 'linkedom';
import { describe, expect, it } from 'vitest';
import { reportCommand } from '../../src/cli/commands/report.js';
import { runCommand } from '../helpers/cli.js';
import { memoryIO } from '../../src/cli/io.js';
import { runWithExitCode } from '../../src/cli/exit.js';
import { parseScenario } from '../../src/model/validate.js';
import { scenarioContext } from '../../src/usecases/context.js';
import { reportUseCase } from '../../src/usecases/report.js';
import { renderReport } from '../../src/html/report-html.js';
import { namerOf, verdicts } from '../../src/html/verdicts.js';

// `edgewise report FILE -o report.html`. Reference values derived by hand (tests/cli/compare.test.ts
// has the steps): K4 minus the edge a ↔ b with rates 0.2, 0.2, 0.4, 0.2 has mean backlog 7/3, and
// adding a ↔ b gives K4 with 11/6.

const dir = mkdtempSync(join(tmpdir(), 'edgewise-report-'));
writeFileSync(
  join(dir, 'pit.json'),
  JSON.stringify({
    name: 'pit crews & "friends"',
    timeUnit: 'minute',
    costUnit: 'credits',
    classes: ['a', 'b', 'c', 'd'].map((id, k) => ({ id, rate: [0.2, 0.2, 0.4, 0.2][k] })),
    compatibilities: [['a', 'c'], ['a', 'd'], ['b', 'c'], ['b', 'd'], ['c', 'd']],
    candidates: [{ pair: ['a', 'b'], cost: 5 }],
    budget: 10,
  }),
);
async function run(opts: Parameters<typeof reportCommand>[0]) {
  return runCommand(reportCommand, opts, dir);
}

describe('report command', () => {
  it('writes one HTML file and says so; the verdicts quote 7/3 → 11/6', async () => {
    const r = await run({ file: 'pit.json', output: 'out.html' });
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/^wrote out\.html \(\d+ KB\)\n\nToday's design keeps up with demand: /);
    const page = readFileSync(join(dir, 'out.html'), 'utf8');
    const { document } = parseHTML(page);
    expect(document.querySelector('h1')!.textContent).toBe('pit crews & "friends"');
    const verdicts = [...document.querySelectorAll('.verdicts li')].map((li) => li.textContent!);
    // four significant digits of 7/3 and 11/6
    expect(verdicts[1]).toContain('waiting goes from 2.333 to 1.833 items');
  });

  it('--json carries the method of the figures and the notes the page prints', async () => {
    const r = await run({ file: 'pit.json', output: 'json.html', json: true, score: 'simulation', seed: 2 } as never);
    expect(r.code).toBe(0);
    const rec = JSON.parse(r.out);
    expect(rec.method).toBe('simulation');
    const page = readFileSync(join(dir, 'json.html'), 'utf8');
    const { document } = parseHTML(page);
    const text = document.body.textContent!.replace(/\s+/g, ' ');
    expect(rec.notes.length).toBeGreaterThan(0);
    expect(rec.notes.join(' ')).toMatch(/Simulated figures \(seed 2/);
    // every note of the record is on the page
    for (const n of rec.notes as string[]) expect(text).toContain(n.replace(/\s+/g, ' ').slice(0, 60));
  }, 120_000);

  it('interrupted (the signal aborted): the page is still written, marked partial, with what was not computed; exit 130', async () => {
    const controller = new AbortController();
    controller.abort();
    const scenario = parseScenario(readFileSync(join(dir, 'pit.json'), 'utf8'), 'pit.json');
    const r = await reportUseCase(scenarioContext(scenario, { source: 'pit.json' }), { jobs: 1, seed: 1, signal: controller.signal });
    expect(r.partial).toBe(true);
    expect(r.sweep).toBeNull();
    expect(r.notes[0]).toMatch(/^Interrupted: .*not computed: the load sweep/);
    const { document } = parseHTML(renderReport(r, { generator: 'test' }));
    expect(document.body.textContent!.replace(/\s+/g, ' ')).toContain('Interrupted: this report shows what was computed before the stop');
    // the command: the page is written and the exit code says it was interrupted
    const io = memoryIO(dir, 120, controller.signal);
    const code = await runWithExitCode(io, () => reportCommand({ file: 'pit.json', output: 'stopped.html' }, io));
    expect(code).toBe(130);
    expect(readFileSync(join(dir, 'stopped.html'), 'utf8')).toContain('Interrupted');
    expect(io.stdout()).toMatch(/interrupted: what was computed so far/);
    // a decision from an interrupted search advises only on what it scored, and says so
    const full = await reportUseCase(scenarioContext(scenario, { source: 'pit.json' }), { jobs: 1, seed: 1 });
    expect(full.partial).toBe(false);
    const cut = { ...full, decision: { ...full.decision!, partial: true } };
    const words = verdicts(cut, namerOf(cut)).join(' ');
    expect(words).toContain('scored before the interruption');
    expect(words).not.toContain("keep today's design");
  }, 120_000);

  it('--budget 0 overrides the scenario: nothing is affordable, keep today', async () => {
    const r = await run({ file: 'pit.json', output: 'zero.html', budget: 0 });
    expect(r.code).toBe(0);
    const { document } = parseHTML(readFileSync(join(dir, 'zero.html'), 'utf8'));
    const text = document.querySelector('.verdicts')!.textContent!;
    expect(text).toContain("no change lowers waiting: keep today's design");
  });

  it('refuses bad options and unwritable targets (exit 2), and missing files', async () => {
    expect((await run({ file: 'pit.json', output: 'x.html', budget: -1 })).code).toBe(2);
    expect((await run({ file: 'pit.json', output: 'x.html', jobs: 0 })).code).toBe(2);
    expect((await run({ file: 'pit.json', output: '' })).code).toBe(2);
    const r = await run({ file: 'pit.json', output: join('no-such-dir', 'x.html') });
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/cannot write/);
    expect((await run({ file: 'missing.json', output: 'x.html' })).code).toBe(2);
  });
});
