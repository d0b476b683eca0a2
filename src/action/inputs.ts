/**
 * The action's inputs, read and checked once before any work, with the defaults that depend on the
 * event that started the workflow: on a pull request the base commit comes from the event payload
 * and only the configs the pull request touches are checked. The reader is handed in, so this
 * module never touches the Actions toolkit and its rules can be tested as plain functions.
 */
import { readFileSync } from 'node:fs';
import { sarifCategoryProblem } from '../report/sarif.js';

export interface ActionInputs {
  /** Policy file or directory, relative to the workspace. */
  readonly policy: string;
  /** Globs relative to the repository root; empty: every config the policies govern. */
  readonly configGlobs: readonly string[];
  readonly base?: string;
  readonly changedOnly: boolean;
  /** `changed-only` was given, not derived from the event. */
  readonly changedOnlyGiven: boolean;
  readonly unprovenFails: boolean;
  /** Where to write the SARIF log, relative to the workspace. */
  readonly sarif?: string;
  /** The SARIF run's category, for matrix jobs that upload several logs for one commit. */
  readonly sarifCategory?: string;
  /** Where to write the JUnit report, relative to the workspace. */
  readonly junit?: string;
  /** Where to write the picture report (one HTML file), relative to the workspace. */
  readonly picture?: string;
}

export interface InputReader {
  /** The trimmed value, '' when the input is not set. */
  readonly get: (name: string) => string;
  /** The value as a YAML 1.2 core-schema boolean; throws on anything else. */
  readonly getBoolean: (name: string) => boolean;
}

export interface WorkflowEvent {
  readonly name: string;
  readonly payload: unknown;
}

/** An input the action cannot work with: reported like a usage error (exit code 2). */
export class ActionInputError extends Error {
  override readonly name = 'ActionInputError';
}

const PULL_REQUEST_EVENTS = new Set(['pull_request', 'pull_request_target']);

/** The event that started the run, from the runner's environment; an empty payload outside one. */
export function readWorkflowEvent(env: NodeJS.ProcessEnv): WorkflowEvent {
  const name = env['GITHUB_EVENT_NAME'] ?? '';
  const path = env['GITHUB_EVENT_PATH'];
  if (!path) return { name, payload: {} };
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch {
    // The runner always writes the file; a local run that names a missing one simply has no event.
    return { name, payload: {} };
  }
  try {
    return { name, payload: JSON.parse(text) as unknown };
  } catch (e) {
    throw new ActionInputError(`the event payload ${path} (GITHUB_EVENT_PATH) is not JSON: ${(e as Error).message}`);
  }
}

/** The base commit of the pull request in the payload, if it names one. */
export function pullRequestBase(payload: unknown): string | undefined {
  const sha = field(field(field(payload, 'pull_request'), 'base'), 'sha');
  return typeof sha === 'string' && sha !== '' ? sha : undefined;
}

export function readInputs(reader: InputReader, event: WorkflowEvent): ActionInputs {
  const policy = reader.get('policy');
  if (policy === '') throw new ActionInputError('the input `policy` is required: a policy file or a directory of policies, relative to the repository root');
  const configGlobs = reader
    .get('configs')
    .split('\n')
    .map((line) => line.trim())
    .filter((line) => line !== '');
  for (const glob of configGlobs) {
    const problem = globProblem(glob);
    if (problem) throw new ActionInputError(`the input \`configs\`: ${problem}`);
  }
  const base = reader.get('base') || pullRequestBase(event.payload);
  const changedOnlyGiven = reader.get('changed-only') !== '';
  const changedOnly = changedOnlyGiven ? boolean(reader, 'changed-only') : PULL_REQUEST_EVENTS.has(event.name);
  const unprovenFails = reader.get('fail-on-unproven') !== '' && boolean(reader, 'fail-on-unproven');
  const sarif = reader.get('sarif');
  const junit = reader.get('junit');
  const picture = reader.get('picture');
  for (const [name, value] of [['sarif', sarif], ['junit', junit], ['picture', picture]] as const) {
    const problem = value === '' ? undefined : reportPathProblem(value);
    if (problem) throw new ActionInputError(`the input \`${name}\`: ${problem}`);
  }
  const sarifCategory = reader.get('sarif-category');
  if (sarifCategory !== '') {
    if (sarif === '') throw new ActionInputError('the input `sarif-category` needs the input `sarif` (the path of the SARIF log)');
    const problem = sarifCategoryProblem(sarifCategory);
    if (problem) throw new ActionInputError(`the input \`sarif-category\`: ${problem}`);
  }
  return {
    policy,
    configGlobs,
    ...(base ? { base } : {}),
    changedOnly,
    changedOnlyGiven,
    unprovenFails,
    ...(sarif ? { sarif } : {}),
    ...(sarifCategory ? { sarifCategory } : {}),
    ...(junit ? { junit } : {}),
    ...(picture ? { picture } : {}),
  };
}

// The same limits as a policy's applies_to: globs name files inside the repository.
function globProblem(glob: string): string | undefined {
  const body = glob.startsWith('!') ? glob.slice(1) : glob;
  if (body === '') return `the pattern '${glob}' is empty`;
  if (/^[/\\]/.test(body) || /^[A-Za-z]:/.test(body)) return `the pattern '${glob}' is absolute; patterns are relative to the repository root, e.g. 'models/*.yaml'`;
  if (body.split(/[/\\]/).includes('..')) return `the pattern '${glob}' has a '..' segment; patterns may not leave the repository root`;
  return undefined;
}

// Report files are written into the workspace only: the checked-out pull request must not be able
// to steer a write elsewhere on the runner (the writer also refuses links on the way).
function reportPathProblem(path: string): string | undefined {
  if (/^[/\\]/.test(path) || /^[A-Za-z]:/.test(path)) return `'${path}' is absolute; give a path relative to the workspace, e.g. 'reports/rankfloor.sarif'`;
  if (path.split(/[/\\]/).includes('..')) return `'${path}' has a '..' segment; report files are written inside the workspace`;
  return undefined;
}

function boolean(reader: InputReader, name: string): boolean {
  try {
    return reader.getBoolean(name);
  } catch {
    throw new ActionInputError(`the input \`${name}\` must be true or false (got '${reader.get(name)}')`);
  }
}

function field(value: unknown, key: string): unknown {
  return value !== null && typeof value === 'object' ? (value as Record<string, unknown>)[key] : undefined;
}
