import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { beforeAll, describe, expect, it } from 'vitest';
import { compileGraph } from '../../src/model/compile.js';
import type { ReplicationRecord } from '../../src/sim/record.js';
import { runReplications } from '../../src/sim/runner.js';
import { buildSimModel } from '../../src/sim/sim-model.js';

/**
 * Replications run in worker threads only from compiled JavaScript (the worker script is
 * dist/workers/worker.js). These tests compile the sources once into .test-output/dist-sim, exactly as
 * `npm run build` does, and run that build: its runner, and its CLI in a child process.
 */
const root = resolve(import.meta.dirname, '../..');
const out = join(root, '.test-output', 'dist-sim');

const plan = { arrivals: 40_000, warmup: 4_000, maxWaiting: 1e6, timed: false };
const model = compileGraph(['red', 'green', 'blue', 'gold'], [1, 1.5, 2, 0.8], [[0, 1], [1, 2], [0, 2], [2, 3], [3, 3]]);

async function collect(run: (sink: (r: ReplicationRecord) => void) => Promise<unknown>): Promise<ReplicationRecord[]> {
  const got: ReplicationRecord[] = [];
  await run((r) => got.push(r));
  return got.sort((a, b) => a.index - b.index);
}

describe('runner from sources (no compiled worker: this thread)', () => {
  it('gives the same records whatever jobs is', async () => {
    const sim = buildSimModel(model);
    const one = await collect((sink) => runReplications(sim, plan, 3, 4, { jobs: 1 }, sink));
    const four = await collect((sink) => runReplications(sim, plan, 3, 4, { jobs: 4 }, sink));
    expect(four).toEqual(one);
    expect(one.map((r) => r.index)).toEqual([0, 1, 2, 3]);
  });
});

