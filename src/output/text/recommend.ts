import type { DesignFigures, VerdictRecord } from '../../usecases/designs.js';
import type { DecisionPart, RecommendRecord } from '../../usecases/recommend.js';
import { count, estimate, money, num, pairText, perUnit, pct, signed, unitName, wait, waitScale, type WaitScale } from '../format.js';
import { changesText, instabilityBlocks } from './common.js';
import { para, tableBlock, title, type Block } from './doc.js';

/** The change in words: fund / stop funding a candidate, keep / drop a removable compatibility. */
export function changeWord(v: Pick<VerdictRecord, 'kind' | 'change'>): string {
  if (v.kind === 'candidate') return v.change === 'add' ? 'fund' : 'stop funding';
  return v.change === 'add' ? 'keep' : 'drop';
}

const ADVICE_WORDS: Record<string, string> = {
  harmful: 'harmful',
  'no effect': 'no effect',
  'over budget': 'helps, but over the budget',
  'not allowed': 'helps, but not allowed (limits or targets)',
  keep: 'keep',
  'needed for stability': 'keep: needed for stability',
  'take it': 'take it',
};

/** The objective's value in words: a backlog, or a wait in the wait scale. */
function objectiveValue(d: DecisionPart, x: number | null, scale: WaitScale): string {
  if (x === null) return '—';
  return d.objective === 'max-wait' ? wait(x, scale) : d.objective === 'abandonment' ? pct(x) : num(x);
}

function deltaText(d: DecisionPart, v: VerdictRecord | undefined, scale: WaitScale): string {
  if (!v) return '—';
  if (v.delta === null) return v.stable ? '—' : 'unstable';
  if (d.objective === 'max-wait') return `${v.delta > 0 ? '+' : v.delta < 0 ? '−' : '±'}${wait(Math.abs(v.delta), scale)}`;
  return signed(v.delta);
}

/** The verdicts against the recommended design, with the same change measured against today's beside them. */
export function verdictBlocks(d: DecisionPart, scale: WaitScale): Block[] {
  const rec = d.verdicts.filter((v) => v.against === 'recommended');
  if (rec.length === 0) return [];
  const today = new Map(d.verdicts.filter((v) => v.against === 'today').map((v) => [`${v.pair[0]}\u0001${v.pair[1]}`, v] as const));
  const order = (v: VerdictRecord): number => (v.change === 'remove' ? 1 : 0);
  // best change first: the largest fall of a backlog or wait, the largest rise of a net value
  const s = d.objectiveBetter === 'higher' ? -1 : 1;
  const key = (v: VerdictRecord): number => (v.delta === null ? Infinity : s * v.delta);
  const rows = [...rec].sort((a, b) => order(a) - order(b) || key(a) - key(b)).map((v) => {
    const t = today.get(`${v.pair[0]}\u0001${v.pair[1]}`);
    return [
      `${changeWord(v)} ${pairText(v.pair)}`,
      num(v.price),
      deltaText(d, v, scale),
      ADVICE_WORDS[v.advice ?? ''] ?? v.advice ?? '',
      t ? `${changeWord(t)}: ${deltaText(d, t, scale)}` : '—',
    ];
  });
  return [
    tableBlock(
      {
        columns: [
          { header: 'single change', wrap: true },
          { header: 'price', align: 'right' },
          { header: `Δ ${d.objectiveLabel}`, align: 'right' },
          { header: 'advice', wrap: true },
          { header: "same pair from today's design", secondary: true },
        ],
        rows,
      },
      `Every single change, measured against the recommended design (Δ: the change of the ${d.objectiveLabel}${d.objectiveBetter === 'higher' ? ', + is better' : ''}; price: cost of adding or saving of dropping${d.costUnit ? `, in ${d.costUnit}` : ''}; the last column measures the same pair against today's design):`,
    ),
  ];
}

/** "Recommended: … cost …; backlog … (today …)." */
export function recommendedWords(d: DecisionPart, scale: WaitScale): string {
  const r = d.recommended;
  const today = d.today.stable ? objectiveValue(d, d.today.objective, scale) : 'unstable';
  const changes = r.added.length + r.removed.length === 0 ? "keep today's design" : changesText(r.added, r.removed);
  return `Recommended (${r.why}): ${changes} · cost ${money(r.cost, d.costUnit)} · ${d.objectiveLabel} ${objectiveValue(d, r.objective, scale)} (today: ${today}).`;
}

