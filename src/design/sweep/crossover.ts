/**
 * Where a variant's backlog curve crosses the base curve along a load sweep.
 *
 * Both backlogs blow up near the stability limit, so their difference is a poor thing to interpolate;
 * the relative difference ρ(s) = (L_variant(s) − L_base(s)) / L_base(s) stays bounded there (both grow
 * like a constant over the remaining slack, from memory of the heavy-traffic results). A crossover is
 * a sign change of ρ between two consecutive steps; its load factor is interpolated linearly in s on
 * ρ between those steps. When the variant is unstable at the later step (ρ = +∞), the sign change is
 * located by bisection on the sign of ρ instead, with exact evaluations supplied by the caller.
 */

export interface Crossover {
  /** Index of the step before the sign change. */
  readonly after: number;
  /** Load factor of the crossover. */
  readonly factor: number;
  /** 'starts-to-hurt': the variant's backlog rises above the base; 'starts-to-help': falls below. */
  readonly direction: 'starts-to-hurt' | 'starts-to-help';
  /** 'interpolated' (linear in s on the relative difference) or 'bisection' (variant turned unstable). */
  readonly how: 'interpolated' | 'bisection';
}

/** |ρ| at or below this counts as equal (rounding level of the exact figures). */
export const EQUAL_RELATIVE = 1e-9;

const sign = (rho: number): number => (rho > EQUAL_RELATIVE ? 1 : rho < -EQUAL_RELATIVE ? -1 : 0);

/**
 * Crossovers along factors[t] given base and variant backlogs (Infinity when unstable). `rhoAt(s)`
 * evaluates ρ exactly at any factor (used only for bisection). Steps where the base itself is
 * unstable end the search. A run of equal steps is crossed at its first step.
 */
export function findCrossovers(
  factors: ArrayLike<number>,
  base: ArrayLike<number>,
  variant: ArrayLike<number>,
  rhoAt: (s: number) => number,
): Crossover[] {
  const out: Crossover[] = [];
  const rho: number[] = [];
  for (let t = 0; t < factors.length; t++) {
    if (!Number.isFinite(base[t]!)) break;
    rho.push(Number.isFinite(variant[t]!) ? (variant[t]! - base[t]!) / base[t]! : Infinity);
  }
  let last = 0; // last non-zero sign seen
  let lastAt = -1;
  for (let t = 0; t < rho.length; t++) {
    const sg = sign(rho[t]!);
    if (sg === 0) continue;
    if (last !== 0 && sg !== last) {
      const direction = sg > 0 ? 'starts-to-hurt' : 'starts-to-help';
      if (lastAt === t - 1) {
        const s0 = factors[t - 1]!;
        const s1 = factors[t]!;
        const r0 = rho[t - 1]!;
        const r1 = rho[t]!;
        if (Number.isFinite(r1)) out.push({ after: t - 1, factor: s0 + ((s1 - s0) * r0) / (r0 - r1), direction, how: 'interpolated' });
        else out.push({ after: t - 1, factor: bisect(s0, s1, rhoAt), direction, how: 'bisection' });
      } else {
        // equal over steps lastAt+1 .. t-1: the curves meet from the first of them
        out.push({ after: lastAt, factor: factors[lastAt + 1]!, direction, how: 'interpolated' });
      }
    }
    last = sg;
    lastAt = t;
  }
  return out;
}

/** Largest s in [lo, hi] with ρ(s) <= 0, by 60 halvings (ρ(lo) < 0 < ρ(hi) = +∞). */
function bisect(lo: number, hi: number, rhoAt: (s: number) => number): number {
  let a = lo;
  let b = hi;
  for (let k = 0; k < 60 && b - a > 1e-12 * b; k++) {
    const m = (a + b) / 2;
    if (sign(rhoAt(m)) > 0) b = m;
    else a = m;
  }
  return (a + b) / 2;
}
