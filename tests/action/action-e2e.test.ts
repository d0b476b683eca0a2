/**
 * The committed bundle dist/action.js run as the runner runs it, in throw-away repositories with a
 * pull_request event: the exact workflow-command lines (the toolkit writes properties in the order
 * title, file, line, col, escapes `:` and `,` in them and newlines in the message), the job
 * summary, the GITHUB_OUTPUT file, the JSON report and the exit code. Each run is one node
 * process.
 */
import { readdirSync, readFileSync, symlinkSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, describe, expect, test } from 'vitest';
import {
  baseRepo,
  commandLines,
  CONFIG_PATH,
  CONFIG_TEXT,
  git,
  LAST_CONV_LINE,
  POLICY_MIN_LINE,
  POLICY_PATH,
  POLICY_TEXT,
  pullRequestEvent,
  removeTempDirs,
  runAction,
  SHRUNK_CONFIG_TEXT,
  tempDir,
  type ActionRun,
} from './action-fixture.js';

afterAll(removeTempDirs);

/** The annotation on the changed `channels: 16` of the last convolution (column 24 of its line). */
const SHRINK_ERROR =
  `::error title=organ-pair%3A capacity below the policy minimum (policy paired-organs),file=models/renal-pair-net.yaml,line=18,col=24::` +
  [
    'needs   rank ≥ 64 (6.00 bits)  [min_rank: 64, policies/paired-organs.yaml:8]',
    'allows  exactly 16 (4.00 bits) — provably short by 2.00 bits',
    'change  base 8.00 bits → head 4.00 bits (-4.00)',
    '        this change on the cut: line 18:24 layer 8 channels: 256 → 16',
    'bottleneck (min-cut): 1 bond of dimension 16 from layer 8 (line 18)',
    'fix (smallest change of one field, cheapest first):',
    '  line 18:24  layer 8 channels: 16 → 64  (+110,784 parameters; then proven by top-window span)',
  ].join('%0A');

const FAILED_STEP = '::error::rankfloor: 1 failing requirement in 1 config; see the annotations and the job summary';

function expectShrinkFailure(r: ActionRun): void {
  expect(r.stderr).toBe('');
  expect(r.code).toBe(1);
  expect(commandLines(r.stdout, 'error')).toEqual([SHRINK_ERROR, FAILED_STEP]);
  expect(r.outputs['verdict']).toBe('fail');
  expect(r.outputs['failed']).toBe('1');
}

