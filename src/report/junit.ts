/**
 * The JUnit XML form of `rankfloor check`, for CI systems that know nothing about capacity but do
 * know test reports: each requirement is a test case, grouped into one suite per (config,
 * policy), so a failing requirement (or a drop against the base that fails) shows up in the same
 * place as a failing unit test, with the explanation as the failure text. A requirement that is
 * neither proven nor refuted, or that may have dropped, counted as a warning, is a skipped test:
 * nothing was shown either way. A config the change removed from
 * a policy's reach is a test case of its own, failed or skipped as the policy says. Input errors
 * are test errors in a suite of their own, so a broken config is not mistaken for a passing one.
 * Output is deterministic (no times, no host names) so that two runs on the same tree give the
 * same file.
 */
import type { CheckOutcome, RequirementDelta } from '../check/run-check.js';
import { formatDiagnosticLine, type Diagnostic } from '../diagnostic.js';
import type { PolicyResult, RequirementResult } from '../policy/evaluate.js';
import type { ArchitectureUse } from '../config/model.js';
import { explainRequirement, removalMessage, requirementSummary } from './check-text.js';
import { labelCount, requirementLabel } from './requirement-label.js';

/** A policy result with the comparison of each requirement against the base, when there was one. */
export interface ComparedResult {
  readonly result: PolicyResult;
  readonly deltas?: readonly (RequirementDelta | undefined)[];
}

/** A config the change deleted or moved out of a policy's reach (see check/findings.ts). */
export interface RemovedConfig {
  readonly file: string;
  readonly policy: string;
  readonly message: string;
  readonly failing: boolean;
}

/** The report of a whole check run. */
export function junitReport(outcome: CheckOutcome): string {
  const results = outcome.checked.flatMap((c): ComparedResult[] => (c.result ? [{ result: c.result, ...(c.deltas ? { deltas: c.deltas } : {}) }] : []));
  const removed = outcome.checked.flatMap((c) =>
    c.comparison === 'deleted' || c.comparison === 'moved-out' ? [{ file: c.file, policy: c.policy.id, message: removalMessage(c), failing: c.failing }] : [],
  );
  // A config built from a definition: its layer lines are the definition's, and the failure says so.
  const built = new Map(outcome.checked.flatMap((c) => (c.result && c.architecture ? [[c.result, c.architecture] as const] : [])));
  return junitXml(results, outcome.errors, removed, (r) => built.get(r));
}

export function junitXml(
  results: readonly (PolicyResult | ComparedResult)[],
  errors: readonly Diagnostic[],
  removed: readonly RemovedConfig[] = [],
  architectureOf: (r: PolicyResult) => ArchitectureUse | undefined = () => undefined,
): string {
  const suites = groupSuites(results, removed, architectureOf).map(policySuite);
  const inputErrors = errors.filter((e) => e.severity === 'error');
  if (inputErrors.length > 0) suites.push(errorSuite(inputErrors));
  const tests = sum(suites, (s) => s.tests);
  const failures = sum(suites, (s) => s.failures);
  const errorCount = sum(suites, (s) => s.errors);
  const skipped = sum(suites, (s) => s.skipped);
  const out = [
    '<?xml version="1.0" encoding="UTF-8"?>',
    `<testsuites${attrs({ name: 'rankfloor', tests, failures, errors: errorCount, skipped })}>`,
  ];
  for (const s of suites) out.push(...s.lines);
  out.push('</testsuites>');
  return out.join('\n') + '\n';
}

interface Suite {
  readonly tests: number;
  readonly failures: number;
  readonly errors: number;
  readonly skipped: number;
  readonly lines: string[];
}

interface Group {
  readonly file: string;
  readonly policy: string;
  readonly requirements: { readonly q: RequirementResult; readonly d: RequirementDelta | undefined }[];
  readonly removed: RemovedConfig[];
  architecture?: ArchitectureUse;
}

/**
 * One suite per (config file, policy id), in code-unit order of both, so the report does not
 * depend on the order in which configs were discovered on disk.
 */
function groupSuites(
  results: readonly (PolicyResult | ComparedResult)[],
  removed: readonly RemovedConfig[],
  architectureOf: (r: PolicyResult) => ArchitectureUse | undefined,
): Group[] {
  const groups = new Map<string, Group>();
  const groupOf = (file: string, policy: string): Group => {
    const key = JSON.stringify([file, policy]);
    let g = groups.get(key);
    if (!g) {
      g = { file, policy, requirements: [], removed: [] };
      groups.set(key, g);
    }
    return g;
  };
  for (const x of results) {
    const { result: r, deltas } = 'result' in x ? x : { result: x, deltas: undefined };
    const g = groupOf(r.file, r.policy.id);
    g.requirements.push(...r.requirements.map((q, i) => ({ q, d: deltas?.[i] })));
    g.architecture ??= architectureOf(r);
  }
  for (const r of removed) groupOf(r.file, r.policy).removed.push(r);
  return [...groups.values()].sort((a, b) => cmp(a.file, b.file) || cmp(a.policy, b.policy));
}

