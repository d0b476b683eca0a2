/**
 * The worker thread of base-evaluation.ts: evaluates the base versions it is given, posts the
 * answers and raises the flag the main thread waits on — also when something goes wrong, so that
 * the main thread never waits for nothing.
 */
import { workerData, type MessagePort } from 'node:worker_threads';
import { evaluateBaseTexts, type BaseTask } from './base-evaluation.js';

const { tasks, port, flag } = workerData as { tasks: BaseTask[]; port: MessagePort; flag: Int32Array };
try {
  port.postMessage({ answers: evaluateBaseTexts(tasks, () => Atomics.add(flag, 1, 1)) });
} catch (e) {
  port.postMessage({ error: e instanceof Error ? e.message : String(e) });
} finally {
  Atomics.store(flag, 0, 1);
  Atomics.notify(flag, 0);
  port.close();
}
