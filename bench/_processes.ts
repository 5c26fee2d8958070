// Shared by bench/evaluate.ts and bench/simulate.ts (files starting with "_" are helpers, not run
// by bench/run.ts): building the plain C references of bench/c/ and timing whole processes.
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, rmSync, statSync } from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const here = dirname(fileURLToPath(import.meta.url));
export const repoRoot = join(here, '..');

/** A scratch folder removed when the process exits. */
export function scratchDir(prefix: string): string {
  const dir = mkdtempSync(join(tmpdir(), prefix));
  process.on('exit', () => rmSync(dir, { recursive: true, force: true }));
  return dir;
}

/** Compiles bench/c/<name>.c with gcc -O2 into `dir`; the path of the binary, or why it could not. */
export function buildC(name: string, dir: string): { path: string } | { skip: string } {
  const probe = spawnSync('gcc', ['--version'], { encoding: 'utf8' });
  if (probe.error || probe.status !== 0) return { skip: 'gcc not found' };
  const out = join(dir, name);
  const p = spawnSync('gcc', ['-O2', '-o', out, join(here, 'c', `${name}.c`), '-lm'], { encoding: 'utf8' });
  if (p.status !== 0) return { skip: `gcc failed: ${p.stderr.trim().split('\n')[0] ?? ''}` };
  return { path: out };
}

/** The newest modification time of the files under `dir`. */
function newest(dir: string): number {
  let t = 0;
  for (const e of readdirSync(dir, { withFileTypes: true })) {
    const p = join(dir, e.name);
    t = Math.max(t, e.isDirectory() ? newest(p) : statSync(p).mtimeMs);
  }
  return t;
}

/** The built CLI, or why the comparisons that run it are skipped. */
export function builtCli(): { path: string } | { skip: string } {
  const main = join(repoRoot, 'dist', 'cli', 'main.js');
  if (!existsSync(main)) return { skip: 'dist/ is not built (npm run build)' };
  if (newest(join(repoRoot, 'src')) > statSync(main).mtimeMs) return { skip: 'dist/ is older than src/ (npm run build)' };
  return { path: main };
}

export interface ProcessTime {
  readonly stdout: string;
  /** Wall-clock seconds. */
  readonly wall: number;
  /** User + system CPU seconds and peak resident KiB, when GNU time is there to measure them. */
  readonly cpu?: number;
  readonly peakKiB?: number;
}

const GNU_TIME = '/usr/bin/time';
const hasGnuTime = existsSync(GNU_TIME) && spawnSync(GNU_TIME, ['-f', '%U', 'true'], { encoding: 'utf8' }).status === 0;

/** Runs a command to completion and times it (CPU and peak memory through GNU time when present). */
export function timeProcess(command: string, args: readonly string[]): ProcessTime {
  const marker = '@@edgewise-bench';
  const full = hasGnuTime ? [GNU_TIME, ['-f', `${marker} %U %S %M`, command, ...args]] as const : ([command, args] as const);
  const t0 = performance.now();
  const p = spawnSync(full[0], full[1], { encoding: 'utf8', maxBuffer: 1 << 28 });
  const wall = (performance.now() - t0) / 1000;
  if (p.status !== 0) throw new Error(`${command} ${args.join(' ')} exited with ${p.status}: ${p.stderr.slice(-500)}`);
  if (!hasGnuTime) return { stdout: p.stdout, wall };
  const line = p.stderr.split('\n').find((l) => l.startsWith(marker));
  const [user, sys, peak] = (line ?? '').slice(marker.length).trim().split(/\s+/).map(Number);
  return { stdout: p.stdout, wall, cpu: user! + sys!, peakKiB: peak! };
}

export const median = (xs: readonly number[]): number => {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 === 1 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
};

/** The 1-minute load average, for the figures of a shared machine. */
export const load = (): string => loadavg()[0]!.toFixed(2);
