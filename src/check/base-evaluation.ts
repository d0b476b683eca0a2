/**
 * The base versions of the compared configs, loaded and evaluated as one batch. Their bounds
 * depend only on the model's values and the policy, so a base model equal to one already
 * evaluated in the batch reuses that evaluation. With many configs and an idle core, the batch
 * runs on a worker thread while the main thread evaluates the heads, so that a comparison costs
 * little more wall time than the check without one. Without an idle core a second thread only
 * competes with the first (and its code runs cold, where the main thread's is already compiled),
 * so the batch then runs in-thread when its answers are collected. Both ways give the same answers
 * (the worker runs this module's `evaluateBaseTexts`).
 */
import { existsSync } from 'node:fs';
import { availableParallelism, loadavg } from 'node:os';
import { fileURLToPath } from 'node:url';
import { MessageChannel, receiveMessageOnPort, Worker } from 'node:worker_threads';
import type { Model } from '../config/model.js';
import { evaluatePolicy, type PolicyResult } from '../policy/evaluate.js';
import type { Policy } from '../policy/policy.js';
import { loadConfig } from './compare-config.js';
import type { DefinitionSource } from '../config/definition-source.js';

export interface BaseTask {
  readonly text: string;
  readonly file: string;
  readonly policy: Policy;
  /** The base version's root-relative path: architecture definitions are named relative to it. */
  readonly path?: string;
  /** The base revision's architecture definition the config names, by root-relative path (read on the main thread). */
  readonly definitions?: Readonly<Record<string, string>>;
}

/** Undefined for a base version that does not load (or evaluate) under today's rules. */
export type BaseAnswer = { readonly model: Model; readonly result: PolicyResult } | undefined;

/** Below this many base versions a thread would cost more to start than it saves. */
export const WORKER_MIN_TASKS = 64;

const WORKER_FILE = new URL('./base-worker.js', import.meta.url);

/**
 * Starts evaluating; the returned function gives the answers, in task order. `thread` decides
 * whether a worker thread is used (`auto`: for a large batch when a core is idle).
 */
export function startBaseEvaluation(tasks: readonly BaseTask[], thread: 'auto' | 'always' | 'never' = 'auto'): () => readonly BaseAnswer[] {
  const wanted = thread === 'always' || (thread === 'auto' && tasks.length >= WORKER_MIN_TASKS && idleCore());
  const worker = wanted ? startWorker(tasks) : undefined;
  return worker ?? (() => evaluateBaseTexts(tasks));
}

/** `progress` is called after each task (the worker counts them in shared memory). */
/** A core beyond this thread's with nothing to do, judged by the last minute's load (0 where the system does not report it). */
function idleCore(): boolean {
  const cores = availableParallelism();
  return cores > 1 && loadavg()[0]! + 1 <= cores;
}

export function evaluateBaseTexts(tasks: readonly BaseTask[], progress?: () => void): BaseAnswer[] {
  const memo = new Map<string, BaseAnswer>();
  const policyIds = new Map<Policy, number>();
  return tasks.map((t) => {
    progress?.();
    const loaded = loadConfig(t.text, t.file, t.policy, [], t.path === undefined ? undefined : { definitions: recordedDefinitions(t.definitions ?? {}), configPath: t.path });
    if (!loaded) return undefined;
    const model = loaded.model;
    let id = policyIds.get(t.policy);
    if (id === undefined) policyIds.set(t.policy, (id = policyIds.size));
    const key = `${id}\u0000${modelKey(model)}`;
    const known = memo.get(key);
    if (known) return { model, result: known.result };
    const evaluated = evaluatePolicy(model, t.policy, { fixes: false });
    const answer = evaluated.ok ? { model, result: evaluated.result } : undefined;
    memo.set(key, answer);
    return answer;
  });
}

/** Definitions handed over as texts (a worker thread cannot read the base revision itself). */
function recordedDefinitions(texts: Readonly<Record<string, string>>): DefinitionSource {
  return {
    read: (rel) => (Object.hasOwn(texts, rel) ? { kind: 'file', text: texts[rel]! } : { kind: 'absent' }),
    display: (rel) => rel,
  };
}

// Where a model sits (its file, its spans) does not change its bounds.
const PLACE = new Set(['file', 'span', 'fieldSpans']);

/** A model's values without where they sit: equal keys give equal bounds. */
function modelKey(model: Model): string {
  return JSON.stringify(model, (k, v: unknown) => (PLACE.has(k) ? undefined : typeof v === 'bigint' ? `${v}n` : v));
}

/** A worker that starts no task for this long is given up, and the batch is evaluated here. */
const STALL_MS = 120_000;

/**
 * The worker posts its answers and then raises a flag in shared memory, so the main thread can
 * wait for them without giving up its synchronous call chain; it also counts the tasks it starts,
 * so that a worker that died without a word is noticed. A failure inside the worker is posted as
 * such, and the answers are then computed here instead.
 */
function startWorker(tasks: readonly BaseTask[]): (() => readonly BaseAnswer[]) | undefined {
  // The compiled package and the bundle ship the worker's file beside this module; run from the
  // sources, there is none, and the batch is evaluated in-thread.
  if (WORKER_FILE.protocol !== 'file:' || !existsSync(fileURLToPath(WORKER_FILE))) return undefined;
  // [0]: answers posted; [1]: tasks started.
  const flag = new Int32Array(new SharedArrayBuffer(8));
  const { port1, port2 } = new MessageChannel();
  let worker: Worker;
  try {
    worker = new Worker(WORKER_FILE, { workerData: { tasks, port: port2, flag }, transferList: [port2] });
  } catch {
    return undefined;
  }
  return () => {
    let seen = -1;
    let since = Date.now();
    while (Atomics.load(flag, 0) === 0) {
      Atomics.wait(flag, 0, 0, 1000);
      const started = Atomics.load(flag, 1);
      if (started !== seen) [seen, since] = [started, Date.now()];
      else if (Date.now() - since > STALL_MS) break;
    }
    const message = receiveMessageOnPort(port1)?.message as { answers?: BaseAnswer[] } | undefined;
    port1.close();
    void worker.terminate();
    return message?.answers ?? evaluateBaseTexts(tasks);
  };
}