function policySuite(g: Group): Suite {
  const classname = dotted(g.file);
  const names = new UniqueNames();
  const cases: string[] = [];
  let failures = 0;
  let skipped = 0;
  for (const { q, d } of g.requirements) {
    const name = names.take(`${g.policy}: ${q.requirement.partition}`);
    const head = `    <testcase${attrs({ classname, name, file: g.file })}`;
    const label = requirementLabel(q, d);
    if (labelCount(label) === 'failing') {
      failures++;
      const type = q.failing ? 'requirement-failed' : label === 'fail (drop)' ? 'capacity-drop' : 'capacity-may-have-dropped';
      cases.push(`${head}>`);
      cases.push(`      <failure${attrs({ message: requirementSummary(q), type })}>${text(explainRequirement(q, d, g.architecture).join('\n'))}</failure>`);
      cases.push('    </testcase>');
    } else if (label !== 'pass') {
      // Counted as a warning by the policy: neither shown nor refuted, so the test is skipped.
      skipped++;
      const why = label === 'may have dropped' ? 'may have dropped more than max_drop_bits against the base' : 'not proven to reach the minimum';
      cases.push(`${head}>`);
      cases.push(`      <skipped${attrs({ message: `${requirementSummary(q)}; ${why} (counted as a warning by the policy)` })}/>`);
      cases.push('    </testcase>');
    } else {
      cases.push(`${head}/>`);
    }
  }
  for (const r of g.removed) {
    const name = names.take(`${g.policy}: governed config removed`);
    cases.push(`    <testcase${attrs({ classname, name, file: g.file })}>`);
    if (r.failing) {
      failures++;
      cases.push(`      <failure${attrs({ message: r.message, type: 'config-removed' })}>${text(r.message)}</failure>`);
    } else {
      skipped++;
      cases.push(`      <skipped${attrs({ message: r.message })}/>`);
    }
    cases.push('    </testcase>');
  }
  const tests = g.requirements.length + g.removed.length;
  const lines = [
    `  <testsuite${attrs({ name: `${g.file}: ${g.policy}`, tests, failures, errors: 0, skipped })}>`,
    ...cases,
    '  </testsuite>',
  ];
  return { tests, failures, errors: 0, skipped, lines };
}

function errorSuite(errors: readonly Diagnostic[]): Suite {
  const names = new UniqueNames();
  const cases: string[] = [];
  for (const e of errors) {
    const where = e.span ? `${e.file}:${e.span.line}:${e.span.column}` : e.file;
    const line = `${where}: ${e.message}`;
    cases.push(`    <testcase${attrs({ classname: dotted(e.file), name: names.take(`${where} ${e.code}`), file: e.file })}>`);
    cases.push(`      <error${attrs({ message: line, type: e.code })}>${text(formatDiagnosticLine(e))}</error>`);
    cases.push('    </testcase>');
  }
  const lines = [
    `  <testsuite${attrs({ name: 'input errors', tests: errors.length, failures: 0, errors: errors.length, skipped: 0 })}>`,
    ...cases,
    '  </testsuite>',
  ];
  return { tests: errors.length, failures: 0, errors: errors.length, skipped: 0, lines };
}

/** Test names must be unique within a suite; repeats get ` #2`, ` #3`, ... in order of appearance. */
class UniqueNames {
  private readonly used = new Set<string>();
  take(base: string): string {
    let name = base;
    for (let n = 2; this.used.has(name); n++) name = `${base} #${n}`;
    this.used.add(name);
    return name;
  }
}

function dotted(file: string): string {
  return file.replace(/\\/g, '/').replace(/\//g, '.');
}

function sum(suites: readonly Suite[], f: (s: Suite) => number): number {
  return suites.reduce((n, s) => n + f(s), 0);
}

function cmp(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}

function attrs(values: Readonly<Record<string, string | number>>): string {
  return Object.entries(values)
    .map(([k, v]) => ` ${k}="${attribute(String(v))}"`)
    .join('');
}

// XML 1.0 allows only these characters, even as references: anything else (most C0 controls,
// lone surrogates, U+FFFE, U+FFFF) makes the whole document unreadable, so it is dropped.
const NOT_XML_CHAR = /[^\t\n\r\u0020-\uD7FF\uE000-\uFFFD\u{10000}-\u{10FFFF}]/gu;

export function xmlText(s: string): string {
  return s
    .replace(NOT_XML_CHAR, '')
    .replace(/&/g, '&amp;')
    .replace(/</g, '&lt;')
    .replace(/>/g, '&gt;')
    .replace(/"/g, '&quot;')
    .replace(/'/g, '&apos;');
}

const text = xmlText;

/** In attributes a parser folds raw tabs and newlines into spaces; references keep them. */
function attribute(s: string): string {
  return xmlText(s).replace(/\t/g, '&#9;').replace(/\n/g, '&#10;').replace(/\r/g, '&#13;');
}
