import { Matrix, determinant } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { parseScenario } from '../../src/model/validate.js';
import { scenarioContext, type ContextOptions } from '../../src/usecases/context.js';
import { evaluateUseCase, type EvaluateRecord } from '../../src/usecases/evaluate.js';
import { evaluateText } from '../../src/output/text/evaluate.js';
import { renderDoc } from '../../src/output/text/doc.js';
import { Rng } from '../helpers/random.js';

// Value per match in `evaluate`: value rate = Σ_pairs value · (exact FCFM match rate along the pair).
//
// The references are closed forms derived by hand from the conservation identity: in a stable
// system every arrival is eventually matched (no item waits forever, the backlog has a finite
// mean), so for each class i
//     λ_i = Σ over the design's pairs {i, j} of r_ij, a self-pair {i, i} counted twice,
// where r_ij is the mean number of matches per time unit along {i, j}. This is n equations in the m
// match rates. When the design is connected with exactly n pairs and one odd cycle (a self-pair is a
// cycle of length 1), the n × n matrix of the system (the unsigned incidence matrix, 2 on a
// self-pair) is invertible: so the match rates are forced by the arrival rates alone, whatever the
// policy, and the value rate is a closed form. (Invertibility is checked numerically below with
// ml-matrix's determinant, an independent npm library.)

const REL = 1e-9;
const close = (a: number, b: number): boolean => Math.abs(a - b) <= REL * Math.max(1, Math.abs(a), Math.abs(b));

async function evaluateDoc(doc: unknown, options: Omit<ContextOptions, 'source'> = {}): Promise<EvaluateRecord> {
  const s = parseScenario(JSON.stringify(doc), 'value.json');
  return evaluateUseCase(scenarioContext(s, { source: 'value.json', ...options }));
}

const rateOf = (r: EvaluateRecord, a: string, b: string): number => {
  const m = r.matchRates.find((x) => (x.pair[0] === a && x.pair[1] === b) || (x.pair[0] === b && x.pair[1] === a));
  if (!m) throw new Error(`no pair ${a}, ${b}`);
  return m.rate;
};

/** Parcels and couriers: small–bike (5), small–van (3), large–van (8), small–small (no value). */
function courier(extra: Record<string, unknown> = {}): Record<string, unknown> {
  return {
    name: 'courier',
    timeUnit: 'hour',
    waitingCost: 2,
    classes: [
      { id: 'small', rate: 3 },
      { id: 'large', rate: 2 },
      { id: 'bike', rate: 2.4 },
      { id: 'van', rate: 2.4 },
    ],
    compatibilities: [
      { pair: ['small', 'bike'], value: 5 },
      { pair: ['small', 'van'], value: 3 },
      { pair: ['large', 'van'], value: 8, removable: true },
      { pair: ['small', 'small'], removable: true },
    ],
    candidates: [{ pair: ['large', 'large'], cost: 1, value: 6 }],
    demand: { busy: { van: 2.5 } },
    ...extra,
  };
}

