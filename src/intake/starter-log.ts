/**
 * The starter set's example arrival log: one invented evening (17:00 to 22:00 UTC) of the starter
 * classes, drawn from their Poisson rates with a fixed seed. Each learner waits for a partner an
 * exponential time (mean 20 minutes here, a made-up figure) and gives up after an exponential
 * patience with the class's mean; the log records who came first. Deterministic: the same text on
 * every run.
 */
import { seededRandom } from '../random.js';

export interface LogClass {
  readonly id: string;
  readonly rate: number;
  readonly patience?: number;
}

const START_MS = Date.UTC(2025, 2, 12, 17, 0, 0);
const HOURS = 5;
const MEAN_MATCH_HOURS = 1 / 3;

/** The log as CSV text with a comment header: arrived (ISO), class, outcome, waited (hours). */
export function starterLog(classes: readonly LogClass[], seed = 2025): string {
  const random = seededRandom(seed);
  const exp = (mean: number) => -Math.log(1 - random()) * mean;
  const rows: Array<[number, string, string, number]> = [];
  for (const c of classes) {
    for (let t = exp(1 / c.rate); t < HOURS; t += exp(1 / c.rate)) {
      const match = exp(MEAN_MATCH_HOURS);
      const patience = c.patience === undefined ? Infinity : exp(c.patience);
      const end = HOURS - t; // still waiting when the log closes
      const wait = Math.min(match, patience, end);
      rows.push([t, c.id, wait === end ? 'waiting' : wait === patience ? 'abandoned' : 'matched', wait]);
    }
  }
  rows.sort((a, b) => a[0] - b[0]);
  const lines = rows.map(([t, id, outcome, wait]) => `${new Date(START_MS + Math.round(t * 3_600_000 / 1000) * 1000).toISOString().replace('.000Z', 'Z')},${id},${outcome},${wait.toFixed(3)}`);
  return (
    '# One invented evening of study-partner requests (17:00 to 22:00 UTC), one row per arrival.\n' +
    '# outcome: matched, abandoned (gave up), or waiting (still waiting at 22:00); waited: hours.\n' +
    `arrived,class,outcome,waited\n${lines.join('\n')}\n`
  );
}
