import { describe, expect, it } from 'vitest';
import { pairKey } from '../../src/model/scenario.js';
import { parseScenario } from '../../src/model/validate.js';
import { Rng } from '../helpers/random.js';

// pairKey must be a function of the unordered pair alone and never give two distinct pairs the
// same key. Reference: the definition of an unordered pair; the ids below are hand-picked so that
// joining with a separator character (U+0000 in an earlier version) would collide.

describe('pairKey', () => {
  it('ignores order', () => {
    expect(pairKey('north', 'centre')).toBe(pairKey('centre', 'north'));
    expect(pairKey('a', 'a')).toBe(pairKey('a', 'a'));
  });

  it('separates pairs that a joined string would confuse (ids holding U+0000 or quotes)', () => {
    expect(pairKey('a\u0000b', 'c')).not.toBe(pairKey('a', 'b\u0000c'));
    expect(pairKey('a', '\u0000')).not.toBe(pairKey('a\u0000', ''));
    expect(pairKey('"', ',')).not.toBe(pairKey('","', ''));
  });

  it('is injective on random pairs of ids drawn from a tiny alphabet with separators (seeded)', () => {
    const rng = new Rng(2024);
    const alphabet = ['a', '\u0000', '"', ',', '[', '\\'];
    const id = (): string => Array.from({ length: rng.int(0, 3) }, () => alphabet[rng.int(0, alphabet.length - 1)]!).join('');
    const byKey = new Map<string, string>();
    for (let t = 0; t < 5000; t++) {
      const a = id();
      const b = id();
      const canonical = JSON.stringify(a <= b ? [a, b] : [b, a]); // the unordered pair itself
      const key = pairKey(a, b);
      const prev = byKey.get(key);
      if (prev !== undefined) expect(prev).toBe(canonical);
      byKey.set(key, canonical);
    }
    expect(byKey.size).toBeGreaterThan(100);
  });

  it('a scenario with such ids keeps both compatibilities (no false duplicate)', () => {
    const s = parseScenario(
      JSON.stringify({
        classes: [{ id: 'a\u0000b', rate: 1 }, { id: 'c', rate: 1 }, { id: 'a', rate: 1 }, { id: 'b\u0000c', rate: 1 }],
        compatibilities: [['a\u0000b', 'c'], ['a', 'b\u0000c']],
      }),
    );
    expect(s.compatibilities).toHaveLength(2);
  });
});
