/**
 * A deterministic layout of the compatibility graph for the report: stress majorization on
 * shortest-path distances, started from a classical scaling of the same distances.
 *
 * Method (from memory): "Graph drawing by stress majorization", Graph Drawing (GD) 2004. The
 * stress Σ_{i<j} w_ij (‖x_i − x_j‖ − d_ij)² with w_ij = d_ij⁻² is lowered node by node with the
 * majorizing update x_i ← Σ_j w_ij (x_j + d_ij (x_i − x_j)/‖x_i − x_j‖) / Σ_j w_ij. Start: the two
 * leading eigenvectors of the double-centred matrix −½ D² (classical scaling), by power iteration
 * from fixed vectors. No randomness anywhere: the same graph always gives the same picture.
 *
 * Disconnected parts are kept apart by a distance of (largest finite distance + 1). Self-loops do
 * not affect positions.
 */

export interface Layout {
  /** Positions in [0, 1] × [0, 1] (before the caller scales them to its canvas). */
  readonly x: Float64Array;
  readonly y: Float64Array;
}

/** All-pairs shortest path lengths (number of edges), breadth-first from every class. */
export function graphDistances(n: number, pairs: ReadonlyArray<readonly [number, number]>): Float64Array {
  const nb: number[][] = Array.from({ length: n }, () => []);
  for (const [a, b] of pairs) {
    if (a === b) continue;
    nb[a]!.push(b);
    nb[b]!.push(a);
  }
  const d = new Float64Array(n * n).fill(Infinity);
  const queue = new Int32Array(n);
  let finiteMax = 0;
  for (let s = 0; s < n; s++) {
    d[s * n + s] = 0;
    let head = 0;
    let tail = 0;
    queue[tail++] = s;
    while (head < tail) {
      const v = queue[head++]!;
      const dv = d[s * n + v]!;
      for (const w of nb[v]!) {
        if (d[s * n + w] === Infinity) {
          d[s * n + w] = dv + 1;
          if (dv + 1 > finiteMax) finiteMax = dv + 1;
          queue[tail++] = w;
        }
      }
    }
  }
  for (let i = 0; i < n * n; i++) if (d[i] === Infinity) d[i] = finiteMax + 1;
  return d;
}

/** Leading eigenvector of the symmetric matrix b (n × n), orthogonal to `against`, by power iteration. */
function powerVector(b: Float64Array, n: number, start: Float64Array, against: Float64Array | undefined): Float64Array {
  let v = Float64Array.from(start);
  const w = new Float64Array(n);
  const project = (u: Float64Array): void => {
    let mean = 0;
    for (let i = 0; i < n; i++) mean += u[i]!;
    mean /= n;
    for (let i = 0; i < n; i++) u[i]! -= mean;
    if (against) {
      let dot = 0;
      let nn = 0;
      for (let i = 0; i < n; i++) {
        dot += u[i]! * against[i]!;
        nn += against[i]! * against[i]!;
      }
      if (nn > 0) for (let i = 0; i < n; i++) u[i]! -= (dot / nn) * against[i]!;
    }
  };
  const normalise = (u: Float64Array): number => {
    let s = 0;
    for (let i = 0; i < n; i++) s += u[i]! * u[i]!;
    s = Math.sqrt(s);
    if (s > 0) for (let i = 0; i < n; i++) u[i]! /= s;
    return s;
  };
  project(v);
  normalise(v);
  let lambda = 0;
  for (let it = 0; it < 300; it++) {
    for (let i = 0; i < n; i++) {
      let s = 0;
      for (let j = 0; j < n; j++) s += b[i * n + j]! * v[j]!;
      w[i] = s;
    }
    project(w);
    lambda = normalise(w);
    if (lambda === 0) break;
    let diff = 0;
    for (let i = 0; i < n; i++) diff = Math.max(diff, Math.abs(w[i]! - v[i]!));
    v = Float64Array.from(w);
    if (diff < 1e-10) break;
  }
  for (let i = 0; i < n; i++) v[i]! *= Math.sqrt(Math.max(lambda, 0));
  return v;
}

/** Classical scaling start: coordinates from −½ J D² J (J centres). */
function classicalStart(d: Float64Array, n: number): { x: Float64Array; y: Float64Array } {
  const b = new Float64Array(n * n);
  const row = new Float64Array(n);
  let all = 0;
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      const sq = d[i * n + j]! ** 2;
      row[i]! += sq / n;
      all += sq / (n * n);
    }
  }
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) b[i * n + j] = -0.5 * (d[i * n + j]! ** 2 - row[i]! - row[j]! + all);
  // fixed, non-symmetric start vectors so that power iteration never starts orthogonal to an axis
  const s1 = Float64Array.from({ length: n }, (_, i) => Math.cos(1 + 2.399963 * i));
  const s2 = Float64Array.from({ length: n }, (_, i) => Math.sin(1 + 2.399963 * i));
  const x = powerVector(b, n, s1, undefined);
  const y = powerVector(b, n, s2, x);
  // break exact ties (coincident points) with a tiny deterministic spiral
  for (let i = 0; i < n; i++) {
    x[i]! += 1e-3 * Math.cos(2.399963 * i) * (1 + i / n);
    y[i]! += 1e-3 * Math.sin(2.399963 * i) * (1 + i / n);
  }
  return { x, y };
}

