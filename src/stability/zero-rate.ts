/**
 * Classes with rate 0 (a demand variant in which a class has no arrivals). No item of such a class
 * ever arrives, so it never waits and never serves anyone: the system is exactly the one of the
 * classes with a positive rate, and so is its verdict. Its own headroom (how far its rate may grow
 * from 0 before the design turns unstable) is still defined: the smallest slack of an independent
 * self-loop-free set containing it, from a forced cut of its component with every class (adding a
 * class of rate 0 to a set never lowers the slack, so that minimum is the one of the design with
 * the class switched on).
 */
import type { CompiledModel } from '../model/compile.js';
import { components, subModel } from '../model/components.js';
import { DoubleCover } from './double-cover.js';
import type { IndexCertificate, StabilityReport, TightSet } from './report.js';
import { memo } from './scale-report.js';
import { measure, stripNeighbours } from './sets.js';

export function checkWithZeroRates(model: CompiledModel, check: (m: CompiledModel) => StabilityReport): StabilityReport {
  const positive: number[] = [];
  for (let k = 0; k < model.n; k++) if (model.rates[k]! > 0) positive.push(k);
  const { sub, edgeMap } = subModel(model, positive);
  const r = check(sub);
  const up = (a: Int32Array): Int32Array => a.map((i) => positive[i]!);
  const cert = memo((c: IndexCertificate): IndexCertificate => ({ ...c, set: up(c.set), neighbours: up(c.neighbours) }));
  const tight = memo((t: TightSet): TightSet => ({ ...t, set: up(t.set), neighbours: up(t.neighbours) }));
  const headroom = new Float64Array(model.n).fill(NaN);
  positive.forEach((k, i) => (headroom[k] = r.headroom[i]!));
  if (r.stable) {
    const comps = components(model);
    const covers = new Map<number, { cover: DoubleCover; local: Map<number, number> }>();
    for (let k = 0; k < model.n; k++) {
      if (model.rates[k]! > 0) continue;
      if (model.selfLoop[k]) {
        headroom[k] = Infinity;
        continue;
      }
      const c = comps.of[k]!;
      let entry = covers.get(c);
      if (!entry) {
        const members = comps.members[c]!;
        entry = { cover: new DoubleCover(model, members), local: new Map(Array.from(members, (v, i) => [v, i] as const)) };
        covers.set(c, entry);
      }
      const { set } = entry.cover.tightestWith(entry.local.get(k)!);
      headroom[k] = measure(model, stripNeighbours(model, set)).slack;
    }
  }
  let flow: Float64Array | undefined;
  if (r.flow) {
    flow = new Float64Array(model.m);
    for (let e = 0; e < sub.m; e++) flow[edgeMap[e]!] = r.flow[e]!;
  }
  return {
    ...r,
    components: r.components.map((c) => ({ ...c, members: up(c.members), ...(c.certificate ? { certificate: cert(c.certificate) } : {}) })),
    ...(r.certificate ? { certificate: cert(r.certificate) } : {}),
    ...(flow ? { flow } : {}),
    headroom,
    tightSets: r.tightSets.map(tight),
    ...(r.bottleneck ? { bottleneck: tight(r.bottleneck) } : {}),
  };
}