describe('a pull request that shrinks the last convolution', () => {
  test('fails with an annotation on the changed line, a summary table, outputs and a report', () => {
    expect(LAST_CONV_LINE).toBe(18);
    const { repo, base } = baseRepo();
    repo.write(CONFIG_PATH, SHRUNK_CONFIG_TEXT);
    repo.commit('trim the last convolution');
    const r = runAction({ workspace: repo.dir, inputs: { policy: 'policies', picture: 'reports/capacity.html' }, event: pullRequestEvent(base) });
    expectShrinkFailure(r);
    expect(commandLines(r.stdout, 'warning')).toEqual([]);
    // The picture report, written where the input says, its absolute path an output.
    expect(r.outputs['picture']).toBe(join(repo.dir, 'reports/capacity.html'));
    const picture = repo.read('reports/capacity.html');
    expect(picture.startsWith('<!DOCTYPE html>')).toBe(true);
    expect(picture.match(/<g class="cut-mark" data-layer="8" data-line="18" data-dim="16" data-count="1">/g)).toHaveLength(1);
    expect(r.summary).toContain('<details><summary>organ-pair: the network and its minimal cut (diagram)</summary>\n\n```mermaid\nflowchart TB\n');
    expect(commandLines(r.stdout, 'notice')).toEqual([]);

    expect(r.summary).toContain('<h3>models/renal-pair-net.yaml — policy paired-organs</h3>');
    expect(r.summary).toContain(
      '<table><tr><th>partition</th><th>required (bits)</th><th>base (bits)</th><th>head (bits)</th><th>change (bits)</th><th>verdict</th></tr>' +
        '<tr><td>organ-pair</td><td>6.00</td><td>8.00</td><td>4.00</td><td>-4.00</td><td>fail</td></tr></table>',
    );
    expect(r.summary).toContain('<details><summary>organ-pair: fail — why, and what restores it</summary><pre>organ-pair — columns 0-31 against columns 32-63');

    expect(r.outputs['report']).toBe(join(r.runnerTemp, 'rankfloor-report.json'));
    const report = JSON.parse(readFileSync(r.outputs['report']!, 'utf8'));
    expect(report.verdict).toBe('fail');
    expect(report.results).toHaveLength(1);
    expect(report.results[0]).toMatchObject({ file: 'models/renal-pair-net.yaml', policy: 'paired-organs', verdict: 'fail', comparison: 'compared' });
    expect(report.results[0].requirements[0]).toMatchObject({
      partition: 'organ-pair',
      upper: { rank: '16', log2: 4 },
      base: { upper: { rank: '256', log2: 8 } },
      change_bits: -4,
      attributed: [{ layer: 8, field: 'channels', from: '256', to: '16', line: 18, column: 24 }],
    });
  });

  test('lowering the policy minimum in the same pull request does not help; the policy change gets a notice', () => {
    const { repo, base } = baseRepo();
    repo.write(CONFIG_PATH, SHRUNK_CONFIG_TEXT);
    repo.write(POLICY_PATH, POLICY_TEXT.replace('min_rank: 64', 'min_rank: 16'));
    repo.commit('trim the last convolution and relax the policy');
    const r = runAction({ workspace: repo.dir, inputs: { policy: 'policies' }, event: pullRequestEvent(base) });
    expectShrinkFailure(r);
    expect(commandLines(r.stdout, 'notice')).toEqual([
      `::notice title=policy changed by this pull request,file=policies/paired-organs.yaml,line=${POLICY_MIN_LINE},col=1::` +
        "the pull request changes this policy; it is judged with the base revision's version (a change cannot loosen its own gate)",
    ]);
    expect(POLICY_MIN_LINE).toBe(8);
    expect(r.summary).toContain('<h3>Policy notices</h3>');
  });

  test('a shallow checkout fetches the missing base commit and fails the same way', () => {
    const { repo: origin, base } = baseRepo();
    origin.write(CONFIG_PATH, SHRUNK_CONFIG_TEXT);
    origin.commit('trim the last convolution');
    git(origin.dir, 'config', 'uploadpack.allowAnySHA1InWant', 'true');
    const clone = join(tempDir(), 'checkout');
    git(origin.dir, 'clone', '-q', '--depth=1', `file://${origin.dir}`, clone);
    expect(git(clone, 'rev-parse', '--is-shallow-repository')).toBe('true');
    expect(() => git(clone, 'cat-file', '-e', `${base}^{commit}`)).toThrow();

    const r = runAction({ workspace: clone, inputs: { policy: 'policies' }, event: pullRequestEvent(base) });
    expectShrinkFailure(r);
    expect(git(clone, 'cat-file', '-t', base)).toBe('commit');
  });
});

test('a pull request that changes no config passes and checks nothing', () => {
  const { repo, base } = baseRepo();
  repo.write('README.md', '# models\n\nHow to train them.\n');
  repo.commit('docs');
  const r = runAction({ workspace: repo.dir, inputs: { policy: 'policies' }, event: pullRequestEvent(base) });
  expect(r.stderr).toBe('');
  expect(r.code).toBe(0);
  expect(commandLines(r.stdout, 'error')).toEqual([]);
  expect(r.outputs['verdict']).toBe('pass');
  expect(r.outputs['failed']).toBe('0');
  expect(JSON.parse(readFileSync(r.outputs['report']!, 'utf8')).results).toEqual([]);
  expect(r.summary).toContain('<p>Nothing to check: no config matched (or none changed).</p>');
});

test('a malformed head config is annotated at its position and exits 2', () => {
  const { repo, base } = baseRepo();
  repo.write(CONFIG_PATH, CONFIG_TEXT.replace('- conv: {channels: 256, kernel: 3}\n', '- conv: {chanels: 256, kernel: 3}\n'));
  repo.commit('typo');
  const r = runAction({ workspace: repo.dir, inputs: { policy: 'policies' }, event: pullRequestEvent(base) });
  expect(r.stderr).toBe('');
  expect(r.code).toBe(2);
  const message =
    "unknown field 'chanels' in model.layers[8].conv (did you mean 'channels'?); it reads channels, kernel, stride, dilation, padding, groups, depthwise, depth_multiplier, bias, norm, batch_norm, layer_norm, activation, dropout, name [config/unknown-field]";
  expect(commandLines(r.stdout, 'error')).toEqual([
    `::error title=cannot check models/renal-pair-net.yaml,file=models/renal-pair-net.yaml,line=18,col=14::${message}`,
    `::error::rankfloor: cannot check every config: models/renal-pair-net.yaml:18:14: error: ${message}`,
  ]);
  expect(r.outputs['verdict']).toBe('error');
  expect(r.summary).toContain('<h3>Input errors</h3>');
});

