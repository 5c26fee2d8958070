/**
 * Runs once before the test files: compiles the sources to dist/ and bundles the command line
 * (`npm run build`), so that the tests about the built CLI (worker threads, piped output, SIGINT)
 * spawn `node dist/cli/main.js` as a user would, and no test file rebuilds dist/ while another one
 * runs it.
 */
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { join } from 'node:path';

export default function setup(): void {
  const root = join(import.meta.dirname, '..');
  // Errors in files of other work in progress may make tsc exit non-zero; it still emits.
  const r = spawnSync(process.execPath, [join(root, 'node_modules', 'typescript', 'bin', 'tsc'), '-p', 'tsconfig.build.json'], { cwd: root, encoding: 'utf8' });
  if (!existsSync(join(root, 'dist', 'cli', 'main.js'))) throw new Error(`the build did not produce dist/cli/main.js:\n${r.stdout}${r.stderr}`);
  // then bundles the command line as `npm run build` does (scripts/bundle-cli.mjs)
  const b = spawnSync(process.execPath, [join(root, 'scripts', 'bundle-cli.mjs')], { cwd: root, encoding: 'utf8' });
  if (b.status !== 0) throw new Error(`bundling the command line failed:\n${b.stdout}${b.stderr}`);
}
