import { spawn } from 'node:child_process';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { writeScenario } from '../helpers/cli.js';
import { randomScenario } from '../helpers/random-scenario.js';

// SIGINT on the built CLI (dist/ is built by tests/global-setup.ts): `recommend` and `simulate`
// stop, print what they found so far as a valid JSON document marked partial, and exit 130. The
// signal is sent after about 3 s; on a machine so slow that nothing was found yet, the run is
// repeated with a longer wait (this is not a timing test: only the outcome is checked). The
// simulate run is sized (400 × 2 M arrivals) so that no machine finishes it before the signal: a
// fast CI machine finished 400 × 200 000 arrivals in under 3 s.

const root = join(import.meta.dirname, '..', '..');
const dir = mkdtempSync(join(tmpdir(), 'edgewise-sigint-'));
// a seeded 20-class scenario with 40 candidates: its search takes minutes
const big = randomScenario(2020, { groups: 4, perGroup: 5, candidates: 40, removableShare: 0.1, budgetShare: 0.4 });
writeScenario(dir, 'big.json', big.doc);

function interrupted(args: string[], afterMs: number): Promise<{ code: number | null; signal: NodeJS.Signals | null; out: string; err: string }> {
  return new Promise((resolve) => {
    const child = spawn(process.execPath, [join(root, 'dist', 'cli', 'main.js'), ...args], { cwd: dir, stdio: ['ignore', 'pipe', 'pipe'] });
    let out = '';
    let err = '';
    child.stdout.on('data', (d: Buffer) => (out += d.toString()));
    child.stderr.on('data', (d: Buffer) => (err += d.toString()));
    const timer = setTimeout(() => child.kill('SIGINT'), afterMs);
    child.on('close', (code, signal) => {
      clearTimeout(timer);
      resolve({ code, signal, out, err });
    });
  });
}

/** Interrupts after 3 s, then 6 s, 12 s… until the run had something to show. */
async function interruptedWithResult(args: string[]) {
  for (const ms of [3000, 6000, 12000, 24000]) {
    const r = await interrupted(args, ms);
    if (r.out.trim() !== '' || r.code !== 130) return r;
  }
  throw new Error('nothing found even after 24 s');
}

describe('SIGINT on the built CLI', () => {
  it('recommend --json: exit 130, a valid JSON document with "partial": true and a non-empty Pareto set', async () => {
    const r = await interruptedWithResult(['recommend', 'big.json', '--json']);
    expect(r.code, r.err).toBe(130);
    const doc = JSON.parse(r.out);
    expect(doc.partial).toBe(true);
    expect(doc.pareto.length).toBeGreaterThan(0);
    for (const p of doc.pareto) {
      expect(p.stable).toBe(true);
      expect(p.cost).toBeLessThanOrEqual((big.doc['budget'] as number) + 1e-9);
    }
    expect(doc.warnings.some((w: string) => /^interrupted/.test(w))).toBe(true);
    expect(r.err).toMatch(/interrupted; finishing with what was found so far/);
  }, 120_000);

  it('simulate --json: exit 130, the finished replications only, marked partial', async () => {
    const r = await interruptedWithResult(['simulate', 'big.json', '--json', '--arrivals', '2000000', '--replications', '400', '--jobs', '2']);
    expect(r.code, r.err).toBe(130);
    const doc = JSON.parse(r.out);
    expect(doc.partial).toBe(true);
    expect(doc.plannedReplications).toBe(400);
    expect(doc.replications).toBeGreaterThanOrEqual(1);
    expect(doc.replications).toBeLessThan(400);
    expect(Number.isFinite(doc.backlog.total.mean)).toBe(true);
    expect(doc.warnings).toContain(`interrupted: ${doc.replications} of 400 replications finished; the figures come from those`);
  }, 120_000);
});
