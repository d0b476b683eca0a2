/**
 * One word per requirement, shared by every output (text, JSON, SARIF, JUnit, annotations, the
 * job summary), so that they all count a requirement the same way. A requirement fails when it is
 * provably short, when it is unproven and counted as failing, when a drop against the base is
 * proven, or when only the upper bounds dropped and its `unproven` setting counts that as failing;
 * otherwise an unproven requirement or a possible drop is a warning.
 */
import type { RequirementDelta } from '../check/run-check.js';
import type { RequirementResult } from '../policy/evaluate.js';

export type RequirementLabel = 'fail' | 'fail (unproven)' | 'fail (drop)' | 'fail (may have dropped)' | 'may have dropped' | 'unproven' | 'pass';

export function requirementLabel(q: RequirementResult, d: RequirementDelta | undefined): RequirementLabel {
  if (q.failing) return q.verdict === 'fail' ? 'fail' : 'fail (unproven)';
  if (d?.drop === 'proven') return 'fail (drop)';
  if (d?.drop === 'possible') return d.dropFails ? 'fail (may have dropped)' : 'may have dropped';
  return q.verdict === 'unproven' ? 'unproven' : 'pass';
}

/** How a label counts in the tallies: failing, a warning (unproven or a possible drop), passing. */
export function labelCount(label: RequirementLabel): 'failing' | 'unproven' | 'passing' {
  return label.startsWith('fail') ? 'failing' : label === 'pass' ? 'passing' : 'unproven';
}
