/**
 * One thing a reviewer must see, independent of where it is shown: a GitHub annotation, a SARIF
 * result, a line of the job summary. `check` turns its results into findings once, and every
 * output format renders the same list, so they never disagree about what failed where.
 */

export type FindingRule =
  /** A requirement whose upper bound is below its minimum (or unproven, counted as failing). */
  | 'requirement-failed'
  /** A requirement neither proven nor refuted, counted as a warning. */
  | 'requirement-unproven'
  /** A proven drop against the base revision larger than the policy's max_drop_bits. */
  | 'capacity-drop'
  /**
   * Only the upper bounds dropped by more than max_drop_bits: the capacity may have dropped. An
   * error or a warning, as the requirement's `unproven` says.
   */
  | 'capacity-may-have-dropped'
  /** The head revision changed a policy; the base policy was used. */
  | 'policy-changed'
  /** A config or policy that could not be read. */
  | 'input-error'
  /** A config governed at the base that the change deleted or moved out of the policy's reach. */
  | 'config-removed'
  /** The head revision changed an architecture definition that checked configs name. */
  | 'definition-changed';

export interface Finding {
  readonly rule: FindingRule;
  readonly level: 'error' | 'warning' | 'notice';
  /** One-line title and the full explanation. */
  readonly title: string;
  readonly message: string;
  /** Path relative to the repository root, forward slashes; never empty. */
  readonly file: string;
  /** Absent when no line is known: the finding is about the file as a whole. */
  readonly line?: number;
  readonly column?: number;
  /** Stable across runs and unrelated edits: rule, file, policy and partition, never a line. */
  readonly fingerprint: string;
}
