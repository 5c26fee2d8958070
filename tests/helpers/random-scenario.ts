import { Rng } from './random.js';

/**
 * Seeded random scenario files (as JSON documents) for the command-level tests: classes in groups
 * (sites, tiers, zones), each group a clique, groups joined along a chain and by a few random links,
 * so that exact evaluation stays small (the independent sets are few) even at 40 classes.
 *
 * Rates come from positive flows on the compatibilities: λ_k = Σ of the flows on the compatibilities
 * of k (a self-pair counts its flow twice). A design whose rates are carried by a positive flow on
 * every compatibility, in a connected non-bipartite graph, is stable ("Stability of the stochastic
 * matching model", J. Appl. Probab. 2016: the stability condition is the existence of such a flow,
 * from memory); a self-pair on the first class of every group keeps every component non-bipartite.
 * So today's design is stable by construction, whatever its size. With `overload`, one class's rate is
 * raised above what its neighbours can serve (unstable today).
 */
export interface RandomScenarioOptions {
  readonly groups: number;
  readonly perGroup: number;
  /** Candidates (absent pairs with a cost), distinct. */
  readonly candidates: number;
  /** Share of today's compatibilities that are removable (with a saving). */
  readonly removableShare?: number;
  /** Add mustKeep, forbidden (with reasons) and maxCompatibilities rules. */
  readonly rules?: boolean;
  /** Give some classes a patience. */
  readonly patience?: boolean;
  /** With patience: give every other class with a patience a maxAbandonment (drawn in [0.02, 0.3)). */
  readonly abandonmentLimits?: boolean;
  /** Budget as a share of the candidates' total cost (absent: no budget). */
  readonly budgetShare?: number;
  /** Long labels (to exercise wrapping). */
  readonly labels?: boolean;
  /** Class ids: "g<group>-<k>" by default; 'hostile' puts ',', '~', '%', '-', spaces, accents and wide (East Asian) characters in them. */
  readonly ids?: 'plain' | 'hostile';
  /** Make today's design unstable: the last class's rate exceeds what its neighbours can serve. */
  readonly overload?: boolean;
  /** Demand variants (named rate changes). */
  readonly demand?: boolean;
  /** Values per match on most compatibilities and candidates (some negative), and a waitingCost. */
  readonly values?: boolean;
}

const HOSTILE = ['a,b', 'x~y', '50%', 'old town', 'ünïcode', '中文', '-dash-', 'x%2Cy', 'é~,%'];

export interface RandomScenario {
  readonly doc: Record<string, unknown>;
  readonly ids: string[];
}

