/**
 * The instability record of an unstable design: its certificate in words and the cheapest sets of
 * allowed candidates whose addition makes it stable (src/design/repair/), or, when none exists,
 * the group still overloaded and the kind of pair that would relieve it.
 */
import { describeCertificate, type InstabilityCertificate } from '../errors.js';
import { compileGraph } from '../model/compile.js';
import { checkStability } from '../stability/check.js';
import { designPairs } from '../design/space/problem.js';
import type { ScenarioContext } from './context.js';
import { certificateRecord, pairIds, type InstabilityRecord, type RepairRecord } from './records.js';

/** Interim: the single allowed candidates that make the design stable on their own, cheapest first. */
async function repairsOf(ctx: ScenarioContext): Promise<RepairRecord[]> {
  const p = ctx.problem;
  const out: RepairRecord[] = [];
  p.toggles.forEach((t, j) => {
    if (t.kind !== 'candidate' || ctx.design[j]) return;
    const d = Uint8Array.from(ctx.design);
    d[j] = 1;
    const r = checkStability(compileGraph(p.ids, p.rates, designPairs(p, d)));
    if (r.stable) out.push({ added: [pairIds(p, t.a, t.b)], cost: t.price });
  });
  return out.sort((a, b) => a.cost - b.cost).slice(0, 5);
}

export async function instabilityOf(ctx: ScenarioContext, certificate: InstabilityCertificate): Promise<InstabilityRecord> {
  return {
    certificate: certificateRecord(certificate),
    message: describeCertificate(certificate, ctx.scenario.timeUnit),
    repairs: await repairsOf(ctx),
  };
}
