/**
 * `sensitivity`: the exact effect of every single change of a design (today's, or the one given by
 * --design), each marked with whether the scenario's rules allow it and, if not, which rule forbids
 * it. Allowed changes come first; what a rule costs (the backlog a forbidden change would save) is
 * listed apart. An unstable design gets its ways out instead of a dead end.
 */
import { describeCertificate, EdgewiseError, type InstabilityCertificate } from '../errors.js';
import { compileGraph, edgePairs, findEdge } from '../model/compile.js';
import { pairKey } from '../model/scenario.js';
import { evaluateExact } from '../exact/evaluate.js';
import { checkStability } from '../stability/check.js';
import { certificateWithIds } from '../stability/certificate.js';
import { explainEntry } from './explain.js';
import { sensitivity, staysBottleneck, type ChangeRule, type ChangeSpec, type SensitivityEntry } from '../design/sensitivity/sensitivity.js';
import { supportedDigits } from '../output/format.js';
import { pairRules, recordBase, type ScenarioContext } from './context.js';
import { instabilityOf } from './instability.js';
import { byClass, certificateRecord, finite, idsOf, pairIds, type CertificateRecord, type InstabilityRecord, type RepairRecord, type PairIds, type RecordBase, type Reference, type SetRecord } from './records.js';
import { exactWarnings, limitsNotComparedWarning, withNote } from './warnings.js';
import { checkChangeCount } from './limits.js';
import { bottlenecksOf, predicted as predictedAt, relationTo } from '../design/sensitivity/bottleneck-relation.js';
import { compareChanges, perUnit } from '../design/sensitivity/change-ranking.js';
import { backlogInterval, byScoring, pairedVs, pairsOf, patienceOf, scoringPlan, simulateAgainstFirst, simulatedWaits, simulationRecord, simulationWarning, type ScoringInput, type ScoringRecord } from './scoring.js';
import { num } from '../output/format.js';

export type ChangeVerdict = 'helps' | 'harmful' | 'no change' | 'not distinguishable' | 'worth dropping' | 'raises backlog' | 'breaks stability' | 'makes it stable' | 'still unstable' | 'not evaluated';

export interface ChangeRecord {
  readonly pair: PairIds;
  readonly change: 'add' | 'remove';
  /** The scenario's rules allow this change. */
  readonly allowed: boolean;
  /** When not allowed: the rule that forbids it. */
  readonly rule?: ChangeRule;
  /** The rule's reason, when the file gives one. */
  readonly ruleReason?: string;
  /** Addition: a candidate of the scenario; removal: a compatibility the designer may drop. */
  readonly listed: boolean;
  /** Cost of adding, or saving of removing (null: the scenario gives no price). */
  readonly price: number | null;
  readonly stable: boolean | null;
  /** Mean total backlog after the change (null when unstable or not evaluated). */
  readonly backlog: number | null;
  /** backlog − the reference design's backlog (null when either is unstable). */
  readonly delta: number | null;
  /** delta per unit of price (null when unpriced). */
  readonly deltaPerPrice: number | null;
  readonly verdict: ChangeVerdict;
  /** The near-saturation condition predicts harm (addition) or benefit (removal). */
  readonly predicted: boolean;
  readonly relation: 'joins-neighbours' | 'touches' | 'elsewhere' | null;
  readonly explanation: string;
  /** How the figures of this change were made. */
  readonly method: 'exact' | 'simulation';
  /**
   * Simulated: 95 % interval of `delta`, the paired difference against the reference design under
   * common random numbers (the same arrival stream); `significant` when it excludes 0. A change
   * that is not significant is "not distinguishable", never helpful or harmful.
   */
  readonly deltaCi95?: [number, number] | null;
  readonly significant?: boolean;
  /** Simulated: replications behind the figures (more where the difference was not yet settled). */
  readonly replications?: number;
  /** Simulated: 95 % interval of the changed design's backlog. */
  readonly backlogCi95?: [number, number] | null;
  /** Change in each class's mean wait (null when not evaluated or unstable). */
  readonly waitDelta: Record<string, number | null> | null;
  readonly certificate?: CertificateRecord;
  readonly skipped?: string;
}

export interface RuleCostRecord {
  readonly pair: PairIds;
  readonly change: 'add' | 'remove';
  readonly rule: ChangeRule;
  readonly ruleReason?: string;
  /** Backlog the change would save if the rule allowed it (> 0). */
  readonly backlogSaved: number;
}

