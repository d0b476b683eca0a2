/**
 * `rankfloor check`: argument parsing and rendering around `runCheck`. The exit code is 2 if any
 * input error occurred (the other files are still reported), else 1 if a requirement failed,
 * else 0. `--sarif`, `--junit` and `--picture` files are written whole, after the check, never partially.
 */
import { parseArgs } from 'node:util';
import { CheckRequestError, runCheck } from '../check/run-check.js';
import { findingsOf } from '../check/findings.js';
import { ReportWriteError, writeReport } from '../check/write-report.js';
import { checkJson } from '../report/check-json.js';
import { checkText } from '../report/check-text.js';
import { sarifCategoryProblem, sarifText } from '../report/sarif.js';
import { junitReport } from '../report/junit.js';
import { TOOL_VERSION } from '../version.js';
import { EXIT_FAIL, EXIT_INPUT, EXIT_OK, UsageError, oneOf, printDiagnostics, type Io } from './cli-support.js';
import { CHECK_HELP, parseOptions } from './help.js';

interface CheckValues {
  policy?: string;
  'model-path'?: string;
  format?: string;
  quiet?: boolean;
  root?: string;
  base?: string;
  changed?: boolean;
  staged?: boolean;
  'policy-from'?: string;
  sarif?: string;
  'sarif-category'?: string;
  junit?: string;
  picture?: string;
}

export async function checkCommand(args: readonly string[], io: Io): Promise<number> {
  const { values, positionals } = parseArgs({ args: [...args], allowPositionals: true, strict: true, options: parseOptions(CHECK_HELP) }) as {
    values: CheckValues;
    positionals: string[];
  };
  if (!values.policy) throw new UsageError('check needs --policy FILE|DIR');
  const format = oneOf(values.format ?? 'text', ['text', 'json'], '--format');
  const policyFrom = oneOf(values['policy-from'] ?? 'base', ['base', 'head'], '--policy-from') as 'base' | 'head';
  if (values.changed && values.base === undefined) throw new UsageError('--changed needs --base REV');
  if (values.staged && values.base !== undefined) throw new UsageError('--staged compares with HEAD; do not give --base');
  if (values['sarif-category'] !== undefined && values.sarif === undefined) throw new UsageError('--sarif-category needs --sarif FILE');
  const categoryProblem = values['sarif-category'] === undefined ? undefined : sarifCategoryProblem(values['sarif-category']);
  if (categoryProblem) throw new UsageError(`--sarif-category: ${categoryProblem}`);
  const cwd = process.cwd();
  let outcome;
  try {
    outcome = runCheck({
      cwd,
      ...(values.root ? { root: values.root } : {}),
      policy: values.policy,
      configs: positionals,
      ...(values.base !== undefined ? { base: values.base } : {}),
      changed: values.changed ?? false,
      staged: values.staged ?? false,
      policyFrom,
      ...(values['model-path'] !== undefined ? { modelPath: values['model-path'] } : {}),
    });
  } catch (e) {
    if (e instanceof CheckRequestError) throw new UsageError(e.message);
    throw e;
  }
  if (format === 'json') io.stdout(checkJson(outcome));
  else {
    io.stdout(checkText(outcome, { color: io.color ?? false, quiet: values.quiet ?? false }));
    if (outcome.checked.length === 0 && outcome.errors.length === 0) io.stdout('nothing to check: no config matched\n');
  }
  const findings = findingsOf(outcome, cwd);
  try {
    const category = values['sarif-category'];
    if (values.sarif) writeReport(values.sarif, sarifText(findings, { version: TOOL_VERSION, ...(category ? { category } : {}) }));
    if (values.junit) writeReport(values.junit, junitReport(outcome));
    // Loaded only when asked for: the layout library is not part of every check's start-up.
    if (values.picture) writeReport(values.picture, (await import('../report/picture-html.js')).checkPicture(outcome));
  } catch (e) {
    if (!(e instanceof ReportWriteError)) throw e;
    if (outcome.errors.length > 0) printDiagnostics(outcome.errors, io, outcome.sources);
    io.stderr(`rankfloor: ${e.message}\n`);
    return EXIT_INPUT;
  }
  if (outcome.errors.length > 0) printDiagnostics(outcome.errors, io, outcome.sources);
  if (outcome.errors.some((d) => d.severity === 'error')) return EXIT_INPUT;
  return outcome.checked.some((c) => c.failing) ? EXIT_FAIL : EXIT_OK;
}
