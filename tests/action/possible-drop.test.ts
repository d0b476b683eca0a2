/**
 * A drop that only the upper bounds show, through the Action's outputs: the annotation's kind and
 * the job summary's verdict follow the requirement's `unproven` setting (a warning, or a failure),
 * and the tally behind the `failed` output counts it the same way. The configs are a depth-2
 * recurrent net whose start-end bounds are C(R + T/2 − 1, T/2) below (Levine, Sharir, Ziv,
 * Shashua) and R times that above, at T = 128 for the base and T = 100 for the head: the upper
 * bound falls by 1.03 bits, more than the 1 allowed, while the base is proven only to reach
 * 15.55 bits, less than 1 bit above the head's ceiling of 16.52 bits.
 */
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { planAnnotations } from '../../src/action/annotations.js';
import { renderJobSummary } from '../../src/action/job-summary.js';
import { tallyRequirements } from '../../src/action/requirement-tally.js';
import { findingsOf } from '../../src/check/findings.js';
import { runCheck, type CheckOutcome } from '../../src/check/run-check.js';
import { initRepo, isolateThisProcess, removeTempDirs } from './action-fixture.js';

const rac = (steps: number): string => `model:\n  input: {shape: [${steps}]}\n  layers:\n    - recurrent: {hidden: 4, depth: 2}\n    - dense: {units: 1}\n`;

const policy = (unproven: string): string =>
  `id: memory\ndescription: start-end memory\napplies_to: ["models/*.yaml"]\nmax_drop_bits: 1\nunproven: ${unproven}\nrequire:\n  - {partition: start-end, min_rank: 16}\n`;

function compare(unproven: 'warn' | 'fail'): CheckOutcome {
  const repo = initRepo();
  repo.write('policies/memory.yaml', policy(unproven));
  repo.write('models/rac.yaml', rac(128));
  const base = repo.commit('base');
  repo.write('models/rac.yaml', rac(100));
  repo.commit('shorter sequences');
  return runCheck({ cwd: repo.dir, policy: 'policies', configs: [], base });
}

beforeAll(isolateThisProcess);
afterAll(removeTempDirs);

describe('a possible drop in the Action', () => {
  test('counted as a warning: a warning annotation, "may have dropped" in the summary, nothing failed', () => {
    const outcome = compare('warn');
    expect(outcome.checked[0]!.deltas![0]).toMatchObject({ drop: 'possible', dropFails: false });
    const findings = findingsOf(outcome, outcome.root);
    expect(findings.map((f) => `${f.rule} ${f.level}`)).toEqual(['capacity-may-have-dropped warning']);
    expect(planAnnotations(findings).shown.map((a) => `${a.kind}: ${a.properties.title}`)).toEqual([
      'warning: start-end: capacity may have dropped more than allowed (policy memory)',
    ]);
    expect(tallyRequirements(outcome)).toEqual({ failing: 0, unproven: 1, passing: 0 });
    const summary = renderJobSummary(outcome, 'pass', []);
    expect(summary).toContain('<td>start-end</td><td>4.00</td><td>15.55–17.55</td><td>14.52–16.52</td><td>-1.03</td><td>may have dropped</td>');
    expect(summary).not.toContain('<details>');
  });

  test('counted as failing: an error annotation, a failing verdict with its explanation, one failed requirement', () => {
    const outcome = compare('fail');
    expect(outcome.checked[0]!.failing).toBe(true);
    const findings = findingsOf(outcome, outcome.root);
    expect(planAnnotations(findings).shown.map((a) => `${a.kind}: ${a.properties.title}`)).toEqual([
      'error: start-end: capacity may have dropped more than allowed, counted as failing (policy memory)',
    ]);
    expect(tallyRequirements(outcome)).toEqual({ failing: 1, unproven: 0, passing: 0 });
    const summary = renderJobSummary(outcome, 'fail', []);
    expect(summary).toContain('<td>fail (may have dropped)</td>');
    expect(summary).toContain('<details><summary>start-end: fail (may have dropped) — why, and what restores it</summary>');
    expect(summary).toContain('counted as failing (unproven: fail)');
  });
});