export interface SensitivityRecord extends RecordBase, ScoringRecord {
  readonly command: 'sensitivity';
  /** The design every change is measured against. */
  readonly reference: Reference;
  readonly base: {
    readonly stable: boolean;
    readonly backlog: number | null;
    /** Simulated: 95 % interval of the base backlog. */
    readonly backlogCi95?: [number, number] | null;
    readonly wait: Record<string, number | null> | null;
    readonly independentSets: number | null;
    readonly bottlenecks: SetRecord[];
  };
  readonly additions: ChangeRecord[];
  readonly removals: ChangeRecord[];
  /** What the rules cost: forbidden changes that would lower the backlog, largest saving first. */
  readonly ruleCosts: RuleCostRecord[];
  readonly instability: InstabilityRecord | null;
  /** When unstable: the cheapest sets of allowed candidates that make it stable, cheapest first (as in `instability`). */
  readonly repairs: RepairRecord[] | null;
}

export interface SensitivityInput extends ScoringInput {
  /** Try every absent pair (self-pairs included), not only the candidates. */
  readonly allPairs?: boolean;
}

/** The changes of the reference design, with the rules that allow or forbid each. */
export function changesOf(ctx: ScenarioContext, allPairs: boolean): ChangeSpec[] {
  const model = ctx.model;
  const rules = pairRules(ctx.scenario);
  const index = model.index;
  const key = (a: number, b: number): string => pairKey(model.ids[a]!, model.ids[b]!);
  const ordered = (x: string, y: string): [number, number] => {
    const a = index.get(x)!;
    const b = index.get(y)!;
    return a <= b ? [a, b] : [b, a];
  };
  const maxDeg = ctx.fields.maxCompatibilities;
  const deg = new Int32Array(model.n);
  for (let e = 0; e < model.m; e++) {
    deg[model.edgeA[e]!]++;
    if (model.edgeB[e] !== model.edgeA[e]) deg[model.edgeB[e]!]++;
  }
  const overLimit = (a: number, b: number): boolean => deg[a]! + 1 > maxDeg[a]! || (a !== b && deg[b]! + 1 > maxDeg[b]!);
  const ruleOf = (k: string, kind: 'add' | 'remove'): { rule?: ChangeRule; reason?: string } => {
    const r = rules.get(k);
    if (kind === 'add' && r?.kind === 'forbidden') return { rule: 'forbidden', ...(r.reason ? { reason: r.reason } : {}) };
    if (kind === 'remove' && r?.kind === 'must-keep') return { rule: 'must-keep', ...(r.reason ? { reason: r.reason } : {}) };
    return {};
  };
  const out: ChangeSpec[] = [];
  const seen = new Set<string>();
  const add = (a: number, b: number, price: number | undefined, listed: boolean): void => {
    const k = key(a, b);
    if (seen.has(k)) return;
    seen.add(k);
    const r = ruleOf(k, 'add');
    const rule: ChangeRule | undefined = r.rule ?? (overLimit(a, b) ? 'limit' : undefined);
    out.push({ kind: 'add', a, b, price, listed, allowed: rule === undefined, ...(rule ? { rule } : {}), ...(r.reason ? { reason: r.reason } : {}) });
  };
  for (const c of ctx.scenario.candidates) {
    const [a, b] = ordered(c.pair[0], c.pair[1]);
    if (findEdge(model, a, b) < 0) add(a, b, c.cost, true);
  }
  for (const c of ctx.scenario.compatibilities) {
    const [a, b] = ordered(c.pair[0], c.pair[1]);
    if (findEdge(model, a, b) < 0) add(a, b, c.saving, true); // dropped by the design: keeping it forgoes its saving
  }
  if (allPairs) {
    for (let a = 0; a < model.n; a++) for (let b = a; b < model.n; b++) if (findEdge(model, a, b) < 0) add(a, b, undefined, false);
  }
  const compat = new Map(ctx.scenario.compatibilities.map((c) => [pairKey(c.pair[0], c.pair[1]), c] as const));
  const cand = new Map(ctx.scenario.candidates.map((c) => [pairKey(c.pair[0], c.pair[1]), c] as const));
  for (let e = 0; e < model.m; e++) {
    const a = model.edgeA[e]!;
    const b = model.edgeB[e]!;
    const k = key(a, b);
    const c = compat.get(k);
    if (c) {
      const r = ruleOf(k, 'remove');
      const rule: ChangeRule | undefined = !c.removable ? 'fixed' : r.rule;
      out.push({ kind: 'remove', a, b, price: c.saving, listed: c.removable, allowed: rule === undefined, ...(rule ? { rule } : {}), ...(r.reason && rule === 'must-keep' ? { reason: r.reason } : {}) });
    } else {
      const f = cand.get(k); // a funded candidate: dropping it saves its cost
      out.push({ kind: 'remove', a, b, price: f?.cost, listed: true, allowed: true });
    }
  }
  return out;
}

