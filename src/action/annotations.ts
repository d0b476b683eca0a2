/**
 * Which findings become annotations on the pull request's diff. GitHub shows at most ten
 * annotations of each kind from one step and drops the rest without a word, so the plan keeps the
 * first ten of each kind and hands the others to the job summary, where a reviewer still sees
 * them. The kind follows the rule, not the finding's own level, so that the mapping is stated once;
 * the exceptions are a removed config and a possible drop, which the policy makes a warning or an
 * error.
 */
import type { Finding, FindingRule } from '../report/finding.js';

export type AnnotationKind = 'error' | 'warning' | 'notice';

/** Per kind and step, the number GitHub displays. */
export const ANNOTATIONS_PER_KIND = 10;

const KIND_OF: Readonly<Record<Exclude<FindingRule, 'config-removed' | 'capacity-may-have-dropped'>, AnnotationKind>> = {
  'requirement-failed': 'error',
  'capacity-drop': 'error',
  'input-error': 'error',
  'requirement-unproven': 'warning',
  'policy-changed': 'notice',
  'definition-changed': 'notice',
};

export interface Annotation {
  readonly kind: AnnotationKind;
  readonly message: string;
  /** The Actions toolkit's annotation properties. */
  readonly properties: {
    readonly title: string;
    readonly file: string;
    /** Absent for a finding on a file as a whole. */
    readonly startLine?: number;
    readonly startColumn?: number;
  };
}

export interface AnnotationPlan {
  readonly shown: readonly Annotation[];
  /** Findings beyond the limit of their kind, in the order they came. */
  readonly overflow: readonly { readonly kind: AnnotationKind; readonly finding: Finding }[];
}

export function kindOf(finding: Finding): AnnotationKind {
  if (finding.rule === 'config-removed' || finding.rule === 'capacity-may-have-dropped') return finding.level === 'error' ? 'error' : 'warning';
  return KIND_OF[finding.rule];
}

export function planAnnotations(findings: readonly Finding[], perKind = ANNOTATIONS_PER_KIND): AnnotationPlan {
  const used: Record<AnnotationKind, number> = { error: 0, warning: 0, notice: 0 };
  const shown: Annotation[] = [];
  const overflow: { kind: AnnotationKind; finding: Finding }[] = [];
  for (const finding of findings) {
    const kind = kindOf(finding);
    if (used[kind] >= perKind) {
      overflow.push({ kind, finding });
      continue;
    }
    used[kind]++;
    shown.push({
      kind,
      message: finding.message,
      properties: {
        title: finding.title,
        file: finding.file,
        ...(finding.line !== undefined ? { startLine: finding.line } : {}),
        ...(finding.column !== undefined ? { startColumn: finding.column } : {}),
      },
    });
  }
  return { shown, overflow };
}
