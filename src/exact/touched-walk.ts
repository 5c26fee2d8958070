import type { ForwardSums } from './forward.js';
import { maskRate, type MaskGraph } from './masks.js';
import { child4 as child, type SetIndex } from './set-index.js';
import { nextLowest } from './trie.js';
import type { VariantScratch } from './touched-record.js';

/**
 * One family of touched sets of a changed design, P ∪ B with B ranging over the independent sets of
 * the classes allowed by (xLo, xHi). P = {p}, or P = {i, j} for the new sets of a removed edge.
 */
export interface TouchedFamily {
  readonly pair: boolean;
  /** P = {p} (pair: p = i). */
  readonly p: number;
  /** Pair: the larger class j of P = {i, j}. */
  readonly q: number;
  readonly xLo: number;
  readonly xHi: number;
  /** N'(P) in the changed design. */
  readonly npLo: number;
  readonly npHi: number;
  /** r'(P) = λ(P ∖ S') in the changed design. */
  readonly rP: number;
  /** Also sum the base Ψ and Ψ_k of the same sets (they exist unchanged in the base). */
  readonly sumBase: boolean;
}

/** Running sums over the touched sets. */
export interface TouchedSums {
  z: number;
  zBase: number;
  readonly classBase: Float64Array;
  satLo: number;
  satHi: number;
}

const bitLo = (k: number): number => (k < 32 ? 1 << k : 0);
const bitHi = (k: number): number => (k < 32 ? 0 : 1 << (k - 32));

/**
 * Computes Ψ' of every set of the family, depth first over B in increasing mask order (children add a
 * smaller class, ascending), and records each set for the reverse pass:
 *   Ψ'(A) = Σ_{x∈A} λ_x Ψ'(A ∖ x) / (μ'(A) − r'(A)),  μ'(A) = λ(N'(P) ∪ N(B)),  r'(A) = r'(P) + r(B).
 * Where A ∖ x lives: A ∖ p = B is a base set (single P); A ∖ x for x ∈ B is in this family, at the
 * carried index of P ∪ (B ∖ x); for a pair, A ∖ j = {i} ∪ B and A ∖ i = {j} ∪ B are in the
 * single-endpoint store (computed before). Returns false at a saturated set (mask in sums).
 */
