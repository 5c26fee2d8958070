/**
 * Independent checks of a returned design for the benchmarks, written without any code of src/:
 * - `naiveFcfm`: a plain FCFM simulator (arrays of arrival times per class, the oldest compatible
 *   waiting item taken, its own sfc32 generator), giving the mean total backlog and a 95 %
 *   interval over independent replications (normal quantile 1.96 × standard error, t would widen
 *   it by under 5 % at 10 replications).
 * - `stableByLp`: the stability condition as the edge-flow LP solved by the npm package `highs`
 *   directly (max t subject to f_e ≥ t, Σ flows at each class = its rate, a self-pair's flow
 *   counted twice), plus no bipartite component ("Stability of the stochastic matching model",
 *   J. Appl. Probab. 2016: stable iff a strictly positive edge flow exists and no component is
 *   bipartite).
 */

export interface PlainDesign {
  readonly ids: readonly string[];
  readonly rates: readonly number[];
  /** Pairs as class indices (i = j: a self-pair). */
  readonly pairs: ReadonlyArray<readonly [number, number]>;
}

/** The design of a scenario document with the changes applied (pairs by id). */
export function plainDesign(
  doc: { classes: Array<{ id: string; rate: number }>; compatibilities: Array<{ pair: [string, string] }> },
  added: ReadonlyArray<readonly [string, string]>,
  removed: ReadonlyArray<readonly [string, string]>,
): PlainDesign {
  const ids = doc.classes.map((c) => c.id);
  const at = new Map(ids.map((id, k) => [id, k] as const));
  const key = (a: string, b: string): string => (a < b ? `${a}\u0000${b}` : `${b}\u0000${a}`);
  const drop = new Set(removed.map(([a, b]) => key(a, b)));
  const pairs = [...doc.compatibilities.map((c) => c.pair).filter(([a, b]) => !drop.has(key(a, b))), ...added].map(
    ([a, b]) => [at.get(a)!, at.get(b)!] as const,
  );
  return { ids, rates: doc.classes.map((c) => c.rate), pairs };
}

/** sfc32 (a small counting generator of 32-bit words), two words per double in (0, 1). */
function generator(seed: number): () => number {
  let a = 0x9e3779b9 ^ seed;
  let b = 0x243f6a88;
  let c = 0xb7e15162 ^ (seed * 31);
  let d = 1;
  const next = (): number => {
    const t = (((a + b) | 0) + d) | 0;
    d = (d + 1) | 0;
    a = b ^ (b >>> 9);
    b = (c + (c << 3)) | 0;
    c = (c << 21) | (c >>> 11);
    c = (c + t) | 0;
    return t >>> 0;
  };
  for (let i = 0; i < 15; i++) next();
  return () => ((next() >>> 5) * 67108864 + (next() >>> 6) + 0.5) / 9007199254740992;
}

export interface NaiveEstimate {
  readonly mean: number;
  readonly ci95: [number, number];
}

/** Mean total number of waiting items under FCFM, over `replications` runs of `arrivals` each. */
export function naiveFcfm(d: PlainDesign, arrivals: number, replications: number, seed: number): NaiveEstimate {
  const n = d.ids.length;
  const nbrs: number[][] = Array.from({ length: n }, () => []);
  for (const [a, b] of d.pairs) {
    nbrs[a]!.push(b);
    if (a !== b) nbrs[b]!.push(a);
  }
  const total = d.rates.reduce((s, r) => s + r, 0);
  const cum = d.rates.map(((s) => (r: number) => (s += r / total))(0));
  const values: number[] = [];
  for (let rep = 0; rep < replications; rep++) {
    const u = generator(seed * 1000 + rep + 1);
    const queues: number[][] = Array.from({ length: n }, () => []);
    const heads = new Array<number>(n).fill(0);
    let waiting = 0;
    let t = 0;
    let area = 0;
    let measured = 0;
    const warmup = Math.floor(arrivals / 4);
    for (let a = 0; a < warmup + arrivals; a++) {
      const dt = -Math.log(u()) / total;
      if (a >= warmup) {
        area += waiting * dt;
        measured += dt;
      }
      t += dt;
      const x = u();
      let k = 0;
      while (k < n - 1 && cum[k]! < x) k++;
      let best = -1;
      let bestTime = Infinity;
      for (const j of nbrs[k]!) {
        const q = queues[j]!;
        if (heads[j]! < q.length && q[heads[j]!]! < bestTime) {
          bestTime = q[heads[j]!]!;
          best = j;
        }
      }
      if (best >= 0) {
        heads[best]!++;
        waiting--;
        if (heads[best]! > 4096 && heads[best]! * 2 > queues[best]!.length) {
          queues[best] = queues[best]!.slice(heads[best]!);
          heads[best] = 0;
        }
      } else {
        queues[k]!.push(t);
        waiting++;
      }
    }
    values.push(area / measured);
  }
  const mean = values.reduce((s, v) => s + v, 0) / values.length;
  const sd = Math.sqrt(values.reduce((s, v) => s + (v - mean) ** 2, 0) / (values.length - 1));
  const half = (1.96 * sd) / Math.sqrt(values.length);
  return { mean, ci95: [mean - half, mean + half] };
}

interface Solver {
  solve(lp: string): { Status: string; ObjectiveValue: number };
}

/** Stable by the edge-flow LP (HiGHS, called directly) and no bipartite component. */
export async function stableByLp(d: PlainDesign): Promise<boolean> {
  const n = d.ids.length;
  // bipartite components are never stable
  const color = new Array<number>(n).fill(-1);
  const nbrs: number[][] = Array.from({ length: n }, () => []);
  for (const [a, b] of d.pairs) {
    nbrs[a]!.push(b);
    if (a !== b) nbrs[b]!.push(a);
  }
  for (let s = 0; s < n; s++) {
    if (color[s] !== -1) continue;
    color[s] = 0;
    const stack = [s];
    let bipartite = true;
    while (stack.length > 0) {
      const v = stack.pop()!;
      for (const w of nbrs[v]!) {
        if (color[w] === -1) {
          color[w] = 1 - color[v]!;
          stack.push(w);
        } else if (color[w] === color[v]) bipartite = false;
      }
    }
    if (bipartite) return false;
  }
  const rows: string[] = [];
  for (let k = 0; k < n; k++) {
    const terms = d.pairs.flatMap(([a, b], e) => (a === k && b === k ? [`2 f${e}`] : a === k || b === k ? [`f${e}`] : []));
    if (terms.length === 0) return false;
    rows.push(` c${k}: ${terms.join(' + ')} = ${d.rates[k]}`);
  }
  d.pairs.forEach((_, e) => rows.push(` g${e}: f${e} - t >= 0`));
  const lp = `Maximize\n obj: t\nSubject To\n${rows.join('\n')}\nBounds\n t <= 1e9\nEnd\n`;
  const m = (await import('highs')) as unknown as { default: (() => Promise<Solver>) | { default: () => Promise<Solver> } };
  const highs = await (typeof m.default === 'function' ? m.default : m.default.default)();
  const r = highs.solve(lp);
  return r.Status === 'Optimal' && r.ObjectiveValue > 1e-9;
}
