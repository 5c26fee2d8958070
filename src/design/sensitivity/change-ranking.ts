/**
 * Ordering of the sensitivity table: by benefit per unit of money.
 *
 *   additions: backlog change per unit of cost, delta / cost, ascending (the largest reduction per
 *              unit spent first; harmful ones last);
 *   removals:  backlog change per unit of saving, delta / saving, ascending (pure gains first, then
 *              the smallest increase per unit saved; removals that break stability last).
 * A zero price makes the ratio −∞, 0 or +∞ by the sign of delta. Entries without a price (pairs that
 * are not candidates, listed by --all-pairs) come after the priced ones, ordered by delta. Ties go to
 * the smaller delta, then to the pair in class order. Entries that could not be evaluated go last.
 */

/** What the ordering reads from an entry. */
export interface Rankable {
  readonly a: number;
  readonly b: number;
  /** Cost (addition) or saving (removal); undefined when unpriced. */
  readonly price: number | undefined;
  /** Change in total backlog (+Infinity when the change breaks stability; NaN when not evaluated). */
  readonly delta: number;
}

/** delta / price with the zero-price convention above (undefined when unpriced). */
export function perUnit(delta: number, price: number | undefined): number | undefined {
  if (price === undefined || Number.isNaN(delta)) return undefined;
  if (price > 0) return delta / price;
  return delta > 0 ? Infinity : delta < 0 ? -Infinity : 0;
}

function tier(e: Rankable): number {
  if (Number.isNaN(e.delta)) return 2;
  return e.price === undefined ? 1 : 0;
}

export function compareChanges(x: Rankable, y: Rankable): number {
  const tx = tier(x);
  const ty = tier(y);
  if (tx !== ty) return tx - ty;
  if (tx === 0) {
    const c = cmp(perUnit(x.delta, x.price)!, perUnit(y.delta, y.price)!);
    if (c !== 0) return c;
  }
  if (tx !== 2) {
    const c = cmp(x.delta, y.delta);
    if (c !== 0) return c;
  }
  return x.a - y.a || x.b - y.b;
}

function cmp(u: number, v: number): number {
  if (u === v) return 0;
  return u < v ? -1 : 1;
}
