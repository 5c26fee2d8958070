import { mkdtempSync, rmSync, truncateSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { InvalidScenarioError } from '../../src/errors.js';
import { exitCodeOf } from '../../src/cli/exit.js';
import { loadScenario } from '../../src/cli/load.js';
import { LIMITS } from '../../src/model/limits.js';

// The documented file-size limit (docs/scenario-format.md, "Size limits"): a file past it is refused
// before it is read, naming the limit.

const dir = mkdtempSync(join(tmpdir(), 'edgewise-load-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('loadScenario', () => {
  it('refuses a file past the size limit without reading it (a sparse file of zeros)', () => {
    const big = join(dir, 'big.json');
    writeFileSync(big, '');
    truncateSync(big, LIMITS.fileChars + 1);
    try {
      loadScenario('big.json', dir);
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(InvalidScenarioError);
      expect(exitCodeOf(e)).toBe(2);
      expect((e as Error).message).toMatch(/16,777,217 bytes, more than the limit of 16,777,216 \(16 MiB\)/);
    }
  });

  it('reads a file at the limit as usual', () => {
    const ok = join(dir, 'ok.json');
    const text = JSON.stringify({ classes: [{ id: 'a', rate: 1 }], compatibilities: [['a', 'a']] });
    writeFileSync(ok, text + ' '.repeat(LIMITS.fileChars - text.length));
    expect(loadScenario('ok.json', dir).classes).toHaveLength(1);
  });
});