function verdictOf(e: SensitivityEntry): ChangeVerdict {
  if (e.skipped) return 'not evaluated';
  if (!e.stable) return 'breaks stability';
  if (e.kind === 'add') return e.harmful ? 'harmful' : e.delta < 0 ? 'helps' : 'no change';
  return e.beneficial ? 'worth dropping' : e.delta > 0 ? 'raises backlog' : 'no change';
}

function ruleFields(s: ChangeSpec): { rule?: ChangeRule; ruleReason?: string } {
  return { ...(s.rule ? { rule: s.rule } : {}), ...(s.reason ? { ruleReason: s.reason } : {}) };
}

export async function sensitivityUseCase(ctx: ScenarioContext, input: SensitivityInput = {}): Promise<SensitivityRecord> {
  const model = ctx.model;
  if (input.allPairs) {
    const n = model.n;
    checkChangeCount((n * (n + 1)) / 2, n, true); // before listing them
  }
  const specs = changesOf(ctx, input.allPairs === true);
  checkChangeCount(specs.length, model.n, input.allPairs === true);
  const base = recordBase(ctx, 'sensitivity', withNote(exactWarnings(ctx), limitsNotComparedWarning(ctx, 'exact', 'These exact figures')));
  const stability = checkStability(model);
  if (!stability.stable) return unstableRecord(ctx, base, specs, certificateWithIds(model, stability.certificate!));
  return byScoring(
    ctx,
    input,
    () => exactSensitivity(ctx, input, specs, base),
    (reason) => simulatedSensitivity(ctx, input, specs, base, stability, reason),
  );
}

function exactSensitivity(ctx: ScenarioContext, input: SensitivityInput, specs: ChangeSpec[], base: ReturnType<typeof recordBase<'sensitivity'>>): SensitivityRecord {
  const model = ctx.model;
  const unit = ctx.scenario.timeUnit;
  const result = sensitivity(model, specs, { ...(input.maxSets === undefined ? {} : { maxSets: input.maxSets }), timeUnit: unit });
  const bottlenecks = result.base.bottlenecks;
  const toRecord = (e: SensitivityEntry): ChangeRecord => ({
    pair: pairIds(model, e.a, e.b),
    change: e.kind,
    allowed: e.allowed,
    ...ruleFields(e),
    listed: e.listed,
    price: e.price ?? null,
    stable: e.stable,
    backlog: e.stable ? finite(e.backlog) : null,
    delta: e.stable ? finite(e.delta) : null,
    deltaPerPrice: e.perUnit === undefined ? null : finite(e.perUnit),
    verdict: verdictOf(e),
    predicted: e.predicted,
    relation: e.relation,
    explanation: explainEntry(model, e, bottlenecks, unit),
    method: 'exact',
    waitDelta: e.stable ? byClass(model.ids, e.waitDelta) : null,
    ...(e.certificate ? { certificate: certificateRecord(e.certificate) } : {}),
    ...(e.skipped ? { skipped: e.skipped } : {}),
  });
  const additions = result.additions.map(toRecord);
  const removals = result.removals.map(toRecord);
  const ruleCosts: RuleCostRecord[] = [...additions, ...removals]
    .filter((c) => !c.allowed && c.rule && c.delta !== null && c.delta < 0)
    .map((c) => ({ pair: c.pair, change: c.change, rule: c.rule!, ...(c.ruleReason ? { ruleReason: c.ruleReason } : {}), backlogSaved: -c.delta! }))
    .sort((x, y) => y.backlogSaved - x.backlogSaved);
  const b = bottlenecks[0];
  return {
    ...base,
    method: 'exact',
    precision: supportedDigits(b ? b.slack / b.capacity : null),
    reference: ctx.reference,
    base: {
      stable: true,
      backlog: result.base.backlog,
      wait: byClass(model.ids, result.base.wait),
      independentSets: result.base.independentSets,
      bottlenecks: bottlenecks.map((x) => ({ set: idsOf(model, x.set), neighbours: idsOf(model, x.neighbours), demand: x.demand, capacity: x.capacity, spareCapacity: x.slack })),
    },
    additions,
    removals,
    ruleCosts,
    instability: null,
    repairs: null,
  };
}

/**
 * An unstable reference design: every addition is checked (does it make the design stable, and
 * with what backlog?), every removal keeps it unstable; and the ways out are listed.
 */
