/**
 * The job summary rendered from a real comparison (a pull request that shrinks the last
 * convolution): the table's cells, the failing requirement's explanation in a <details> block,
 * the annotations that did not fit; that text from the pull request can never end the HTML block
 * (after which forged Markdown would render); and that it stays under GitHub's 1 MiB limit
 * ("$GITHUB_STEP_SUMMARY upload aborted, supports content up to a size of 1024k") with a note
 * pointing to the JSON report.
 */
import { afterAll, beforeAll, expect, test } from 'vitest';
import { planAnnotations } from '../../src/action/annotations.js';
import { escapeHtml, renderJobSummary, SUMMARY_LIMIT_BYTES } from '../../src/action/job-summary.js';
import { runCheck, type CheckOutcome } from '../../src/check/run-check.js';
import type { Finding } from '../../src/report/finding.js';
import type { Model } from '../../src/config/model.js';
import { baseRepo, CONFIG_PATH, isolateThisProcess, removeTempDirs, SHRUNK_CONFIG_TEXT } from './action-fixture.js';

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

const EMPTY = (root: string): CheckOutcome => ({ root, checked: [], notices: [], skipped: [], errors: [] });

/** Lines that are empty or only spaces and tabs: each would end the summary's HTML block (CommonMark, HTML blocks of type 6). */
function blankLines(text: string): number {
  return text.replace(/\n$/, '').split(/\r\n|\r|\n/).filter((l) => /^[ \t]*$/.test(l)).length;
}

