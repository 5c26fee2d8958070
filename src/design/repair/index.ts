/** A way out of instability: the cheapest sets of allowed candidates that make today's design stable. */
export { repairs, DEFAULT_REPAIR_COUNT } from './repairs.js';
export { forbiddenCandidates } from './forbidden.js';
export type {
  BlockedPair,
  ForbiddenCandidate,
  LimitBound,
  LimitExcess,
  Overload,
  Overloaded,
  Partner,
  ReliefKind,
  Repair,
  RepairOptions,
  RepairResult,
  RepairsFound,
  StableToday,
} from './types.js';
