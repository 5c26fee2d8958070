/**
 * Edge lists of standard design families, as class-index pairs. Randomness is a parameter
 * (`random()` uniform in [0, 1)), so callers pass a seeded generator.
 */

/** The cycle 0–1–…–(n−1)–0 (odd n gives the smallest non-bipartite connected designs). */
export function cyclePairs(n: number): Array<[number, number]> {
  const out: Array<[number, number]> = [];
  for (let i = 0; i < n; i++) out.push([Math.min(i, (i + 1) % n), Math.max(i, (i + 1) % n)]);
  return n === 2 ? [[0, 1]] : n === 1 ? [] : out;
}

/** Every pair of distinct classes; with `selfLoops`, every class also matches its own kind. */
export function completePairs(n: number, selfLoops = false): Array<[number, number]> {
  const out: Array<[number, number]> = [];
  for (let i = 0; i < n; i++) {
    if (selfLoops) out.push([i, i]);
    for (let j = i + 1; j < n; j++) out.push([i, j]);
  }
  return out;
}

/**
 * A uniformly shuffled d-regular simple graph on n classes (configuration model, retried until it
 * has no self-loop or repeated pair). n·d must be even.
 */
export function randomRegularPairs(n: number, d: number, random: () => number, maxTries = 10_000): Array<[number, number]> {
  if ((n * d) % 2 !== 0 || d >= n) throw new RangeError(`no ${d}-regular simple graph on ${n} classes`);
  for (let attempt = 0; attempt < maxTries; attempt++) {
    const stubs: number[] = [];
    for (let i = 0; i < n; i++) for (let j = 0; j < d; j++) stubs.push(i);
    for (let i = stubs.length - 1; i > 0; i--) {
      const j = Math.floor(random() * (i + 1));
      const t = stubs[i]!;
      stubs[i] = stubs[j]!;
      stubs[j] = t;
    }
    const seen = new Set<number>();
    const out: Array<[number, number]> = [];
    let ok = true;
    for (let i = 0; i < stubs.length; i += 2) {
      const a = Math.min(stubs[i]!, stubs[i + 1]!);
      const b = Math.max(stubs[i]!, stubs[i + 1]!);
      if (a === b || seen.has(a * n + b)) {
        ok = false;
        break;
      }
      seen.add(a * n + b);
      out.push([a, b]);
    }
    if (ok) return out;
  }
  throw new Error(`could not draw a simple ${d}-regular graph on ${n} classes`);
}

/** Each unordered pair (and, with probability pLoop, each self-pair) independently with probability p. */
export function randomPairs(n: number, p: number, random: () => number, pLoop = 0): Array<[number, number]> {
  const out: Array<[number, number]> = [];
  for (let i = 0; i < n; i++) {
    if (pLoop > 0 && random() < pLoop) out.push([i, i]);
    for (let j = i + 1; j < n; j++) if (random() < p) out.push([i, j]);
  }
  return out;
}