test('one table per checked config with base, head and change in bits', () => {
  const text = renderJobSummary(outcome, 'fail', []);
  const lines = text.split('\n');
  expect(lines[0]).toBe('<h2>rankfloor: fail</h2>');
  expect(lines[1]).toBe(`<p>1 config × policy check against base ${base.slice(0, 12)}: 1 failing requirement, 0 unproven, 0 passing.</p>`);
  expect(lines[2]).toBe('<h3>models/renal-pair-net.yaml — policy paired-organs</h3>');
  expect(lines[3]).toBe(
    '<table><tr><th>partition</th><th>required (bits)</th><th>base (bits)</th><th>head (bits)</th><th>change (bits)</th><th>verdict</th></tr>' +
      '<tr><td>organ-pair</td><td>6.00</td><td>8.00</td><td>4.00</td><td>-4.00</td><td>fail</td></tr></table>',
  );
  expect(lines[4]).toMatch(/^<details><summary>organ-pair: fail — why, and what restores it<\/summary><pre>organ-pair — columns 0-31 against columns 32-63&#10;/);
  expect(lines[4]).toContain('change  base 8.00 bits → head 4.00 bits (-4.00)');
  expect(lines[4]).toContain('line 18:24  layer 8 channels: 16 → 64');
  // The flowchart, folded: the cut layer with its cut, fix and change written in, the runs of other
  // layers collapsed, and the blank lines Markdown needs around a code block.
  expect(lines.slice(5)).toEqual([
    '<details><summary>organ-pair: the network and its minimal cut (diagram)</summary>',
    '',
    '```mermaid',
    'flowchart TB',
    '  n0(["input 64×64<br>4,096 positions, M = 32 · line 6"])',
    '  n1["layer 8: conv 3×3<br>width 16, grid 4×4 · line 18<br>✂ CUT 1 bond × dim 16<br>FIX channels 16 → 64 (+110784 parameters)<br>CHANGED channels 256 → 16"]',
    '  n2(["head: the analysed score"])',
    '  n3["⋯ 8 layers, lines 10–17"]',
    '  n4["⋯ 2 layers, lines 19–20"]',
    '  n0 --> n3',
    '  n3 --> n1',
    '  n1 --> n4',
    '  n4 --> n2',
    '  classDef cut stroke:#b3261e,stroke-width:4px,stroke-dasharray:6 3',
    '  classDef fix stroke:#2f7d32,stroke-width:3px',
    '  classDef change stroke:#8a5a00,stroke-width:3px',
    '  classDef run stroke-dasharray:3 3',
    '  class n1 cut',
    '  class n3,n4 run',
    '```',
    '',
    '</details>',
    '',
  ]);
});

/** The flowchart code blocks with the blank lines around them, which end (and start) HTML blocks on purpose. */
const FLOWCHART = /\n\n```mermaid\n((?:[^\n]*\n)*?)```\n\n/g;

test('nothing checked says so', () => {
  expect(renderJobSummary(EMPTY(outcome.root), 'pass', [])).toBe('<h2>rankfloor: pass</h2>\n<p>Nothing to check: no config matched (or none changed).</p>\n');
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
  const text = renderJobSummary(EMPTY(outcome.root), 'error', plan.overflow);
  expect(text.split('\n').slice(2)).toEqual([
    '<h3>Not shown as annotations</h3>',
    '<p>2 more errors:</p>',
    '<ul><li>models/&lt;m11&gt;.yaml:11:2: cannot check models/&lt;m11&gt;.yaml</li><li>models/&lt;m12&gt;.yaml:12:2: cannot check models/&lt;m12&gt;.yaml</li></ul>',
    '',
  ]);
});

test('names and messages with blank lines and markup cannot end the HTML block', () => {
  const forged = '\n\n## rankfloor: pass\n\n**all good**\r\n\r\n<script>x</script>\n```\n"]) --> x';
  // A layer name from the pull request reaches the flowchart's labels too: the cut layer, as if
  // the config had named it (reports then call it by its name).
  const name = `conv${forged}`;
  const label = <T extends { layer: number | string }>(x: T): T => (x.layer === 8 ? { ...x, layer: name } : x);
  const rename = (m: Model): Model => (m.kind === 'layered' ? { ...m, layers: m.layers.map((l) => (l.index === 8 ? { ...l, name } : l)) } : m);
  const checked = outcome.checked.map((c) => ({
    ...c,
    file: `models/evil${forged}.yaml`,
    model: rename(c.model!),
    result: {
      ...c.result!,
      requirements: c.result!.requirements.map((q) => ({ ...q, bounds: { ...q.bounds, upper: { ...q.bounds.upper, cut: q.bounds.upper.cut.map(label) } }, fixes: q.fixes.map(label) })),
    },
    deltas: c.deltas!.map((d) => ({ ...d, attributed: d.attributed.map(label) })),
  }));
  const hostile: CheckOutcome = {
    ...outcome,
    checked,
    notices: [{ file: `policies/p${forged}.yaml`, path: 'policies/p.yaml', line: 3, message: `changed${forged}` }],
    skipped: [{ path: `models/x${forged}.txt`, reason: 'not a YAML file (.yaml or .yml)' }],
    errors: [{ code: 'config/unknown-field', message: `bad field${forged}`, file: `models/y${forged}.yaml`, severity: 'error' }],
  };
  const text = renderJobSummary(hostile, 'error', []);
  const charts = [...text.matchAll(FLOWCHART)].map((m) => m[1]!);
  expect(charts).toHaveLength(1);
  // Every line of the chart is a node, an edge or a style statement; labels hold no quote, backtick or line break.
  const quoted = '"(?:[^"`\\n<>]|<br>)*"';
  const statement = new RegExp(`^  (n\\d+(\\[${quoted}\\]|\\(\\[${quoted}\\]\\)|\\{\\{${quoted}\\}\\})|n\\d+ (-->|-\\.->)(\\|${quoted}\\|)? n\\d+|classDef \\w+ [\\w:#,. -]+|class [n\\d,]+ \\w+)$`);
  const chartLines = charts[0]!.trimEnd().split('\n');
  expect(chartLines[0]).toBe('flowchart TB');
  for (const l of chartLines.slice(1)) expect(l).toMatch(statement);
  expect(charts[0]).toContain('["conv#10;#10;#35;#35; rankfloor: pass#10;#10;#42;#42;all good#42;#42;#13;#10;#13;#10;#60;script#62;x#60;/script#62;#10;#96;#96;#96;#10;#34;]) --#62; x: conv 3×3<br>');
  expect(charts[0]).toContain('<br>✂ CUT 1 bond × dim 16<br>');
  // Outside the charts' code blocks, no line is blank: nothing from the pull request ends an HTML block.
  expect(blankLines(text.replace(FLOWCHART, '\n'))).toBe(0);
  expect(text).not.toMatch(/^##/m);
  expect(text).not.toContain('<script>');
  expect(text).toContain('<h3>models/evil&#10;&#10;## rankfloor: pass&#10;&#10;**all good**&#13;&#10;&#13;&#10;&lt;script&gt;x&lt;/script&gt;&#10;```&#10;&quot;]) --&gt; x.yaml — policy paired-organs</h3>');
});

test('a summary over 1 MiB keeps whole sections and ends with a note that points to the JSON report', () => {
  const one = outcome.checked[0]!;
  const many: CheckOutcome = { ...outcome, checked: Array.from({ length: 4000 }, (_, i) => ({ ...one, file: `models/net-${String(i).padStart(4, '0')}.yaml` })) };
  const full = renderJobSummary(many, 'fail', [], { limitBytes: Number.MAX_SAFE_INTEGER });
  expect(Buffer.byteLength(full)).toBeGreaterThan(SUMMARY_LIMIT_BYTES);
  const text = renderJobSummary(many, 'fail', [], { reportPath: '/runner/temp/rankfloor-report.json' });
  expect(Buffer.byteLength(text)).toBeLessThanOrEqual(SUMMARY_LIMIT_BYTES);
  const lines = text.trimEnd().split('\n');
  const kept = lines.filter((l) => l.startsWith('<h3>models/net-')).length;
  expect(kept).toBeGreaterThan(100);
  expect(kept).toBeLessThan(4000);
  // Whole sections only: the last kept config still has its table, its details and its flowchart.
  expect(lines.filter((l) => l === '```mermaid')).toHaveLength(kept);
  expect(lines.at(-2)).toBe('</details>');
  expect(lines.at(-4)).toBe('```');
  expect(lines.at(-1)).toBe(
    `<p><strong>This summary stops here to stay under GitHub's 1 MiB limit for a step summary; ${4000 - kept} more sections (configs, notices, errors) ` +
      "are in the JSON report at /runner/temp/rankfloor-report.json (the action's `report` output).</strong></p>",
  );
  expect(renderJobSummary(outcome, 'fail', [])).not.toContain('stops here');
});

test('escapeHtml', () => {
  expect(escapeHtml('a < b && "c" > d\r\n')).toBe('a &lt; b &amp;&amp; &quot;c&quot; &gt; d&#13;&#10;');
});
