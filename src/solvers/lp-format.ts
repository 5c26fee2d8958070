/**
 * Writes a LinearProgram in the CPLEX LP text format (the input of the HiGHS adapter). Variables are
 * named x0, x1, … and rows c0, c1, … so that ids never need escaping.
 */
import { boundsOf, type LinearExpression, type LinearProgram } from './lp.js';

/** Shortest exact decimal of a finite number (the format accepts 1e-7 style exponents). */
function numText(x: number): string {
  if (!Number.isFinite(x)) throw new RangeError(`cannot write ${x} as an LP coefficient`);
  return String(x);
}

/** " + 2 x0 - 1.5 x3 …", wrapped every few terms (an expression may continue on the next line). */
function expression(e: LinearExpression, allVariables?: number): string {
  const terms: string[] = [];
  const seen = allVariables === undefined ? undefined : new Uint8Array(allVariables);
  for (let i = 0; i < e.variables.length; i++) {
    const a = e.coefficients[i]!;
    const j = e.variables[i]!;
    if (seen) seen[j] = 1;
    terms.push(`${a < 0 ? '-' : '+'} ${numText(Math.abs(a))} x${j}`);
  }
  // mention every variable in the objective so that the reader creates all columns
  if (seen) for (let j = 0; j < seen.length; j++) if (!seen[j]) terms.push(`+ 0 x${j}`);
  if (terms.length === 0) terms.push('+ 0 x0');
  const lines: string[] = [];
  for (let i = 0; i < terms.length; i += 8) lines.push(terms.slice(i, i + 8).join(' '));
  return lines.join('\n   ');
}

export function toLpFormat(lp: LinearProgram): string {
  const out: string[] = [];
  out.push(lp.sense === 'max' ? 'Maximize' : 'Minimize');
  out.push(` obj: ${expression(lp.objective, lp.variables.length)}`);
  out.push('Subject To');
  lp.constraints.forEach((c, i) => {
    const rel = c.relation === '=' ? '=' : c.relation;
    out.push(` c${i}: ${expression(c)} ${rel} ${numText(c.rhs)}`);
  });
  out.push('Bounds');
  const general: string[] = [];
  const binary: string[] = [];
  lp.variables.forEach((v, j) => {
    if (v.kind === 'binary') {
      binary.push(`x${j}`);
      return;
    }
    if (v.kind === 'integer') general.push(`x${j}`);
    const { lower, upper } = boundsOf(v);
    const lo = lower === -Infinity ? '-inf' : numText(lower);
    const hi = upper === Infinity ? '+inf' : numText(upper);
    if (lower === -Infinity && upper === Infinity) out.push(` x${j} free`);
    else out.push(` ${lo} <= x${j} <= ${hi}`);
  });
  if (general.length > 0) out.push('General', ...chunks(general));
  if (binary.length > 0) out.push('Binary', ...chunks(binary));
  out.push('End', '');
  return out.join('\n');
}

function chunks(names: string[]): string[] {
  const lines: string[] = [];
  for (let i = 0; i < names.length; i += 16) lines.push(` ${names.slice(i, i + 16).join(' ')}`);
  return lines;
}
