/**
 * The base versions of a comparison, evaluated as one batch: equal models share one evaluation,
 * a base that does not load has no answer, and the worker thread the built CLI uses for large
 * batches gives exactly the report the in-thread evaluation gives.
 */
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, expect, test } from 'vitest';
import { evaluateBaseTexts, WORKER_MIN_TASKS, type BaseAnswer, type BaseTask } from '../../src/check/base-evaluation.js';
import { runCheck } from '../../src/check/run-check.js';
import { checkJson } from '../../src/report/check-json.js';
import { policyOf } from '../policy/helpers.js';
import { REPO, runCli } from '../e2e/run-cli.js';
import { makeRepo, removeTempDirs } from '../git/git-fixture.js';
import { pyramid } from './pyramid.js';
import { NET, runConfig } from '../helpers/definitions.js';

afterAll(removeTempDirs);

const POLICY = 'id: pairs\ndescription: d\napplies_to: ["configs/*.yaml"]\nmax_drop_bits: 1\nrequire:\n  - {partition: left-right, min_rank: 4}\n';

const config = (first: number, last: number, preamble = ''): string => pyramid(last, first, preamble);

test('equal models share one evaluation; a base that does not load has no answer', () => {
  const policy = policyOf(POLICY);
  const answers = evaluateBaseTexts([
    { text: config(4, 64), file: 'a.yaml', policy },
    // The same model two lines further down: same values, other spans.
    { text: config(4, 64, '# moved\n# down\n'), file: 'b.yaml', policy },
    { text: config(4, 32), file: 'c.yaml', policy },
    { text: 'model: {layers: []}\n', file: 'd.yaml', policy },
  ]);
  expect(answers[1]!.result).toBe(answers[0]!.result);
  expect(answers[1]!.model.span.line).toBe(answers[0]!.model.span.line + 2);
  expect(answers[2]!.result).not.toBe(answers[0]!.result);
  // min(64, 36) and min(32, 36): see pyramid.ts (derived here)
  expect(answers.slice(0, 3).map((a) => a!.result.requirements[0]!.bounds.upper.rank)).toEqual([36n, 36n, 32n]);
  expect(answers[3]).toBeUndefined();
});

test('the built CLI, which takes a large batch to a worker thread when a core is idle, reports exactly what the in-thread evaluation reports', () => {
  expect(existsSync(join(REPO, 'build', 'check', 'base-worker.js'))).toBe(true);
  const n = WORKER_MIN_TASKS + 6;
  const files: Record<string, string> = { 'policies/pairs.yaml': POLICY };
  for (let i = 0; i < n; i++) files[`configs/c${String(i).padStart(3, '0')}.yaml`] = config(2 + (i % 5), 36 + (i % 30));
  const repo = makeRepo(files);
  const base = repo.commitAll('base');
  for (let i = 0; i < n; i++) repo.write(`configs/c${String(i).padStart(3, '0')}.yaml`, config(2 + (i % 5), 8 + (i % 30)));
  // From min(last, 36) = 36 at the base to 8 + i mod 30: more than 1 bit lost below 18 channels.
  repo.commitAll('every last width lowered');
  const cli = runCli(['check', '--policy', 'policies', '--format', 'json', '--base', base], repo.dir);
  expect(cli.stderr).toBe('');
  const inThread = checkJson(runCheck({ cwd: repo.dir, policy: 'policies', configs: [], base }));
  expect(JSON.parse(cli.stdout)).toEqual(JSON.parse(inThread));
  const doc = JSON.parse(cli.stdout);
  expect(doc.results).toHaveLength(n);
  expect(doc.results.filter((r: { verdict: string }) => r.verdict === 'fail').length).toBeGreaterThan(0);
});

test('the worker thread of the compiled package gives the in-thread answers', async () => {
  // Run from the sources there is no worker file; the compiled module has one beside it.
  const built = (await import(join(REPO, 'build', 'check', 'base-evaluation.js'))) as {
    startBaseEvaluation: (tasks: readonly BaseTask[], thread: 'always') => () => readonly BaseAnswer[];
  };
  const policy = policyOf(POLICY);
  const tasks = Array.from({ length: 12 }, (_, i) => ({ text: config(2 + (i % 3), 8 + 4 * i), file: `c${i}.yaml`, policy }));
  const ranks = (answers: readonly BaseAnswer[]) => answers.map((a) => a!.result.requirements.map((q) => [q.bounds.upper.rank, q.bounds.lower?.rank]));
  const onThread = built.startBaseEvaluation(tasks, 'always')();
  expect(ranks(onThread)).toEqual(ranks(evaluateBaseTexts(tasks)));
  expect(onThread[11]!.model.kind).toBe('layered');
});

test('a base version that names a definition is built from the text handed over with it, never read from elsewhere', () => {
  const policy = policyOf(POLICY);
  const config = runConfig('width: 0.5');
  const [withText, without] = evaluateBaseTexts([
    { text: config, file: 'configs/run.yaml', policy, path: 'configs/run.yaml', definitions: { 'arch/net.yaml': NET } },
    { text: config, file: 'configs/run.yaml', policy, path: 'configs/run.yaml' },
  ]);
  // ceil(16 · 0.5) channels on the last conv: tests/helpers/definitions.ts (derived here)
  expect(withText!.result.requirements[0]!.bounds.upper.rank).toBe(8n);
  expect(withText!.model.kind === 'layered' && withText!.model.architecture?.path).toBe('arch/net.yaml');
  expect(without).toBeUndefined();
});
