/**
 * Throw-away git repositories shaped like a team's model repository (a policy under policies/, a
 * kidney-pair classifier under models/), and a way to run the committed bundle dist/action.js in
 * them the way the runner does: a child process whose inputs, event and output files come from
 * the environment. Git runs with the machine's global and system configuration cut off, the
 * identity lives in each repository's own config, and nothing global is written.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, realpathSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

export const REPO = fileURLToPath(new URL('../..', import.meta.url));
export const ACTION = join(REPO, 'dist', 'action.js');

const TMP = realpathSync(tmpdir());
const made: string[] = [];

export function tempDir(prefix = 'rankfloor-action-'): string {
  const dir = mkdtempSync(join(TMP, prefix));
  made.push(dir);
  return dir;
}

export function removeTempDirs(): void {
  for (const dir of made.splice(0)) rmSync(dir, { recursive: true, force: true });
}

const HOME = tempDir('rankfloor-action-home-');

/** The environment every git (and action) process gets: no user or system git configuration. */
export function isolatedEnv(): NodeJS.ProcessEnv {
  const env: NodeJS.ProcessEnv = {};
  for (const [k, v] of Object.entries(process.env)) {
    // GITHUB_* and INPUT_* of an enclosing workflow would leak into the action under test.
    if (k.startsWith('GIT_') || k.startsWith('GITHUB_') || k.startsWith('INPUT_') || k === 'RUNNER_TEMP') continue;
    env[k] = v;
  }
  return {
    ...env,
    HOME,
    XDG_CONFIG_HOME: join(HOME, '.config'),
    GIT_CONFIG_NOSYSTEM: '1',
    GIT_CONFIG_GLOBAL: join(HOME, 'gitconfig'),
    GIT_CEILING_DIRECTORIES: TMP,
  };
}

export function git(cwd: string, ...args: string[]): string {
  return execFileSync('git', args, { cwd, env: isolatedEnv(), encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] }).replace(/\n$/, '');
}

export interface Repo {
  readonly dir: string;
  write(path: string, text: string): void;
  read(path: string): string;
  /** Stages everything and commits; returns the commit id. */
  commit(message: string): string;
}

export function openRepo(dir: string): Repo {
  return {
    dir,
    write(path, text) {
      mkdirSync(dirname(join(dir, path)), { recursive: true });
      writeFileSync(join(dir, path), text);
    },
    read: (path) => readFileSync(join(dir, path), 'utf8'),
    commit(message) {
      git(dir, 'add', '-A');
      git(dir, 'commit', '-q', '-m', message);
      return git(dir, 'rev-parse', 'HEAD');
    },
  };
}

export function initRepo(): Repo {
  const dir = tempDir();
  git(dir, 'init', '-q', '-b', 'main');
  git(dir, 'config', 'user.name', 'Rankfloor Test');
  git(dir, 'config', 'user.email', 'test@example.com');
  git(dir, 'config', 'commit.gpgsign', 'false');
  return openRepo(dir);
}

export const CONFIG_PATH = 'models/renal-pair-net.yaml';
export const POLICY_PATH = 'policies/paired-organs.yaml';

/** The bundled kidney-pair classifier, as a team would keep it. */
export const CONFIG_TEXT = readFileSync(join(REPO, 'examples', 'renal-pair-net.yaml'), 'utf8');

/** The line of the last convolution (256 channels), which the pull requests below shrink. */
export const LAST_CONV_LINE = CONFIG_TEXT.split('\n').findIndex((l) => l.includes('- conv: {channels: 256, kernel: 3}')) + 1;

/** The last convolution cut from 256 to 16 channels: organ-pair drops from 8 to 4 bits. */
export const SHRUNK_CONFIG_TEXT = CONFIG_TEXT.replace('- conv: {channels: 256, kernel: 3}\n', '- conv: {channels: 16, kernel: 3}\n');

// One requirement and no max_drop_bits, so that a shrink fails exactly one requirement.
export const POLICY_TEXT = `# Kidney-pair classifiers compare the left and the right organ.
id: paired-organs
description: Kidney-pair classifiers must couple the two image halves.
applies_to: ["models/renal-*.yaml"]
partitions:
  organ-pair: {kind: left-right}
require:
  - {partition: organ-pair, min_rank: 64}
`;

