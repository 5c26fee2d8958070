/**
 * Bounded text for messages: a preview of a value found in a file (never the whole of a deeply
 * nested or giant value) and JSON paths such as `classes[2].rate` or `demand["late night"].a`.
 */

/** Longest preview, in characters (an ellipsis marks a cut). */
export const PREVIEW_CHARS = 60;

function scalar(v: unknown, max: number): string {
  if (v === undefined) return 'missing';
  if (typeof v === 'string') return v.length > max ? `${JSON.stringify(v.slice(0, max))}…` : JSON.stringify(v);
  if (typeof v === 'number' || typeof v === 'boolean' || typeof v === 'bigint') return String(v);
  if (v === null) return 'null';
  return typeof v;
}

function cut(s: string, max: number): string {
  return s.length > max ? `${s.slice(0, max)}…` : s;
}

/**
 * A short text for a value: scalars as JSON (strings cut), arrays and objects one level deep with
 * nested containers shown as `[…]` / `{…}`, the whole at most about PREVIEW_CHARS characters.
 * Never walks more of the value than it shows.
 */
export function preview(v: unknown, max = PREVIEW_CHARS): string {
  if (typeof v !== 'object' || v === null) return scalar(v, max);
  const inner = (x: unknown): string => (typeof x === 'object' && x !== null ? (Array.isArray(x) ? '[…]' : '{…}') : scalar(x, max));
  const parts: string[] = [];
  let len = 2;
  let more = false;
  if (Array.isArray(v)) {
    for (let i = 0; i < v.length; i++) {
      if (len > max) {
        more = true;
        break;
      }
      const s = inner(v[i]);
      parts.push(s);
      len += s.length + 1;
    }
    return cut(`[${parts.join(',')}${more ? ',…' : ''}]`, max);
  }
  for (const k in v) {
    if (!Object.prototype.hasOwnProperty.call(v, k)) continue;
    if (len > max) {
      more = true;
      break;
    }
    const s = `${scalar(k, max)}:${inner((v as Record<string, unknown>)[k])}`;
    parts.push(s);
    len += s.length + 1;
  }
  return cut(`{${parts.join(',')}${more ? ',…' : ''}}`, max);
}

/** One step of a JSON path. */
export type PathStep = string | number;

const IDENT = /^[A-Za-z_$][\w$]*$/;

/** `classes[2].rate`; keys that are not identifiers in brackets (`demand["late night"]`), cut when long. */
export function formatPath(path: readonly PathStep[]): string {
  let out = '';
  for (const step of path) {
    if (typeof step === 'number') out += `[${step}]`;
    else if (IDENT.test(step) && step.length <= PREVIEW_CHARS) out += out === '' ? step : `.${step}`;
    else out += `[${scalar(step, PREVIEW_CHARS)}]`;
  }
  return out;
}
