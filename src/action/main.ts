/**
 * The GitHub Action: the same check job as `rankfloor check`, driven by the action's inputs and
 * the pull request event, reported the way GitHub shows things — annotations on the changed
 * lines, a job summary, step outputs, and the step's status. This is the only module that talks
 * to the Actions toolkit; everything it renders is computed by pure modules beside it.
 *
 * Exit codes follow the CLI: 1 when a requirement fails, 2 when an input or the request itself is
 * wrong, and nothing can hide a 2.
 */
import { randomUUID } from 'node:crypto';
import { EOL, tmpdir } from 'node:os';
import { resolve } from 'node:path';
import * as core from '@actions/core';
import { findingsOf } from '../check/findings.js';
import { ReportWriteError, writeReport } from '../check/write-report.js';
import { CheckRequestError, runCheck, type CheckOutcome } from '../check/run-check.js';
import { formatDiagnosticLine } from '../diagnostic.js';
import { GitError } from '../git/git.js';
import { checkJson, overallVerdict } from '../report/check-json.js';
import { checkText } from '../report/check-text.js';
import { junitReport } from '../report/junit.js';
import { checkPicture } from '../report/picture-html.js';
import { sarifText } from '../report/sarif.js';
import { TOOL_VERSION } from '../version.js';
import { planAnnotations } from './annotations.js';
import { ActionInputError, readInputs, readWorkflowEvent, type ActionInputs } from './inputs.js';
import { tallyRequirements } from './requirement-tally.js';
import { renderJobSummary } from './job-summary.js';

const EXIT_INPUT = 2;
const REPORT_NAME = 'rankfloor-report.json';

export async function run(): Promise<void> {
  try {
    await check();
  } catch (e) {
    if (e instanceof ActionInputError || e instanceof CheckRequestError || e instanceof GitError || e instanceof ReportWriteError) {
      failWithInputError(e.message);
      return;
    }
    failWithInputError(`internal error (please report it with the config that caused it): ${e instanceof Error ? (e.stack ?? e.message) : String(e)}`);
  }
}

async function check(): Promise<void> {
  // Paths in inputs, annotations and the report are relative to the checked-out repository.
  const workspace = process.env['GITHUB_WORKSPACE'] || process.cwd();
  try {
    process.chdir(workspace);
  } catch (e) {
    throw new ActionInputError(`cannot enter the workspace ${workspace} (GITHUB_WORKSPACE): ${(e as Error).message}; check out the repository first (actions/checkout)`);
  }
  const cwd = process.cwd();
  const inputs = readInputs(
    { get: (name) => core.getInput(name), getBoolean: (name) => core.getBooleanInput(name) },
    readWorkflowEvent(process.env),
  );
  if (inputs.changedOnly && inputs.base === undefined && inputs.changedOnlyGiven) {
    core.warning('changed-only needs a base commit (the `base` input, or a pull_request event); every governed config is checked');
  }
  const outcome = checkConfigs(cwd, inputs);
  const verdict = overallVerdict(outcome);
  const findings = findingsOf(outcome, cwd);
  const plan = planAnnotations(findings);

  core.startGroup('rankfloor check');
  logPlainText([checkText(outcome, { color: false, quiet: false }), ...outcome.errors.map(formatDiagnosticLine)].join('\n'));
  core.endGroup();
  for (const a of plan.shown) core[a.kind](a.message, a.properties);

  const reportPath = resolve(process.env['RUNNER_TEMP'] || tmpdir(), REPORT_NAME);
  writeReport(reportPath, checkJson(outcome));
  // Inside the workspace only: the paths are inputs, and the workspace holds the pull request.
  const sarifOptions = { version: TOOL_VERSION, ...(inputs.sarifCategory ? { category: inputs.sarifCategory } : {}) };
  if (inputs.sarif) writeReport(resolve(cwd, inputs.sarif), sarifText(findings, sarifOptions), { inside: cwd });
  if (inputs.junit) writeReport(resolve(cwd, inputs.junit), junitReport(outcome), { inside: cwd });
  const picturePath = inputs.picture ? resolve(cwd, inputs.picture) : undefined;
  if (picturePath) writeReport(picturePath, checkPicture(outcome), { inside: cwd });
  const tally = tallyRequirements(outcome);
  core.setOutput('verdict', verdict);
  core.setOutput('failed', tally.failing);
  core.setOutput('report', reportPath);
  if (picturePath) core.setOutput('picture', picturePath);

  if (process.env['GITHUB_STEP_SUMMARY']) {
    core.summary.addRaw(renderJobSummary(outcome, verdict, plan.overflow, { reportPath }));
    try {
      await core.summary.write();
    } catch (e) {
      // The verdict is already out in annotations and outputs; a summary file the runner did not
      // provide must not turn it into an error.
      core.warning(`could not write the job summary: ${(e as Error).message}`);
    }
  }

  const inputErrors = outcome.errors.filter((e) => e.severity === 'error');
  if (inputErrors.length > 0) {
    const first = formatDiagnosticLine(inputErrors[0]!);
    const more = inputErrors.length > 1 ? ` (and ${inputErrors.length - 1} more)` : '';
    core.setFailed(`rankfloor: cannot check every config: ${first}${more}`);
    process.exitCode = EXIT_INPUT;
  } else if (outcome.checked.some((c) => c.failing)) {
    const plural = (n: number, one: string): string => `${n} ${one}${n === 1 ? '' : 's'}`;
    const configs = outcome.checked.filter((c) => c.failing && c.result).length;
    const removed = outcome.checked.filter((c) => c.failing && !c.result).length;
    const parts = [
      ...(tally.failing > 0 ? [`${plural(tally.failing, 'failing requirement')} in ${plural(configs, 'config')}`] : []),
      ...(removed > 0 ? [`${plural(removed, 'governed config')} removed from ${removed === 1 ? 'its policy' : 'their policies'}`] : []),
    ];
    core.setFailed(`rankfloor: ${parts.join('; ')}; see the annotations and the job summary`);
  }
}

function checkConfigs(cwd: string, inputs: ActionInputs): CheckOutcome {
  return runCheck({
    cwd,
    policy: inputs.policy,
    configs: [],
    // Globs that match nothing check nothing, not every governed config.
    ...(inputs.configGlobs.length > 0 ? { configGlobs: inputs.configGlobs } : {}),
    ...(inputs.base !== undefined ? { base: inputs.base } : {}),
    changed: inputs.changedOnly && inputs.base !== undefined,
    unprovenFails: inputs.unprovenFails,
  });
}

function failWithInputError(message: string): void {
  core.setOutput('verdict', 'error');
  core.setOutput('failed', 0);
  core.setFailed(`rankfloor: ${message}`);
  process.exitCode = EXIT_INPUT;
}

/**
 * The runner reads a log line that starts with `::` as a workflow command, and file names and
 * messages in the report come from the pull request, so the report is logged with command
 * processing stopped; the token that restarts it is random, so the logged text cannot contain it.
 */
function logPlainText(text: string): void {
  const token = `rankfloor-${randomUUID()}`;
  process.stdout.write(`::stop-commands::${token}${EOL}`);
  core.info(text);
  process.stdout.write(`::${token}::${EOL}`);
}
