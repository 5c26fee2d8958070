/**
 * Pareto local search over designs. Every design of the first `depth` Pareto layers of what has been
 * scored so far is expanded once: all its neighbours that respect the budget and maxCompatibilities
 * are scored — switch one toggle on or off (add, remove) and, for the first `swapLayers` layers,
 * switch one off and another on (swap). With wait targets, two guide fronts are expanded as well:
 * stable designs ignoring the targets, and designs missing a target ranked by how far they miss.
 * The search stops when every design of those layers has been expanded; seeded random kicks (a few
 * toggles of a front design flipped at once) then try to escape, and the search resumes whenever a
 * kick lands in the layers. Defaults (depth 2, swaps on both layers) were chosen on seeded random
 * problems of 8–14 toggles, where they returned the exhaustive front on each of about 300 problems
 * tried for the total and the weighted backlog (tests/design/recommend.test.ts checks this against brute force).
 *
 * Expanding a design scores in particular every design obtained by dropping one compatibility it
 * pays for, so its flexibility penalty (penalty.ts) is known afterwards; designs that pay for a
 * harmful compatibility are refused and leave the archive. The add/remove neighbours of an expanded
 * design are passed with it as their origin, so that the evaluator may score them by reusing its
 * single-change preparation (reuse.ts).
 *
 * Determinism: the designs of a round are listed in a fixed order (layers sorted by cost, objective,
 * changes, key; neighbours by toggle index) and scored as one batch whose results come back in that
 * order, so the search never depends on which worker finishes first.
 */
import { admissibleBeforeEvaluation, designKey, type DesignProblem } from '../space/problem.js';
import type { DesignEvaluator, DesignRecord, Origin } from '../scoring/evaluator.js';
import { comparePoints, frontOfSorted, paretoFront } from '../space/pareto.js';
import { penaltyVerdict } from '../space/penalty.js';
import { SearchStopped } from '../scoring/scorer.js';

export interface SearchOptions {
  /** Pareto layers expanded (default 2). */
  readonly depth?: number;
  /** Of those, the layers whose designs also get swap moves (default 2). */
  readonly swapLayers?: number;
  /** Random kicks tried once the layers are all expanded (default: the number of toggles). */
  readonly kicks?: number;
  /** Uniform [0, 1) generator for the kicks (seeded by the caller). */
  readonly random: () => number;
  /**
   * Most designs the evaluator may have scored (absent: no limit). A round that would pass it scores
   * the neighbours of its designs in turn (the first neighbour of each, then the second, ...) up to
   * the limit, and the search stops there (`limitReached`).
   */
  readonly maxDesigns?: number;
  /**
   * A second pass once the first has expanded its layers without reaching `maxDesigns`: the same
   * search state (expansions, penalty verdicts, the evaluator's cache) expanded again with these
   * layers, up to the same limit. A simulated search starts with the front's add/remove moves only
   * and then, where the limit leaves room, expands a second layer.
   */
  readonly refine?: { readonly depth: number; readonly swapLayers: number };
}

export interface SearchResult {
  /** The Pareto set of admissible designs found, sorted by cost. */
  readonly front: DesignRecord[];
  /** Designs refused by the flexibility penalty. */
  readonly harmful: ReadonlyMap<string, number[]>;
  /** Expansion rounds. */
  readonly rounds: number;
  /** Kicks tried. */
  readonly kicks: number;
  /** True when the search was stopped (SIGINT) before it finished: the front is what was found so far. */
  readonly stopped: boolean;
  /** True when the search stopped at `maxDesigns`. */
  readonly limitReached: boolean;
}

/**
 * The moves to a design's neighbours, in the order the search scores them: each toggle flipped
 * ([i, −1]), then, with `swaps`, each pair of toggles in different states swapped ([i, j], i < j).
 * Which of them respect the budget and maxCompatibilities is checked by the caller, after the key
 * lookup: most neighbours of a later round are already scored, and building their designs costs
 * more than their keys.
 */
export function* moves(design: Uint8Array, swaps = true): Generator<readonly [number, number]> {
  const k = design.length;
  for (let i = 0; i < k; i++) yield [i, -1];
  if (!swaps) return;
  for (let i = 0; i < k; i++) for (let j = i + 1; j < k; j++) if (design[i] !== design[j]) yield [i, j];
}

/** The key (designKey) of the design reached by a move from the design of key `key`. */
function movedKey(key: string, [i, j]: readonly [number, number]): string {
  const flip = (c: string): string => (c === '1' ? '0' : '1');
  if (j < 0) return key.slice(0, i) + flip(key[i]!) + key.slice(i + 1);
  return key.slice(0, i) + flip(key[i]!) + key.slice(i + 1, j) + flip(key[j]!) + key.slice(j + 1);
}

/** The design reached by a move. */
function moved(design: Uint8Array, [i, j]: readonly [number, number]): Uint8Array {
  const d = Uint8Array.from(design);
  d[i] = d[i] ? 0 : 1;
  if (j >= 0) d[j] = d[j] ? 0 : 1;
  return d;
}

