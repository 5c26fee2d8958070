import { TooLargeError } from '../errors.js';

/**
 * The error a replication stops with when more than `cap` items wait at once; `bytesPerItem`: what
 * the engine keeps per waiting item (its arrival stamp, and a flag or a deadline).
 */
export function waitingCapError(cap: number, counts: ArrayLike<number>, ids: readonly string[], clockLabel: string, bytesPerItem = 9): TooLargeError {
  let worst = 0;
  for (let k = 1; k < counts.length; k++) if (counts[k]! > counts[worst]!) worst = k;
  let total = 0;
  for (let k = 0; k < counts.length; k++) total += counts[k]!;
  return new TooLargeError(
    `simulation stopped: more than ${cap.toLocaleString('en-US')} items were waiting at once (${counts[worst]!.toLocaleString('en-US')} of class ${ids[worst]}) ${clockLabel}; ` +
      `the design is probably unstable or close to it — shorten --arrivals or raise --max-waiting if memory allows (about ${bytesPerItem} bytes per waiting item)`,
    total,
    cap,
  );
}
