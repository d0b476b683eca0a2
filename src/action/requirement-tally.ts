/**
 * The counts over a whole run, so that the `failed` output, the log line and the job summary's
 * verdict column all count a requirement the same way (report/requirement-label.ts): failing,
 * unproven (an unproven requirement or a possible drop counted as a warning), passing.
 */
import type { CheckOutcome } from '../check/run-check.js';
import { labelCount, requirementLabel } from '../report/requirement-label.js';

export { requirementLabel, type RequirementLabel } from '../report/requirement-label.js';

export interface Tally {
  readonly failing: number;
  readonly unproven: number;
  readonly passing: number;
}

export function tallyRequirements(outcome: CheckOutcome): Tally {
  const t = { failing: 0, unproven: 0, passing: 0 };
  for (const c of outcome.checked) c.result?.requirements.forEach((q, i) => t[labelCount(requirementLabel(q, c.deltas?.[i]))]++);
  return t;
}
