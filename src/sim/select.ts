import { nextUint32 } from './random.js';
import type { SimModel } from './sim-model.js';

/**
 * The candidate position p (index into model.nbr) whose class an arriving item of class k takes
 * under the model's policy, or −1 when no compatible item waits. `counts` are live waiting items,
 * `headVal` the arrival stamp of each class's oldest live item (Infinity when none). The random
 * policy draws from `rng` only when two or more classes qualify.
 *
 * The timed engine and the patient engine's loop for longest, priority and random use it; the
 * patient engine's FCFM loops inline the oldest-head rule.
 */
export function selectPartner(model: SimModel, counts: Int32Array, headVal: Float64Array, k: number, rng: Uint32Array): number {
  const { nbrStart, nbr, rank, policy } = model;
  const ps = nbrStart[k]!;
  const pe = nbrStart[k + 1]!;
  let bp = -1;
  if (policy === 1) {
    let bc = 0;
    let bt = Infinity;
    for (let p = ps; p < pe; p++) {
      const j = nbr[p]!;
      const c = counts[j]!;
      if (c > bc || (c === bc && c > 0 && headVal[j]! < bt)) {
        bc = c;
        bt = headVal[j]!;
        bp = p;
      }
    }
  } else if (policy === 2) {
    let br = 0x7fffffff;
    let bt = Infinity;
    for (let p = ps; p < pe; p++) {
      const j = nbr[p]!;
      if (counts[j] === 0) continue;
      const h = headVal[j]!;
      const r = rank[j]!;
      if (r < br || (r === br && h < bt)) {
        br = r;
        bt = h;
        bp = p;
      }
    }
  } else if (policy === 3) {
    let nonEmpty = 0;
    for (let p = ps; p < pe; p++) if (counts[nbr[p]!]! > 0) nonEmpty++;
    if (nonEmpty > 0) {
      let pick = nonEmpty > 1 ? (nextUint32(rng) * nonEmpty * 2.3283064365386963e-10) | 0 : 0;
      for (let p = ps; p < pe; p++) {
        if (counts[nbr[p]!]! > 0 && pick-- === 0) {
          bp = p;
          break;
        }
      }
    }
  } else {
    let bt = Infinity;
    for (let p = ps; p < pe; p++) {
      const j = nbr[p]!;
      if (counts[j] === 0) continue;
      const h = headVal[j]!;
      if (h < bt) {
        bt = h;
        bp = p;
      }
    }
  }
  return bp;
}
