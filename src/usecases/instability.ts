/**
 * The instability record of an unstable design: its certificate in words and the cheapest sets of
 * allowed candidates whose addition makes it stable (src/design/repair/), or, when none exists,
 * the group still overloaded with every allowed candidate and the kind of pair that would relieve it.
 */
import { describeCertificate, type InstabilityCertificate } from '../errors.js';
import { forbiddenCandidates, repairs, type RepairResult } from '../design/repair/index.js';
import { degrees, designPairs, designPairValues, type DesignProblem } from '../design/space/problem.js';
import { listWords, num, setText } from '../output/format.js';
import type { ScenarioContext } from './context.js';
import { certificateRecord, pairIds, type InstabilityRecord, type NoRepairRecord, type PairIds } from './records.js';

/**
 * The design problem whose "today" is the context's reference design: its pairs are fixed, the
 * candidates it leaves out are the toggles (a repair only adds).
 */
function referenceProblem(ctx: ScenarioContext): DesignProblem {
  const p = ctx.problem;
  if (ctx.reference.kind === 'today') return p;
  const fixed = designPairs(p, ctx.design);
  const toggles = p.toggles.filter((t, j) => t.kind === 'candidate' && !ctx.design[j]);
  const base: DesignProblem = { ...p, fixed, fixedValue: designPairValues(p, ctx.design), toggles, forcedOut: [], costOffset: 0, today: new Uint8Array(toggles.length) };
  return { ...base, fixedDegree: degrees({ ...base, toggles: [] }, []) };
}

function noRepairOf(problem: DesignProblem, r: RepairResult, unit: string): NoRepairRecord | undefined {
  const ids = (set: ArrayLike<number>): string[] => Array.from(set, (k) => problem.ids[k]!);
  if (r.status === 'overloaded') {
    const o = r.overload;
    const partners = o.partners.filter((x) => x.rate > 0).slice(0, 3).map((x) => `${problem.ids[x.class]!} (${num(x.rate)}/${unit})`);
    const within = o.set.length === 1 ? `${problem.ids[o.set[0]!]} matched with itself` : `two classes of ${setText(ids(o.set))} matched with each other, or one matched with itself`;
    const relief =
      `A relief needs capacity beyond ${num(o.deficit)}/${unit}: a compatibility between a class of ${setText(ids(o.set))} and a class that cannot serve it yet` +
      (partners.length > 0 ? ` (the largest: ${listWords(partners)})` : '') +
      `, or ${within}.`;
    return {
      overloaded: { set: ids(o.set), neighbours: ids(o.neighbours), demand: o.demand, capacity: o.capacity, spareCapacity: o.capacity - o.demand },
      relief,
      blocked: o.blocked.map((b) => ({ pair: pairIds(problem, b.a, b.b), rule: b.rule === 'limit' ? `maxCompatibilities of ${listWords(b.full.map((k) => problem.ids[k]!))}` : 'forbidden' })),
    };
  }
  if (r.status === 'limits') {
    const over = r.overLimit.map((x) => `${problem.ids[x.class]} (${x.degree} > ${x.max})`);
    const relief = `Every allowed candidate together would make the design stable, but no set of them stays within maxCompatibilities${over.length > 0 ? `: the cheapest repair without limits takes ${listWords(over)}` : ''}.`;
    const withoutLimits: PairIds[] = r.withoutLimits ? r.withoutLimits.added.map((j) => pairIds(problem, problem.toggles[j]!.a, problem.toggles[j]!.b)) : [];
    return {
      overloaded: { set: [], neighbours: [], demand: 0, capacity: 0, spareCapacity: 0 },
      relief: withoutLimits.length > 0 ? `${relief} (It adds ${withoutLimits.map((p) => `${p[0]} ↔ ${p[1]}`).join(', ')}.)` : relief,
      blocked: over.length > 0 ? r.overLimit.map((x) => ({ pair: [problem.ids[x.class]!, problem.ids[x.class]!] as const, rule: 'limit' })) : [],
    };
  }
  return undefined;
}

export async function instabilityOf(ctx: ScenarioContext, certificate: InstabilityCertificate): Promise<InstabilityRecord> {
  const problem = referenceProblem(ctx);
  const result = await repairs(problem, { forbiddenCandidates: forbiddenCandidates(ctx.scenario, ctx.fields) });
  const list =
    result.status === 'repairs'
      ? result.repairs.map((r) => ({ added: r.added.map((j) => pairIds(problem, problem.toggles[j]!.a, problem.toggles[j]!.b)), cost: r.cost }))
      : [];
  const noRepair = noRepairOf(problem, result, ctx.scenario.timeUnit);
  return {
    certificate: certificateRecord(certificate),
    message: describeCertificate(certificate, ctx.scenario.timeUnit),
    repairs: list,
    ...(noRepair ? { noRepair } : {}),
  };
}
