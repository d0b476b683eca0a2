/**
 * The action's inputs and their event-dependent defaults, with a reader that behaves like the
 * toolkit's (trimmed strings, '' when unset, YAML 1.2 core booleans): which base a pull request
 * compares with, when only changed configs are checked, and which values are refused.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, test } from 'vitest';
import { ActionInputError, pullRequestBase, readInputs, readWorkflowEvent, type InputReader, type WorkflowEvent } from '../../src/action/inputs.js';

function reader(values: Record<string, string>): InputReader {
  const get = (name: string): string => (values[name] ?? '').trim();
  return {
    get,
    getBoolean(name) {
      const v = get(name);
      if (['true', 'True', 'TRUE'].includes(v)) return true;
      if (['false', 'False', 'FALSE'].includes(v)) return false;
      throw new TypeError(`Input does not meet YAML 1.2 "Core Schema" specification: ${name}`);
    },
  };
}

const SHA = '0123456789abcdef0123456789abcdef01234567';
const PR: WorkflowEvent = { name: 'pull_request', payload: { pull_request: { base: { sha: SHA } } } };
const PUSH: WorkflowEvent = { name: 'push', payload: { before: SHA } };

describe('readInputs', () => {
  test('a pull request compares with its base and checks only what changed', () => {
    expect(readInputs(reader({ policy: 'policies' }), PR)).toEqual({
      policy: 'policies',
      configGlobs: [],
      base: SHA,
      changedOnly: true,
      changedOnlyGiven: false,
      unprovenFails: false,
    });
    expect(readInputs(reader({ policy: 'policies' }), { ...PR, name: 'pull_request_target' }).changedOnly).toBe(true);
  });

  test('a push has no base unless one is given, and checks everything', () => {
    const plain = readInputs(reader({ policy: 'policies' }), PUSH);
    expect(plain.base).toBeUndefined();
    expect(plain.changedOnly).toBe(false);
    const given = readInputs(reader({ policy: 'policies', base: 'origin/main' }), PUSH);
    expect(given.base).toBe('origin/main');
  });

  test('explicit inputs win over the event', () => {
    const r = readInputs(reader({ policy: 'p.yaml', base: 'v1.2', 'changed-only': 'false', 'fail-on-unproven': 'True', sarif: 'out/r.sarif' }), PR);
    expect(r).toEqual({ policy: 'p.yaml', configGlobs: [], base: 'v1.2', changedOnly: false, changedOnlyGiven: true, unprovenFails: true, sarif: 'out/r.sarif' });
  });

  test('configs: one glob per line, blank lines and surrounding spaces dropped', () => {
    const r = readInputs(reader({ policy: 'p', configs: '\n  models/*.yaml  \n\n!models/old-*.yaml\n' }), PUSH);
    expect(r.configGlobs).toEqual(['models/*.yaml', '!models/old-*.yaml']);
  });

  test('refused: no policy, a non-boolean flag, globs that leave the repository', () => {
    const bad = (values: Record<string, string>) => () => readInputs(reader({ policy: 'p', ...values }), PUSH);
    expect(() => readInputs(reader({}), PUSH)).toThrow(ActionInputError);
    expect(() => readInputs(reader({}), PUSH)).toThrow(/input `policy` is required/);
    expect(bad({ 'changed-only': 'yes' })).toThrow("the input `changed-only` must be true or false (got 'yes')");
    expect(bad({ 'fail-on-unproven': '1' })).toThrow(ActionInputError);
    expect(bad({ configs: '/abs/*.yaml' })).toThrow(/is absolute/);
    expect(bad({ configs: 'models/../../x.yaml' })).toThrow(/'\.\.' segment/);
    expect(bad({ configs: '!' })).toThrow(/is empty/);
  });

  test('report files: sarif with its category, junit and picture, relative paths inside the workspace only', () => {
    const ok = readInputs(reader({ policy: 'p', sarif: 'out/r.sarif', 'sarif-category': 'gpu', junit: 'out/r.xml', picture: 'out/r.html' }), PUSH);
    expect([ok.sarif, ok.sarifCategory, ok.junit, ok.picture]).toEqual(['out/r.sarif', 'gpu', 'out/r.xml', 'out/r.html']);
    expect(readInputs(reader({ policy: 'p' }), PUSH).picture).toBeUndefined();
    const bad = (values: Record<string, string>) => () => readInputs(reader({ policy: 'p', ...values }), PUSH);
    expect(bad({ sarif: '../../home/runner/.bashrc' })).toThrow("the input `sarif`: '../../home/runner/.bashrc' has a '..' segment; report files are written inside the workspace");
    expect(bad({ sarif: '/etc/cron.d/x' })).toThrow(/the input `sarif`: '\/etc\/cron.d\/x' is absolute/);
    expect(bad({ junit: 'C:\\x.xml' })).toThrow(/the input `junit`: .* is absolute/);
    expect(bad({ junit: 'out/../../x.xml' })).toThrow(/the input `junit`: .*'\.\.' segment/);
    expect(bad({ picture: '/tmp/x.html' })).toThrow("the input `picture`: '/tmp/x.html' is absolute; give a path relative to the workspace, e.g. 'reports/rankfloor.sarif'");
    expect(bad({ picture: '../x.html' })).toThrow("the input `picture`: '../x.html' has a '..' segment; report files are written inside the workspace");
    expect(bad({ 'sarif-category': 'gpu' })).toThrow('the input `sarif-category` needs the input `sarif` (the path of the SARIF log)');
    expect(bad({ sarif: 'r.sarif', 'sarif-category': 'a\u0007b' })).toThrow('the input `sarif-category`: the category contains control characters');
  });
});

describe('the event', () => {
  const dir = mkdtempSync(join(tmpdir(), 'rankfloor-event-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  test('pullRequestBase reads pull_request.base.sha and nothing else', () => {
    expect(pullRequestBase(PR.payload)).toBe(SHA);
    expect(pullRequestBase(PUSH.payload)).toBeUndefined();
    expect(pullRequestBase({ pull_request: { base: { sha: 7 } } })).toBeUndefined();
    expect(pullRequestBase(null)).toBeUndefined();
  });

  test('readWorkflowEvent: the payload file, none, or a file that is not JSON', () => {
    const file = join(dir, 'event.json');
    writeFileSync(file, JSON.stringify(PR.payload));
    expect(readWorkflowEvent({ GITHUB_EVENT_NAME: 'pull_request', GITHUB_EVENT_PATH: file })).toEqual(PR);
    expect(readWorkflowEvent({})).toEqual({ name: '', payload: {} });
    expect(readWorkflowEvent({ GITHUB_EVENT_NAME: 'push', GITHUB_EVENT_PATH: join(dir, 'missing.json') })).toEqual({ name: 'push', payload: {} });
    writeFileSync(file, '{not json');
    expect(() => readWorkflowEvent({ GITHUB_EVENT_PATH: file })).toThrow(ActionInputError);
  });
});
