import type { ChangeRecord, SensitivityRecord } from '../../usecases/sensitivity.js';
import { num, pairText, rate, setText, signed, wait, waitScale } from '../format.js';
import { instabilityBlocks, referenceWords } from './common.js';
import { list, para, tableBlock, title, type Block } from './doc.js';

const RULE_WORDS: Record<string, string> = {
  forbidden: 'forbidden',
  fixed: 'fixed (not removable)',
  'must-keep': 'must keep',
  limit: 'over maxCompatibilities',
};

function condition(c: ChangeRecord, hasBottleneck: boolean): string {
  if (!hasBottleneck || c.relation === null) return '—';
  const what = c.change === 'add' ? 'harm' : 'benefit';
  const where = c.relation === 'joins-neighbours' ? 'joins two neighbours' : c.relation === 'touches' ? 'touches the bottleneck' : 'away from the bottleneck';
  return `${c.predicted ? `${what} predicted` : 'not predicted'} (${where})`;
}

/** The class whose mean wait changes most, e.g. "mage −3.2 min". */
function largestWaitChange(c: ChangeRecord, timeUnit: string, waits: readonly number[]): string {
  if (!c.waitDelta) return '';
  let best: [string, number] | undefined;
  for (const [id, d] of Object.entries(c.waitDelta)) if (d !== null && (!best || Math.abs(d) > Math.abs(best[1]))) best = [id, d];
  if (!best || best[1] === 0) return '';
  const scale = waitScale(timeUnit, waits);
  return `${best[0]} ${best[1] > 0 ? '+' : '−'}${wait(Math.abs(best[1]), scale)}`;
}

/** `sensitivity` for people. */
export function sensitivityText(r: SensitivityRecord): Block[] {
  const sim = r.method === 'simulation';
  const blocks: Block[] = [title(`${r.scenario} — ${sim ? 'simulated' : 'exact'} effect of single changes to ${referenceWords(r.reference)} (FCFM)`)];
  const hasBottleneck = r.base.bottlenecks.length > 0;
  const waits = Object.values(r.base.wait ?? {}).map((w) => w ?? NaN);
  if (!r.base.stable) {
    blocks.push(...instabilityBlocks(r.instability!, r.timeUnit, null));
    const allowed = r.additions.filter((c) => c.allowed);
    blocks.push(
      tableBlock(
        {
          columns: [{ header: 'add', wrap: true }, { header: 'cost', align: 'right' }, { header: 'on its own', wrap: true }, { header: 'backlog then', align: 'right' }],
          rows: allowed.map((c) => [pairText(c.pair), c.price === null ? '—' : num(c.price), c.verdict, c.backlog === null ? '—' : num(c.backlog)]),
        },
        'Each allowed addition on its own:',
      ),
    );
  } else {
    const b = r.base.bottlenecks[0];
    blocks.push(
      para(
        `${referenceWords(r.reference)}: mean backlog ${num(r.base.backlog!)}` +
          (r.base.backlogCi95 ? ` (simulated, 95 % interval ${num(r.base.backlogCi95[0])} to ${num(r.base.backlogCi95[1])})` : '') +
          (b
            ? ` · bottleneck ${r.base.bottlenecks.map((x) => setText(x.set)).join(' and ')} with ${rate(b.spareCapacity, r.timeUnit)} of spare capacity (can only be matched with ${setText(b.neighbours)})`
            : ' · no bottleneck (every class matches its own kind); the near-saturation condition does not apply'),
      ),
    );
    const table = (entries: readonly ChangeRecord[], kind: 'add' | 'remove'): Block => {
      const money = kind === 'add' ? 'cost' : 'saving';
      return tableBlock(
        {
          columns: [
            { header: kind === 'add' ? 'add' : 'remove', wrap: true },
            { header: money, align: 'right' },
            { header: 'backlog', align: 'right' },
            { header: 'Δ backlog', align: 'right' },
            ...(sim ? [{ header: 'Δ 95 % interval', align: 'right' as const }] : []),
            { header: `Δ per ${money}`, align: 'right', secondary: true },
            { header: sim ? 'simulated verdict' : 'exact verdict' },
            { header: 'near-saturation condition', wrap: true, secondary: true },
            { header: 'largest wait change', secondary: true },
          ],
          rows: entries.map((c) => [
            pairText(c.pair),
            c.price === null ? '—' : num(c.price),
            c.skipped ? '—' : c.stable ? num(c.backlog!) : 'unstable',
            c.delta === null ? (c.stable === false ? 'unbounded' : '—') : signed(c.delta),
            ...(sim ? [c.deltaCi95 ? `${signed(c.deltaCi95[0])} to ${signed(c.deltaCi95[1])}` : '—'] : []),
            c.deltaPerPrice === null ? '—' : signed(c.deltaPerPrice),
            c.verdict,
            condition(c, hasBottleneck),
            largestWaitChange(c, r.timeUnit, waits),
          ]),
        },
        kind === 'add' ? 'Additions the rules allow (most backlog saved per unit of cost first):' : 'Removals the rules allow (least backlog added per unit saved first):',
      );
    };
    const adds = r.additions.filter((c) => c.allowed);
    const rems = r.removals.filter((c) => c.allowed);
    blocks.push(adds.length > 0 ? table(adds, 'add') : para('Additions: none the rules allow (use --all-pairs to try every absent pair).'));
    if (rems.length > 0) blocks.push(table(rems, 'remove'));
  }
  const ruled = [...r.additions, ...r.removals].filter((c) => !c.allowed);
  if (ruled.length > 0) {
    blocks.push(
      tableBlock(
        {
          columns: [
            { header: 'change', wrap: true },
            { header: 'rule' },
            { header: 'Δ backlog if allowed', align: 'right' },
            { header: 'reason given', wrap: true, secondary: true },
          ],
          rows: ruled.map((c) => [`${c.change === 'add' ? 'add' : 'remove'} ${pairText(c.pair)}`, RULE_WORDS[c.rule ?? ''] ?? c.rule ?? '', c.delta === null ? (c.stable === false ? 'unstable' : '—') : signed(c.delta), c.ruleReason ?? '']),
        },
        `Not allowed by the scenario's rules (what each rule costs: a negative Δ is backlog the rule keeps you from saving):`,
      ),
    );
  }
  const notes: string[] = [];
  for (const c of [...r.additions, ...r.removals]) {
    if (c.certificate && r.base.stable) notes.push(`${c.change === 'add' ? 'with' : 'without'} ${pairText(c.pair)}: unstable (${setText(c.certificate.set)} outgrows ${setText(c.certificate.neighbours)})`);
    if (c.skipped) notes.push(`${pairText(c.pair)}: ${c.skipped}`);
  }
  if (notes.length > 0) blocks.push(list(notes));
  if (r.base.stable) {
    blocks.push(
      para(
        `Every figure is measured against ${referenceWords(r.reference)}. harmful: the addition raises the mean backlog; worth dropping: the removal lowers it (or keeps it and saves money). ` +
          (sim
            ? 'Simulated: each Δ is the paired difference against it under the same arrival stream (common random numbers), with its 95 % interval; ' +
              'not distinguishable: the interval holds 0, so this simulation cannot tell whether the change helps or hurts. '
            : '') +
          `The condition column is the published near-saturation criterion for the bottleneck; the ${sim ? 'simulated' : 'exact'} verdict is what holds.`,
      ),
    );
  }
  return blocks;
}