describe('evaluate: value rate from the exact match rates (closed forms derived by hand)', () => {
  it("today's design: forced match rates and value rate 29.2", async () => {
    // Conservation, class by class (rates λ_small 3, λ_large 2, λ_bike 2.4, λ_van 2.4):
    //   bike only matches small:  r_sb = λ_bike = 2.4
    //   large only matches van:   r_lv = λ_large = 2
    //   van:   λ_van = r_sv + r_lv            → r_sv = 2.4 − 2 = 0.4
    //   small: λ_small = r_sb + r_sv + 2 r_ss  → r_ss = (3 − 2.4 − 0.4) / 2 = 0.1
    // value rate = 5·2.4 + 3·0.4 + 8·2 + 0·0.1 = 12 + 1.2 + 16 = 29.2
    const r = await evaluateDoc(courier());
    expect(r.stable).toBe(true);
    expect(close(rateOf(r, 'small', 'bike'), 2.4)).toBe(true);
    expect(close(rateOf(r, 'large', 'van'), 2)).toBe(true);
    expect(close(rateOf(r, 'small', 'van'), 0.4)).toBe(true);
    expect(close(rateOf(r, 'small', 'small'), 0.1)).toBe(true);
    const v = r.value!;
    expect(close(v.rate, 29.2)).toBe(true);
    // the waiting cost rate is waitingCost × the record's own backlog (checked against independent
    // references in tests/exact/): a consistency check of the arithmetic, not of the backlog
    expect(v.waitingCost).toBe(2);
    expect(close(v.waitingCostRate, 2 * r.backlog!.total)).toBe(true);
    expect(close(v.net, 29.2 - 2 * r.backlog!.total)).toBe(true);
    expect(v.pairsWithValue).toBe(3);
    expect(v.pairsWithoutValue).toBe(1);
    const ss = r.matchRates.find((m) => m.pair[0] === 'small' && m.pair[1] === 'small')!;
    expect(ss.value).toBeNull();
    expect(ss.valueRate).toBeNull();
    const lv = r.matchRates.find((m) => m.pair.includes('large'))!;
    expect(close(lv.valueRate!, 16)).toBe(true);
    // the text says pairs without a value count 0, and lists the pairs with one (one pair spelling)
    const text = renderDoc(evaluateText(r, { costUnit: null }), { width: 120 });
    const flat = text.replace(/\s+/g, ' ');
    expect(flat).toContain('1 of the design\'s 4 pairs has no value in the file and counts 0');
    expect(flat).toContain('net value');
    expect(text).toContain('large ↔ van');
    expect(text).not.toContain('small ↔ small  '); // not in the table of pairs with a value
  });

  it('a design chosen by --design: drop small–small, add large–large → value rate 28.8', async () => {
    // Pairs small–bike, small–van, large–van, large–large (4 pairs, 4 classes, one self-pair):
    //   r_sb = λ_bike = 2.4; small: 3 = r_sb + r_sv → r_sv = 0.6;
    //   van: 2.4 = r_sv + r_lv → r_lv = 1.8; large: 2 = r_lv + 2 r_ll → r_ll = 0.1
    // value rate = 5·2.4 + 3·0.6 + 8·1.8 + 6·0.1 = 12 + 1.8 + 14.4 + 0.6 = 28.8
    const r = await evaluateDoc(courier(), { design: { added: [['large', 'large']], removed: [['small', 'small']], from: 'd.json' } });
    expect(r.reference.kind).toBe('design');
    expect(close(rateOf(r, 'large', 'large'), 0.1)).toBe(true);
    expect(close(r.value!.rate, 28.8)).toBe(true);
    expect(r.value!.pairsWithoutValue).toBe(0);
  });

  it('a demand variant (--demand busy: van 2.5) → value rate 29.5', async () => {
    //   r_sb = 2.4, r_lv = 2, r_sv = 2.5 − 2 = 0.5, r_ss = (3 − 2.4 − 0.5) / 2 = 0.05
    // value rate = 12 + 3·0.5 + 16 = 29.5
    const r = await evaluateDoc(courier(), { demand: 'busy' });
    expect(close(rateOf(r, 'small', 'small'), 0.05)).toBe(true);
    expect(close(r.value!.rate, 29.5)).toBe(true);
  });

  it('patience in the file: the warnings say the value figures ignore it, and the text says so beside them', async () => {
    const doc = courier();
    (doc['classes'] as Array<Record<string, unknown>>)[3]!['patience'] = 1.5;
    const r = await evaluateDoc(doc);
    expect(r.warnings.some((w) => w.startsWith('The value rate, waiting cost and net value ignore patience') && w.includes('van'))).toBe(true);
    expect(r.value!.patienceIgnored).toBe(true);
    expect(renderDoc(evaluateText(r, { costUnit: null }), { width: 120 }).replace(/\s+/g, ' ')).toContain('patience is ignored');
  });

  it('no values and no waitingCost: no value figures, no value warning', async () => {
    const doc = courier();
    delete doc['waitingCost'];
    doc['compatibilities'] = [['small', 'bike'], ['small', 'van'], ['large', 'van'], ['small', 'small']];
    doc['candidates'] = [];
    const r = await evaluateDoc(doc);
    expect(r.value).toBeNull();
    expect(r.matchRates.every((m) => m.value === null)).toBe(true);
  });

  it('waitingCost only: value rate 0, net value = −waitingCost × backlog', async () => {
    const doc = courier({ waitingCost: 0.5 });
    doc['compatibilities'] = [['small', 'bike'], ['small', 'van'], ['large', 'van'], ['small', 'small']];
    doc['candidates'] = [];
    const r = await evaluateDoc(doc);
    expect(r.value!.rate).toBe(0);
    expect(r.value!.pairsWithValue).toBe(0);
    expect(close(r.value!.net, -0.5 * r.backlog!.total)).toBe(true);
  });
});