async function unstableRecord(ctx: ScenarioContext, base: ReturnType<typeof recordBase<'sensitivity'>>, specs: readonly ChangeSpec[], cert: InstabilityCertificate): Promise<SensitivityRecord> {
  const model = ctx.model;
  const unit = ctx.scenario.timeUnit;
  const pairs = edgePairs(model);
  const record = (s: ChangeSpec): ChangeRecord => {
    const common = { pair: pairIds(model, s.a, s.b), change: s.kind, allowed: s.allowed, ...ruleFields(s), listed: s.listed, price: s.price ?? null, delta: null, deltaPerPrice: null, predicted: false, relation: null, waitDelta: null, method: 'exact' as const };
    if (s.kind === 'remove') return { ...common, stable: false, backlog: null, verdict: 'still unstable', explanation: 'the design is unstable with it, and removing a compatibility never helps stability' };
    const changed = compileGraph(model.ids, model.rates, [...pairs, [s.a, s.b]]);
    let st;
    try {
      st = checkStability(changed);
    } catch (e) {
      if (e instanceof EdgewiseError) return { ...common, stable: null, backlog: null, verdict: 'not evaluated', explanation: e.message, skipped: e.message };
      throw e;
    }
    if (!st.stable) {
      const c = certificateWithIds(changed, st.certificate!);
      return { ...common, stable: false, backlog: null, verdict: 'still unstable', explanation: describeCertificate(c, unit), certificate: certificateRecord(c) };
    }
    try {
      const r = evaluateExact(changed, { timeUnit: unit });
      return { ...common, stable: true, backlog: r.backlogTotal, verdict: 'makes it stable', explanation: 'on its own, this addition makes the design stable' };
    } catch (e) {
      if (e instanceof EdgewiseError) return { ...common, stable: true, backlog: null, verdict: 'makes it stable', explanation: `makes the design stable; its backlog was not evaluated: ${e.message}`, skipped: e.message };
      throw e;
    }
  };
  const order = (x: ChangeRecord, y: ChangeRecord): number =>
    (x.allowed === y.allowed ? 0 : x.allowed ? -1 : 1) || (x.stable === y.stable ? 0 : x.stable ? -1 : 1) || (x.price ?? Infinity) - (y.price ?? Infinity);
  return {
    ...base,
    method: 'exact',
    reference: ctx.reference,
    base: { stable: false, backlog: null, wait: null, independentSets: null, bottlenecks: [] },
    additions: specs.filter((s) => s.kind === 'add').map(record).sort(order),
    removals: specs.filter((s) => s.kind === 'remove').map(record).sort(order),
    ruleCosts: [],
    ...(await (async () => {
      const instability = await instabilityOf(ctx, cert);
      return { instability, repairs: instability.repairs };
    })()),
  };
}

const interval = (c: readonly [number, number] | null | undefined): [number, number] | null => (c ? [c[0], c[1]] : null);

/**
 * Every single change scored by seeded simulation against the reference design, all with the same
 * plan (common random numbers: the same arrival stream for every design), and its effect taken as
 * the paired difference of the replications. A difference whose 95 % interval holds 0 is "not
 * distinguishable": this simulation cannot tell whether the change helps or hurts.
 */
