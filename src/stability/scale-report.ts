/** A stability report computed on rates divided by `scale`, brought back to the original rates. */
import type { ComponentStability, IndexCertificate, StabilityReport, TightSet } from './report.js';

/** f with one result per argument object. */
export function memo<T extends object>(f: (x: T) => T): (x: T) => T {
  const done = new Map<T, T>();
  return (x) => {
    let y = done.get(x);
    if (!y) {
      y = f(x);
      done.set(x, y);
    }
    return y;
  };
}

export function scaledReport(r: StabilityReport, scale: number): StabilityReport {
  if (scale === 1) return r;
  // one new object per old one, so that identities (report.certificate is a component's, the
  // bottleneck is tightSets[0]) survive
  const cert = memo((c: IndexCertificate): IndexCertificate => ({ ...c, demand: c.demand * scale, capacity: c.capacity * scale }));
  const tight = memo((t: TightSet): TightSet => ({ ...t, slack: t.slack * scale, demand: t.demand * scale, capacity: t.capacity * scale }));
  const comp = (c: ComponentStability): ComponentStability => ({
    ...c,
    ...(c.minEdgeFlow === undefined ? {} : { minEdgeFlow: c.minEdgeFlow * scale }),
    ...(c.certificate ? { certificate: cert(c.certificate) } : {}),
  });
  const times = (a: Float64Array): Float64Array => a.map((x) => x * scale);
  return {
    ...r,
    components: r.components.map(comp),
    ...(r.certificate ? { certificate: cert(r.certificate) } : {}),
    ...(r.flow ? { flow: times(r.flow) } : {}),
    headroom: times(r.headroom),
    tightSets: r.tightSets.map(tight),
    ...(r.bottleneck ? { bottleneck: tight(r.bottleneck) } : {}),
  };
}
