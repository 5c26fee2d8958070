/**
 * The standard cautions a record carries where its figures do not account for something the
 * scenario says. Each is one sentence; records put them in `warnings`, the CLI prints them on
 * standard error, JSON keeps the array.
 */
import type { ScenarioContext } from './context.js';

/** Exact FCFM figures assume patient items: said whenever the file gives a class a patience. */
export function patienceWarning(ctx: ScenarioContext, what = 'These exact figures'): string | null {
  const who = impatientClasses(ctx);
  return who === null ? null : `${what} ignore patience: ${who} a patience in the file, so in reality some items give up and fewer wait; \`edgewise simulate\` gives figures with abandonment.`;
}

/** "class c has" / "classes a, b and 3 more have" for the classes with a patience, null when none. */
export function impatientClasses(ctx: ScenarioContext): string | null {
  const impatient = ctx.scenario.classes.filter((c) => c.patience !== undefined).map((c) => c.id);
  if (impatient.length === 0) return null;
  const which = impatient.length <= 4 ? impatient.join(', ') : `${impatient.slice(0, 3).join(', ')} and ${impatient.length - 3} more`;
  return `${impatient.length === 1 ? 'class' : 'classes'} ${which} ${impatient.length === 1 ? 'has' : 'have'}`;
}

/** Figures under a demand variant say so. */
export function demandNote(ctx: ScenarioContext): string | null {
  return ctx.reference.demand === 'today' ? null : `Rates are those of the demand variant "${ctx.reference.demand}", not the classes' own.`;
}

/** Every standard warning that applies to exact figures of the context. */
export function exactWarnings(ctx: ScenarioContext, what?: string): string[] {
  return [patienceWarning(ctx, what), demandNote(ctx)].filter((w): w is string => w !== null);
}

/**
 * With values in the file: the value figures are exact FCFM figures too, so they ignore patience
 * (an item that gives up is never matched, so its pair earns nothing for it); said beside them.
 */
export function valueWarnings(ctx: ScenarioContext): string[] {
  const who = impatientClasses(ctx);
  if (who === null) return [];
  return [
    `The value rate, waiting cost and net value ignore patience: ${who} a patience in the file, so in reality some items give up unmatched (their pairs earn nothing for them) and fewer wait; \`edgewise simulate\` gives figures with abandonment.`,
  ];
}

/**
 * The cautions of a command that scored designs with `--score auto|simulation`: which figures are
 * simulated and why, that patience is modelled (simulation with abandonment) or, for exact figures,
 * ignored, and what a simulated recommendation does not have.
 */
export function scoringWarnings(
  ctx: ScenarioContext,
  method: 'auto' | 'simulation',
  rec: { readonly simulated?: number; readonly scored: number },
  simulatedFront: boolean,
): string[] {
  const who = impatientClasses(ctx);
  const out: Array<string | null> = [];
  if (simulatedFront || (rec.simulated ?? 0) > 0) {
    out.push(
      who !== null
        ? `Scored by simulation with abandonment (${who} a patience in the file): backlogs count the items still waiting, after those who gave up; each figure carries its 95 % interval.`
        : method === 'simulation'
          ? 'Scored by simulation (--score simulation): each figure carries its 95 % interval; two designs are called different only when their paired difference is significant.'
          : `Scored by simulation where the exact recursion is not feasible (${rec.simulated ?? 0} of ${rec.scored} designs in the search): those figures carry their 95 % interval.`,
    );
    if (simulatedFront) out.push('No single-change verdicts: they need exact figures, and the recommended design is scored by simulation.');
  } else {
    out.push(patienceWarning(ctx, 'The figures of every design'));
  }
  out.push(demandNote(ctx));
  return out.filter((w): w is string => w !== null);
}

/** The warnings with `note` added when there is one. */
export function withNote(warnings: string[], note: string | null): string[] {
  return note === null ? warnings : [...warnings, note];
}

/** "classes a, b, c, d and 2 more" for the classes with a maxAbandonment; null when none has one. */
function limitedClasses(ctx: ScenarioContext): string | null {
  const limited = ctx.scenario.classes.filter((c) => c.maxAbandonment !== undefined).map((c) => c.id);
  if (limited.length === 0) return null;
  return `${limited.length === 1 ? 'class' : 'classes'} ${limited.slice(0, 4).join(', ')}${limited.length > 4 ? ` and ${limited.length - 4} more` : ''}`;
}

/**
 * The file's maxAbandonment limits where a command's figures (exact, or simulated without a check
 * of the limits: sensitivity, sweep, compare, report) do not compare the shares with them: said.
 */
export function limitsNotComparedWarning(ctx: ScenarioContext, method: 'exact' | 'simulation', what: string): string | null {
  if (method === 'exact') return limitsIgnoredWarning(ctx, what);
  const who = limitedClasses(ctx);
  if (who === null) return null;
  return `${what} do not compare the abandonment shares with the limits (maxAbandonment of ${who}): \`edgewise recommend\` keeps designs over a limit out of its Pareto set, and \`edgewise evaluate\` and \`edgewise simulate\` compare each share with its limit.`;
}

/**
 * The file's maxAbandonment limits, when the figures printed have no abandonment (exact figures):
 * said, never silently ignored. Null when the file has none.
 */
export function limitsIgnoredWarning(ctx: ScenarioContext, what = 'These exact figures'): string | null {
  const who = limitedClasses(ctx);
  if (who === null) return null;
  return `${what} do not check the abandonment limits (maxAbandonment of ${who}): they have no abandonment; simulated figures (--score auto or simulation, or \`edgewise simulate\`) compare each share with its limit.`;
}