describe('compiled build: worker threads', () => {
  beforeAll(() => {
    mkdirSync(join(root, '.test-output'), { recursive: true });
    // type errors elsewhere in the tree do not stop tsc from emitting; the files below must exist
    spawnSync(process.execPath, [join(root, 'node_modules/typescript/bin/tsc'), '-p', 'tsconfig.build.json', '--outDir', out], { cwd: root, encoding: 'utf8' });
    for (const f of ['cli/main.js', 'cli/commands/simulate.js', 'workers/worker.js', 'sim/runner.js', 'sim/sim-model.js', 'model/compile.js']) {
      expect(existsSync(join(out, f)), `${f} was not built`).toBe(true);
    }
  });

  const load = async <T>(file: string): Promise<T> => (await import(pathToFileURL(join(out, file)).href)) as T;

  it('the built runner finds its worker script and 2 workers give the records of this thread', async () => {
    const runner = await load<typeof import('../../src/sim/runner.js')>('sim/runner.js');
    const built = await load<typeof import('../../src/sim/sim-model.js')>('sim/sim-model.js');
    const url = runner.defaultWorkerUrl();
    expect(url).not.toBeNull();
    expect(existsSync(url!)).toBe(true);
    const sim = built.buildSimModel(model);
    let progress = 0;
    const inThread = await collect((sink) => runner.runReplications(sim, plan, 8, 5, { jobs: 1 }, sink));
    const workers = await collect((sink) => runner.runReplications(sim, plan, 8, 5, { jobs: 2, onProgress: (a) => (progress += a) }, sink));
    expect(workers).toEqual(inThread);
    expect(progress).toBe(5 * (plan.arrivals + plan.warmup));
  });

  it('a side task (the exact column) runs on a worker, before the pool closes, and equals an evaluation in this thread', async () => {
    const runner = await load<typeof import('../../src/sim/runner.js')>('sim/runner.js');
    const built = await load<typeof import('../../src/sim/sim-model.js')>('sim/sim-model.js');
    const { exactColumn } = await import('../../src/exact/column.js');
    const { edgePairs } = await import('../../src/model/compile.js');
    const sim = built.buildSimModel(model);
    const task = { kind: 'exact' as const, ids: model.ids, rates: model.rates, pairs: edgePairs(model), maxSets: 1e6, timeUnit: 'minute' };
    let accepted: Promise<unknown> | undefined;
    let calls = 0;
    const accept = (r: Promise<unknown> | undefined): void => {
      calls++;
      accepted = r;
    };
    const records = await collect((sink) => runner.runReplications(sim, plan, 8, 4, { jobs: 2, side: { task, accept } }, sink));
    expect(records).toHaveLength(4);
    expect(calls).toBe(1);
    expect(accepted).toBeDefined();
    const column = (await accepted) as { exact?: { backlogTotal: number; backlog: Float64Array }; reason: string | null };
    // the reference: the same function run here from the sources (no worker)
    const here = exactColumn(model.ids, model.rates, edgePairs(model), { maxSets: 1e6, timeUnit: 'minute' });
    expect(column.reason).toBeNull();
    expect(column.exact!.backlogTotal).toBe(here.exact!.backlogTotal);
    expect(Array.from(column.exact!.backlog)).toEqual(Array.from(here.exact!.backlog));
    // without workers the caller is told to do it itself
    let without: unknown = 'not called';
    await collect((sink) => runner.runReplications(sim, plan, 8, 2, { jobs: 1, side: { task, accept: (r) => (without = r) } }, sink));
    expect(without).toBeUndefined();
    // a too large design comes back as the reason, not as an error
    const refused = (await new Promise<unknown>((resolve) => {
      void runner.runReplications(sim, plan, 8, 2, { jobs: 2, side: { task: { ...task, maxSets: 3 }, accept: (r) => void r!.then(resolve) } }, () => undefined);
    })) as { exact?: unknown; reason: string | null };
    expect(refused.exact).toBeUndefined();
    expect(refused.reason).toMatch(/independent sets/);
    expect(refused.reason).toMatch(/raise --max-sets/);
    expect(refused.reason).not.toMatch(/edgewise simulate/); // said beside a simulation
  });

  it('workers started before their pool are adopted by it and give the records of this thread', async () => {
    const runner = await load<typeof import('../../src/sim/runner.js')>('sim/runner.js');
    const pool = await load<typeof import('../../src/workers/pool.js')>('workers/pool.js');
    const built = await load<typeof import('../../src/sim/sim-model.js')>('sim/sim-model.js');
    const sim = built.buildSimModel(model, { patience: [0, 3, 0, 1.5] });
    const timedPlan = { ...plan, timed: true };
    const inThread = await collect((sink) => runner.runReplications(sim, timedPlan, 4, 5, { jobs: 1 }, sink));
    pool.prestartWorkers('simulate', 2);
    expect(pool.pendingPrestarted()).toBe(2);
    // a pool of the other kind does not take them
    const other = pool.createPool({ kind: 'score', spec: {} as never }, 2)!;
    expect(await other.run({ kind: 'score', tasks: [] })).toEqual([]);
    await other.close();
    expect(pool.pendingPrestarted()).toBe(2);
    // --jobs 3: this thread and two workers, both prestarted ones
    const adopted = await collect((sink) => runner.runReplications(sim, timedPlan, 4, 5, { jobs: 3 }, sink));
    expect(pool.pendingPrestarted()).toBe(0);
    expect(adopted).toEqual(inThread);
  });

  it('an unused prestarted worker does not keep the process alive', () => {
    const poolUrl = pathToFileURL(join(out, 'workers', 'pool.js')).href;
    const r = spawnSync(process.execPath, ['--input-type=module', '-e', `const m = await import(${JSON.stringify(poolUrl)}); m.prestartWorkers('simulate', 1);`], { encoding: 'utf8', timeout: 20_000 });
    expect(r.error).toBeUndefined(); // no timeout
    expect(r.status, r.stderr).toBe(0);
  });

  it('with jobs ≥ 2 the work really goes to the worker script (a missing script fails)', async () => {
    const runner = await load<typeof import('../../src/sim/runner.js')>('sim/runner.js');
    const built = await load<typeof import('../../src/sim/sim-model.js')>('sim/sim-model.js');
    const sim = built.buildSimModel(model);
    const bogus = pathToFileURL(join(out, 'sim', 'no-such-worker.js'));
    await expect(runner.runReplications(sim, plan, 1, 2, { jobs: 2, workerUrl: bogus }, () => {})).rejects.toThrow();
  });

  it('a worker that hits the memory cap stops the run with the typed error', async () => {
    const runner = await load<typeof import('../../src/sim/runner.js')>('sim/runner.js');
    const built = await load<typeof import('../../src/sim/sim-model.js')>('sim/sim-model.js');
    const unstable = compileGraph(['a', 'b'], [2, 1], [[0, 1]]);
    const sim = built.buildSimModel(unstable);
    const error = await runner.runReplications(sim, { ...plan, maxWaiting: 300 }, 1, 4, { jobs: 2 }, () => {}).then(
      () => undefined,
      (e: Error) => e,
    );
    expect(error?.name).toBe('TooLargeError');
    expect(error?.message).toMatch(/more than 300 items were waiting at once/);
  });

  describe('the built CLI', () => {
    const dir = mkdtempSync(join(tmpdir(), 'edgewise-sim-'));
    const file = join(dir, 'swaps.json');
    writeFileSync(
      file,
      JSON.stringify({
        name: 'Hospital shift swaps (invented)',
        timeUnit: 'day',
        classes: [
          { id: 'early', rate: 2 },
          { id: 'late', rate: 1.5 },
          { id: 'night', rate: 1, patience: 2 },
          { id: 'weekend', rate: 0.8 },
        ],
        compatibilities: [['early', 'late'], ['late', 'night'], ['early', 'night'], ['night', 'weekend'], ['weekend', 'weekend']],
      }),
    );
    const cli = (...args: string[]) =>
      spawnSync(process.execPath, [join(out, 'cli/main.js'), 'simulate', file, ...args], { cwd: dir, encoding: 'utf8' });

    it('--json output is byte-identical for --jobs 1, 2 and 3', () => {
      // the night shift has patience, so this run uses the timed engine
      const common = ['--json', '--arrivals', '20000', '--replications', '5', '--seed', '17'];
      const runs = ['1', '2', '3'].map((j) => cli(...common, '--jobs', j));
      for (const r of runs) {
        expect(r.status, r.stderr).toBe(0);
        expect(r.stderr).toBe('');
      }
      expect(runs[1]!.stdout).toBe(runs[0]!.stdout);
      expect(runs[2]!.stdout).toBe(runs[0]!.stdout);
      const doc = JSON.parse(runs[0]!.stdout);
      expect(doc.replications).toBe(5);
      expect(doc.engine).toBe('timed');
    });
  });
});
