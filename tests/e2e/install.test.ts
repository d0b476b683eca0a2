/**
 * Installing rankfloor into another repository, end to end: the packed package installed into a
 * scratch project and run there, and the pre-commit hook installed and run by the real pre-commit
 * client (Debian's package, which .ci/run installs) on a scratch repository. Both use the npm
 * cache the repository's own install filled (prefer-offline), so they need no network when the
 * cache holds the dependencies.
 */
import { spawnSync, type SpawnSyncReturns } from 'node:child_process';
import { cpSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { afterAll, describe, expect, test } from 'vitest';
import { REPO } from './run-cli.js';

const made: string[] = [];
afterAll(() => {
  for (const dir of made) rmSync(dir, { recursive: true, force: true });
});
function scratch(prefix: string): string {
  const dir = mkdtempSync(join(tmpdir(), prefix));
  made.push(dir);
  return dir;
}

const ENV = { ...process.env, npm_config_prefer_offline: 'true', npm_config_audit: 'false', npm_config_fund: 'false', NO_COLOR: '1' };
const IDENTITY = ['-c', 'user.name=Rankfloor Test', '-c', 'user.email=test@example.com', '-c', 'commit.gpgsign=false', '-c', 'init.defaultBranch=main'];

function sh(cmd: string, args: readonly string[], cwd: string, env: NodeJS.ProcessEnv = ENV): SpawnSyncReturns<string> {
  return spawnSync(cmd, [...args], { cwd, env, encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] });
}
function ok(r: SpawnSyncReturns<string>): string {
  if (r.status !== 0) throw new Error(`exit ${r.status}\n${r.stdout}\n${r.stderr}`);
  return r.stdout;
}

const POLICY = 'id: scratch\ndescription: A scratch policy.\napplies_to: ["models/*.yaml"]\nrequire:\n  - {partition: start-end, min_rank: 2}\n';
const CONFIG = 'model:\n  input: {shape: [8], channels: 2}\n  layers:\n    - conv: {channels: 4}\n    - pool: {window: 2}\n    - pool: {global: true}\n';

describe('the packed package in another project', () => {
  test('npm pack, install the tarball into a scratch project, run it', { timeout: 300_000 }, () => {
    const out = scratch('rankfloor-pack-');
    // The build of `npm test` is packed as it is (scripts would rebuild under running tests).
    const packed = ok(sh('npm', ['pack', '--ignore-scripts', '--pack-destination', out], REPO)).trim().split('\n').at(-1)!;
    expect(packed).toBe(`rankfloor-${(JSON.parse(readFileSync(join(REPO, 'package.json'), 'utf8')) as { version: string }).version}.tgz`);
    const project = scratch('rankfloor-consumer-');
    writeFileSync(join(project, 'package.json'), JSON.stringify({ name: 'consumer', version: '1.0.0', private: true }));
    ok(sh('npm', ['install', '--save-dev', join(out, packed)], project));
    mkdirSync(join(project, 'policies'));
    mkdirSync(join(project, 'models'));
    writeFileSync(join(project, 'policies', 'scratch.yaml'), POLICY);
    writeFileSync(join(project, 'models', 'net.yaml'), CONFIG);
    const version = sh('npx', ['--no-install', 'rankfloor', '--version'], project);
    expect(version.stdout).toMatch(/^rankfloor \d+\.\d+\.\d+\n$/);
    const pass = sh('npx', ['--no-install', 'rankfloor', 'check', '--policy', 'policies'], project);
    expect(pass.stderr).toBe('');
    expect(pass.status).toBe(0);
    expect(pass.stdout).toContain('PASS      start-end');
    writeFileSync(join(project, 'models', 'net.yaml'), CONFIG.replace('channels: 4', 'channels: 1'));
    const fail = sh('npx', ['--no-install', 'rankfloor', 'check', '--policy', 'policies'], project);
    expect(fail.status).toBe(1);
    expect(fail.stdout).toContain('FAIL      start-end');
  });
});

const hasClient = sh('pre-commit', ['--version'], REPO).status === 0;

