/**
 * Start-up cost of the built CLI: CPU seconds (user + system, GNU time) of each command on a small
 * scenario, median of several interleaved rounds, and the npm packages each command loaded (read
 * by a module-resolution hook, so the list is what Node really resolved, not what the code
 * declares). The heavy packages (HiGHS, Observable Plot, linkedom, the CSV libraries, cli-progress)
 * should appear only under the commands that use them.
 *
 * Run alone: npx tsx bench/startup.ts   (about half a minute). Figures are printed, never asserted.
 * EDGEWISE_STARTUP_BEFORE=/path/to/other/dist/cli/main.js adds that build's CPU seconds (interleaved
 * in the same rounds), e.g. a build of the commit before a change.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { builtCli, load, median, repoRoot, scratchDir, timeProcess } from './_processes.js';

const HEAVY = ['highs', '@observablehq/plot', 'linkedom', 'csv-parse', 'csv-stringify', 'cli-progress', 'javascript-lp-solver', 'graphology', 'zod'];

const log = (line: string): void => console.log(line);

function main(): void {
  const cli = builtCli();
  if ('skip' in cli) {
    log(`start-up bench skipped: ${cli.skip}`);
    return;
  }
  const dir = scratchDir('edgewise-startup-');
  // a resolve hook that writes every npm package an ESM module comes from, and a wrapper of the
  // CommonJS loader for the packages loaded by require() (createRequire and the packages' own)
  const hook = join(dir, 'trace.mjs');
  const out = join(dir, 'packages.txt');
  // npm packages, and the files of the bundled command line (dist/cli/main.js, its chunks, the worker)
  const record =
    `const m = /node_modules\\/((?:@[^/]+\\/)?[^/]+)/.exec(String(u)); if (m) appendFileSync(process.env.EDGEWISE_TRACE, m[1] + '\\n'); ` +
    `const f = /dist\\/cli\\/((?:chunk-[A-Z0-9]+|main|worker)\\.js)$/.exec(String(u)); if (f) appendFileSync(process.env.EDGEWISE_TRACE, 'file:' + f[1] + '\\n');`;
  writeFileSync(
    hook,
    `import Module, { register } from 'node:module';\n` +
      `import { appendFileSync } from 'node:fs';\n` +
      `const load = Module._load;\n` +
      `Module._load = function (request, parent, isMain) { const r = load.apply(this, arguments); try { const u = Module._resolveFilename(request, parent, isMain); ${record} } catch {} return r; };\n` +
      `register('data:text/javascript,' + encodeURIComponent(${JSON.stringify(
        `import { appendFileSync } from 'node:fs';\n` + `export async function resolve(s, c, next) { const r = await next(s, c); const u = r.url; ${record} return r; }\n`,
      )}));\n`,
  );
  const scenario = join(repoRoot, 'scenarios', 'ride-pooling-hub.json');
  const html = join(dir, 'report.html');
  const commands: Array<[string, string[]]> = [
    ['--version', ['--version']],
    ['check', ['check', scenario]],
    ['check --json', ['check', scenario, '--json']],
    ['evaluate', ['evaluate', scenario]],
    ['sensitivity --csv', ['sensitivity', scenario, '--csv']],
    ['simulate', ['simulate', scenario, '--arrivals', '20000', '--replications', '2', '--jobs', '1']],
    ['recommend', ['recommend', scenario, '--jobs', '1']],
    ['report', ['report', scenario, '-o', html, '--jobs', '1']],
  ];
  const rounds = Number(process.env.EDGEWISE_STARTUP_ROUNDS ?? 5);
  log(`start-up: CPU seconds (user + system) of the built CLI on scenarios/ride-pooling-hub.json (10 classes), median of ${rounds} interleaved rounds`);
  const before = process.env.EDGEWISE_STARTUP_BEFORE;
  const cpu = commands.map(() => [] as number[]);
  const wall = commands.map(() => [] as number[]);
  const cpuBefore = commands.map(() => [] as number[]);
  const loads: string[] = [];
  for (let r = 0; r < rounds; r++) {
    loads.push(load());
    commands.forEach(([, args], i) => {
      const t = timeProcess(process.execPath, [cli.path, ...args]);
      wall[i]!.push(t.wall);
      if (t.cpu !== undefined) cpu[i]!.push(t.cpu);
      if (before) {
        const b = timeProcess(process.execPath, [before, ...args]);
        if (b.cpu !== undefined) cpuBefore[i]!.push(b.cpu);
      }
    });
  }
  const map = join(repoRoot, 'dist', 'cli', 'bundle-packages.json');
  const bundled = (existsSync(map) ? JSON.parse(readFileSync(map, 'utf8')) : {}) as Record<string, string[]>;
  log(`command             CPU s   wall s  ${before ? 'CPU s before  ' : ''}heavy packages loaded (bundled or from node_modules)`);
  commands.forEach(([name, args], i) => {
    writeFileSync(out, '');
    const traced = spawnSync(process.execPath, ['--import', hook, cli.path, ...args], { env: { ...process.env, EDGEWISE_TRACE: out }, encoding: 'utf8' });
    if (traced.status !== 0) log(`  (the traced run of ${name} exited ${traced.status}: ${traced.stderr.trim().split('\n').slice(0, 8).join(' / ')})`);
    const lines = readFileSync(out, 'utf8').split('\n').filter(Boolean);
    // the packages inside the bundle's files that were loaded (scripts/bundle-cli.mjs), and the others
    const loaded = new Set(lines.filter((l) => !l.startsWith('file:')));
    for (const l of lines) if (l.startsWith('file:')) for (const p of bundled[l.slice(5)] ?? []) loaded.add(p);
    const heavy = HEAVY.filter((p) => loaded.has(p));
    const c = cpu[i]!.length > 0 ? median(cpu[i]!).toFixed(3) : '?';
    const b = before ? `${(cpuBefore[i]!.length > 0 ? median(cpuBefore[i]!).toFixed(3) : '?').padStart(12)}  ` : '';
    log(`${name.padEnd(18)}  ${c.padStart(5)}  ${median(wall[i]!).toFixed(3).padStart(6)}  ${b}${heavy.join(', ') || '-'} (${loaded.size} packages)`);
  });
  log(`(1-minute load average before each round: ${loads.join(', ')}; CPU time moves less than wall time with the other load)`);
}

main();
