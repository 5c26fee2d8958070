/**
 * Which pairs relieve an overloaded set I (λ(I) ≥ λ(N(I)), I independent without self-pair): only a
 * pair within I (a self-pair of a class of I, or two classes of I: I is then no longer independent)
 * or one from a class of I to a class outside I ∪ N(I) (N(I) gains that class). A pair touching N(I)
 * or away from I leaves λ(I) and λ(N(I)) as they are.
 */
import type { ReliefKind } from './types.js';

/** Membership masks of I and N(I) over n classes. */
export interface SetMasks {
  readonly inI: Uint8Array;
  readonly inN: Uint8Array;
}

export function setMasks(n: number, set: ArrayLike<number>, neighbours: ArrayLike<number>): SetMasks {
  const inI = new Uint8Array(n);
  const inN = new Uint8Array(n);
  for (let i = 0; i < set.length; i++) inI[set[i]!] = 1;
  for (let i = 0; i < neighbours.length; i++) inN[neighbours[i]!] = 1;
  return { inI, inN };
}

/** How the pair a–b relieves I, or undefined when it does not. */
export function reliefOf({ inI, inN }: SetMasks, a: number, b: number): ReliefKind | undefined {
  if (inI[a] && inI[b]) return 'within';
  if ((inI[a] && !inN[b]) || (inI[b] && !inN[a])) return 'outside';
  return undefined;
}