describe('the pre-commit hook with the real pre-commit client', () => {
  // CI installs the client (.ci/run); elsewhere the test runs where the client is installed.
  test.skipIf(!hasClient && process.env['CI'] !== 'true')('a staged shrink fails the commit; an unrelated YAML file or no YAML passes', { timeout: 900_000 }, () => {
    expect(hasClient).toBe(true);
    // The hook repository: this repository's files as they are now, committed in a scratch clone.
    const hookRepo = scratch('rankfloor-hook-repo-');
    const files = ok(sh('git', ['ls-files', '--cached', '--others', '--exclude-standard', '-z'], REPO)).split('\0').filter(Boolean);
    for (const f of files.filter((f) => !/^(dist|tests|examples|bench)\//.test(f))) {
      mkdirSync(dirname(join(hookRepo, f)), { recursive: true });
      try {
        cpSync(join(REPO, f), join(hookRepo, f));
      } catch {
        // listed but deleted in the working tree
      }
    }
    ok(sh('git', [...IDENTITY, 'init', '-q'], hookRepo));
    ok(sh('git', [...IDENTITY, 'add', '-A'], hookRepo));
    ok(sh('git', [...IDENTITY, 'commit', '-q', '-m', 'hook'], hookRepo));
    const rev = ok(sh('git', ['rev-parse', 'HEAD'], hookRepo)).trim();

    const user = scratch('rankfloor-hook-user-');
    const env = { ...ENV, PRE_COMMIT_HOME: join(user, '.pre-commit-home') };
    const git = (...args: string[]) => sh('git', [...IDENTITY, ...args], user, env);
    ok(git('init', '-q'));
    mkdirSync(join(user, 'policies'));
    mkdirSync(join(user, 'models'));
    writeFileSync(join(user, 'policies', 'scratch.yaml'), POLICY);
    writeFileSync(join(user, 'models', 'net.yaml'), CONFIG);
    writeFileSync(join(user, '.gitignore'), '.pre-commit-home/\n');
    writeFileSync(
      join(user, '.pre-commit-config.yaml'),
      `repos:\n  - repo: ${hookRepo}\n    rev: ${rev}\n    hooks:\n      - id: rankfloor\n        args: [--policy, policies]\n`,
    );
    ok(git('add', '-A'));
    ok(git('commit', '-q', '-m', 'base'));
    ok(sh('pre-commit', ['install'], user, env));
    ok(sh('pre-commit', ['install-hooks'], user, env));

    // A staged shrink: the commit fails, and says why.
    writeFileSync(join(user, 'models', 'net.yaml'), CONFIG.replace('channels: 4', 'channels: 1'));
    ok(git('add', 'models/net.yaml'));
    const shrink = git('commit', '-m', 'shrink');
    expect(shrink.status).toBe(1);
    expect(shrink.stdout + shrink.stderr).toContain('rankfloor capacity check');
    expect(shrink.stdout + shrink.stderr).toContain('FAIL      start-end');
    ok(git('reset', '-q', '--hard'));

    // An unrelated YAML file: the hook runs (it is YAML) but no policy governs it.
    mkdirSync(join(user, 'other'));
    writeFileSync(join(user, 'other', 'settings.yaml'), 'debug: true\n');
    ok(git('add', 'other/settings.yaml'));
    const unrelated = git('commit', '-m', 'unrelated');
    expect(unrelated.status).toBe(0);
    expect(unrelated.stdout + unrelated.stderr).toMatch(/rankfloor capacity check\.+Passed/);

    // No YAML file at all: the hook is not run (files are selected by type).
    writeFileSync(join(user, 'notes.txt'), 'hello\n');
    ok(git('add', 'notes.txt'));
    const text = git('commit', '-m', 'text');
    expect(text.status).toBe(0);
    expect(text.stdout + text.stderr).toMatch(/rankfloor capacity check\.+\(no files to check\)Skipped/);
    expect(readdirSync(join(user, 'models'))).toEqual(['net.yaml']);
  });
});