export const POLICY_MIN_LINE = POLICY_TEXT.split('\n').findIndex((l) => l.includes('min_rank: 64')) + 1;

/** A repository at its base commit: the policy and the config that passes it. */
export function baseRepo(): { repo: Repo; base: string } {
  const repo = initRepo();
  repo.write(POLICY_PATH, POLICY_TEXT);
  repo.write(CONFIG_PATH, CONFIG_TEXT);
  repo.write('README.md', '# models\n');
  return { repo, base: repo.commit('base: policy and model') };
}

export interface ActionRun {
  readonly code: number;
  readonly stdout: string;
  readonly stderr: string;
  readonly summary: string;
  /** GITHUB_OUTPUT read back into name → value (the heredoc form the toolkit writes). */
  readonly outputs: Record<string, string>;
  readonly runnerTemp: string;
}

export interface ActionOptions {
  readonly workspace: string;
  readonly inputs: Record<string, string>;
  readonly event?: { readonly name: string; readonly payload: unknown };
}

/** Runs the committed bundle as the runner would, with `INPUT_<NAME>` variables for the inputs. */
export function runAction(options: ActionOptions): ActionRun {
  const scratch = tempDir('rankfloor-runner-');
  const runnerTemp = join(scratch, 'temp');
  mkdirSync(runnerTemp);
  const summaryFile = join(scratch, 'step-summary.md');
  const outputFile = join(scratch, 'output.txt');
  writeFileSync(summaryFile, '');
  writeFileSync(outputFile, '');
  const env: NodeJS.ProcessEnv = {
    ...isolatedEnv(),
    GITHUB_ACTIONS: 'true',
    GITHUB_WORKSPACE: options.workspace,
    GITHUB_STEP_SUMMARY: summaryFile,
    GITHUB_OUTPUT: outputFile,
    RUNNER_TEMP: runnerTemp,
  };
  if (options.event) {
    const eventFile = join(scratch, 'event.json');
    writeFileSync(eventFile, JSON.stringify(options.event.payload));
    env['GITHUB_EVENT_NAME'] = options.event.name;
    env['GITHUB_EVENT_PATH'] = eventFile;
  }
  // The toolkit reads `INPUT_` + the name upper-cased with spaces as underscores; dashes stay.
  for (const [name, value] of Object.entries(options.inputs)) env[`INPUT_${name.replace(/ /g, '_').toUpperCase()}`] = value;
  // Started from elsewhere, so that only GITHUB_WORKSPACE can point the action at the repository.
  const r = spawnSync(process.execPath, [ACTION], { cwd: scratch, env, encoding: 'utf8' });
  return {
    code: r.status ?? -1,
    stdout: r.stdout,
    stderr: r.stderr,
    summary: readFileSync(summaryFile, 'utf8'),
    outputs: parseOutputs(readFileSync(outputFile, 'utf8')),
    runnerTemp,
  };
}

/** `name<<DELIM\nvalue\nDELIM` blocks, as the toolkit appends them to GITHUB_OUTPUT. */
export function parseOutputs(text: string): Record<string, string> {
  const out: Record<string, string> = {};
  const lines = text.split('\n');
  for (let i = 0; i < lines.length; i++) {
    const m = /^([^<]+)<<(.+)$/.exec(lines[i]!);
    if (!m) continue;
    const [, name, delimiter] = m;
    const value: string[] = [];
    for (i++; i < lines.length && lines[i] !== delimiter; i++) value.push(lines[i]!);
    out[name!] = value.join('\n');
  }
  return out;
}

/** The workflow-command lines of a run's stdout that start with `::kind`. */
export function commandLines(stdout: string, kind: 'error' | 'warning' | 'notice'): string[] {
  return stdout.split('\n').filter((l) => l.startsWith(`::${kind} `) || l.startsWith(`::${kind}::`));
}

/** A pull_request event whose base is `sha`. */
export function pullRequestEvent(sha: string): { name: string; payload: unknown } {
  return { name: 'pull_request', payload: { action: 'synchronize', number: 7, pull_request: { number: 7, base: { ref: 'main', sha } } } };
}

/** For tests that run the check in-process: the same git isolation for this test process. */
export function isolateThisProcess(): void {
  const env = isolatedEnv();
  for (const key of Object.keys(process.env)) if (!(key in env)) delete process.env[key];
  Object.assign(process.env, env);
}