/** The abandonment limits of a design in a few words: "within", "noise: a, b" or "over: a". */
function limitsCell(e: DesignFigures): string {
  const l = e.abandonmentLimits;
  if (!l) return '—';
  const list = (xs: string[]): string => (xs.length > 2 ? `${xs.slice(0, 2).join(', ')} +${xs.length - 2}` : xs.join(', '));
  const over = l.filter((x) => !x.within).map((x) => x.class);
  if (over.length > 0) return `over: ${list(over)}`;
  const noise = l.filter((x) => x.withinNoise).map((x) => x.class);
  return noise.length > 0 ? `noise: ${list(noise)}` : 'within';
}

/** "lower", "higher" (significant), "within 1 %" (negligible) or "not distinguishable". */
function vsCheaperCell(v: NonNullable<DesignFigures['vsCheaper']>): string {
  if (v.significant) return v.backlogDifference < 0 ? 'lower' : 'higher';
  return v.negligible ? 'within 1 %' : 'not distinguishable';
}

function frontRow(d: DecisionPart, e: DesignFigures & { recommended?: boolean }, i: number, scale: WaitScale, simulated = false, abandon = false, limits = false): string[] {
  return [
    `${e.recommended ? '→ ' : ''}${i + 1}`,
    num(e.cost),
    e.backlog === null ? '—' : e.backlogCi95 ? estimate(e.backlog, e.backlogCi95[0], e.backlogCi95[1]) : num(e.backlog),
    ...(d.objective === 'weighted' || d.objective === 'net-value' ? [e.objective === null ? '—' : num(e.objective)] : []),
    ...(d.objective === 'net-value' ? [e.valueRate === null ? '—' : num(e.valueRate)] : []),
    e.maxWait === null ? '—' : `${wait(e.maxWait, scale)} (${e.maxWaitClass})`,
    e.spareCapacity === null ? '—' : num(e.spareCapacity),
    ...(abandon ? [e.abandonShare === undefined ? '—' : pct(e.abandonShare)] : []),
    ...(limits ? [limitsCell(e)] : []),
    ...(simulated ? [e.vsCheaper ? vsCheaperCell(e.vsCheaper) : i === 0 ? '' : '—'] : []),
    changesText(e.added, e.removed),
  ];
}

