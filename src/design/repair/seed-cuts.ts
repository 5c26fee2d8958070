/**
 * Cuts known before the first solve, from the overloaded sets of today's design: the certificate of
 * each unstable component; for a bipartite component whose two sides weigh the same, the other side
 * too (N(T) = S there, so T is overloaded exactly when λ(T) ≥ λ(S)); and, per class, the tightest
 * independent set containing it (the stability layer's forced cuts) when it is overloaded.
 *
 * Each overloaded set I with deficit D = λ(I) − λ(N(I)) ≥ 0 must be relieved (relief.ts): by a
 * candidate within I, or by candidates from I to classes outside I ∪ N(I) that together raise the
 * capacity above D. A candidate to class o raises it by at most λ_o, so at least c of them are needed,
 * c the fewest of the largest such λ_o whose sum exceeds D. Derived by hand, valid for every repair:
 *     Σ_{j outside} x_j + c · Σ_{j within} x_j ≥ c
 * (c = 1 is the stability cut of ../milp.ts; with no outside set large enough, Σ_{j within} x_j ≥ 1).
 * The MILP would otherwise find these out one unstable or fractional answer at a time.
 */
import { SolverError } from '../../errors.js';
import { compileGraph } from '../../model/compile.js';
import { components } from '../../model/components.js';
import { tightestPerClass } from '../../stability/certificate.js';
import { checkStability } from '../../stability/check.js';
import type { ToggleCut } from '../search/milp.js';
import type { DesignProblem } from '../space/problem.js';
import { reliefOf, setMasks } from './relief.js';

/** Relative tie below which two rates count as equal (bipartite sides, deficits). */
const TIE = 1e-9;

interface Overloaded {
  readonly set: ArrayLike<number>;
  readonly neighbours: ArrayLike<number>;
  readonly demand: number;
  readonly capacity: number;
}

export interface Seeds {
  readonly cuts: ToggleCut[];
  /** True when some overloaded set of today's design has no candidate that could relieve it. */
  readonly hopeless: boolean;
}

/** The cut of one overloaded set (see above), or 'hopeless' when no candidate relieves it. */
function coverCut(sub: DesignProblem, o: Overloaded): ToggleCut | 'hopeless' {
  const masks = setMasks(sub.n, o.set, o.neighbours);
  const within: number[] = [];
  const outside: Array<{ j: number; capacity: number }> = [];
  sub.toggles.forEach((t, j) => {
    const kind = reliefOf(masks, t.a, t.b);
    if (kind === 'within') within.push(j);
    else if (kind === 'outside') outside.push({ j, capacity: sub.rates[masks.inI[t.a] ? t.b : t.a]! });
  });
  const deficit = o.demand - o.capacity;
  const caps = outside.map((x) => x.capacity).sort((x, y) => y - x);
  let c = 0;
  let sum = 0;
  while (c < caps.length && (c === 0 || sum < deficit * (1 - TIE))) sum += caps[c++]!;
  const enough = c > 0 && sum >= deficit * (1 - TIE);
  if (!enough) return within.length === 0 ? 'hopeless' : { toggles: within, coefficients: within.map(() => 1), rhs: 1 };
  return {
    toggles: [...outside.map((x) => x.j), ...within],
    coefficients: [...outside.map(() => 1), ...within.map(() => c)],
    rhs: c,
  };
}

/** Today's overloaded sets (see the top of this file); empty when the verdict cannot decide. */
function overloadedToday(sub: DesignProblem): Overloaded[] {
  const model = compileGraph(sub.ids, sub.rates, sub.fixed);
  let report;
  try {
    report = checkStability(model);
  } catch (e) {
    if (e instanceof SolverError) return [];
    throw e;
  }
  const out: Overloaded[] = [];
  const comps = components(model).members;
  report.components.forEach((c, i) => {
    const cert = c.certificate;
    if (!cert) return;
    out.push(cert);
    if (cert.reason === 'bipartite' && cert.neighbours.length > 0 && cert.capacity >= cert.demand * (1 - TIE)) {
      out.push({ set: cert.neighbours, neighbours: cert.set, demand: cert.capacity, capacity: cert.demand });
    }
    for (const m of tightestPerClass(model, comps[i]!).values()) if (m.slack <= 0) out.push(m);
  });
  return out;
}

export function seedCuts(sub: DesignProblem): Seeds {
  const cuts: ToggleCut[] = [];
  const seen = new Set<string>();
  for (const o of overloadedToday(sub)) {
    const key = Array.from(o.set).join();
    if (seen.has(key)) continue;
    seen.add(key);
    const cut = coverCut(sub, o);
    if (cut === 'hopeless') return { cuts: [], hopeless: true };
    cuts.push(cut);
  }
  return { cuts, hopeless: false };
}
