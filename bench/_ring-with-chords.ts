// Shared by bench/recommend.ts and bench/_incremental-crossover.ts (files starting with "_" are
// helpers, not run by bench/run.ts).
import type { ScoreSpec } from '../src/design/scoring/score.js';
import { seededRandom } from '../src/random.js';

/**
 * A ring of n classes with a self-pair at 0, `extra` fixed chords and k paid chords (all on), rates
 * from positive flows on every pair (so the design is stable).
 */
export function ringWithChords(n: number, extra: number, k: number, seed: number, perClass: boolean): { spec: ScoreSpec; design: Uint8Array } {
  const random = seededRandom(seed);
  const fixed: Array<[number, number]> = [[0, 0]];
  const used = new Set<number>([0]);
  const id = (a: number, b: number): number => Math.min(a, b) * n + Math.max(a, b);
  for (let i = 0; i < n; i++) {
    fixed.push([Math.min(i, (i + 1) % n), Math.max(i, (i + 1) % n)]);
    used.add(id(i, (i + 1) % n));
  }
  const chord = (): [number, number] => {
    for (;;) {
      const a = Math.floor(random() * n);
      const b = Math.floor(random() * n);
      if (a === b || used.has(id(a, b))) continue;
      used.add(id(a, b));
      return [Math.min(a, b), Math.max(a, b)];
    }
  };
  for (let c = 0; c < extra; c++) fixed.push(chord());
  const toggles: Array<[number, number]> = [];
  while (toggles.length < k) toggles.push(chord());
  const rates = new Array<number>(n).fill(0);
  for (const [a, b] of [...fixed, ...toggles]) {
    const mu = 0.3 + random();
    rates[a]! += mu;
    rates[b]! += mu;
  }
  return { spec: { ids: Array.from({ length: n }, (_, i) => `r${i}`), rates, fixed, toggles, perClass }, design: new Uint8Array(k).fill(1) };
}
