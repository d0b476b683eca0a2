/**
 * What a new user meets first: help for every command with every option on one line, the
 * version, `check --model-path`, a closing line whose counts add up, and an unproven
 * requirement that is explained as unproven, not as disproven.
 */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, test } from 'vitest';
import { BOUNDS_HELP, CHECK_HELP } from '../../src/cli/help.js';
import { REPO, runCli } from './run-cli.js';

function scratch(files: Record<string, string>): string {
  const dir = mkdtempSync(join(tmpdir(), 'rankfloor-first-'));
  for (const [name, text] of Object.entries(files)) writeFileSync(join(dir, name), text);
  return dir;
}

describe('help and version', () => {
  test.each([
    [['bounds', '--help'], BOUNDS_HELP],
    [['check', '-h'], CHECK_HELP],
    [['help', 'check'], CHECK_HELP],
    [['help', 'bounds'], BOUNDS_HELP],
  ] as const)('%j lists every option on its own line, exit 0', (args, table) => {
    const r = runCli([...args]);
    expect(r.code).toBe(0);
    expect(r.stderr).toBe('');
    for (const o of table.options) {
      const lines = r.stdout.split('\n').filter((l) => l.includes(`--${o.name}`) && l.includes(o.help));
      expect(lines, o.name).toHaveLength(1);
    }
  });

  test('rankfloor help names the commands; --version prints the package version', () => {
    const r = runCli(['help']);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('rankfloor bounds CONFIG');
    expect(r.stdout).toContain('rankfloor check --policy FILE|DIR');
    const pkg = JSON.parse(readFileSync(join(REPO, 'package.json'), 'utf8')) as { version: string };
    for (const flag of ['--version', '-V']) {
      const v = runCli([flag]);
      expect(v.code).toBe(0);
      expect(v.stdout).toBe(`rankfloor ${pkg.version}\n`);
    }
  });

  test('a usage error points at the command help in one line', () => {
    const r = runCli(['check', '--polciy', 'policies/']);
    expect(r.code).toBe(2);
    expect(r.stderr.split('\n').filter(Boolean)).toHaveLength(2);
    expect(r.stderr).toContain("run 'rankfloor check --help' for its options");
  });
});

describe('check', () => {
  test('--model-path reads the architecture where a training file keeps it', () => {
    // Configs are read only inside the repository root: the training file is copied there.
    const dir = scratch({
      'policy.yaml': 'id: weave\ndescription: Test.\napplies_to: ["*.yaml"]\nrequire:\n  - {partition: left-right, min_rank: 2}\n',
      'weave.yaml': readFileSync(join(REPO, 'examples/weave-defects-training.yaml'), 'utf8'),
    });
    const config = join(dir, 'weave.yaml');
    const without = runCli(['check', '--policy', join(dir, 'policy.yaml'), config], dir);
    expect(without.code).toBe(2);
    expect(without.stderr).toContain('--model-path /experiment/network');
    const r = runCli(['check', '--policy', join(dir, 'policy.yaml'), '--model-path', '/experiment/network', config], dir);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('PASS      left-right');
  });

  test('the closing line counts configs and requirements apart, and each group adds up', () => {
    const r = runCli(['check', '--policy', 'policies/']);
    expect(r.code).toBe(1);
    const last = r.stdout.trimEnd().split('\n').at(-1)!;
    expect(last).toBe('10 configs against 6 policies: 10 checks (1 failing, 0 unproven, 9 passing); 20 requirements (1 failing, 0 unproven, 19 passing)');
  });

  test('an unproven requirement counted as failing says what would prove it, never that it is short', () => {
    const dir = scratch({
      // the fully connected classifier's left/right halves: ceiling 2^20.17, no rule proves a lower
      // bound through flatten + dense, and no single change makes one
      'policy.yaml': 'id: mlp\ndescription: Test.\napplies_to: ["*.yaml"]\nunproven: fail\nrequire:\n  - {partition: left-right, min_rank: 2^10}\n',
      'mlp.yaml': readFileSync(join(REPO, 'examples/architectures/mlp-fashion.yaml'), 'utf8'),
    });
    const r = runCli(['check', '--policy', join(dir, 'policy.yaml'), join(dir, 'mlp.yaml')], dir);
    expect(r.code).toBe(1);
    expect(r.stdout).toContain('UNPROVEN  left-right');
    expect(r.stdout).toContain('not disproven');
    expect(r.stdout).toContain('to prove it: a proven lower bound of at least');
    expect(r.stdout).not.toContain('needs a larger change');
    expect(r.stdout).not.toContain('provably short');
  });
});
