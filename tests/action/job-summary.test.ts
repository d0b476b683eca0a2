/**
 * The job summary rendered into a recording sink from a real comparison (a pull request that
 * shrinks the last convolution): the table's cells, the failing requirement's explanation in a
 * <details> block, HTML escaping, and the annotations that did not fit.
 */
import { afterAll, beforeAll, expect, test } from 'vitest';
import { planAnnotations } from '../../src/action/annotations.js';
import { escapeHtml, writeJobSummary, type SummaryCell, type SummarySink } from '../../src/action/job-summary.js';
import { runCheck, type CheckOutcome } from '../../src/check/run-check.js';
import type { Finding } from '../../src/report/finding.js';
import { baseRepo, CONFIG_PATH, isolateThisProcess, removeTempDirs, SHRUNK_CONFIG_TEXT } from './action-fixture.js';

type Call = [string, ...unknown[]];

function recorder(): { sink: SummarySink; calls: Call[] } {
  const calls: Call[] = [];
  return {
    calls,
    sink: {
      addHeading: (text, level) => calls.push(['heading', text, level]),
      addTable: (rows: SummaryCell[][]) => calls.push(['table', rows]),
      addDetails: (label, content) => calls.push(['details', label, content]),
      addRaw: (text) => calls.push(['raw', text]),
    },
  };
}

let outcome: CheckOutcome;
let base: string;

beforeAll(() => {
  isolateThisProcess();
  const made = baseRepo();
  base = made.base;
  made.repo.write(CONFIG_PATH, SHRUNK_CONFIG_TEXT);
  made.repo.commit('shrink the last convolution');
  outcome = runCheck({ cwd: made.repo.dir, policy: 'policies', configs: [], base, changed: true });
});
afterAll(removeTempDirs);

test('one table per checked config with base, head and change in bits', () => {
  const { sink, calls } = recorder();
  writeJobSummary(sink, outcome, 'fail', []);
  expect(calls[0]).toEqual(['heading', 'rankfloor: fail', 2]);
  expect(calls[1]).toEqual(['raw', `<p>1 config × policy check against base ${base.slice(0, 12)}: 1 failing requirement, 0 unproven, 0 passing.</p>`]);
  expect(calls[2]).toEqual(['heading', 'models/renal-pair-net.yaml — policy paired-organs', 3]);
  const header = ['partition', 'required (bits)', 'base (bits)', 'head (bits)', 'change (bits)', 'verdict'].map((data) => ({ data, header: true }));
  expect(calls[3]).toEqual(['table', [header, ['organ-pair', '6.00', '8.00', '4.00', '-4.00', 'fail']]]);
  const [kind, label, content] = calls[4]!;
  expect(kind).toBe('details');
  expect(label).toBe('organ-pair: fail — why, and what restores it');
  expect(content).toMatch(/^<pre>organ-pair — columns 0-31 against columns 32-63\n/);
  expect(content).toContain('change  base 8.00 bits → head 4.00 bits (-4.00)');
  expect(content).toContain('line 18:24  layer 8 channels: 16 → 64');
  expect(calls).toHaveLength(5);
});

test('without a base the base and change columns say so; nothing checked says so too', () => {
  const { sink, calls } = recorder();
  // Without a base the policies are read from the working tree, relative to the process's own
  // directory, as the action has it after moving into the workspace.
  const before = process.cwd();
  let noBase: CheckOutcome;
  try {
    process.chdir(outcome.root);
    noBase = runCheck({ cwd: outcome.root, policy: 'policies', configs: [] });
  } finally {
    process.chdir(before);
  }
  writeJobSummary(sink, noBase, 'fail', []);
  const table = calls.find((c) => c[0] === 'table')![1] as SummaryCell[][];
  expect(table[1]).toEqual(['organ-pair', '6.00', '—', '4.00', '—', 'fail']);
  const empty = recorder();
  writeJobSummary(empty.sink, { root: outcome.root, checked: [], notices: [], errors: [] }, 'pass', []);
  expect(empty.calls).toEqual([
    ['heading', 'rankfloor: pass', 2],
    ['raw', '<p>Nothing to check: no config matched (or none changed).</p>'],
  ]);
});

test('annotations beyond the limit are listed, counted per kind', () => {
  const f = (n: number): Finding => ({
    rule: 'input-error',
    level: 'error',
    title: `cannot check models/<m${n}>.yaml`,
    message: 'x',
    file: `models/<m${n}>.yaml`,
    line: n,
    column: 2,
    fingerprint: `${n}`,
  });
  const plan = planAnnotations(Array.from({ length: 12 }, (_, i) => f(i + 1)));
  const { sink, calls } = recorder();
  writeJobSummary(sink, { root: outcome.root, checked: [], notices: [], errors: [] }, 'error', plan.overflow);
  expect(calls.slice(2)).toEqual([
    ['heading', 'Not shown as annotations', 3],
    ['raw', '<p>2 more errors:</p>'],
    ['raw', '<ul><li>models/&lt;m11&gt;.yaml:11:2: cannot check models/&lt;m11&gt;.yaml</li><li>models/&lt;m12&gt;.yaml:12:2: cannot check models/&lt;m12&gt;.yaml</li></ul>'],
  ]);
});

test('escapeHtml', () => {
  expect(escapeHtml('a < b && "c" > d')).toBe('a &lt; b &amp;&amp; &quot;c&quot; &gt; d');
});
