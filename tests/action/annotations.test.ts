/**
 * Findings to annotations: the kind each rule gets, the toolkit's property names, and the limit
 * of ten per kind with the rest kept, in order, for the job summary.
 */
import { expect, test } from 'vitest';
import { ANNOTATIONS_PER_KIND, kindOf, planAnnotations } from '../../src/action/annotations.js';
import type { Finding, FindingRule } from '../../src/report/finding.js';

function finding(rule: FindingRule, n: number): Finding {
  return {
    rule,
    level: rule === 'requirement-unproven' ? 'warning' : rule === 'policy-changed' ? 'notice' : 'error',
    title: `${rule} ${n}`,
    message: `message ${n}`,
    file: `models/m${n}.yaml`,
    line: n,
    column: n + 1,
    fingerprint: `${rule}|${n}`,
  };
}

test('each rule has one kind', () => {
  expect(kindOf(finding('requirement-failed', 1))).toBe('error');
  expect(kindOf(finding('capacity-drop', 1))).toBe('error');
  expect(kindOf(finding('input-error', 1))).toBe('error');
  expect(kindOf(finding('requirement-unproven', 1))).toBe('warning');
  expect(kindOf(finding('policy-changed', 1))).toBe('notice');
  expect(kindOf(finding('definition-changed', 1))).toBe('notice');
  // A possible drop is a warning or an error as the requirement's `unproven` counts it.
  expect(kindOf({ ...finding('capacity-may-have-dropped', 1), level: 'warning' })).toBe('warning');
  expect(kindOf({ ...finding('capacity-may-have-dropped', 1), level: 'error' })).toBe('error');
});

test('an annotation carries title, file, line and column under the toolkit names', () => {
  const plan = planAnnotations([finding('capacity-drop', 4)]);
  expect(plan).toEqual({
    shown: [{ kind: 'error', message: 'message 4', properties: { title: 'capacity-drop 4', file: 'models/m4.yaml', startLine: 4, startColumn: 5 } }],
    overflow: [],
  });
});

test('ten of each kind are shown; the rest overflow in their order', () => {
  expect(ANNOTATIONS_PER_KIND).toBe(10);
  const findings = [
    ...Array.from({ length: 3 }, (_, i) => finding('policy-changed', 100 + i)),
    ...Array.from({ length: 7 }, (_, i) => finding('requirement-failed', i)),
    ...Array.from({ length: 5 }, (_, i) => finding('capacity-drop', 10 + i)),
    ...Array.from({ length: 11 }, (_, i) => finding('requirement-unproven', 20 + i)),
  ];
  const plan = planAnnotations(findings);
  const count = (k: string) => plan.shown.filter((a) => a.kind === k).length;
  expect([count('error'), count('warning'), count('notice')]).toEqual([10, 10, 3]);
  expect(plan.overflow.map((o) => `${o.kind} ${o.finding.title}`)).toEqual([
    'error capacity-drop 13',
    'error capacity-drop 14',
    'warning requirement-unproven 30',
  ]);
});
