/**
 * Entry point of a scoring worker thread (started by pool.ts from the built dist/ folder). Receives
 * batches of scoring tasks (score-task.ts: one design afresh, or the flips of a base design by reuse)
 * and answers with their scores in the same order.
 */
import { parentPort, workerData } from 'node:worker_threads';
import type { ScoreSpec } from './score.js';
import { runTask } from './score-task.js';
import { serializeError, type WorkerReply, type WorkerRequest } from './worker-protocol.js';

const spec = workerData as ScoreSpec;
const port = parentPort;
if (port) {
  port.on('message', (msg: WorkerRequest) => {
    let reply: WorkerReply;
    try {
      reply = { id: msg.id, scores: msg.tasks.map((t) => runTask(spec, t)) };
    } catch (e) {
      reply = { id: msg.id, error: serializeError(e) };
    }
    port.postMessage(reply);
  });
}
