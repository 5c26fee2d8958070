/**
 * Invented, seeded inputs for the drawing tests: compatibility graphs of 16 to 60 classes in three
 * shapes (a ring with chords and no groups, a zone × time-band design with groups, dense groups
 * with few links between them) and chart inputs of matching size.
 */
import type { GraphEdge, GraphNode, GraphPicture } from '../../src/html/graph-svg.js';
import type { ParetoChartInput } from '../../src/html/pareto-chart.js';
import type { SweepChartInput } from '../../src/html/sweep-chart.js';
import type { WaitChartInput } from '../../src/html/wait-chart.js';
import { Rng } from './random.js';

const PLACES = ['Harbour', 'Old Mill', 'Northgate', 'Riverside', 'Quarry Hill', 'Lantern Row', 'Saltmarsh', 'Copper Lane', 'Eastfield', 'Windward', 'Pine Hollow', 'Brookside', 'Kingsmoor', 'Ashford Yard', 'Glassworks'];
const BANDS = ['early', 'day', 'late', 'night', 'weekend'];

function edgeKinds(rng: Rng, pairs: Array<[number, number]>, candidates: Array<[number, number]>): GraphEdge[] {
  const edges: GraphEdge[] = pairs.map(([a, b]) => ({ a, b, kind: rng.chance(0.08) ? 'drop' : 'today', matchRate: rng.uniform(0.05, 2) }));
  for (const [a, b] of candidates) {
    const r = rng.next();
    edges.push(r < 0.3 ? { a, b, kind: 'fund' } : r < 0.5 ? { a, b, kind: 'candidate', harmful: true } : { a, b, kind: 'candidate' });
  }
  return edges;
}

/** A ring of n classes with chords, no groups (ids without separators), a few self-loops. */
export function ringWithChords(n: number, seed: number): GraphPicture {
  const rng = new Rng(seed);
  const nodes: GraphNode[] = Array.from({ length: n }, (_, i) => ({
    id: `stop${i + 1}`,
    label: `${PLACES[i % PLACES.length]!}${i >= PLACES.length ? ` ${Math.floor(i / PLACES.length) + 1}` : ''}`,
    rate: rng.uniform(0.2, 3),
    ...(rng.chance(0.15) ? { bottleneck: true } : {}),
  }));
  const pairs: Array<[number, number]> = [];
  for (let i = 0; i < n; i++) pairs.push([i, (i + 1) % n]);
  for (let k = 0; k < Math.floor(n / 3); k++) {
    const a = rng.int(0, n - 1);
    const b = (a + rng.int(2, Math.floor(n / 2))) % n;
    pairs.push([Math.min(a, b), Math.max(a, b)]);
  }
  for (let i = 0; i < n; i++) if (rng.chance(0.12)) pairs.push([i, i]);
  const candidates: Array<[number, number]> = [];
  for (let k = 0; k < Math.floor(n / 4); k++) {
    const a = rng.int(0, n - 1);
    const b = (a + rng.int(2, n - 2)) % n;
    candidates.push([a, b]);
  }
  return { nodes, edges: edgeKinds(rng, dedupe(pairs), dedupe(candidates, pairs)), timeUnit: 'hour', title: `Ring with chords, ${n} classes` };
}

/**
 * Zones × time bands: ids "zone-band" (grouped by their prefix, or by an explicit group when
 * `explicit`), labels "Zone: band shift offered"; each band is compatible with the next in its
 * zone and with the same band of the next zone; candidates join neighbouring zones' other bands.
 */
export function zoneBands(zones: number, bands: number, seed: number, explicit = false): GraphPicture {
  const rng = new Rng(seed);
  const nodes: GraphNode[] = [];
  const idx = (z: number, b: number): number => z * bands + b;
  for (let z = 0; z < zones; z++) {
    for (let b = 0; b < bands; b++) {
      const zone = PLACES[z % PLACES.length]!;
      nodes.push({
        id: `${zone.toLowerCase().replace(/ /g, '')}-${BANDS[b]}`,
        label: `${zone}: ${BANDS[b]} shift offered`,
        rate: rng.uniform(0.3, 2.5),
        ...(explicit ? { group: zone } : {}),
        ...(z === 0 && b < 2 ? { bottleneck: true } : {}),
      });
    }
  }
  const pairs: Array<[number, number]> = [];
  for (let z = 0; z < zones; z++) {
    for (let b = 0; b < bands; b++) {
      if (b + 1 < bands) pairs.push([idx(z, b), idx(z, b + 1)]);
      if (z + 1 < zones) pairs.push([idx(z, b), idx(z + 1, b)]);
      if (rng.chance(0.1)) pairs.push([idx(z, b), idx(z, b)]);
    }
  }
  const candidates: Array<[number, number]> = [];
  for (let z = 0; z + 1 < zones; z++) if (rng.chance(0.6)) candidates.push([idx(z, rng.int(0, bands - 1)), idx(z + 1, rng.int(0, bands - 1))]);
  return { nodes, edges: edgeKinds(rng, dedupe(pairs), dedupe(candidates, pairs)), timeUnit: 'day', title: `Zones and time bands, ${zones * bands} classes` };
}

