/**
 * `npm run bench`: runs every benchmark script in bench/ (each in its own process) and prints their
 * figures. Figures are never asserted; see each script for what it measures.
 *   npm run bench                 all
 *   npm run bench -- evaluate     only bench/evaluate.ts
 */
import { spawnSync } from 'node:child_process';
import { readdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { cpus, totalmem } from 'node:os';

const here = dirname(fileURLToPath(import.meta.url));
const only = process.argv.slice(2);
const scripts = readdirSync(here)
  .filter((f) => f.endsWith('.ts') && f !== 'run.ts' && !f.startsWith('_'))
  .filter((f) => only.length === 0 || only.includes(f.replace(/\.ts$/, '')))
  .sort();
console.log(`edgewise benchmarks — node ${process.version}, ${cpus().length} cores (${cpus()[0]?.model ?? '?'}), ${(totalmem() / 2 ** 30).toFixed(0)} GiB`);
// the CLI and worker-thread comparisons run the built code
const build = spawnSync('npm', ['run', '--silent', 'build'], { stdio: 'inherit', cwd: join(here, '..') });
console.log(build.status === 0 ? 'dist/ built' : 'npm run build failed: the comparisons that run dist/ are skipped');
let failed = 0;
for (const f of scripts) {
  console.log(`\n=== ${f} ===`);
  const t0 = performance.now();
  const p = spawnSync(process.execPath, ['--import', 'tsx', join(here, f)], { stdio: 'inherit' });
  console.log(`(${f}: ${((performance.now() - t0) / 1000).toFixed(1)} s${p.status === 0 ? '' : `, exit ${p.status}`})`);
  if (p.status !== 0) failed++;
}
process.exit(failed > 0 ? 1 : 0);