async function simulatedSensitivity(
  ctx: ScenarioContext,
  input: SensitivityInput,
  specs: readonly ChangeSpec[],
  base: ReturnType<typeof recordBase<'sensitivity'>>,
  stability: ReturnType<typeof checkStability>,
  reason: string,
): Promise<SensitivityRecord> {
  const model = ctx.model;
  const unit = ctx.scenario.timeUnit;
  const basePairs = pairsOf(model);
  const designs = specs.map((s) =>
    s.kind === 'add' ? [...basePairs, [s.a, s.b] as const] : basePairs.filter(([x, y]) => !(x === s.a && y === s.b)),
  );
  const { scores, allocation } = await simulateAgainstFirst(model.ids, model.rates, [basePairs, ...designs], scoringPlan(ctx, input), input, patienceOf(ctx));
  const scoring = simulationRecord(ctx, input, reason, allocation);
  const baseScore = scores[0]!;
  const bottlenecks = bottlenecksOf(model, stability);
  if (!baseScore.stable) {
    // the stability LP says stable, but the queues outgrew the simulation's cap: nothing to measure against
    throw new EdgewiseError(`the reference design's queues outgrew the simulation's cap of ${scoringPlan(ctx, input).maxWaiting.toLocaleString('en-US')} waiting items: it is too close to the stability limit to simulate`);
  }
  const baseWaits = simulatedWaits(baseScore, model.rates)!;
  const records = specs.map((s, i): ChangeRecord & { sortDelta: number } => {
    const sc = scores[i + 1]!;
    const relation = relationTo(bottlenecks, s.a, s.b);
    const d = pairedVs(sc, baseScore);
    const stable = sc.stable;
    const delta = stable ? d.mean : Infinity;
    const significant = stable && d.significant;
    const verdict: ChangeVerdict = !stable
      ? 'breaks stability'
      : !significant
        ? 'not distinguishable'
        : s.kind === 'add'
          ? delta < 0
            ? 'helps'
            : 'harmful'
          : delta < 0
            ? 'worth dropping'
            : 'raises backlog';
    const waits = simulatedWaits(sc, model.rates);
    const ci = stable ? interval(d.ci95) : null;
    const lead = !stable
      ? 'simulated: breaks stability'
      : `simulated: ${verdict}, backlog ${delta >= 0 ? '+' : ''}${num(delta)}${ci ? ` (95 % interval ${num(ci[0])} to ${num(ci[1])})` : ''}`;
    // the entry explainEntry reads (the verdict words are the simulated lead)
    const entry: SensitivityEntry = {
      ...s,
      stable,
      backlog: stable ? sc.backlogTotal : Infinity,
      delta,
      waitDelta: new Float64Array(model.n),
      perUnit: undefined,
      harmful: verdict === 'harmful',
      beneficial: verdict === 'worth dropping',
      relation,
      predicted: predictedAt(relation) && (s.kind === 'add' || staysBottleneck(model, s, bottlenecks[0]?.slack ?? Infinity)),
    };
    // rank on what the simulation can tell: an indistinguishable change counts as no change
    const sortDelta = !stable ? Infinity : significant ? delta : 0;
    const pu = perUnit(sortDelta, s.price);
    return {
      pair: pairIds(model, s.a, s.b),
      change: s.kind,
      allowed: s.allowed,
      ...ruleFields(s),
      listed: s.listed,
      price: s.price ?? null,
      stable,
      backlog: stable ? finite(sc.backlogTotal) : null,
      delta: stable ? finite(delta) : null,
      deltaPerPrice: pu === undefined || !significant ? null : finite(pu),
      verdict,
      predicted: entry.predicted,
      relation,
      explanation: explainEntry(model, entry, bottlenecks, unit, lead),
      method: 'simulation',
      deltaCi95: ci,
      significant,
      replications: sc.perReplication?.length ?? 0,
      backlogCi95: stable ? backlogInterval(sc) : null,
      waitDelta: waits ? byClass(model.ids, Float64Array.from(waits, (w, k) => w - baseWaits[k]!)) : null,
      sortDelta,
    };
  });
  const order = (x: (typeof records)[number], y: (typeof records)[number]): number =>
    (x.allowed === y.allowed ? 0 : x.allowed ? -1 : 1) ||
    compareChanges({ a: model.index.get(x.pair[0])!, b: model.index.get(x.pair[1])!, price: x.price ?? undefined, delta: x.sortDelta }, { a: model.index.get(y.pair[0])!, b: model.index.get(y.pair[1])!, price: y.price ?? undefined, delta: y.sortDelta });
  const strip = ({ sortDelta: _, ...c }: (typeof records)[number]): ChangeRecord => c;
  const additions = records.filter((c) => c.change === 'add').sort(order).map(strip);
  const removals = records.filter((c) => c.change === 'remove').sort(order).map(strip);
  // a rule costs backlog only where the simulation shows a significant saving
  const ruleCosts: RuleCostRecord[] = [...additions, ...removals]
    .filter((c) => !c.allowed && c.rule && c.significant === true && c.delta !== null && c.delta < 0)
    .map((c) => ({ pair: c.pair, change: c.change, rule: c.rule!, ...(c.ruleReason ? { ruleReason: c.ruleReason } : {}), backlogSaved: -c.delta! }))
    .sort((x, y) => y.backlogSaved - x.backlogSaved);
  const warnings = withNote([simulationWarning(scoring)!, ...base.warnings.filter((w) => !/ignore patience|abandonment limits/.test(w))], limitsNotComparedWarning(ctx, 'simulation', 'These simulated figures'));
  return {
    ...base,
    warnings,
    ...scoring,
    reference: ctx.reference,
    base: {
      stable: true,
      backlog: finite(baseScore.backlogTotal),
      backlogCi95: backlogInterval(baseScore),
      wait: byClass(model.ids, baseWaits),
      independentSets: null,
      bottlenecks: bottlenecks.map((x) => ({ set: idsOf(model, x.set), neighbours: idsOf(model, x.neighbours), demand: x.demand, capacity: x.capacity, spareCapacity: x.slack })),
    },
    additions,
    removals,
    ruleCosts,
    instability: null,
    repairs: null,
  };
}
