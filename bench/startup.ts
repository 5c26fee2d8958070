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
import { readFileSync, writeFileSync } from 'node:fs';
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
  const record = `const m = /node_modules\\/((?:@[^/]+\\/)?[^/]+)/.exec(String(u)); if (m) appendFileSync(process.env.EDGEWISE_TRACE, m[1] + '\\n');`;
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
  log(`command             CPU s   wall s  ${before ? 'CPU s before  ' : ''}heavy packages loaded`);
  commands.forEach(([name, args], i) => {
    writeFileSync(out, '');
    spawnSync(process.execPath, ['--import', hook, cli.path, ...args], { env: { ...process.env, EDGEWISE_TRACE: out }, encoding: 'utf8' });
    const loaded = new Set(readFileSync(out, 'utf8').split('\n').filter(Boolean));
    const heavy = HEAVY.filter((p) => loaded.has(p));
    const c = cpu[i]!.length > 0 ? median(cpu[i]!).toFixed(3) : '?';
    const b = before ? `${(cpuBefore[i]!.length > 0 ? median(cpuBefore[i]!).toFixed(3) : '?').padStart(12)}  ` : '';
    log(`${name.padEnd(18)}  ${c.padStart(5)}  ${median(wall[i]!).toFixed(3).padStart(6)}  ${b}${heavy.join(', ') || '-'} (${loaded.size} packages)`);
  });
  log(`(1-minute load average before each round: ${loads.join(', ')}; CPU time moves less than wall time with the other load)`);
}

main();
