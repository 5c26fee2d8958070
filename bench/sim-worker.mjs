// Worker bootstrap for bench/simulate.ts, which runs from TypeScript sources under tsx: worker
// threads do not inherit tsx's loader, so register it here, then load the real worker module.
import { register } from 'tsx/esm/api';

register();
await import('../src/workers/worker.ts');