export function walkFamily(
  g: MaskGraph,
  t: SetIndex,
  base: ForwardSums,
  f: TouchedFamily,
  tol: number,
  sc: VariantScratch,
  sums: TouchedSums,
): boolean {
  const n = g.n;
  const { rate, nbLo, nbHi } = g;
  const baseLoop = g.loop;
  const { node } = t;
  const blk = base.blk;
  const { pair, p, q: pj, xLo, xHi, npLo, npHi, rP, sumBase } = f;
  const vst = sc.vst;
  const nst = sc.nst;
  const classBase = sums.classBase;
  const D = n + 2;
  const idxB = new Int32Array(D);
  const idxA = new Int32Array(D); // single: base index of {p} ∪ B_d
  const idxI = new Int32Array(D); // pair: base index of {i} ∪ B_d
  const idxJ = new Int32Array(D); // pair: base index of {j} ∪ B_d
  const elem = new Int32Array(D); // elem[d]: class added at depth d (decreasing)
  const remB = new Int32Array(D * n); // base index of B_d ∖ elem[u+1]
  const remA = new Int32Array(D * n); // single: base index of {p} ∪ (B_d ∖ elem[u+1])
  const bLo = new Int32Array(D); // N(B_d)
  const bHi = new Int32Array(D);
  const rB = new Float64Array(D);
  const mLo = new Int32Array(D); // mask of B_d
  const mHi = new Int32Array(D);
  const posJ = new Int32Array(D); // members of B_d above max(P)
  const posI = new Int32Array(D); // pair: members of B_d between i and j
  const todoLo = new Int32Array(D);
  const todoHi = new Int32Array(D);
  const warm = new Float64Array(D);
  const hiP = pair ? pj : p;

  const visit = (d: number): boolean => {
    const den = maskRate(g, npLo | bLo[d]!, npHi | bHi[d]!) - (rP + rB[d]!);
    if (!(den > tol)) {
      sums.satLo = mLo[d]! | bitLo(p) | (pair ? bitLo(pj) : 0);
      sums.satHi = mHi[d]! | bitHi(p) | (pair ? bitHi(pj) : 0);
      return false;
    }
    const a = d + (pair ? 2 : 1);
    sc.reserve(a);
    const mCls = sc.mCls;
    const mTarget = sc.mTarget;
    const mKind = sc.mKind;
    const mVal = sc.mVal;
    const mBase = sc.mBase;
    const start = sc.members;
    const row = d * n;
    const pJ = posJ[d]!;
    const pI = pJ + 1 + posI[d]!;
    // single family: the block of B = A ∖ p (Ψ(B), then Ψ_k(B) for the members of B in order) is
    // copied next to the members, so the reverse pass reads it sequentially
    const ob = pair ? 0 : node[4 * idxB[d]! + 3]!;
    let tB = 0; // next member of B: elem[tB + 1]
    let sum = 0;
    for (let u = 0; u < a; u++) {
      const m = start + u;
      let k: number;
      let v: number;
      if (u === pJ) {
        if (pair) {
          k = pj; // A ∖ j = {i} ∪ B
          const s = idxI[d]!;
          mTarget[m] = s;
          mKind[m] = 0;
          mBase[m] = 0;
          v = vst[2 * s]!;
        } else {
          k = p; // A ∖ p = B, a base set
          mTarget[m] = -1;
          mKind[m] = 0;
          mBase[m] = 0;
          v = blk[ob]!;
        }
      } else if (pair && u === pI) {
        k = p; // A ∖ i = {j} ∪ B
        const s = idxJ[d]!;
        mTarget[m] = s;
        mKind[m] = 0;
        mBase[m] = 0;
        v = vst[2 * s]!;
      } else {
        k = elem[tB + 1]!;
        if (pair) {
          const s = remB[row + tB]!;
          mTarget[m] = s;
          mKind[m] = 1;
          mBase[m] = 0;
          v = nst[2 * s]!;
        } else {
          const s = remA[row + tB]!;
          mTarget[m] = s;
          mKind[m] = 0;
          mBase[m] = blk[ob + 1 + tB]!;
          v = vst[2 * s]!;
        }
        tB++;
      }
      const w = rate[k]! * v;
      mCls[m] = k;
      mVal[m] = w;
      sum += w;
    }
    const ps = sum / den;
    const h = sc.sets;
    let s: number;
    if (pair) {
      s = idxB[d]!;
      nst[2 * s] = ps;
      nst[2 * s + 1] = 0;
      sc.hP[h] = -1;
    } else {
      s = idxA[d]!;
      vst[2 * s] = ps;
      vst[2 * s + 1] = 0;
      sc.hP[h] = p;
      if (sumBase) {
        const o = node[4 * s + 3]!;
        sums.zBase += blk[o]!;
        for (let u = 0; u < a; u++) classBase[mCls[start + u]!] += blk[o + 1 + u]!;
      }
    }
    sc.hStore[h] = s;
    sc.hKind[h] = pair ? 1 : 0;
    sc.hDen[h] = den;
    sc.hPsi[h] = ps;
    sc.hStart[h] = start;
    sc.hSize[h] = a;
    sc.sets = h + 1;
    sc.members = start + a;
    sums.z += ps;
    return true;
  };

  // root: B = ∅
  if (pair) {
    idxI[0] = child(node, 0, p);
    idxJ[0] = child(node, 0, pj);
  } else idxA[0] = child(node, 0, p);
  if (!visit(0)) return false;
  todoLo[0] = node[1]! & xLo;
  todoHi[0] = node[2]! & xHi;
  let d = 0;
  while (d >= 0) {
    const c = nextLowest(todoLo, todoHi, d);
    if (c < 0) {
      d--;
      continue;
    }
    const e = d + 1;
    const sb = child(node, idxB[d]!, c);
    idxB[e] = sb;
    // load the block of B early (single family): its cache miss then overlaps the index work below
    if (!pair) warm[e] = blk[node[4 * sb + 3]!]!;
    elem[e] = c;
    const from = d * n;
    const to = e * n;
    if (pair || c > p) {
      // (a single family needs B ∖ x only while every member is above p)
      for (let u = 0; u < d; u++) remB[to + u] = child(node, remB[from + u]!, c);
      remB[to + d] = idxB[d]!;
    }
    if (pair) {
      idxI[e] = c > p ? child(node, sb, p) : child(node, idxI[d]!, c);
      idxJ[e] = c > pj ? child(node, sb, pj) : child(node, idxJ[d]!, c);
      posI[e] = posI[d]! + (c > p && c < pj ? 1 : 0);
    } else if (c > p) {
      // every member of B ∪ {c} is above p: {p} ∪ X is the child p of X
      idxA[e] = child(node, sb, p);
      for (let u = 0; u <= d; u++) remA[to + u] = child(node, remB[to + u]!, p);
    } else {
      idxA[e] = child(node, idxA[d]!, c);
      for (let u = 0; u < d; u++) remA[to + u] = child(node, remA[from + u]!, c);
      remA[to + d] = idxA[d]!;
    }
    posJ[e] = posJ[d]! + (c > hiP ? 1 : 0);
    bLo[e] = bLo[d]! | nbLo[c]!;
    bHi[e] = bHi[d]! | nbHi[c]!;
    rB[e] = rB[d]! + (baseLoop[c] ? 0 : rate[c]!);
    mLo[e] = mLo[d]! | bitLo(c);
    mHi[e] = mHi[d]! | bitHi(c);
    if (!visit(e)) return false;
    todoLo[e] = node[4 * sb + 1]! & xLo;
    todoHi[e] = node[4 * sb + 2]! & xHi;
    d = e;
  }
  return true;
}