/** Shared state of a search: what has been expanded and which designs the penalty refused. */
export class SearchState {
  /** Expansion level per design key: 1 = flips scored, 2 = flips and swaps scored. */
  readonly expanded = new Map<string, number>();
  readonly harmful = new Map<string, number[]>();

  constructor(readonly evaluator: DesignEvaluator) {}

  /**
   * With wait targets: the front of stable designs ignoring the targets (by objective) and the front
   * of stable designs missing a target (by how far: max_k W_k / target_k). Expanding them walks the
   * search towards and along the boundary of the feasible region.
   */
  guides(): DesignRecord[] {
    const ignoring: DesignRecord[] = [];
    const missing: Array<DesignRecord & { readonly record: DesignRecord }> = [];
    for (const r of this.evaluator.records()) {
      if (!r.stable || !r.withinLimits || this.harmful.has(r.key)) continue;
      ignoring.push(r);
      if (!r.meetsTargets) missing.push({ ...r, objective: r.targetRatio, record: r });
    }
    return [...paretoFront(ignoring), ...paretoFront(missing).map((m) => m.record)];
  }

  /** The pool sorted by comparePoints, kept up to date as designs are scored or refused. */
  private sorted: DesignRecord[] = [];
  /** Records of the evaluator already merged into `sorted`, and refusals already filtered out. */
  private merged = 0;
  private filtered = 0;

  /**
   * The first `depth` Pareto layers of the pool: the same as paretoLayers(pool(), depth) (the sweep
   * order is a total order, so a sorted pool gives the same layers), without sorting the whole pool
   * every round: new records are sorted among themselves and merged in.
   */
  layers(depth: number): DesignRecord[][] {
    if (this.evaluator.size > this.merged) {
      const fresh: DesignRecord[] = [];
      let i = 0;
      for (const r of this.evaluator.records()) {
        if (i++ < this.merged) continue;
        if (r.feasible && !this.harmful.has(r.key)) fresh.push(r);
      }
      this.merged = this.evaluator.size;
      fresh.sort(comparePoints);
      this.sorted = mergeSorted(this.sorted, fresh);
    }
    if (this.harmful.size > this.filtered) {
      this.sorted = this.sorted.filter((r) => !this.harmful.has(r.key));
      this.filtered = this.harmful.size;
    }
    const out: DesignRecord[][] = [];
    let rest = this.sorted;
    for (let d = 0; d < depth && rest.length > 0; d++) {
      const front = frontOfSorted(rest);
      out.push(front);
      const taken = new Set(front);
      rest = rest.filter((r) => !taken.has(r));
    }
    return out;
  }

  /** Feasible scored designs not refused by the penalty. */
  pool(): DesignRecord[] {
    const out: DesignRecord[] = [];
    for (const r of this.evaluator.records()) if (r.feasible && !this.harmful.has(r.key)) out.push(r);
    return out;
  }

  /** Records the penalty verdict of an expanded (or fully known) design; false when not yet decidable. */
  judge(r: DesignRecord): boolean {
    const v = penaltyVerdict(this.evaluator.problem, r.design, r.objective, (key) => this.evaluator.get(key));
    if (!v.known) return false;
    if (v.harmful.length > 0) this.harmful.set(r.key, v.harmful);
    return true;
  }
}

/** Merges two arrays sorted by comparePoints. */
function mergeSorted(a: readonly DesignRecord[], b: readonly DesignRecord[]): DesignRecord[] {
  if (b.length === 0) return a as DesignRecord[];
  const out: DesignRecord[] = new Array<DesignRecord>(a.length + b.length);
  let i = 0;
  let j = 0;
  let o = 0;
  while (i < a.length && j < b.length) out[o++] = comparePoints(a[i]!, b[j]!) <= 0 ? a[i++]! : b[j++]!;
  while (i < a.length) out[o++] = a[i++]!;
  while (j < b.length) out[o++] = b[j++]!;
  return out;
}

/** Random kicks from front designs: 2 or 3 toggles flipped, kept when within budget and limits and new. */
function kickDesigns(problem: DesignProblem, front: readonly DesignRecord[], count: number, random: () => number, seen: (key: string) => boolean): Uint8Array[] {
  const k = problem.toggles.length;
  const out: Uint8Array[] = [];
  const keys = new Set<string>();
  if (front.length === 0 || k < 2) return out;
  for (let attempt = 0; attempt < count * 20 && out.length < count; attempt++) {
    const from = front[Math.floor(random() * front.length)]!;
    const d = Uint8Array.from(from.design);
    const flips = 2 + Math.floor(random() * 2);
    for (let f = 0; f < flips; f++) {
      const j = Math.floor(random() * k);
      d[j] = d[j] ? 0 : 1;
    }
    const key = designKey(d);
    if (seen(key) || keys.has(key) || !admissibleBeforeEvaluation(problem, d)) continue;
    keys.add(key);
    out.push(d);
  }
  return out;
}

