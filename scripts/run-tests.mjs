// Runs the whole vitest suite, then prints one plain closing line "N passed, N failed"
// (from vitest's JSON reporter) so that a run which executed no test is visible.
import { spawnSync } from 'node:child_process';
import { mkdirSync, readFileSync, existsSync, rmSync } from 'node:fs';

const out = '.test-output/vitest.json';
mkdirSync('.test-output', { recursive: true });
if (existsSync(out)) rmSync(out);
const args = ['vitest', 'run', '--reporter=default', '--reporter=json', `--outputFile.json=${out}`, ...process.argv.slice(2)];
const run = spawnSync('npx', args, { stdio: 'inherit' });
let passed = 0;
let failed = 0;
if (existsSync(out)) {
  const report = JSON.parse(readFileSync(out, 'utf8'));
  passed = report.numPassedTests ?? 0;
  failed = (report.numFailedTests ?? 0) + (report.numFailedTestSuites ?? 0) - 0;
  failed = report.numFailedTests ?? 0;
  if ((report.numFailedTestSuites ?? 0) > 0 && failed === 0) failed = report.numFailedTestSuites;
}
console.log(`${passed} passed, ${failed} failed`);
const code = run.status ?? 1;
process.exit(code !== 0 ? code : passed === 0 ? 1 : 0);