/** Stress Σ_{i<j} d_ij⁻² (‖x_i − x_j‖ − d_ij)² of a layout (in distance units, before scaling). */
export function stress(d: Float64Array, n: number, x: ArrayLike<number>, y: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j < n; j++) {
      const dij = d[i * n + j]!;
      const e = Math.hypot(x[i]! - x[j]!, y[i]! - y[j]!) - dij;
      s += (e * e) / (dij * dij);
    }
  }
  return s;
}

/** Raw positions in distance units (no normalisation): classical start + stress majorization. */
export function stressPositions(n: number, pairs: ReadonlyArray<readonly [number, number]>, iterations = 400): { x: Float64Array; y: Float64Array; d: Float64Array } {
  const d = graphDistances(n, pairs);
  if (n === 1) return { x: new Float64Array(1), y: new Float64Array(1), d };
  const { x, y } = classicalStart(d, n);
  for (let it = 0; it < iterations; it++) {
    let moved = 0;
    for (let i = 0; i < n; i++) {
      let sx = 0;
      let sy = 0;
      let sw = 0;
      for (let j = 0; j < n; j++) {
        if (j === i) continue;
        const dij = d[i * n + j]!;
        const w = 1 / (dij * dij);
        const dx = x[i]! - x[j]!;
        const dy = y[i]! - y[j]!;
        const len = Math.hypot(dx, dy) || 1e-9;
        sx += w * (x[j]! + (dij * dx) / len);
        sy += w * (y[j]! + (dij * dy) / len);
        sw += w;
      }
      const nx = sx / sw;
      const ny = sy / sw;
      moved = Math.max(moved, Math.abs(nx - x[i]!), Math.abs(ny - y[i]!));
      x[i] = nx;
      y[i] = ny;
    }
    if (moved < 1e-7) break;
  }
  return { x, y, d };
}

/**
 * Layout in the unit square: stress positions, centred, turned so that the widest spread is
 * horizontal, mirrored so that class 0 sits left of centre and the first class off the axis sits above it, scaled to fit
 * an aspect ratio `aspect` = width / height (uniform scale, so distances keep their proportions).
 */
export function layoutGraph(n: number, pairs: ReadonlyArray<readonly [number, number]>, aspect = 1.6): Layout {
  if (n === 0) return { x: new Float64Array(0), y: new Float64Array(0) };
  if (n === 1) return { x: Float64Array.of(0.5), y: Float64Array.of(0.5) };
  const { x, y } = stressPositions(n, pairs);
  let cx = 0;
  let cy = 0;
  for (let i = 0; i < n; i++) {
    cx += x[i]! / n;
    cy += y[i]! / n;
  }
  let sxx = 0;
  let syy = 0;
  let sxy = 0;
  for (let i = 0; i < n; i++) {
    x[i]! -= cx;
    y[i]! -= cy;
    sxx += x[i]! * x[i]!;
    syy += y[i]! * y[i]!;
    sxy += x[i]! * y[i]!;
  }
  const angle = 0.5 * Math.atan2(2 * sxy, sxx - syy); // principal axis
  const c = Math.cos(-angle);
  const s = Math.sin(-angle);
  for (let i = 0; i < n; i++) {
    const rx = c * x[i]! - s * y[i]!;
    const ry = s * x[i]! + c * y[i]!;
    x[i] = rx;
    y[i] = ry;
  }
  if (x[0]! > 1e-9) for (let i = 0; i < n; i++) x[i] = -x[i]!;
  const firstOff = Array.from(y).find((v) => Math.abs(v) > 1e-9) ?? 0;
  if (firstOff > 0) for (let i = 0; i < n; i++) y[i] = -y[i]!;
  let xmin = Infinity;
  let xmax = -Infinity;
  let ymin = Infinity;
  let ymax = -Infinity;
  for (let i = 0; i < n; i++) {
    xmin = Math.min(xmin, x[i]!);
    xmax = Math.max(xmax, x[i]!);
    ymin = Math.min(ymin, y[i]!);
    ymax = Math.max(ymax, y[i]!);
  }
  const w = Math.max(xmax - xmin, 1e-9);
  const h = Math.max(ymax - ymin, 1e-9);
  // fit a w × h cloud into an aspect × 1 box, then express both axes as fractions of that box
  const scale = Math.min(aspect / w, 1 / h);
  const ox = (aspect - w * scale) / 2;
  const oy = (1 - h * scale) / 2;
  const px = new Float64Array(n);
  const py = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    px[i] = (ox + (x[i]! - xmin) * scale) / aspect;
    py[i] = oy + (y[i]! - ymin) * scale;
  }
  return { x: px, y: py };
}
