/**
 * The scenario written by `fit -o`: the fitted classes (rate, its 95 % interval `rateCi95`, the mean
 * patience where abandonments were seen, the counts in `data`), with time bands as demand variants,
 * and — given a compatibilities table — the compatibilities, making a full scenario. Without one it
 * is a fragment: a valid scenario file with no compatibilities yet.
 */
import type { TableProblem } from '../errors.js';
import { assembleScenario, type Assembled } from './assemble.js';
import type { FitResult } from './fit-log.js';
import { fitRecord } from './fit-record.js';
import { compatibilityEntries, type Located, type TableText } from './tables.js';

/** Six significant digits: enough for any decision, and readable in the file. */
const sig = (x: number): number => Number(x.toPrecision(6));
const sigOrNull = (x: number): number | null => (Number.isFinite(x) ? sig(x) : null);

export interface FitScenarioOptions {
  readonly name?: string;
  readonly compatibilities?: TableText;
}

/** Demand variants from the bands: one per band, with every class's rate in it (bands where some class has no arrival are skipped). */
function bandVariants(r: FitResult, warnings: string[]): Record<string, Record<string, number>> | undefined {
  if (!r.bands) return undefined;
  const fitted = r.classes.filter((c) => c.count > 0);
  const out: Record<string, Record<string, number>> = {};
  r.bands.forEach((b, k) => {
    const name = b.kind === 'clock' ? `hours ${b.name}` : `part ${b.name}`;
    const empty = fitted.filter((c) => c.bands![k]!.count === 0).map((c) => c.id);
    if (empty.length > 0) {
      warnings.push(`demand variant "${name}" left out: no arrival of ${empty.join(', ')} in it`);
      return;
    }
    out[name] = Object.fromEntries(fitted.map((c) => [c.id, sig(c.bands![k]!.rate)]));
  });
  return Object.keys(out).length > 0 ? out : undefined;
}

/** Builds and validates the scenario; `warnings` receives what was left out. */
export function fitScenario(r: FitResult, options: FitScenarioOptions, warnings: string[] = []): Assembled {
  const classes: Located[] = r.classes
    .filter((c) => c.count > 0)
    .map((c) => {
      const p = c.patience;
      return {
        entry: {
          id: c.id,
          rate: sig(c.rate),
          rateCi95: [sig(c.ci95[0]), sig(c.ci95[1])],
          ...(p && Number.isFinite(p.mean) ? { patience: sig(p.mean) } : {}),
          data: {
            count: c.count,
            exposure: sig(c.exposure),
            ...(p ? { abandoned: p.abandoned, censored: p.censored, patienceCi95: [sigOrNull(p.meanCi95[0]), sigOrNull(p.meanCi95[1])] } : {}),
          },
        },
        origin: { file: r.source },
      };
    });
  const problems: TableProblem[] = [];
  const compatibilities = options.compatibilities ? compatibilityEntries(options.compatibilities, problems) : [];
  const demand = bandVariants(r, warnings);
  return assembleScenario(
    {
      name: options.name ?? `rates fitted from ${r.source}`,
      timeUnit: r.timeUnit,
      classes,
      compatibilities,
      extra: { ...(demand ? { demand } : {}), data: { fittedFrom: r.source, window: fitRecord(r).window, timeFormat: r.timeFormat } },
    },
    problems,
    options.compatibilities?.file ?? r.source,
  );
}
