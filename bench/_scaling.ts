// Shared by bench/simulate.ts and bench/recommend-jobs.ts: the built CLI with --jobs 1 against
// --jobs 2, interleaved rounds, medians, the outputs compared byte for byte, and a projection of
// the speed-up on a free machine from the CPU time of every thread.
//
// How the projection is measured: while a run goes, /proc/<pid>/task/*/stat is read every 20 ms
// and each thread's user + system CPU time (in 10 ms ticks) noted; readings are grouped into
// windows of 0.1 s of CPU time (all threads together). Per window, a free 2-core machine needs at
// least max(Σ threads' CPU / 2, the busiest thread's CPU): the work of one window cannot run on more
// than two cores, nor one thread's work on more than one. The sum over the windows is the run's
// projected wall time on a free machine; serial stages (one thread busy, the others waiting) count
// in full. Projected speed-up = projected wall time of
// --jobs 1 / that of --jobs 2. Coarse (the ticks are 10 ms, the last ≤ 20 ms of a thread can be
// missed), but it moves little with the other load of a shared machine, unlike the wall ratio.
import { spawn } from 'node:child_process';
import { readdirSync, readFileSync } from 'node:fs';
import { load, median } from './_processes.js';

const TICK = 100; // clock ticks per second of /proc stat times (USER_HZ: 100 on Linux)
/** CPU seconds of a window (10 ticks): long enough for the 10 ms ticks, short against a run. */
const WINDOW = 0.1;

interface Run {
  readonly stdout: string;
  readonly wall: number;
  /** Total CPU seconds of all threads, and the projected wall time on a free 2-core machine (undefined without /proc). */
  readonly cpu?: number;
  readonly freeWall?: number;
}

function threadTimes(pid: number, into: Map<string, number>): void {
  let tasks: string[];
  try {
    tasks = readdirSync(`/proc/${pid}/task`);
  } catch {
    return;
  }
  for (const t of tasks) {
    try {
      const stat = readFileSync(`/proc/${pid}/task/${t}/stat`, 'utf8');
      const f = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
      // fields 14 and 15 (utime, stime) of stat are 12 and 13 after the command name
      into.set(t, (Number(f[11]) + Number(f[12])) / TICK);
    } catch {
      /* the thread ended between the listing and the read */
    }
  }
}

/** Runs `node args` to completion, sampling its threads' CPU time. */
function runSampled(args: readonly string[]): Promise<Run> {
  return new Promise((resolve, reject) => {
    const t0 = performance.now();
    const child = spawn(process.execPath, args, { stdio: ['ignore', 'pipe', 'pipe'] });
    // readings every 20 ms; a window closes once its threads used WINDOW s of CPU together
    let base = new Map<string, number>();
    let last = new Map<string, number>();
    let cpu = 0;
    let freeWall = 0;
    let sampled = false;
    const close = (): void => {
      let sum = 0;
      let most = 0;
      for (const [t, c] of last) {
        const d = c - (base.get(t) ?? 0);
        sum += d;
        most = Math.max(most, d);
      }
      cpu += sum;
      freeWall += Math.max(sum / 2, most);
      base = last;
    };
    const sample = (): void => {
      const now = new Map<string, number>();
      threadTimes(child.pid!, now);
      if (now.size === 0) return; // the process has gone: keep the last reading
      sampled = true;
      for (const [t, c] of base) if (!now.has(t)) now.set(t, c); // a thread that ended
      last = now;
      let sum = 0;
      for (const [t, c] of now) sum += c - (base.get(t) ?? 0);
      if (sum >= WINDOW) close();
    };
    const chunks: Buffer[] = [];
    const err: Buffer[] = [];
    child.stdout.on('data', (b: Buffer) => chunks.push(b));
    child.stderr.on('data', (b: Buffer) => err.push(b));
    const timer = setInterval(sample, 20);
    child.on('error', reject);
    child.on('close', (code) => {
      clearInterval(timer);
      if (sampled) close();
      const wall = (performance.now() - t0) / 1000;
      if (code !== 0) {
        reject(new Error(`node ${args.join(' ')} exited with ${code}: ${Buffer.concat(err).toString().slice(-400)}`));
        return;
      }
      resolve({ stdout: Buffer.concat(chunks).toString(), wall, ...(sampled ? { cpu, freeWall } : {}) });
    });
  });
}

export interface Scaling {
  readonly wall1: number;
  readonly wall2: number;
  readonly identical: boolean;
  readonly projected?: number;
}

/**
 * `node argsFor(1)` against `node argsFor(2)`, `rounds` interleaved rounds; prints one line under
 * `label` and returns the medians.
 */
export async function jobsScaling(label: string, argsFor: (jobs: number) => string[], rounds: number, log: (line: string) => void): Promise<Scaling> {
  const one: Run[] = [];
  const two: Run[] = [];
  const loads: string[] = [];
  for (let r = 0; r < rounds; r++) {
    loads.push(load());
    one.push(await runSampled(argsFor(1)));
    two.push(await runSampled(argsFor(2)));
  }
  const identical = [...one, ...two].every((x) => x.stdout === one[0]!.stdout);
  const wall1 = median(one.map((x) => x.wall));
  const wall2 = median(two.map((x) => x.wall));
  let projected: number | undefined;
  let cpuText = 'CPU time not available (no /proc)';
  if (one.every((x) => x.cpu !== undefined) && two.every((x) => x.cpu !== undefined)) {
    const c1 = median(one.map((x) => x.cpu!));
    const c2 = median(two.map((x) => x.cpu!));
    const f1 = median(one.map((x) => x.freeWall!));
    const f2 = median(two.map((x) => x.freeWall!));
    projected = f1 / f2;
    cpuText = `CPU ${c1.toFixed(2)} s against ${c2.toFixed(2)} s, projected wall on a free 2-core machine ${f1.toFixed(2)} s against ${f2.toFixed(2)} s: ×${projected.toFixed(2)}`;
  }
  log(
    `  ${label}: --jobs 1 ${wall1.toFixed(2)} s, --jobs 2 ${wall2.toFixed(2)} s wall: ×${(wall1 / wall2).toFixed(2)}; ${cpuText}; ` +
      `outputs ${identical ? 'byte-identical' : 'DIFFER'} (${rounds * 2} runs)`,
  );
  log(`  (medians of ${rounds} interleaved rounds; 1-minute load average before each round: ${loads.join(', ')})`);
  return { wall1, wall2, identical, ...(projected !== undefined ? { projected } : {}) };
}

export const PROJECTION_NOTE =
  'projection: every thread\'s CPU time read from /proc every 20 ms, each window of 0.1 CPU s needing max(its CPU / 2, its busiest thread) on a free 2-core machine (bench/_scaling.ts)';
