/**
 * Scale-free numerics: the figures of a design depend only on the ratios of its rates, so the
 * numerical layers (exact evaluator, stability verdict, simulator, MILP) work on rates divided by a
 * power of two near their mean and scale back at the boundary. Dividing by a power of two is exact
 * in binary floating point, so rates multiplied by any power of two give bit-identical figures, and
 * rates anywhere between 1e-300 and 1e300 stay far from overflow and underflow.
 */
import type { CompiledModel } from './compile.js';

/** The power of two nearest the mean of the positive finite values (1 when there is none). Never overflows. */
export function powerOfTwoScale(values: ArrayLike<number>): number {
  let max = 0;
  for (let i = 0; i < values.length; i++) if (values[i]! > max && Number.isFinite(values[i]!)) max = values[i]!;
  if (!(max > 0)) return 1;
  // mean = max · Σ(v / max) / count, with every term ≤ 1: no overflow
  let sum = 0;
  let count = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i]!;
    if (v > 0 && Number.isFinite(v)) {
      sum += v / max;
      count++;
    }
  }
  const e = Math.round(Math.log2(max) + Math.log2(sum / count));
  return pow2(e);
}

/** 2^e for integer e in the whole double range (subnormal powers included). */
export function pow2(e: number): number {
  if (e > 1023) return Infinity;
  if (e >= -1022) return 2 ** e;
  return 2 ** (e + 60) / 2 ** 60;
}

/** values / scale, as a new array. */
export function divided(values: ArrayLike<number>, scale: number): Float64Array {
  const out = new Float64Array(values.length);
  for (let i = 0; i < values.length; i++) out[i] = values[i]! / scale;
  return out;
}

/** The model with rates divided by a power of two near their mean, and that scale. */
export function scaledModel(model: CompiledModel): { working: CompiledModel; scale: number } {
  const scale = powerOfTwoScale(model.rates);
  if (scale === 1) return { working: model, scale };
  const rates = divided(model.rates, scale);
  let total = 0;
  for (let k = 0; k < model.n; k++) total += rates[k]!;
  return { working: { ...model, rates, totalRate: total }, scale };
}
