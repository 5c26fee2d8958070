import { describeCertificate, type InstabilityCertificate } from '../errors.js';
import { round } from './format.js';
import type { CommandIO } from './io.js';

/**
 * How `check` and `evaluate` report an unstable design: with --json the certificate on stdout as
 * `{stable: false, timeUnit, certificate}`; always the sentence on stderr; exit code 3.
 */
export function reportUnstable(cert: InstabilityCertificate, timeUnit: string, json: boolean | undefined, io: CommandIO): number {
  if (json) {
    const certificate = { set: cert.set, demand: round(cert.demand), capacity: round(cert.capacity), neighbours: cert.neighbours, reason: cert.reason };
    io.out(`${JSON.stringify({ stable: false, timeUnit, certificate }, null, 2)}\n`);
  }
  io.err(`edgewise: ${describeCertificate(cert, timeUnit)}\n`);
  return 3;
}
