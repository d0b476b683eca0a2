/**
 * Throw-away git repositories for the git layer's tests. Importing this module cuts the test
 * process off from the machine's git setup (global and system config, global ignore file, GIT_*
 * variables a hook may have exported, repositories above the temp directory), so results do not
 * depend on who runs the tests; identities are passed with `-c` and nothing global is written.
 */
import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, realpathSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { openRepo, type Repo } from '../../src/git/git.js';

const TMP = realpathSync(tmpdir());
const HOME = mkdtempSync(join(TMP, 'rankfloor-git-home-'));
for (const key of Object.keys(process.env)) if (key.startsWith('GIT_')) delete process.env[key];
process.env['HOME'] = HOME;
process.env['XDG_CONFIG_HOME'] = join(HOME, '.config');
process.env['GIT_CONFIG_NOSYSTEM'] = '1';
process.env['GIT_CONFIG_GLOBAL'] = join(HOME, 'gitconfig');
// If the temp directory sits inside some repository, "not a repository" tests would find it.
process.env['GIT_CEILING_DIRECTORIES'] = TMP;

const made: string[] = [HOME];

export function tempDir(prefix = 'rankfloor-git-'): string {
  const dir = mkdtempSync(join(TMP, prefix));
  made.push(dir);
  return dir;
}

export function removeTempDirs(): void {
  for (const dir of made.splice(0)) rmSync(dir, { recursive: true, force: true });
}

export interface TempRepo {
  readonly dir: string;
  /** Runs git in the repository and returns stdout without its final newline. */
  git(...args: string[]): string;
  write(path: string, text: string | Buffer): void;
  /** Stages everything and commits; returns the new commit id. */
  commitAll(message: string): string;
}

const IDENTITY = ['-c', 'user.name=Rankfloor Test', '-c', 'user.email=test@example.com', '-c', 'commit.gpgsign=false'];

export function git(cwd: string, ...args: string[]): string {
  return execFileSync('git', [...IDENTITY, ...args], { cwd, encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] }).replace(/\n$/, '');
}

export function openTempRepo(dir: string): TempRepo {
  return {
    dir,
    git: (...args) => git(dir, ...args),
    write(path, text) {
      const file = join(dir, path);
      mkdirSync(dirname(file), { recursive: true });
      writeFileSync(file, text);
    },
    commitAll(message) {
      git(dir, 'add', '-A');
      git(dir, 'commit', '-q', '-m', message);
      return git(dir, 'rev-parse', 'HEAD');
    },
  };
}

export function makeRepo(files: Record<string, string> = {}): TempRepo {
  const dir = tempDir();
  git(dir, 'init', '-q', '-b', 'main');
  const repo = openTempRepo(dir);
  for (const [path, text] of Object.entries(files)) repo.write(path, text);
  return repo;
}

/** The Repo of a temporary repository; a test that expects one fails clearly without it. */
export function repoOf(t: TempRepo): Repo {
  const repo = openRepo(t.dir);
  if (repo === undefined) throw new Error(`expected ${t.dir} to be a repository`);
  return repo;
}

/** A repository in the middle of a merge whose `m.yaml` has an unresolved conflict. */
export function conflictedRepo(files: Record<string, string> = {}): TempRepo {
  const t = makeRepo({ 'm.yaml': 'base\n', ...files });
  t.commitAll('base');
  t.git('checkout', '-q', '-b', 'other');
  t.write('m.yaml', 'other\n');
  t.commitAll('other');
  t.git('checkout', '-q', 'main');
  t.write('m.yaml', 'main\n');
  t.commitAll('main');
  try {
    t.git('merge', '-q', 'other');
  } catch {
    return t;
  }
  throw new Error('expected the merge to stop at a conflict');
}
