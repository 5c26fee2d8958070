/**
 * Entry point of a scoring worker thread (started by pool.ts from the built dist/ folder). Receives
 * batches of designs, scores each with scoreDesign and answers with the scores in the same order.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { scoreDesign, type ScoreSpec } from './score.js';
import { serializeError, type WorkerReply, type WorkerRequest } from './worker-protocol.js';

const spec = workerData as ScoreSpec;
const port = parentPort;
if (port) {
  port.on('message', (msg: WorkerRequest) => {
    let reply: WorkerReply;
    try {
      reply = { id: msg.id, scores: msg.designs.map((d) => scoreDesign(spec, d)) };
    } catch (e) {
      reply = { id: msg.id, error: serializeError(e) };
    }
    port.postMessage(reply);
  });
}
