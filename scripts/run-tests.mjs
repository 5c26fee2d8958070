// Runs the whole vitest suite, then prints one plain closing line "N passed, N failed" (and
// ", N skipped" when any test was skipped, with the skipped tests and the reason their file printed
// listed just above it), read from vitest's JSON reporter, so that a run which executed no test is
// visible.
import { spawnSync } from 'node:child_process';
import { mkdirSync, readFileSync, existsSync, rmSync } from 'node:fs';

const out = '.test-output/vitest.json';
mkdirSync('.test-output', { recursive: true });
if (existsSync(out)) rmSync(out);
const args = ['vitest', 'run', '--reporter=default', '--reporter=json', `--outputFile.json=${out}`, ...process.argv.slice(2)];
const run = spawnSync('npx', args, { stdio: 'inherit' });
let passed = 0;
let failed = 0;
let skipped = 0;
const skippedNames = [];
if (existsSync(out)) {
  const report = JSON.parse(readFileSync(out, 'utf8'));
  passed = report.numPassedTests ?? 0;
  failed = report.numFailedTests ?? 0;
  if ((report.numFailedTestSuites ?? 0) > 0 && failed === 0) failed = report.numFailedTestSuites;
  for (const file of report.testResults ?? []) {
    for (const t of file.assertionResults ?? []) {
      if (t.status === 'skipped' || t.status === 'pending' || t.status === 'todo') {
        skipped++;
        skippedNames.push(`${file.name.replace(process.cwd() + '/', '')}: ${t.fullName}`);
      }
    }
  }
}
if (skipped > 0) {
  // Each skipping test file prints its reason ("SKIPPED: …") when it is loaded; repeat the names here.
  console.log(`\nskipped (${skipped}); the reason is printed by the test file above as "SKIPPED: …":`);
  for (const name of skippedNames) console.log(`  - ${name}`);
}
console.log(`${passed} passed, ${failed} failed${skipped > 0 ? `, ${skipped} skipped` : ''}`);
const code = run.status ?? 1;
process.exit(code !== 0 ? code : passed === 0 ? 1 : 0);
