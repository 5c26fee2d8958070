// Bundles the command line after `tsc` (npm run build): dist/cli/main.js and the worker
// dist/cli/worker.js are rewritten as esbuild bundles, with code splitting so that every command
// still loads only what it uses (one chunk per lazily imported part, dist/cli/chunk-*.js). Loading
// some 250 small ES modules (our files and zod's, commander's, ...) cost about 70 ms of every
// command's start-up; a handful of chunks costs a fraction of it (bench/startup.ts).
//
// The library (dist/index.js and the rest of dist/) stays as tsc wrote it. The heavy packages that
// are loaded only on demand (HiGHS, Observable Plot, linkedom, cli-progress, csv-stringify) stay
// outside the bundle and are loaded from node_modules when a command needs them.
//
// Without esbuild (an install without the dev dependencies) the tsc output is left as it is: the
// same program, only slower to start.
import { existsSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';

const root = join(import.meta.dirname, '..');
let esbuild;
try {
  esbuild = await import('esbuild');
} catch {
  console.log('bundle-cli: esbuild is not installed; dist/cli/main.js stays as tsc wrote it');
  process.exit(0);
}
const out = join(root, 'dist', 'cli');
if (!existsSync(join(out, 'main.js'))) {
  console.error('bundle-cli: dist/cli/main.js is missing: run tsc first');
  process.exit(1);
}
// chunks of an earlier build (tsc writes no file of that name)
for (const f of readdirSync(out)) if (/^chunk-[A-Z0-9]+\.js(\.map)?$/.test(f)) rmSync(join(out, f));
const result = await esbuild.build({
  absWorkingDir: root,
  // the worker sits next to main.js: src/workers/pool.ts finds it as ./worker.js beside itself,
  // and in the bundle "itself" is a file of dist/cli (entries and chunks alike, see chunkNames)
  entryPoints: { main: 'src/cli/main.ts', worker: 'src/workers/worker.ts' },
  outdir: out,
  chunkNames: 'chunk-[hash]',
  bundle: true,
  splitting: true,
  format: 'esm',
  platform: 'node',
  target: 'node20',
  sourcemap: true,
  external: ['highs', '@observablehq/plot', 'linkedom', 'cli-progress', 'csv-stringify'],
  // bundled CommonJS packages call require(); give the ES module one
  banner: { js: "import { createRequire as __edgewiseRequire } from 'node:module'; const require = __edgewiseRequire(import.meta.url);" },
  logLevel: 'warning',
  metafile: true,
});
// which npm packages each output file holds: bench/startup.ts reads it to name the packages a
// command loaded, bundled or not
const packages = {};
for (const [file, o] of Object.entries(result.metafile.outputs)) {
  if (!file.endsWith('.js')) continue;
  const names = new Set();
  for (const input of Object.keys(o.inputs)) {
    const m = /node_modules\/((?:@[^/]+\/)?[^/]+)/.exec(input);
    if (m) names.add(m[1]);
  }
  packages[file.split('/').pop()] = [...names].sort();
}
writeFileSync(join(out, 'bundle-packages.json'), JSON.stringify(packages, null, 1) + '\n');