export function randomScenario(seed: number, o: RandomScenarioOptions): RandomScenario {
  const rng = new Rng(seed);
  const n = o.groups * o.perGroup;
  const ids = Array.from({ length: n }, (_, k) => {
    const g = Math.floor(k / o.perGroup);
    const base = `g${g}-${k % o.perGroup}`;
    return o.ids === 'hostile' && k % 3 === 0 ? `${HOSTILE[(k / 3) % HOSTILE.length]}${k}` : base;
  });
  const key = (a: number, b: number): string => (a <= b ? `${a},${b}` : `${b},${a}`);
  const present = new Map<string, [number, number]>();
  const add = (a: number, b: number): void => void present.set(key(a, b), a <= b ? [a, b] : [b, a]);
  for (let g = 0; g < o.groups; g++) {
    const first = g * o.perGroup;
    add(first, first);
    for (let i = 0; i < o.perGroup; i++) for (let j = i + 1; j < o.perGroup; j++) add(first + i, first + j);
    if (g > 0) add(first - 1 - rng.int(0, o.perGroup - 1), first + rng.int(0, o.perGroup - 1));
  }
  for (let extra = 0; extra < o.groups; extra++) add(rng.int(0, n - 1), rng.int(0, n - 1));
  if (o.overload) present.delete(key(n - 1, n - 1)); // the overloaded class must not match its own kind
  const pairs = [...present.values()];
  const rates = new Array<number>(n).fill(0);
  for (const [a, b] of pairs) {
    const mu = rng.uniform(0.05, 0.5);
    rates[a]! += mu;
    rates[b]! += mu; // a self-pair takes two items of its class per match
  }
  if (o.overload) {
    // the last class alone against its neighbours: more than all of them together
    const k = n - 1;
    let around = 0;
    for (const [a, b] of pairs) if (a === k || b === k) around += rates[a === k ? b : a]!;
    rates[k] = around * 1.3 + 0.5;
  }
  const absent: Array<[number, number]> = [];
  for (let a = 0; a < n; a++) for (let b = a; b < n; b++) if (!present.has(key(a, b))) absent.push([a, b]);
  const cands = rng.shuffled(absent).slice(0, o.candidates);
  const removable = o.removableShare ?? 0.3;
  const compat = pairs.map(([a, b]) => {
    const r = a !== b && rng.chance(removable);
    return r ? { pair: [ids[a], ids[b]], removable: true, saving: rng.int(1, 9) } : { pair: [ids[a], ids[b]] };
  });
  const candidates = cands.map(([a, b]) => ({ pair: [ids[a], ids[b]], cost: rng.int(1, 20) }));
  const total = candidates.reduce((s, c) => s + c.cost, 0);
  const classes = ids.map((id, k) => ({
    id,
    rate: Number(rates[k]!.toFixed(4)),
    ...(o.labels ? { label: `Site ${Math.floor(k / o.perGroup) + 1}, ${['early', 'day', 'late', 'night', 'weekend', 'on call'][k % 6]} shift (${k})` } : {}),
    ...(o.patience && k % 4 === 1 ? { patience: rng.uniform(0.5, 3) } : {}),
    ...(o.patience && o.abandonmentLimits && k % 8 === 1 ? { maxAbandonment: rng.uniform(0.02, 0.3) } : {}),
  }));
  const doc: Record<string, unknown> = {
    name: `random scenario ${seed}`,
    timeUnit: 'hour',
    description: 'Invented test data (seeded).',
    costUnit: 'credits',
    classes,
    compatibilities: compat,
    candidates,
    ...(o.budgetShare === undefined ? {} : { budget: Math.round(total * o.budgetShare) }),
  };
  if (o.rules) {
    const removableCompat = compat.filter((c) => c.removable);
    if (removableCompat.length > 0) doc['mustKeep'] = [{ pair: removableCompat[0]!.pair, reason: 'a standing agreement' }];
    if (candidates.length > 1) doc['forbidden'] = [{ pair: candidates[1]!.pair, reason: 'breaks the rest rule' }, ...(candidates.length > 4 ? [candidates[4]!.pair] : [])];
    // a limit on a class touched by a candidate: exactly its degree today, so any addition there breaks it
    const c0 = cands[0];
    if (c0) {
      const k = c0[0];
      const fixed = pairs.filter(([a, b]) => a === k || b === k).length;
      (classes[k] as Record<string, unknown>)['maxCompatibilities'] = fixed;
    }
  }
  if (o.values) {
    // drawn from a generator of their own, so that the rest of the file is the same with or without values
    const vr = new Rng(seed + 7919);
    const withValue = (c: Record<string, unknown>): Record<string, unknown> =>
      Array.isArray(c) ? (vr.chance(0.8) ? { pair: c, value: Number(vr.uniform(-2, 12).toFixed(2)) } : c) : vr.chance(0.8) ? { ...c, value: Number(vr.uniform(-2, 12).toFixed(2)) } : c;
    doc['compatibilities'] = compat.map((c) => withValue(c as Record<string, unknown>));
    doc['candidates'] = candidates.map((c) => withValue(c as Record<string, unknown>));
    doc['waitingCost'] = Number(vr.uniform(0.2, 3).toFixed(2));
  }
  if (o.demand) {
    doc['demand'] = { peak: Object.fromEntries(ids.slice(0, Math.min(3, n)).map((id, k) => [id, Number((rates[k]! * 1.1).toFixed(4))])) };
  }
  return { doc, ids };
}
