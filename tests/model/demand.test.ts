import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { demandVariants } from '../../src/model/demand.js';
import { parseScenario } from '../../src/model/validate.js';
import { InvalidScenarioError } from '../../src/errors.js';

// Demand variants (src/model/demand.ts). References: the format as documented in
// docs/scenario-format.md ("Demand variants"); expected rate vectors are written out by hand from
// the documented rule "a variant overrides the classes it names, the others keep their rate".

const base = {
  name: 'kart racing lobby',
  timeUnit: 'minute',
  classes: [
    { id: 'rookie', rate: 2 },
    { id: 'pro racer', rate: 3 },
    { id: 'ghost', rate: 1.5 },
  ],
  compatibilities: [['rookie', 'pro racer'], ['pro racer', 'pro racer'], ['ghost', 'pro racer']],
};
const load = (demand: unknown) => parseScenario(JSON.stringify({ ...base, demand }), 'lobby.json');
// the whole file is validated when it is read, so problems of `demand` come from parseScenario
const problems = (demand: unknown): Array<{ path: string; message: string }> => {
  try {
    load(demand);
  } catch (e) {
    expect(e).toBeInstanceOf(InvalidScenarioError);
    return [...(e as InvalidScenarioError).problems];
  }
  throw new Error('expected InvalidScenarioError');
};

describe('demandVariants', () => {
  it('is empty when the scenario has no demand field', () => {
    expect(demandVariants(parseScenario(JSON.stringify(base)))).toEqual([]);
  });

  it('overrides named classes and keeps the others (hand-written expected vectors)', () => {
    const v = demandVariants(load({ 'friday night': { rookie: 4, ghost: 0.5 }, quiet: { 'pro racer': 1 } }));
    expect(v.map((x) => x.name)).toEqual(['friday night', 'quiet']);
    expect(Array.from(v[0]!.rates)).toEqual([4, 3, 0.5]);
    expect(v[0]!.changed).toEqual(['rookie', 'ghost']);
    expect(Array.from(v[1]!.rates)).toEqual([2, 1, 1.5]);
  });

  it('a variant rate may be 0: no items of that class arrive in the variant', () => {
    const v = demandVariants(load({ summer: { ghost: 0 } }));
    expect(Array.from(v[0]!.rates)).toEqual([2, 3, 0]);
  });

  it('lists every problem with its JSON path at once', () => {
    const p = problems({
      peak: { rookie: -1, 'pro racr': 2, ghost: 'many' },
      today: { rookie: 1 },
      empty: {},
      notAnObject: [1, 2],
    });
    expect(p).toEqual([
      { path: 'demand.peak.rookie', message: 'rate must be >= 0 (0: no arrivals in this variant), found -1' },
      { path: 'demand.peak["pro racr"]', message: 'unknown class "pro racr" (known: rookie, pro racer, ghost)' },
      { path: 'demand.peak.ghost', message: 'rate must be a finite number >= 0 (0: no arrivals in this variant), found "many"' },
      { path: 'demand.today', message: 'the name "today" is reserved for the rates written in classes; pick another name' },
      { path: 'demand.empty', message: 'empty: name at least one class and its rate' },
      { path: 'demand.notAnObject', message: 'must be an object mapping class ids to rates, found [1,2]' },
    ]);
  });

  it('refuses a demand field that is not an object, or an empty one', () => {
    expect(problems([{ rookie: 1 }])[0]!.path).toBe('demand');
    expect(problems({})).toEqual([{ path: 'demand', message: 'empty: list at least one named rate set, or leave the field out' }]);
    expect(problems(null)[0]!.message).toMatch(/must be an object of named rate sets/);
  });

  it('the error names the source file and counts the problems, as the validator does', () => {
    try {
      load({ peak: { rookie: -1, ghost: Infinity } });
      throw new Error('unreachable');
    } catch (e) {
      // Infinity is not JSON: it becomes null in the file text, which is refused as not finite
      expect((e as Error).message.split('\n')).toEqual([
        'lobby.json: 2 problems',
        '  - demand.peak.rookie: rate must be >= 0 (0: no arrivals in this variant), found -1',
        '  - demand.peak.ghost: rate must be a finite number >= 0 (0: no arrivals in this variant), found null',
      ]);
    }
  });

  it('the example of docs/scenario-format.md produces the messages it shows', () => {
    const doc = readFileSync(join(import.meta.dirname, '..', '..', 'docs', 'scenario-format.md'), 'utf8');
    const section = doc.slice(doc.indexOf('## Demand variants'), doc.indexOf('## What each command uses'));
    const shown = section.split('\n').filter((l) => l.startsWith('  - demand'));
    expect(shown.length).toBe(3);
    const ride = JSON.parse(readFileSync(join(import.meta.dirname, '..', '..', 'scenarios', 'ride-pooling-hub.json'), 'utf8'));
    try {
      parseScenario(JSON.stringify({ ...ride, demand: { peak: { 'tech-parc': 3, airport: -2 }, today: { airport: 3 } } }), 'scenarios/ride.json');
      throw new Error('unreachable');
    } catch (e) {
      const lines = (e as Error).message.split('\n');
      expect(lines[0]).toBe('scenarios/ride.json: 3 problems');
      // the documented list abbreviates the known ids; compare up to the ellipsis
      for (const line of shown) {
        const cut = line.indexOf('…');
        const prefix = cut >= 0 ? line.slice(0, line.lastIndexOf(',', cut)) : line;
        expect(lines.some((l) => l.startsWith(prefix))).toBe(true);
      }
    }
  });

  it('ride-pooling-hub.json ships three variants; under "tech-park-launch" {tech-park} is overloaded (26 ≥ 17 + 6)', () => {
    // Stability condition ("Stability of the stochastic matching model", J. Appl. Probab. 2016):
    // an independent set I without self-loop needs λ(I) < λ(N(I)); tech-park has no self-loop
    // today, so I = {tech-park} with its neighbours read from the file.
    const ride = parseScenario(readFileSync(join(import.meta.dirname, '..', '..', 'scenarios', 'ride-pooling-hub.json'), 'utf8'));
    const v = demandVariants(ride);
    expect(v.map((x) => x.name)).toEqual(['rainy-evening', 'concert-night', 'tech-park-launch']);
    const launch = v[2]!;
    const k = ride.classes.findIndex((c) => c.id === 'tech-park');
    const nb = ride.compatibilities.flatMap((c) => (c.pair[0] === 'tech-park' ? [c.pair[1]] : c.pair[1] === 'tech-park' ? [c.pair[0]] : []));
    expect(nb).not.toContain('tech-park');
    const capacity = nb.reduce((sum, id) => sum + launch.rates[ride.classes.findIndex((c) => c.id === id)]!, 0);
    expect(capacity).toBe(23);
    expect(launch.rates[k]).toBe(26);
  });
});