/** Runs the search from the seeds (designs outside the budget or limits are ignored). */
export async function paretoLocalSearch(evaluator: DesignEvaluator, seeds: readonly Uint8Array[], options: SearchOptions): Promise<SearchResult> {
  const problem = evaluator.problem;
  const depth = options.depth ?? 2;
  const swapLayers = options.swapLayers ?? 2;
  const targets = problem.waitTarget.some((w) => Number.isFinite(w));
  let kicksLeft = options.kicks ?? problem.toggles.length;
  let kicks = 0;
  const state = new SearchState(evaluator);
  let rounds = 0;
  const limit = { reached: false };
  try {
    await evaluator.evaluate(seeds.filter((d) => admissibleBeforeEvaluation(problem, d)));
    rounds = await searchRounds(evaluator, state, options, depth, swapLayers, targets, kicksLeft, (k) => (kicks += k), limit);
    if (options.refine && !limit.reached) {
      rounds += await searchRounds(evaluator, state, options, options.refine.depth, options.refine.swapLayers, targets, 0, (k) => (kicks += k), limit);
    }
  } catch (e) {
    if (!(e instanceof SearchStopped)) throw e;
    return { front: paretoFront(state.pool()), harmful: state.harmful, rounds, kicks, stopped: true, limitReached: limit.reached };
  }
  return { front: paretoFront(state.pool()), harmful: state.harmful, rounds, kicks, stopped: false, limitReached: limit.reached };
}

/**
 * The batch cut to `room` designs, taking the neighbours of the round's designs in turn (the first of
 * each, then the second, ...), so that a cut round still reaches along the whole front.
 */
function interleaved<T>(groups: readonly T[][], room: number): T[] {
  const out: T[] = [];
  for (let i = 0; out.length < room; i++) {
    let any = false;
    for (const g of groups) {
      if (i < g.length) {
        any = true;
        out.push(g[i]!);
        if (out.length >= room) break;
      }
    }
    if (!any) break;
  }
  return out;
}

/** The expansion rounds of the search (see paretoLocalSearch); returns how many ran. */
async function searchRounds(
  evaluator: DesignEvaluator,
  state: SearchState,
  options: SearchOptions,
  depth: number,
  swapLayers: number,
  targets: boolean,
  kicksLeft: number,
  addKicks: (k: number) => void,
  limit: { reached: boolean },
): Promise<number> {
  const problem = evaluator.problem;
  let rounds = 0;
  for (;;) {
    const layers = state.layers(depth);
    // the front gets flips and swaps; deeper layers get flips only
    const levels = new Map<string, { r: DesignRecord; level: number }>();
    const want = (r: DesignRecord, level: number): void => {
      if ((state.expanded.get(r.key) ?? 0) >= level) return;
      const prev = levels.get(r.key);
      if (!prev || prev.level < level) levels.set(r.key, { r, level });
    };
    layers.forEach((layer, i) => layer.forEach((r) => want(r, i < swapLayers ? 2 : 1)));
    if (targets) for (const r of state.guides()) want(r, 2);
    const frontier = [...levels.values()];
    frontier.sort((x, y) => comparePoints(x.r, y.r));
    const room = options.maxDesigns === undefined ? Infinity : options.maxDesigns - evaluator.scored;
    if (room <= 0) {
      limit.reached = true;
      break;
    }
    if (frontier.length === 0) {
      if (kicksLeft <= 0) break;
      const batch = kickDesigns(problem, layers[0] ?? [], Math.min(kicksLeft, 8, room), options.random, (key) => evaluator.has(key));
      kicksLeft -= Math.max(batch.length, 1);
      addKicks(batch.length);
      if (batch.length > 0) await evaluator.evaluate(batch);
      continue;
    }
    rounds++;
    const groups: Array<Array<{ d: Uint8Array; origin: Origin | undefined }>> = [];
    const queued = new Set<string>();
    let size = 0;
    for (const { r, level } of frontier) {
      const group: Array<{ d: Uint8Array; origin: Origin | undefined }> = [];
      for (const move of moves(r.design, level === 2)) {
        const key = movedKey(r.key, move);
        if (evaluator.has(key) || queued.has(key)) continue;
        const d = moved(r.design, move);
        if (!admissibleBeforeEvaluation(problem, d)) continue;
        queued.add(key);
        group.push({ d, origin: move[1] < 0 ? { from: r, toggle: move[0] } : undefined });
      }
      groups.push(group);
      size += group.length;
    }
    const cut = size > room;
    const picked = cut ? interleaved(groups, room) : groups.flat();
    await evaluator.evaluate(
      picked.map((x) => x.d),
      picked.map((x) => x.origin),
    );
    if (cut) {
      // the round's designs are not fully expanded: their penalty may still be unknown
      for (const { r } of frontier) state.judge(r);
      limit.reached = true;
      break;
    }
    for (const { r, level } of frontier) {
      state.expanded.set(r.key, level);
      state.judge(r);
    }
  }
  return rounds;
}
