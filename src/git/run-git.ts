/**
 * The one place that starts git. Arguments always travel as an array to `spawnSync` with
 * `shell: false`, so no revision or path is ever read by a shell. The environment is the caller's
 * (so GIT_DIR and GIT_INDEX_FILE set by a git hook keep working) with a few overrides that make
 * git safe and predictable for a tool: never prompt, English messages, no optional index locks
 * and literal pathspecs. A missing git, a timeout or an oversized output become a GitError.
 */
import { spawnSync } from 'node:child_process';
import { accessSync, constants, statSync } from 'node:fs';
import { delimiter, isAbsolute, join } from 'node:path';
import { GitError } from './git-error.js';

/** Largest file the tool reads out of git; bigger blobs are refused, not truncated. */
export const MAX_FILE_BYTES = 4 * 1024 * 1024;

// Listings (diffs, untracked files) of a large monorepo can pass Node's 1 MiB default.
const MAX_LISTING_BYTES = 64 * 1024 * 1024;
const LOCAL_TIMEOUT_MS = 120_000;

export interface GitRun {
  readonly status: number;
  readonly stdout: Buffer;
  readonly stderr: string;
}

export interface RunOptions {
  readonly maxBuffer?: number;
  readonly timeoutMs?: number;
  /** Builds the error for output beyond `maxBuffer`, so callers can name the file and the limit. */
  readonly tooLarge?: () => GitError;
  /** Written to git's standard input (the requests of a `cat-file --batch` session). */
  readonly input?: string;
}

export function gitEnv(): NodeJS.ProcessEnv {
  return {
    ...process.env,
    GIT_TERMINAL_PROMPT: '0',
    LC_ALL: 'C',
    // A pre-commit run happens while `git commit` holds the index; refreshing it would contend.
    GIT_OPTIONAL_LOCKS: '0',
    // Paths are given to git literally: a config named `*.yaml` means that one file.
    GIT_LITERAL_PATHSPECS: '1',
    // In a partial clone a missing object would be fetched from the remote on demand; the tool
    // never reaches the network behind the user's back, so a missing object is reported instead.
    GIT_NO_LAZY_FETCH: '1',
  };
}

let found: { readonly pathVar: string; readonly git: string | undefined } | undefined;

/**
 * Absolute path of the git executable, looked up in PATH by hand. Only absolute PATH entries
 * count: on Windows a bare `git` would first be searched in the current directory, which is the
 * checked-out (untrusted) repository.
 */
export function findGit(): string | undefined {
  const pathVar = process.env['PATH'] ?? '';
  if (found?.pathVar === pathVar) return found.git;
  const names = process.platform === 'win32' ? ['git.exe'] : ['git'];
  let git: string | undefined;
  search: for (const raw of pathVar.split(delimiter)) {
    const dir = raw.replace(/^"(.*)"$/, '$1');
    if (dir === '' || !isAbsolute(dir)) continue;
    for (const name of names) {
      const candidate = join(dir, name);
      if (isExecutableFile(candidate)) {
        git = candidate;
        break search;
      }
    }
  }
  found = { pathVar, git };
  return git;
}

function isExecutableFile(path: string): boolean {
  try {
    if (!statSync(path).isFile()) return false;
    accessSync(path, constants.X_OK);
    return true;
  } catch {
    return false;
  }
}

function gitOrThrow(): string {
  const git = findGit();
  if (git === undefined) {
    throw new GitError('git was not found on PATH: install git (or put it on PATH) to compare configs across revisions', '');
  }
  return git;
}

function describe(args: readonly string[]): string {
  return `git ${args.join(' ')}`;
}

export function firstLine(text: string): string {
  return text.split('\n').find((line) => line.trim() !== '')?.trim() ?? '';
}

/** Runs git in `cwd`; any exit status is returned, only failures to run at all throw. */
export function runGit(cwd: string, args: readonly string[], options: RunOptions = {}): GitRun {
  const git = gitOrThrow();
  const r = spawnSync(git, ['-c', 'core.quotepath=off', ...args], {
    cwd,
    env: gitEnv(),
    shell: false,
    windowsHide: true,
    stdio: [options.input === undefined ? 'ignore' : 'pipe', 'pipe', 'pipe'],
    ...(options.input === undefined ? {} : { input: options.input }),
    maxBuffer: options.maxBuffer ?? MAX_LISTING_BYTES,
    timeout: options.timeoutMs ?? LOCAL_TIMEOUT_MS,
  });
  const stderr = r.stderr ? r.stderr.toString('utf8') : '';
  if (r.error) {
    const code = (r.error as NodeJS.ErrnoException).code;
    if (code === 'ENOBUFS') {
      throw options.tooLarge?.() ?? new GitError(`${describe(args)} printed more than ${options.maxBuffer ?? MAX_LISTING_BYTES} bytes`, stderr);
    }
    if (code === 'ETIMEDOUT') {
      throw new GitError(`${describe(args)} did not finish within ${Math.round((options.timeoutMs ?? LOCAL_TIMEOUT_MS) / 1000)} s`, stderr);
    }
    // spawn reports a missing working directory as ENOENT too; say which one it was.
    if (code === 'ENOENT' && !isDirectory(cwd)) throw new GitError(`cannot run git in '${cwd}': no such directory`, stderr);
    throw new GitError(`cannot run ${git}: ${r.error.message}`, stderr);
  }
  if (r.status === null) throw new GitError(`${describe(args)} was stopped by signal ${r.signal ?? 'unknown'}`, stderr);
  return { status: r.status, stdout: r.stdout, stderr };
}

/** Runs git and throws a GitError carrying git's first message line unless it exits 0. */
export function runGitOk(cwd: string, args: readonly string[], options: RunOptions = {}): Buffer {
  const r = runGit(cwd, args, options);
  if (r.status !== 0) throw gitFailure(args, r);
  return r.stdout;
}

export function gitFailure(args: readonly string[], r: GitRun): GitError {
  const why = firstLine(r.stderr);
  return new GitError(`${describe(args)} failed (exit ${r.status})${why ? `: ${why}` : ''}`, r.stderr);
}

function isDirectory(path: string): boolean {
  try {
    return statSync(path).isDirectory();
  } catch {
    return false;
  }
}
