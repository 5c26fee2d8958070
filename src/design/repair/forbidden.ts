/** The candidates a scenario's forbidden pairs keep out (the design problem leaves them out of its toggles). */
import type { DesignFields } from '../../model/design-fields.js';
import { pairKey, type Scenario } from '../../model/scenario.js';
import type { ForbiddenCandidate } from './types.js';

export function forbiddenCandidates(scenario: Scenario, fields: DesignFields): ForbiddenCandidate[] {
  const forbid = new Set(fields.forbidden.map((p) => pairKey(p[0], p[1])));
  const index = new Map(scenario.classes.map((c, k) => [c.id, k] as const));
  const out: ForbiddenCandidate[] = [];
  scenario.candidates.forEach((c, source) => {
    if (!forbid.has(pairKey(c.pair[0], c.pair[1]))) return;
    const x = index.get(c.pair[0])!;
    const y = index.get(c.pair[1])!;
    out.push({ a: Math.min(x, y), b: Math.max(x, y), source });
  });
  return out;
}
