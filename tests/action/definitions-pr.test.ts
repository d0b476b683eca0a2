/**
 * Pull requests on a repository whose training configs name an architecture definition (the
 * bundled examples/arch/residual-image-net.yaml), end to end: the committed bundle run as the
 * runner runs it, and the built CLI's JSON and SARIF. A pull request that halves the width
 * multiplier fails with an annotation on the config's `width:` line and a parameter fix; one that
 * edits the definition fails at the definition line, with a notice on the definition; `--changed`
 * selects the unchanged configs that name a changed definition. Widths derived here: the
 * left-right bound of this net is the width of its last stage, ceil(64 · width) (64 at width 1,
 * 32 at 0.5, 48 at 0.75).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, describe, expect, test } from 'vitest';
import { runCli } from '../e2e/run-cli.js';
import { commandLines, git, initRepo, pullRequestEvent, removeTempDirs, REPO, runAction } from './action-fixture.js';

afterAll(removeTempDirs);

const DEFINITION = readFileSync(join(REPO, 'examples', 'arch', 'residual-image-net.yaml'), 'utf8');
const DEFINITION_PATH = 'arch/residual-image-net.yaml';
const LINES = DEFINITION.split('\n');
/** The 1×1 conv that widens to the last stage, and the last stage's residual block (1-based lines). */
const WIDEN_LINE = LINES.findIndex((l) => l.includes('name: widen3')) + 1;
const LAST_BLOCK_LINE = LINES.findIndex((l) => l.includes('name: stage3'));

const TRAY = `# Tray blight classifier (invented demo data).
run: {name: trays, epochs: 40}
model:
  architecture: ../arch/residual-image-net.yaml
  width: 1.0
  stages: [1, 1, 1]
  classes: 4
`;
const BENCH = TRAY.replace('width: 1.0', 'width: 2');

const POLICY = `id: trays
description: Tray blight classifiers must couple the two halves of the tray.
applies_to: ["configs/*.yaml"]
require:
  - {partition: left-right, min_rank: 64}
`;

function repository(): { repo: ReturnType<typeof initRepo>; base: string } {
  const repo = initRepo();
  repo.write(DEFINITION_PATH, DEFINITION);
  repo.write('configs/tray.yaml', TRAY);
  repo.write('configs/bench.yaml', BENCH);
  repo.write('policies/trays.yaml', POLICY);
  return { repo, base: repo.commit('base') };
}

describe('a pull request that halves the width multiplier', () => {
  const { repo, base } = repository();
  repo.write('configs/tray.yaml', TRAY.replace('width: 1.0', 'width: 0.5'));
  repo.commit('halve the width');

  test('the Action annotates the config line of the parameter, with the layers it shrank and a parameter fix', () => {
    const r = runAction({ workspace: repo.dir, inputs: { policy: 'policies' }, event: pullRequestEvent(base) });
    expect(r.stderr).toBe('');
    expect(r.code).toBe(1);
    const [error] = commandLines(r.stdout, 'error');
    expect(error).toBe(
      `::error title=left-right%3A capacity below the policy minimum (policy trays),file=configs/tray.yaml,line=5,col=10::` +
        [
          'needs   rank ≥ 64 (6.00 bits)  [min_rank: 64, policies/trays.yaml:5]',
          'allows  exactly 32 (5.00 bits) — provably short by 1.00 bits',
          'change  base 6.00 bits → head 5.00 bits (-1.00)',
          '        this change: line 5:10 parameter width: 1 → 0.5; it shrinks widen3 channels 64 → 32, layer 24 channels 64 → 32, stem channels 16 → 8, layer 3 channels 16 → 8 and 5 more',
          'model   built from arch/residual-image-net.yaml (residual-image-net) with width = 0.5, stages = [1, 1, 1], resolution = 32, classes = 4',
          `bottleneck (rank propagation): 1 bond of dimension 32 from layer stage3[1] (arch/residual-image-net.yaml:${LAST_BLOCK_LINE})`,
          'fix (smallest change of one parameter, then of one field of the definition; cheapest first):',
          // 100,836 parameters at width 1 and 25,588 at width 0.5 (kernels, biases and batch-norm
          // scale and shift; counted by hand here)
          '  line 5:10  parameter width: 0.5 → 1  (+75,248 parameters; then proven)',
        ].join('%0A'),
    );
    // the unchanged config is not checked (changed-only), and nothing else is annotated
    expect(commandLines(r.stdout, 'notice')).toEqual([]);
    expect(r.summary).toContain('Built from the architecture definition arch/residual-image-net.yaml (residual-image-net).');
  });

  test('JSON, SARIF and JUnit say the same: the parameter, its line, its effects and the fix', () => {
    const json = runCli(['check', '--policy', 'policies', '--base', base, '--changed', '--format', 'json', '--sarif', 'out.sarif', '--junit', 'out.xml'], repo.dir);
    expect(json.code).toBe(1);
    const doc = JSON.parse(json.stdout);
    expect(doc.results.map((x: { file: string }) => x.file)).toEqual(['configs/tray.yaml']);
    const q = doc.results[0].requirements[0];
    expect(q.attributed).toHaveLength(1);
    expect(q.attributed[0]).toMatchObject({ layer: 'parameter', field: 'width', from: '1', to: '0.5', line: 5, column: 10 });
    // the layers whose widths the cut's bond carries come first
    expect(q.attributed[0].effects.slice(0, 2)).toEqual([
      { layer: 'widen3', field: 'channels', from: '64', to: '32' },
      { layer: 24, field: 'channels', from: '64', to: '32' },
    ]);
    expect(q.attributed[0].effects).toHaveLength(9);
    expect(q.fix[0]).toEqual({ layer: 'parameter', field: 'width', line: 5, column: 10, from: 0.5, to: 1, added_parameters: '75248', verdict: 'pass' });
    expect(q.cut[0]).toMatchObject({ layer: 'stage3[1]', file: DEFINITION_PATH });
    const sarif = JSON.parse(readFileSync(join(repo.dir, 'out.sarif'), 'utf8'));
    const result = sarif.runs[0].results.find((x: { ruleId: string }) => x.ruleId === 'rankfloor/requirement-failed');
    expect(result.locations[0].physicalLocation).toMatchObject({ artifactLocation: { uri: 'configs/tray.yaml' }, region: { startLine: 5, startColumn: 10 } });
    const junit = readFileSync(join(repo.dir, 'out.xml'), 'utf8');
    expect(junit).toContain(`from layer stage3[1] (arch/residual-image-net.yaml:${LAST_BLOCK_LINE})`);
    expect(junit).toContain('line 5:10  parameter width: 0.5 → 1');
  });
});

