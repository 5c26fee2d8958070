/**
 * Entry point of every worker thread (started by pool.ts from the built dist/ folder). Set up once
 * with a WorkerInit (workerData), it runs the tasks it is sent one at a time and posts back
 * progress, a result or a serialised error. Each kind loads only the modules it needs.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { serialiseError, type DeferredInit, type FromWorker, type ToWorker, type WorkerInit, type WorkerKind } from './protocol.js';

const data = workerData as WorkerInit | DeferredInit;
const port = parentPort!;

type Task = Extract<ToWorker, { readonly task: unknown }>;
type Handled = { result: unknown; transfer: ArrayBuffer[] };
type Handler = (msg: Task, progress: (amount: number) => void) => Handled | Promise<Handled>;

/** The modules of a kind: loaded at once, also by a prestarted worker that has no init yet. */
const modules = (kind: WorkerKind) => (kind === 'simulate' ? import('../sim/replication.js') : import('../design/scoring/score-task.js'));

async function handlerFor(init: WorkerInit): Promise<Handler> {
  if (init.kind === 'simulate') {
    const { runReplication } = await import('../sim/replication.js');
    return (msg, progress) => {
      if (msg.task.kind === 'exact') {
        const t = msg.task;
        // loaded on demand: only a worker given the exact column needs the exact evaluator
        return import('../exact/column.js').then(({ exactColumn }) => ({ result: exactColumn(t.ids, t.rates, t.pairs, { maxSets: t.maxSets, timeUnit: t.timeUnit }), transfer: [] }));
      }
      if (msg.task.kind !== 'replication') throw new Error(`a simulation worker got a ${msg.task.kind} task`);
      // taken by the main thread already: answer null
      if (init.claims && Atomics.compareExchange(init.claims, msg.task.index, 0, 1) !== 0) return { result: null, transfer: [] };
      const record = runReplication(init.model, init.plan, msg.task.index, msg.task.state, progress);
      return { result: record, transfer: [record.hist.buffer as ArrayBuffer] };
    };
  }
  const { runTask } = await import('../design/scoring/score-task.js');
  return (msg) => {
    if (msg.task.kind !== 'score') throw new Error(`a scoring worker got a ${msg.task.kind} task`);
    return { result: msg.task.tasks.map((t) => runTask(init.spec, t)), transfer: [] };
  };
}

// a prestarted worker loads its modules now and gets its init as its first message
let receiveInit: (init: WorkerInit) => void = () => undefined;
const ready: Promise<Handler> =
  'deferred' in data
    ? (void modules(data.kind).catch(() => undefined), new Promise<WorkerInit>((resolve) => (receiveInit = resolve)).then(handlerFor))
    : handlerFor(data);
// tasks run one after the other in the order they came, also those that wait for a module
let previous: Promise<unknown> = ready;
port.on('message', (msg: ToWorker) => {
  if ('init' in msg) {
    receiveInit(msg.init);
    return;
  }
  previous = previous.catch(() => undefined).then(() => ready).then(async (handle) => {
    try {
      const { result, transfer } = await handle(msg, (amount) => port.postMessage({ id: msg.id, type: 'progress', amount } satisfies FromWorker));
      port.postMessage({ id: msg.id, type: 'done', result } satisfies FromWorker, transfer);
    } catch (e) {
      port.postMessage({ id: msg.id, type: 'error', error: serialiseError(e) } satisfies FromWorker);
    }
  });
});
