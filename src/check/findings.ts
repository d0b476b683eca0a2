/**
 * The check outcome as findings: what failed, where a reviewer should look, in one list that
 * annotations, SARIF and the job summary all render. A failing requirement points at the changed
 * field that lies on the minimal cut when the comparison found one (the line of the pull request
 * that shrank it), else at the bottleneck layer. A config the change took out of a policy's reach
 * (deleted, or renamed where the policy does not look) is a finding on the file as a whole.
 */
import { resolve } from 'node:path';
import type { Diagnostic } from '../diagnostic.js';
import type { Finding, FindingRule } from '../report/finding.js';
import { labelCount, requirementLabel, type RequirementLabel } from '../report/requirement-label.js';
import { explainRequirement, removalMessage } from '../report/check-text.js';
import type { CheckedConfig, CheckOutcome } from './run-check.js';
import { toRootRelative } from './repo-files.js';

export function findingsOf(outcome: CheckOutcome, cwd: string): Finding[] {
  const out: Finding[] = [];
  for (const n of outcome.notices) {
    const rule = n.definition ? 'definition-changed' : 'policy-changed';
    out.push({
      rule,
      level: 'notice',
      title: n.definition ? 'architecture definition changed by this pull request' : 'policy changed by this pull request',
      message: n.message,
      file: n.path,
      line: n.line,
      column: 1,
      fingerprint: `${rule}|${n.path}`,
    });
  }
  for (const c of outcome.checked) {
    if (c.comparison === 'deleted' || c.comparison === 'moved-out') {
      out.push(removalFinding(c));
      continue;
    }
    if (!c.result) continue;
    c.result.requirements.forEach((q, i) => {
      const d = c.deltas?.[i];
      const label = requirementLabel(q, d);
      if (label === 'pass') return;
      const failing = labelCount(label) === 'failing';
      const attributed = d?.attributed[0];
      const cut = q.bounds.upper.cut.find((e) => e.layer !== 'input') ?? q.bounds.upper.cut[0];
      // A config built from a definition: the changed parameter's line, or the changed line of the
      // definition; with no change to point at, the config's `architecture` line (the cut's lines
      // are the definition's, named in the message).
      const place = attributed
        ? { file: attributed.file ?? c.path, line: attributed.span.line, column: attributed.span.column }
        : c.architecture
          ? { file: c.path, line: c.architecture.span.line, column: c.architecture.span.column }
          : { file: c.path, line: cut?.line ?? 1, column: 1 };
      const { rule, what } = FINDING_OF[label];
      const [, ...body] = explainRequirement(q, d, c.architecture);
      out.push({
        rule,
        level: failing ? 'error' : 'warning',
        title: `${q.requirement.partition}: ${what} (policy ${c.policy.id})`,
        message: body.join('\n'),
        ...place,
        fingerprint: `${rule}|${c.path}|${c.policy.id}|${q.requirement.partition}`,
      });
    });
  }
  for (const e of outcome.errors) out.push(errorFinding(e, outcome.root, cwd));
  return out;
}

/** The finding of each requirement label other than `pass`: its rule and what its title says. */
const FINDING_OF: Readonly<Record<Exclude<RequirementLabel, 'pass'>, { rule: FindingRule; what: string }>> = {
  fail: { rule: 'requirement-failed', what: 'capacity below the policy minimum' },
  'fail (unproven)': { rule: 'requirement-failed', what: 'capacity not proven to reach the minimum, counted as failing' },
  'fail (drop)': { rule: 'capacity-drop', what: 'capacity dropped more than allowed' },
  'fail (may have dropped)': { rule: 'capacity-may-have-dropped', what: 'capacity may have dropped more than allowed, counted as failing' },
  'may have dropped': { rule: 'capacity-may-have-dropped', what: 'capacity may have dropped more than allowed' },
  unproven: { rule: 'requirement-unproven', what: 'capacity not proven' },
};

function errorFinding(e: Diagnostic, root: string, cwd: string): Finding {
  const relative = toRootRelative(root, resolve(cwd, e.file));
  // A file outside the root (or the root itself) keeps the name it was given.
  const path = relative === '' || relative === '..' || relative.startsWith('../') ? e.file : relative;
  return {
    rule: 'input-error',
    level: 'error',
    title: `cannot check ${e.file}`,
    message: `${e.message} [${e.code}]`,
    file: path,
    ...(e.span ? { line: e.span.line, column: e.span.column } : {}),
    fingerprint: `input-error|${path}|${e.code}|${e.span?.offset ?? 0}`,
  };
}

function removalFinding(c: CheckedConfig): Finding {
  // A deleted file has no line to point at; a moved one is pointed at where it went.
  const file = c.movedTo?.path ?? c.path;
  return {
    rule: 'config-removed',
    level: c.failing ? 'error' : 'warning',
    title: `${c.path}: ${c.movedTo ? 'moved out of' : 'deleted from'} policy ${c.policy.id}`,
    message: removalMessage(c),
    file,
    fingerprint: `config-removed|${c.path}|${c.policy.id}`,
  };
}