test('a missing policy input or a base that cannot be found exits 2 without checking', () => {
  const { repo } = baseRepo();
  const none = runAction({ workspace: repo.dir, inputs: {} });
  expect(none.code).toBe(2);
  expect(commandLines(none.stdout, 'error')).toEqual([
    '::error::rankfloor: the input `policy` is required: a policy file or a directory of policies, relative to the repository root',
  ]);
  expect(none.outputs).toEqual({ verdict: 'error', failed: '0' });

  const missing = runAction({ workspace: repo.dir, inputs: { policy: 'policies', base: 'no-such-branch' } });
  expect(missing.code).toBe(2);
  expect(commandLines(missing.stdout, 'error')).toEqual([
    '::error::rankfloor: --base no-such-branch: no such commit in this repository; check out with full history (for example fetch-depth: 0)',
  ]);

  // A full commit id is fetched once from origin; with no origin the request cannot be met.
  const unreachable = runAction({ workspace: repo.dir, inputs: { policy: 'policies' }, event: pullRequestEvent('0'.repeat(40)) });
  expect(unreachable.code).toBe(2);
  expect(commandLines(unreachable.stdout, 'error')).toEqual([
    `::error::rankfloor: commit ${'0'.repeat(40)} is not in this clone, and there is no remote named origin to fetch it from. ` +
      'Check out the repository with full history (for GitHub Actions: `fetch-depth: 0` in actions/checkout; elsewhere `git fetch --unshallow origin`).',
  ]);
  expect(unreachable.outputs).toEqual({ verdict: 'error', failed: '0' });
});

describe('outside a pull request', () => {
  test('configs globs choose what is checked; the SARIF log lands where asked', () => {
    const { repo } = baseRepo();
    repo.write(CONFIG_PATH, SHRUNK_CONFIG_TEXT);
    repo.write('models/old-renal-net.yaml', SHRUNK_CONFIG_TEXT);
    repo.commit('trim the last convolution');
    const r = runAction({
      workspace: repo.dir,
      inputs: { policy: POLICY_PATH, configs: 'models/*.yaml\n!models/old-*.yaml\n', sarif: 'reports/rankfloor.sarif' },
      event: { name: 'push', payload: {} },
    });
    expect(r.stderr).toBe('');
    expect(r.code).toBe(1);
    // No base: the annotation points at the bottleneck layer's line, not at a change.
    expect(commandLines(r.stdout, 'error')).toEqual([
      `::error title=organ-pair%3A capacity below the policy minimum (policy paired-organs),file=models/renal-pair-net.yaml,line=18,col=1::` +
        [
          'needs   rank ≥ 64 (6.00 bits)  [min_rank: 64, policies/paired-organs.yaml:8]',
          'allows  exactly 16 (4.00 bits) — provably short by 2.00 bits',
          'bottleneck (min-cut): 1 bond of dimension 16 from layer 8 (line 18)',
          'fix (smallest change of one field, cheapest first):',
          '  line 18:24  layer 8 channels: 16 → 64  (+110,784 parameters; then proven by top-window span)',
        ].join('%0A'),
      FAILED_STEP,
    ]);
    expect(r.summary).toContain('<tr><td>organ-pair</td><td>6.00</td><td>—</td><td>4.00</td><td>—</td><td>fail</td></tr>');
    const sarif = JSON.parse(repo.read('reports/rankfloor.sarif'));
    expect(sarif.runs[0].results.map((x: { locations: { physicalLocation: { artifactLocation: { uri: string }; region: unknown } }[] }) => x.locations[0]!.physicalLocation)).toEqual([
      { artifactLocation: { uri: 'models/renal-pair-net.yaml', uriBaseId: '%SRCROOT%' }, region: { startLine: 18, startColumn: 1 } },
    ]);
  });

  test('globs that match no file check nothing, rather than everything', () => {
    const { repo } = baseRepo();
    repo.write(CONFIG_PATH, SHRUNK_CONFIG_TEXT);
    repo.commit('trim the last convolution');
    const r = runAction({ workspace: repo.dir, inputs: { policy: 'policies', configs: 'experiments/**/*.yaml' } });
    expect(r.code).toBe(0);
    expect(commandLines(r.stdout, 'error')).toEqual([]);
    expect(r.outputs['verdict']).toBe('pass');
    expect(r.outputs['failed']).toBe('0');
  });
});