describe('evaluate: value rate on seeded random designs with forced match rates (conservation, derived by hand)', () => {
  // A random tree on n classes plus one more pair that closes an odd cycle (or a self-pair): n pairs,
  // one odd cycle. Positive flows f_e are drawn on the pairs and the rates set to λ_i = Σ f_e over
  // the pairs at i (a self-pair twice). The flows solve the conservation system, which has a unique
  // solution (invertible matrix), so the exact match rates must equal them; a positive flow on every
  // pair of a connected non-bipartite design also makes it stable ("Stability of the stochastic
  // matching model", J. Appl. Probab. 2016, from memory).
  for (const seed of [1, 2, 3, 4, 5, 6, 7, 8]) {
    it(`seed ${seed}`, async () => {
      const rng = new Rng(500 + seed);
      const n = rng.int(5, 12);
      const pairs: Array<[number, number]> = [];
      const depth = new Array<number>(n).fill(0);
      const parent = new Array<number>(n).fill(-1);
      for (let v = 1; v < n; v++) {
        const u = rng.int(0, v - 1);
        pairs.push([u, v]);
        parent[v] = u;
        depth[v] = depth[u]! + 1;
      }
      if (seed % 2 === 0) {
        const k = rng.int(0, n - 1);
        pairs.push([k, k]);
      } else {
        // two classes at even tree distance, not already joined: the extra pair closes an odd cycle
        const dist = (a: number, b: number): number => {
          let d = 0;
          while (a !== b) {
            if (depth[a]! >= depth[b]!) a = parent[a]!;
            else b = parent[b]!;
            d++;
          }
          return d;
        };
        const options: Array<[number, number]> = [];
        for (let a = 0; a < n; a++) for (let b = a + 1; b < n; b++) if (dist(a, b) % 2 === 0) options.push([a, b]);
        pairs.push(options[rng.int(0, options.length - 1)]!);
      }
      const flows = pairs.map(() => Number(rng.uniform(0.2, 2).toFixed(3)));
      const rates = new Array<number>(n).fill(0);
      pairs.forEach(([a, b], e) => {
        rates[a]! += flows[e]!;
        rates[b]! += flows[e]!;
      });
      const values = pairs.map((_, e) => (e % 3 === 2 ? undefined : Number(rng.uniform(-3, 10).toFixed(2))));
      // the conservation matrix is invertible (ml-matrix), so the flows are the only solution
      const A = Matrix.zeros(n, n);
      pairs.forEach(([a, b], e) => {
        A.set(a, e, A.get(a, e) + 1);
        A.set(b, e, A.get(b, e) + 1);
      });
      expect(Math.abs(determinant(A))).toBeGreaterThan(0.5); // an integer matrix: |det| ≥ 1
      const ids = Array.from({ length: n }, (_, k) => `c${k}`);
      const doc = {
        name: `forced ${seed}`,
        timeUnit: 'minute',
        classes: ids.map((id, k) => ({ id, rate: Number(rates[k]!.toFixed(6)) })),
        compatibilities: pairs.map(([a, b], e) => (values[e] === undefined ? [ids[a], ids[b]] : { pair: [ids[a], ids[b]], value: values[e] })),
      };
      // the rates as written (6 decimals) carry the flows exactly: each λ is a sum of 3-decimal flows
      const r = await evaluateDoc(doc);
      expect(r.stable).toBe(true);
      let expected = 0;
      pairs.forEach(([a, b], e) => {
        expect(close(rateOf(r, ids[a]!, ids[b]!), flows[e]!)).toBe(true);
        expected += (values[e] ?? 0) * flows[e]!;
      });
      expect(close(r.value!.rate, expected)).toBe(true);
      expect(r.value!.waitingCost).toBeNull();
      expect(r.value!.waitingCostRate).toBe(0);
      expect(r.value!.pairsWithoutValue).toBe(values.filter((v) => v === undefined).length);
    });
  }
});
