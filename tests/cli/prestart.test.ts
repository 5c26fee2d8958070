import { describe, expect, it } from 'vitest';
import { DEFAULT_REPLICATIONS, prestartScoring, prestartSimulation } from '../../src/cli/prestart.js';
import { SIM_DEFAULTS } from '../../src/sim/simulate.js';
import { pendingPrestarted } from '../../src/workers/pool.js';

describe('workers started before simulate loads (src/cli/prestart.ts)', () => {
  it('counts replications by the simulator’s own default', () => {
    expect(DEFAULT_REPLICATIONS).toBe(SIM_DEFAULTS.replications);
  });

  it('starts nothing from the TypeScript sources (no compiled worker), whatever the flags', async () => {
    // from sources workerUrl() is undefined: the pool runs everything in this thread (pool.ts)
    await prestartSimulation({ jobs: '4', replications: '8' });
    await prestartSimulation({ jobs: 'many' });
    await prestartScoring({ jobs: '2' });
    expect(pendingPrestarted()).toBe(0);
  });
});