describe('report files and removed configs', () => {
  test('sarif (with its category) and junit inside the workspace; a deleted governed config is a warning annotation', () => {
    const { repo, base } = baseRepo();
    git(repo.dir, 'rm', '-q', CONFIG_PATH);
    repo.commit('drop the kidney-pair model');
    const r = runAction({
      workspace: repo.dir,
      inputs: { policy: 'policies', sarif: 'reports/rankfloor.sarif', 'sarif-category': 'models', junit: 'reports/rankfloor.xml' },
      event: pullRequestEvent(base),
    });
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const message =
      'models/renal-pair-net.yaml was governed by policy paired-organs at the base and this change deletes it; ' +
      'policy paired-organs counts this as a warning (set removal: fail to make it fail)';
    expect(commandLines(r.stdout, 'warning')).toEqual([
      `::warning title=models/renal-pair-net.yaml%3A deleted from policy paired-organs,file=models/renal-pair-net.yaml::${message}`,
    ]);
    expect(r.summary).toContain(`<p>Warning: ${message}.</p>`);
    const sarif = JSON.parse(repo.read('reports/rankfloor.sarif'));
    expect(sarif.runs[0].automationDetails).toEqual({ id: 'models/' });
    expect(sarif.runs[0].results.map((x: { ruleId: string }) => x.ruleId)).toEqual(['rankfloor/config-removed']);
    expect(repo.read('reports/rankfloor.xml')).toContain('<skipped message="models/renal-pair-net.yaml was governed by policy paired-organs');
  });

  test('a report path outside the workspace, or through a link out of it, is refused with exit 2 and one line', () => {
    const { repo, base } = baseRepo();
    const outside = tempDir('rankfloor-outside-');
    const escape = runAction({ workspace: repo.dir, inputs: { policy: 'policies', sarif: `../${outside.split('/').at(-1)}/x.sarif` }, event: pullRequestEvent(base) });
    expect(escape.code).toBe(2);
    expect(commandLines(escape.stdout, 'error')).toEqual([expect.stringMatching(/^::error::rankfloor: the input `sarif`: .* has a '\.\.' segment; report files are written inside the workspace$/)]);
    symlinkSync(outside, join(repo.dir, 'reports'));
    const linked = runAction({ workspace: repo.dir, inputs: { policy: 'policies', junit: 'reports/x.xml' }, event: pullRequestEvent(base) });
    expect(linked.code).toBe(2);
    expect(commandLines(linked.stdout, 'error')).toEqual([
      `::error::rankfloor: cannot write ${join(repo.dir, 'reports/x.xml')}: its directory leads, through a symbolic link, outside ${repo.dir}`,
    ]);
    expect(readdirSync(outside)).toEqual([]);
  });
});

test('a config whose name holds blank lines and Markdown cannot forge the job summary', () => {
  const { repo, base } = baseRepo();
  const forged = 'models/renal-\n\n## rankfloor: pass\n\n<!-- .yaml';
  repo.write(forged, SHRUNK_CONFIG_TEXT);
  repo.commit('a config with a hostile name');
  const r = runAction({ workspace: repo.dir, inputs: { policy: 'policies' }, event: pullRequestEvent(base) });
  expect(r.code).toBe(1);
  // A blank line would end an HTML block of the summary; what follows would render as Markdown.
  // The only blank lines are those around the flowchart's code block, which the summary writes.
  const outsideCharts = r.summary.replace(/\n\n```mermaid\n(?:[^\n]*\n)*?```\n\n/g, '\n');
  expect(r.summary).toContain('```mermaid');
  expect(outsideCharts.replace(/\n$/, '').split('\n').filter((l) => l.trim() === '')).toEqual([]);
  expect(r.summary).not.toMatch(/^## /m);
  expect(r.summary).toContain('<h3>models/renal-&#10;&#10;## rankfloor: pass&#10;&#10;&lt;!-- .yaml — policy paired-organs</h3>');
});
