/**
 * Time bands for rates that change over time: either N equal parts of the observation window
 * (`--bands N`) or hours of the day (`--band-hours 0-7,7-10,22-6`), each with its exposure (the
 * time of the window that falls in it).
 */

export interface Band {
  /** "1/4" for equal parts, "7-10" for hours of the day. */
  readonly name: string;
  /** Equal parts: the part's start and end (time units); hours of the day: the clock hours [start, end), end < start wrapping past midnight. */
  readonly start: number;
  readonly end: number;
  readonly kind: 'window' | 'clock';
}

/** N equal parts of [from, to]. */
export function equalBands(from: number, to: number, n: number): Band[] {
  return Array.from({ length: n }, (_, k) => ({
    name: `${k + 1}/${n}`,
    start: from + ((to - from) * k) / n,
    end: k === n - 1 ? to : from + ((to - from) * (k + 1)) / n,
    kind: 'window' as const,
  }));
}

const HOURS = /^(\d+(?:\.\d+)?)\s*-\s*(\d+(?:\.\d+)?)$/;

/** Pieces of the day [a, b) with 0 ≤ a < b ≤ 24 that a clock band covers. */
function pieces(b: Band): Array<[number, number]> {
  return b.end > b.start ? [[b.start, b.end]] : [[b.start, 24], [0, b.end]];
}

/**
 * Reads "0-7,7-10,10-16,22-6" (hours of the day, 0 to 24, decimals allowed; a band may wrap past
 * midnight). Returns the bands or the list of problems (overlaps, bad numbers).
 */
export function parseBandHours(spec: string): { bands: Band[] } | { problems: string[] } {
  const problems: string[] = [];
  const bands: Band[] = [];
  for (const part of spec.split(',').map((p) => p.trim())) {
    const m = HOURS.exec(part);
    const start = m ? Number(m[1]) : NaN;
    const end = m ? Number(m[2]) : NaN;
    if (!m || start > 24 || end > 24 || start === end || (start === 24 && end === 0)) {
      problems.push(`"${part}" is not a band of hours such as 7-10 (hours 0 to 24; 22-6 wraps past midnight)`);
      continue;
    }
    bands.push({ name: part.replace(/\s+/g, ''), start: start % 24, end: end === 0 ? 24 : end, kind: 'clock' });
  }
  for (let i = 0; i < bands.length; i++) {
    for (let j = 0; j < i; j++) {
      const overlap = pieces(bands[i]!).some(([a, b]) => pieces(bands[j]!).some(([c, d]) => a < d && c < b));
      if (overlap) problems.push(`bands ${bands[j]!.name} and ${bands[i]!.name} overlap`);
    }
  }
  return problems.length > 0 ? { problems } : { bands };
}

/** Is the clock hour h in band b? */
export function inClockBand(b: Band, h: number): boolean {
  return pieces(b).some(([lo, hi]) => h >= lo && h < hi);
}

/** Measure of {x ∈ [0, x): x mod 24 ∈ [lo, hi)} on the line of hours. */
function covered(x: number, lo: number, hi: number): number {
  const days = Math.floor(x / 24);
  return days * (hi - lo) + Math.min(Math.max(x - days * 24 - lo, 0), hi - lo);
}

/**
 * Hours of the day in band `b` between the clock readings `fromHours` and `toHours` (hours counted
 * on one line, e.g. hours since a midnight), i.e. the band's exposure in hours.
 */
export function clockExposureHours(b: Band, fromHours: number, toHours: number): number {
  return pieces(b).reduce((s, [lo, hi]) => s + covered(toHours, lo, hi) - covered(fromHours, lo, hi), 0);
}