describe('a pull request that edits the definition', () => {
  const { repo, base } = repository();
  // The last stage at half its width (its 1×1 widening conv and both convs of its block).
  repo.write(DEFINITION_PATH, DEFINITION.replaceAll('"=ceil(64 * width)"', '"=ceil(32 * width)"'));
  repo.commit('narrow the last stage');

  test('--changed selects every config that names it; the failure is at the definition line, with a notice', () => {
    const r = runCli(['check', '--policy', 'policies', '--base', base, '--changed', '--format', 'json'], repo.dir);
    const doc = JSON.parse(r.stdout);
    expect(doc.results.map((x: { file: string; verdict: string }) => `${x.file} ${x.verdict}`)).toEqual(['configs/bench.yaml pass', 'configs/tray.yaml fail']);
    expect(doc.notices).toEqual([
      { file: DEFINITION_PATH, line: WIDEN_LINE, message: expect.stringContaining('the pull request changes this architecture definition') },
    ]);
  });

  test('the Action annotates the definition line and notes the changed definition', () => {
    const r = runAction({ workspace: repo.dir, inputs: { policy: 'policies' }, event: pullRequestEvent(base) });
    expect(r.code).toBe(1);
    const errors = commandLines(r.stdout, 'error');
    expect(errors[0]).toMatch(new RegExp(`^::error title=left-right%3A capacity below the policy minimum \\(policy trays\\),file=${DEFINITION_PATH},line=${WIDEN_LINE},col=24::`));
    expect(errors[0]).toContain(`this change on the cut: ${DEFINITION_PATH}:${WIDEN_LINE}:24 layer widen3 channels: 64 → 32`);
    expect(commandLines(r.stdout, 'notice')).toEqual([
      expect.stringMatching(new RegExp(`^::notice title=architecture definition changed by this pull request,file=${DEFINITION_PATH},line=${WIDEN_LINE},col=1::`)),
    ]);
  });
});

describe('a pull request that widens a range and uses it', () => {
  const { repo, base } = repository();
  repo.write(DEFINITION_PATH, DEFINITION.replace('    min: 0.25\n    max: 4\n', '    min: 0.125\n    max: 4\n'));
  repo.write('configs/tray.yaml', TRAY.replace('width: 1.0', 'width: 0.125'));
  repo.commit('allow thinner nets, and use one');

  test('is judged with the base revision’s range, at the config value', () => {
    const r = runCli(['check', '--policy', 'policies', '--base', base, '--changed'], repo.dir);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain(
      'configs/tray.yaml:5:10: error: model.width is 0.125, below the minimum 0.25: parameter width allows 0.25 to 4 (its range as the base revision declares it in arch/residual-image-net.yaml',
    );
  });

  test('with --policy-from head the head judges itself, and the value is in range', () => {
    const r = runCli(['check', '--policy', 'policies', '--base', base, '--changed', '--policy-from', 'head', '--format', 'json'], repo.dir);
    expect(JSON.parse(r.stdout).errors).toEqual([]);
  });
});

describe('before a commit', () => {
  test('--staged checks the configs that name a staged definition, against HEAD', () => {
    const { repo } = repository();
    repo.write(DEFINITION_PATH, DEFINITION.replaceAll('"=ceil(64 * width)"', '"=ceil(32 * width)"'));
    const unstaged = runCli(['check', '--policy', 'policies', '--staged'], repo.dir);
    expect(unstaged.code).toBe(0);
    git(repo.dir, 'add', DEFINITION_PATH);
    const r = runCli(['check', '--policy', 'policies', '--staged', '--format', 'json'], repo.dir);
    expect(r.code).toBe(1);
    expect(JSON.parse(r.stdout).results.map((x: { file: string; verdict: string }) => `${x.file} ${x.verdict}`)).toEqual(['configs/bench.yaml pass', 'configs/tray.yaml fail']);
  });
});
