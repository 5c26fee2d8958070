/**
 * `check`: is the design stable, how much room is left, and — when it is not stable — why, and the
 * cheapest ways out.
 */
import { checkStability } from '../stability/check.js';
import { certificateWithIds } from '../stability/certificate.js';
import { recordBase, type ScenarioContext } from './context.js';
import { instabilityOf } from './instability.js';
import { byClass, setRecord, type InstabilityRecord, type RepairRecord, type RecordBase, type Reference, type SetRecord } from './records.js';
import { demandNote } from './warnings.js';

export interface CheckRecord extends RecordBase {
  readonly command: 'check';
  readonly reference: Reference;
  readonly stable: boolean;
  /** The independent set with the least spare capacity (stable designs). */
  readonly bottleneck: SetRecord | null;
  /** The tightest set through each class, least spare capacity first. */
  readonly tightSets: SetRecord[];
  /** Per class: how far its rate may grow, the others fixed, before the design turns unstable; null when unbounded (the class is matched with its own kind). */
  readonly headroom: Record<string, number | null> | null;
  /** Classes whose headroom is unbounded (matched with their own kind). */
  readonly unboundedHeadroom: string[];
  readonly components: number;
  /** Unstable designs: the certificate and the repairs. */
  readonly instability: InstabilityRecord | null;
  /** When unstable: the cheapest sets of allowed candidates that make it stable, cheapest first (as in `instability`). */
  readonly repairs: RepairRecord[] | null;
}

export async function checkUseCase(ctx: ScenarioContext): Promise<CheckRecord> {
  const model = ctx.model;
  const r = checkStability(model);
  const base = { ...recordBase(ctx, 'check', [demandNote(ctx)]), reference: ctx.reference, components: r.components.length };
  if (!r.stable) {
    const instability = await instabilityOf(ctx, certificateWithIds(model, r.certificate!));
    return { ...base, stable: false, bottleneck: null, tightSets: [], headroom: null, unboundedHeadroom: [], instability, repairs: instability.repairs };
  }
  return {
    ...base,
    stable: true,
    bottleneck: r.bottleneck ? setRecord(model, r.bottleneck) : null,
    tightSets: r.tightSets.map((t) => setRecord(model, t)),
    headroom: byClass(model.ids, r.headroom),
    unboundedHeadroom: model.ids.filter((_, k) => r.headroom[k] === Infinity),
    instability: null,
    repairs: null,
  };
}