/** `recommend` for people. */
export function recommendText(r: RecommendRecord, o: { readonly waitUnit?: string } = {}): Block[] {
  const scale = waitScale(r.timeUnit, r.pareto.flatMap((e) => (e.maxWait === null ? [] : [e.maxWait])), o.waitUnit);
  const budget = r.budget === null ? 'no budget limit' : `budget ${money(r.budget, r.costUnit)}`;
  const blocks: Block[] = [title(`${r.scenario} — designs worth considering (objective: ${r.objectiveLabel}, ${budget})`)];
  const simulated = r.pareto.some((e) => e.method === 'simulation');
  const limits = r.pareto.some((e) => e.abandonmentLimits !== undefined);
  const abandon = r.objective === 'abandonment' || limits;
  if (r.instability) blocks.push(para("Today's design is unstable."), ...instabilityBlocks(r.instability, r.timeUnit, r.costUnit));
  blocks.push(
    tableBlock(
      {
        columns: [
          { header: '#', align: 'right' },
          { header: 'cost', align: 'right' },
          { header: 'backlog', align: 'right' },
          ...(r.objective === 'weighted' ? [{ header: r.objectiveLabel, align: 'right' as const }] : []),
          ...(r.objective === 'net-value'
            ? [
                { header: `net value ${perUnit(r.timeUnit)} (higher is better)`, align: 'right' as const },
                { header: `value of matches ${perUnit(r.timeUnit)}`, align: 'right' as const, secondary: true },
              ]
            : []),
          { header: 'largest mean wait', align: 'right', secondary: true },
          { header: 'spare capacity', align: 'right', secondary: true },
          ...(abandon ? [{ header: 'abandoning', align: 'right' as const }] : []),
          ...(limits ? [{ header: 'abandonment limits' }] : []),
          ...(simulated ? [{ header: 'backlog vs previous', secondary: true }] : []),
          { header: 'changes from today', wrap: true },
        ],
        rows: r.pareto.map((e, i) => frontRow(r, e, i, scale, simulated, abandon, limits)),
      },
      `Pareto set, cheapest first (no design is both cheaper and better${r.objectiveBetter === 'higher' ? ` — better is a higher ${r.objectiveLabel}: value of matches − ${r.waitingCost === null ? 'waiting cost (none in the file)' : `${num(r.waitingCost)} per waiting item per ${unitName(r.timeUnit)} × backlog`}; the net value rises along the set` : ''}${r.partial ? '; INTERRUPTED: what was found so far' : ''}; → the recommended design)` +
        (simulated
          ? '; backlogs simulated: ± is the half-width of the 95 % interval, and "vs previous" compares with the design above under the same random streams (lower or higher only when the paired difference is significant; "within 1 %" when its whole interval is within 1 % of the previous backlog)' +
            (abandon ? '; "abandoning" is the share of all arrivals that give up' : '') +
            (limits ? '; "abandonment limits": every limited class within its maxAbandonment, or "noise" where its interval contains the limit' : '') +
            ':'
          : ':'),
    ),
  );
  blocks.push(para(recommendedWords(r, scale)));
  blocks.push(...verdictBlocks(r, scale));
  blocks.push(
    tableBlock(
      {
        columns: [
          { header: 'rule of thumb' },
          { header: 'cost', align: 'right' },
          { header: r.objectiveLabel, align: 'right' },
          { header: 'Pareto set at this cost', align: 'right' },
          { header: r.objectiveBetter === 'higher' ? 'behind the set' : 'gap', align: 'right' },
          { header: 'how it is built', wrap: true, secondary: true },
        ],
        rows: r.baselines.map((b) => {
          const gap = b.gap === null ? (b.noGap ?? '—') : `${num(b.gap)}${b.relativeGap === null ? '' : ` (${pct(b.relativeGap)})`}`;
          const harmful = b.harmful.length > 0 ? `; pays for harmful ${b.harmful.map((p) => pairText(p)).join(', ')}` : '';
          return [b.name, num(b.cost), objectiveValue(r, b.objective, scale), b.frontAtCost === null ? '—' : objectiveValue(r, b.frontAtCost, scale), gap, b.note + harmful];
        }),
      },
      'Rules of thumb beside the Pareto set:',
    ),
  );
  const s = r.search;
  const how = s.exhaustive ? 'every design enumerated' : 'MILP seeds + Pareto local search';
  blocks.push(
    para(
      (s.simulated ? `${count(s.evaluations)} evaluation${s.evaluations === 1 ? '' : 's'}, ${count(s.simulated)} of them simulated` : `${count(s.evaluations)} exact evaluation${s.evaluations === 1 ? '' : 's'}`) +
        (s.designSpace !== null ? ` (${pct(s.evaluations / s.designSpace, 2)} of the ${count(s.designSpace)} possible designs; ${how})` : ` (${how})`) +
        (s.harmfulRefused > 0 ? ` · ${count(s.harmfulRefused)} design${s.harmfulRefused === 1 ? '' : 's'} refused for paying for a harmful compatibility` : '') +
        ` · the cheapest stable design costs ${num(s.cheapestStableCost)}`,
    ),
  );
  if (s.allocation) blocks.push(para(allocationWords(s.allocation)));
  return blocks;
}

/** What the sequential allocation of the re-score did, in one sentence. */
export function allocationWords(a: NonNullable<RecommendRecord['search']['allocation']>): string {
  const head = `Re-score: ${a.initialReplications} replications a design`;
  if (a.extended === 0) return `${head}; every comparison was settled with them (significant, or within ${pct(a.indifference)}), so none needed more.`;
  return (
    `${head}; ${count(a.openAtStart)} comparison${a.openAtStart === 1 ? ' was' : 's were'} not settled by them, so ${count(a.extended)} design${a.extended === 1 ? '' : 's'} got more (${count(a.extraReplications)} replications in ${a.rounds} round${a.rounds === 1 ? '' : 's'}, at most ${a.maxReplications} a design)` +
    (a.stopped ? '; interrupted before it finished' : '') +
    (a.unresolved > 0
      ? `; ${count(a.unresolved)} comparison${a.unresolved === 1 ? ' is' : 's are'} still not settled (not distinguishable, or a limit inside an interval).`
      : '; every comparison is now settled.')
  );
}