/** `groups` explicit groups of `size` classes, dense inside, sparse between. */
export function denseGroups(groups: number, size: number, seed: number): GraphPicture {
  const rng = new Rng(seed);
  const nodes: GraphNode[] = [];
  for (let g = 0; g < groups; g++) for (let k = 0; k < size; k++) nodes.push({ id: `t${g}x${k}`, label: `Team ${String.fromCharCode(65 + g)} seat ${k + 1}`, rate: rng.uniform(0.2, 2), group: `Team ${String.fromCharCode(65 + g)}` });
  const n = groups * size;
  const pairs: Array<[number, number]> = [];
  for (let i = 0; i < n; i++) {
    for (let j = i; j < n; j++) {
      const same = Math.floor(i / size) === Math.floor(j / size);
      if (i === j ? rng.chance(0.1) : rng.chance(same ? 0.55 : 0.03)) pairs.push([i, j]);
    }
  }
  const candidates: Array<[number, number]> = [];
  for (let k = 0; k < groups; k++) candidates.push([rng.int(0, n - 1), rng.int(0, n - 1)]);
  return { nodes, edges: edgeKinds(rng, dedupe(pairs), dedupe(candidates.filter(([a, b]) => a !== b), pairs)), timeUnit: 'week', title: `Dense groups, ${n} classes` };
}

/** A drawing far narrower than the report's column, so that some names do not fit and are numbered. */
export function narrowGraph(seed = 3): GraphPicture {
  const rng = new Rng(seed);
  const n = 24;
  const nodes: GraphNode[] = Array.from({ length: n }, (_, i) => ({ id: `k${i}`, label: `Class with a long name ${i} <&>`, rate: rng.uniform(0.1, 3) }));
  const edges: GraphEdge[] = [];
  for (let i = 0; i < n; i++) for (let j = i; j < n; j++) if (rng.chance(0.3)) edges.push({ a: i, b: j, kind: rng.chance(0.2) ? 'fund' : 'today', matchRate: 1 });
  return { nodes, edges, timeUnit: 'hour', title: 'Narrow drawing', width: 220 };
}

function dedupe(list: Array<[number, number]>, taken: Array<[number, number]> = []): Array<[number, number]> {
  const seen = new Set(taken.map(([a, b]) => `${Math.min(a, b)},${Math.max(a, b)}`));
  const out: Array<[number, number]> = [];
  for (const [a, b] of list) {
    const k = `${Math.min(a, b)},${Math.max(a, b)}`;
    if (seen.has(k)) continue;
    seen.add(k);
    out.push([Math.min(a, b), Math.max(a, b)]);
  }
  return out;
}

/** The three graph shapes at n classes (n a multiple of 8). */
export function graphsOf(n: number, seed: number): GraphPicture[] {
  return [ringWithChords(n, seed), zoneBands(n / 4, 4, seed + 1, n % 16 === 0), denseGroups(n / 8, 8, seed + 2)];
}

/** A load sweep: today's design, two designs that coincide exactly, one that crosses today's curve. */
export function sweepOf(n: number): SweepChartInput {
  const grow = Array.from({ length: Math.max(2, Math.round(n / 4)) }, (_, i) => `${PLACES[i % PLACES.length]!} ${i + 1}`);
  const loads = (limit: number): number[] => Array.from({ length: 14 }, (_, k) => 1 + ((limit - 1) * (k + 0.5)) / 14);
  const curve = (limit: number, scale: number) => loads(limit).map((l) => ({ load: l, backlog: (scale * n) / (limit + 0.02 - l) }));
  return {
    curves: [
      { name: "today's design", role: 'today', points: curve(1.4, 0.2) },
      { name: 'recommended (cost 30)', role: 'recommended', points: curve(1.55, 0.16) },
      { name: 'cheapest stable design', role: 'alternative', points: curve(1.55, 0.16) },
      { name: 'with Harbour–Old Mill', role: 'warning', points: loads(1.35).map((l) => ({ load: l, backlog: (0.17 * n) / (1.37 - l) + 0.5 * (l - 1) })) },
    ],
    crossovers: [
      { load: 1.12, label: 'Harbour–Old Mill starts to hurt' },
      { load: 1.14, label: 'recommended overtakes' },
    ],
    loadLabel: `Demand of ${grow.join(', ')} (× today)`,
    itemWord: 'shifts',
  };
}

/** A cost/backlog front of about n/2 designs and baselines, two of which coincide. */
export function paretoOf(n: number): ParetoChartInput {
  const k = Math.max(4, Math.round(n / 2));
  const front = Array.from({ length: k }, (_, i) => ({ cost: i * 6, backlog: 2 + 40 / (1 + i) }));
  return {
    front,
    baselines: [
      { name: 'longest chain', cost: 30, backlog: 2 + 40 / 4 },
      { name: 'two partners per class', cost: 30, backlog: 2 + 40 / 4 },
      { name: 'everything compatible', cost: front[k - 1]!.cost + 20, backlog: 2 + 40 / k },
      { name: 'cheapest stable', cost: 12, backlog: 2 + 40 / 3 + 1 },
    ],
    chosen: front[Math.floor(k / 2)]!,
    budget: front[Math.floor(k / 2)]!.cost + 3,
    costUnit: 'credits per week',
    itemWord: 'shifts',
  };
}

/** Waits of n classes for today's design and two recommendations. */
export function waitsOf(n: number, seed: number): WaitChartInput {
  const rng = new Rng(seed);
  const classes = Array.from({ length: n }, (_, i) => ({ label: `${PLACES[i % PLACES.length]!}: ${BANDS[i % 4]!} shift offered by the pool` }));
  return {
    classes,
    series: [
      { name: 'today', role: 'today', waits: classes.map(() => rng.uniform(0.1, 6)) },
      { name: 'recommended (cost 30)', role: 'recommended', waits: classes.map(() => rng.uniform(0.05, 3)) },
      { name: 'runner-up (cost 24)', role: 'alternative', waits: classes.map(() => rng.uniform(0.05, 4)) },
    ],
    timeUnit: 'day',
  };
}
