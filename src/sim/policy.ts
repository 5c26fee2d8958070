/** Matching policies: which waiting compatible item an arriving item takes. */

export const POLICIES = ['fcfm', 'most-waiting', 'ranked', 'random-class'] as const;
export type PolicyName = (typeof POLICIES)[number];

/** Integer codes used by the hot loops. */
export const POLICY_CODE: Readonly<Record<PolicyName, number>> = { fcfm: 0, 'most-waiting': 1, ranked: 2, 'random-class': 3 };

export function isPolicyName(s: string): s is PolicyName {
  return (POLICIES as readonly string[]).includes(s);
}

/** One line per policy, for help texts and reports. */
export const POLICY_DESCRIPTION: Readonly<Record<PolicyName, string>> = {
  fcfm: 'the oldest waiting compatible item',
  'most-waiting': 'the compatible class with the most waiting items (ties: the oldest item)',
  ranked: 'the compatible non-empty class ranked first in the ranking (then its oldest item)',
  'random-class': 'a compatible non-empty class uniformly at random, then its oldest item',
};

/**
 * Rank of each class under a priority list of class indices (first = most preferred partner).
 * Classes left out of the list share the rank after the last listed one (ties go to the oldest item).
 */
export function priorityRanks(n: number, order: readonly number[]): Int32Array {
  const rank = new Int32Array(n).fill(order.length);
  order.forEach((k, r) => {
    if (rank[k] === order.length) rank[k] = r;
  });
  return rank;
}
