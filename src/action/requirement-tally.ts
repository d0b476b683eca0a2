/**
 * One word per requirement and the counts over a whole run, so that the `failed` output, the log
 * line and the job summary's verdict column all count a requirement the same way: a requirement
 * fails when it is provably short, when it is unproven and counted as failing, or when it dropped
 * more than the policy's max_drop_bits against the base.
 */
import type { CheckOutcome, RequirementDelta } from '../check/run-check.js';
import type { RequirementResult } from '../policy/evaluate.js';

export type RequirementLabel = 'fail' | 'fail (unproven)' | 'fail (drop)' | 'unproven' | 'pass';

export function requirementLabel(q: RequirementResult, d: RequirementDelta | undefined): RequirementLabel {
  if (q.failing) return q.verdict === 'fail' ? 'fail' : 'fail (unproven)';
  if (d?.dropFails) return 'fail (drop)';
  return q.verdict === 'unproven' ? 'unproven' : 'pass';
}

export interface Tally {
  readonly failing: number;
  readonly unproven: number;
  readonly passing: number;
}

export function tallyRequirements(outcome: CheckOutcome): Tally {
  let failing = 0;
  let unproven = 0;
  let passing = 0;
  for (const c of outcome.checked) {
    c.result?.requirements.forEach((q, i) => {
      const label = requirementLabel(q, c.deltas?.[i]);
      if (label.startsWith('fail')) failing++;
      else if (label === 'unproven') unproven++;
      else passing++;
    });
  }
  return { failing, unproven, passing };
}
