// Worker bootstrap for tests that run the scoring pool on worker threads from the TypeScript sources:
// worker threads do not inherit the test runner's transform, so register tsx here, then load the
// real worker module.
import { register } from 'tsx/esm/api';

register();
await import('../../../src/workers/worker.ts');
