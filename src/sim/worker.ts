/**
 * Worker-thread entry: receives the compiled model and plan once (workerData), then runs the
 * replications it is sent, one at a time, and posts back progress and records.
 */
import { parentPort, workerData } from 'node:worker_threads';
import type { ReplicationPlan } from './record.js';
import { runReplication } from './replication.js';
import type { SimModel } from './sim-model.js';
import { serialiseError, type FromWorker, type ToWorker } from './worker-protocol.js';

const { model, plan } = workerData as { model: SimModel; plan: ReplicationPlan };
const port = parentPort!;

port.on('message', (msg: ToWorker) => {
  try {
    const record = runReplication(model, plan, msg.index, msg.state, (arrivals) => {
      port.postMessage({ type: 'progress', arrivals } satisfies FromWorker);
    });
    port.postMessage({ type: 'done', record } satisfies FromWorker, [record.hist.buffer as ArrayBuffer]);
  } catch (e) {
    port.postMessage({ type: 'error', error: serialiseError(e) } satisfies FromWorker);
  }
});
