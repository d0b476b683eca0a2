/**
 * The picture report and the job summary's flowcharts in a real browser: Debian's headless
 * Chromium (driven by playwright-core) opens the HTML files that `check --picture` and
 * `bounds --picture` write for the bundled examples, and the checks read the rendered DOM against
 * the JSON report of the same run — one cut mark per cut entry, every bar's value equal to the
 * JSON's, the bars' rendered geometry telling "provably short" from "proven" — and that opening
 * the file requests nothing. The flowcharts are checked with the Mermaid library's own parser and
 * renderer, loaded into the same browser from the `mermaid` package (it needs a DOM; it does not
 * run in Node). Screenshots go to test-output/picture/ (not committed).
 */
import { mkdirSync, readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import type { BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { renderJobSummary } from '../../src/action/job-summary.js';
import { runCheck } from '../../src/check/run-check.js';
import { loadConfigFile } from '../../src/config/load-config.js';
import { requirementFlowchart } from '../../src/report/mermaid-flowchart.js';
import { drawNetwork } from '../../src/report/network-drawing.js';
import { panelMarks } from '../../src/report/picture-panels.js';
import { baseRepo, CONFIG_PATH, isolatedEnv, isolateThisProcess, removeTempDirs, SHRUNK_CONFIG_TEXT } from '../action/action-fixture.js';
import { openChromium } from '../helpers/chromium.mjs';
import { REPO, runCli } from './run-cli.js';

const OUT = join(REPO, 'test-output', 'picture');

interface BoundDoc {
  rank: string | null;
  log2: number;
}
interface RequirementDoc {
  partition: string;
  required: BoundDoc;
  upper: BoundDoc;
  lower: BoundDoc | null;
  verdict: string;
  cut: { layer: number | string; line: number; dim: number; count: number }[];
  fix: { layer: number | string; field: string; from: number; to: number; added_parameters: string }[];
  base?: { upper: BoundDoc; lower: BoundDoc | null } | null;
  attributed?: { layer: number | string; field: string; from: string; to: string }[];
}
interface CheckDoc {
  results: { file: string; policy: string; requirements: RequirementDoc[] }[];
}

let browser: Awaited<ReturnType<typeof openChromium>>;
let context: BrowserContext;

beforeAll(async () => {
  rmSync(OUT, { recursive: true, force: true });
  mkdirSync(OUT, { recursive: true });
  browser = await openChromium();
  context = browser.context;
});
afterAll(async () => {
  await browser?.close();
  removeTempDirs();
});

/** Opens a report file and records every request the page makes. */
async function open(file: string): Promise<{ page: Page; requests: string[] }> {
  const page = await context.newPage();
  const requests: string[] = [];
  page.on('request', (r) => requests.push(r.url()));
  await page.goto(pathToFileURL(file).href);
  return { page, requests };
}

interface RenderedRow {
  series: string;
  log2: string | null;
  rank: string | null;
  value: string;
  x: number;
  right: number | null;
}

/** What a panel shows, read from the rendered DOM. */
async function readPanel(page: Page, index: number) {
  return page.locator('section.panel').nth(index).evaluate((panel: Dom) => {
    const attrs = (e: Dom) => Object.fromEntries([...e.attributes].filter((a) => a.name.startsWith('data-')).map((a) => [a.name.slice(5), a.value]));
    const rows = [...panel.querySelectorAll('.capacity-bars .bar-row')].map((g) => {
      const bar = g.querySelector('rect.bar');
      const box = bar?.getBoundingClientRect();
      return {
        series: g.getAttribute('data-series')!,
        log2: g.getAttribute('data-log2'),
        rank: g.getAttribute('data-rank'),
        value: (g.querySelector('.bar-value, .bar-missing')?.textContent ?? '').trim(),
        x: box?.left ?? 0,
        right: box ? box.right : null,
        broken: bar?.classList.contains('bar-broken') ?? false,
      };
    });
    const line = panel.querySelector('.required-line')?.getBoundingClientRect();
    const visible = (e: Dom) => {
      const r = e.getBoundingClientRect();
      return r.width > 0 && r.height > 0;
    };
    return {
      file: panel.getAttribute('data-file')!,
      policy: panel.getAttribute('data-policy'),
      partition: panel.getAttribute('data-partition')!,
      state: panel.getAttribute('data-state')!,
      cuts: [...panel.querySelectorAll('.cut-mark')].map(attrs),
      cutTexts: [...panel.querySelectorAll('.cut-mark')].map((e) => (e.textContent ?? '').trim()),
      cutsVisible: [...panel.querySelectorAll('.cut-mark')].every(visible),
      cutNodes: panel.querySelectorAll('.node.on-cut').length,
      fixes: [...panel.querySelectorAll('.fix-mark')].map(attrs),
      changes: [...panel.querySelectorAll('.change-mark')].map(attrs),
      rows,
      requiredX: line ? line.left + line.width / 2 : null,
      nodes: panel.querySelectorAll('.architecture .node').length,
      gridCells: [...panel.querySelectorAll('.partition-grid path.cells')].map((p) => [p.getAttribute('class'), p.getAttribute('data-cells')]),
    };
  });
}

type Panel = Awaited<ReturnType<typeof readPanel>>;

/** The few DOM members the checks read (the project type-checks without the DOM library). */
interface Dom {
  readonly attributes: ArrayLike<{ readonly name: string; readonly value: string }> & Iterable<{ readonly name: string; readonly value: string }>;
  readonly classList: { contains(c: string): boolean };
  readonly textContent: string | null;
  getAttribute(name: string): string | null;
  querySelector(selector: string): Dom | null;
  querySelectorAll(selector: string): ArrayLike<Dom> & Iterable<Dom>;
  getBoundingClientRect(): { left: number; right: number; width: number; height: number };
}

/** The displayed value of a bound: the JSON's log2 as JSON writes it, with the JSON's rank. */
function shown(b: BoundDoc): string {
  if (b.rank === null) return `${JSON.stringify(b.log2)} bits (more than 2^4,000,000)`;
  return b.rank.length <= 15 ? `${JSON.stringify(b.log2)} bits (rank ${b.rank})` : `${JSON.stringify(b.log2)} bits (${b.rank.length} digits)`;
}

function expectRow(row: RenderedRow | undefined, b: BoundDoc | null): void {
  expect(row).toBeDefined();
  if (b === null) {
    expect([row!.log2, row!.rank]).toEqual(['null', 'null']);
    return;
  }
  expect(row!.log2).toBe(JSON.stringify(b.log2));
  expect(row!.rank).toBe(b.rank ?? 'null');
  expect(row!.value.startsWith(shown(b))).toBe(true);
}

/** The panel's numbers and marks are the JSON requirement's. */
function expectPanelMatches(p: Panel, r: RequirementDoc): void {
  const row = (s: string) => p.rows.find((x) => x.series === s) as RenderedRow | undefined;
  expectRow(row('required'), r.required);
  expectRow(row('head-upper'), r.upper);
  expectRow(row('head-lower'), r.lower);
  if (r.base !== undefined) {
    expectRow(row('base-upper'), r.base?.upper ?? null);
    expectRow(row('base-lower'), r.base?.lower ?? null);
  } else expect(row('base-upper')).toBeUndefined();
  // One cut mark per cut entry of the JSON, with its values, each visible (the picture lists them
  // in the order of the drawing, the JSON in its own: compared as sets).
  const sorted = <T,>(xs: readonly T[]): string[] => xs.map((x) => JSON.stringify(x)).sort();
  expect(sorted(p.cuts)).toEqual(sorted(r.cut.map((c) => ({ layer: String(c.layer), line: String(c.line), dim: String(c.dim), count: String(c.count) }))));
  expect([...p.cutTexts].sort()).toEqual(r.cut.map((c) => `✂ cut: ${c.count} bond${c.count === 1 ? '' : 's'} × dim ${c.dim}`).sort());
  expect(p.cutsVisible).toBe(true);
  expect(p.fixes.map((f) => [f['layer'], f['field'], f['from'], f['to'], f['added-parameters']])).toEqual(
    r.fix.map((f) => [String(f.layer), f.field, String(f.from), String(f.to), f.added_parameters]),
  );
}

describe('check --picture over the bundled examples', () => {
  let doc: CheckDoc;
  let panels: Panel[];
  let requests: string[];
  let page: Page;

  beforeAll(async () => {
    const file = join(OUT, 'examples.html');
    const r = runCli(['check', '--policy', 'policies/', '--format', 'json', '--picture', file]);
    expect(r.code).toBe(1);
    doc = JSON.parse(r.stdout) as CheckDoc;
    ({ page, requests } = await open(file));
    const count = await page.locator('section.panel').count();
    panels = [];
    for (let i = 0; i < count; i++) panels.push(await readPanel(page, i));
    await page.screenshot({ path: join(OUT, 'examples.png'), fullPage: true });
    await page.locator('section.panel').first().screenshot({ path: join(OUT, 'examples-first-panel.png') });
  });

  test('opening the file requests nothing but the file itself', () => {
    expect(requests).toEqual([pathToFileURL(join(OUT, 'examples.html')).href]);
  });

  test('one panel per config × requirement, the failing one first, then the passing ones', () => {
    expect(panels).toHaveLength(doc.results.reduce((n, x) => n + x.requirements.length, 0));
    expect(panels.map((p) => p.state)).toEqual(['fail', ...Array<string>(19).fill('pass')]);
    expect([panels[0]!.file, panels[0]!.partition]).toEqual(['examples/renal-pair-net-trimmed.yaml', 'organ-pair']);
    // Within a state, the JSON report's order (by file).
    const passing = doc.results.flatMap((x) => x.requirements.filter((q) => q.verdict === 'pass').map((q) => [x.file, q.partition]));
    expect(panels.slice(1).map((p) => [p.file, p.partition])).toEqual(passing);
  });

  test('every panel: bars, cut marks and fixes equal the JSON report', () => {
    for (const p of panels) {
      const r = doc.results.find((x) => x.file === p.file && x.policy === p.policy)!.requirements.find((q) => q.partition === p.partition)!;
      expectPanelMatches(p, r);
      expect(p.nodes).toBeGreaterThan(2);
    }
  });

  test('the trimmed kidney-pair net: the cut and the fix sit on layer 8 (line 17), its upper bar stops short of the requirement', () => {
    const p = panels[0]!;
    expect(p.cuts).toEqual([{ layer: '8', line: '17', dim: '16', count: '1' }]);
    expect(p.cutNodes).toBe(1);
    expect(p.fixes).toEqual([{ layer: '8', field: 'channels', line: '17', from: '16', to: '64', 'added-parameters': '7104', verdict: 'pass' }]);
    const upper = p.rows.find((r) => r.series === 'head-upper')!;
    // Provably short, visibly: the head's upper bar ends left of the requirement's line (4 of 6 bits).
    expect(upper.right!).toBeLessThan(p.requiredX! - 20);
    // The 64×64 input split into columns 0-31 and 32-63: 2,048 positions per side, one cell each.
    expect(p.gridCells).toEqual([
      ['cells cells-side-a', '2048'],
      ['cells cells-side-b', '2048'],
    ]);
  });

  test('a proven requirement: the lower bar reaches past the requirement line', () => {
    const p = panels.find((x) => x.file === 'examples/renal-pair-net.yaml' && x.partition === 'organ-pair')!;
    const lower = p.rows.find((r) => r.series === 'head-lower')!;
    expect(lower.right!).toBeGreaterThan(p.requiredX!);
  });
});

/** A layer name from a pull request, with everything that could end a label, an attribute or a code block. */
const HOSTILE = 'conv") --> x |y| \n```\n<script>alert(1)</script> #35; ;&amp;';

let hostile: { dir: string; base: string } | undefined;

/** A pull request that shrinks the last convolution and gives it the hostile name (made once). */
function hostilePullRequest(): { dir: string; base: string } {
  if (hostile) return hostile;
  const { repo, base } = baseRepo();
  repo.write(CONFIG_PATH, SHRUNK_CONFIG_TEXT.replace('- conv: {channels: 16, kernel: 3}\n', `- conv: {channels: 16, kernel: 3, name: ${JSON.stringify(HOSTILE)}}\n`));
  repo.commit('shrink and name the last convolution');
  return (hostile = { dir: repo.dir, base });
}

describe('check --base --picture: base and head side by side, the change marked on the cut', () => {
  test('a pull request that shrinks (and names) the last convolution', async () => {
    const { dir, base } = hostilePullRequest();
    const file = join(OUT, 'comparison.html');
    const r = runCli(['check', '--policy', 'policies', '--base', base, '--format', 'json', '--picture', file], dir, isolatedEnv());
    expect(r.code).toBe(1);
    const json = JSON.parse(r.stdout) as CheckDoc;
    const { page, requests } = await open(file);
    expect(requests).toHaveLength(1);
    const p = await readPanel(page, 0);
    const q = json.results[0]!.requirements[0]!;
    expectPanelMatches(p, q);
    expect(q.cut).toEqual([{ layer: HOSTILE, line: 18, dim: 16, count: 1 }]);
    expect(p.rows.map((x) => [x.series, x.log2])).toEqual([
      ['required', '6'],
      ['base-lower', '8'],
      ['base-upper', '8'],
      ['head-lower', '4'],
      ['head-upper', '4'],
    ]);
    expect(p.changes.filter((c) => c['field'] === 'channels')).toEqual([{ layer: HOSTILE, field: 'channels', line: '18', from: '256', to: '16' }]);
    // The head's upper bar is shorter than the base's: the drop is visible as such.
    const right = (s: string) => p.rows.find((x) => x.series === s)!.right!;
    expect(right('head-upper')).toBeLessThan(right('base-upper'));
    // The name is text: no element came out of it.
    expect(await page.locator('script').count()).toBe(0);
    expect(await page.locator('section.panel .node.on-cut .node-title').first().textContent()).toBe(`${HOSTILE}: conv 3×3`);
    await page.locator('section.panel').first().screenshot({ path: join(OUT, 'comparison-panel.png') });
  });
});

describe('bounds --picture: a huge bound and an explicit network', () => {
  test('inception net, checkerboard: a bound over 2^4,000,000 is a broken bar with its log2, the grid in mixed blocks', async () => {
    const file = join(OUT, 'inception.html');
    const args = ['bounds', 'examples/architectures/inception-wildlife.yaml', '--model-path', '/pipeline/stages/1/network', '--partition', 'checkerboard'];
    const r = runCli([...args, '--format', 'json', '--picture', file]);
    expect(r.code).toBe(0);
    const json = JSON.parse(r.stdout) as { partitions: { partition: string; upper: BoundDoc; lower: BoundDoc | null; cut: RequirementDoc['cut'] }[] };
    const { page, requests } = await open(file);
    expect(requests).toHaveLength(1);
    for (let i = 0; i < json.partitions.length; i++) {
      const p = await readPanel(page, i);
      const j = json.partitions[i]!;
      expect(p.partition).toBe(j.partition);
      expectRow(p.rows.find((x) => x.series === 'head-upper'), j.upper);
      expectRow(p.rows.find((x) => x.series === 'head-lower'), j.lower);
      expect(p.cuts).toHaveLength(j.cut.length);
    }
    const huge = await readPanel(page, 0);
    expect(json.partitions[0]!.upper.rank).toBeNull();
    const upper = huge.rows.find((x) => x.series === 'head-upper')! as RenderedRow & { broken: boolean };
    expect(upper.broken).toBe(true);
    expect(upper.value).toBe(`${JSON.stringify(json.partitions[0]!.upper.log2)} bits (more than 2^4,000,000)`);
    // 224×224 in blocks of 4×4: each block holds both sides of a checkerboard.
    expect(huge.gridCells).toEqual([['cells cells-mixed', String(56 * 56)]]);
    await page.locator('section.panel').first().screenshot({ path: join(OUT, 'inception-checkerboard.png') });
  });

  test('an explicit ring of four tensors: the cut legs marked on their tensors', async () => {
    const file = join(OUT, 'probe-ring.html');
    const r = runCli(['bounds', 'examples/probe-ring.yaml', '--format', 'json', '--picture', file]);
    expect(r.code).toBe(0);
    const json = JSON.parse(r.stdout) as { partitions: { cut: RequirementDoc['cut'] }[] };
    const { page } = await open(file);
    const p = await readPanel(page, 0);
    expect(p.cuts).toEqual(json.partitions[0]!.cut.map((c) => ({ layer: String(c.layer), line: String(c.line), dim: String(c.dim), count: String(c.count) })));
    expect(p.cutNodes).toBe(2);
  });
});

describe("the job summary's flowcharts parse and render with the Mermaid library", () => {
  let page: Page;
  beforeAll(async () => {
    page = await context.newPage();
    await page.setContent('<!DOCTYPE html><html><body><div id="out"></div></body></html>');
    await page.addScriptTag({ path: join(REPO, 'node_modules', 'mermaid', 'dist', 'mermaid.min.js') });
    await page.evaluate(() => (globalThis as unknown as { mermaid: { initialize: (c: object) => void } }).mermaid.initialize({ startOnLoad: false, securityLevel: 'strict' }));
  });

  /** Parses and renders one chart; returns the rendered node labels. */
  async function render(chart: string, id: string): Promise<{ labels: string[]; scripts: number }> {
    return page.evaluate(
      async ({ chart, id }) => {
        const m = (globalThis as unknown as { mermaid: { parse: (t: string) => Promise<unknown>; render: (id: string, t: string) => Promise<{ svg: string }> } }).mermaid;
        await m.parse(chart);
        const { svg } = await m.render(id, chart);
        const out = (globalThis as unknown as { document: { getElementById(id: string): Dom & { innerHTML: string } } }).document.getElementById('out');
        out.innerHTML = svg;
        const labels = [...out.querySelectorAll('.node')].map((n) => (n.textContent ?? '').trim());
        return { labels, scripts: out.querySelectorAll('script').length };
      },
      { chart, id },
    );
  }

  test('the failing requirement of a shrinking pull request, under a hostile layer name', async () => {
    isolateThisProcess();
    const { dir, base } = hostilePullRequest();
    const outcome = runCheck({ cwd: dir, policy: 'policies', configs: [], base, changed: true });
    const summary = renderJobSummary(outcome, 'fail', []);
    const charts = [...summary.matchAll(/```mermaid\n((?:[^\n]*\n)*?)```\n/g)].map((m) => m[1]!);
    expect(charts).toHaveLength(1);
    const { labels, scripts } = await render(charts[0]!, 'summary');
    expect(scripts).toBe(0);
    // The hostile name is shown as text, whole; the cut, the fix and the change are written in.
    const cutNode = labels.find((l) => l.includes('✂ CUT 1 bond × dim 16'))!;
    // (Mermaid turns the line breaks of a label into breaks of its own: compared without white space.)
    expect(cutNode.replace(/\s+/g, '')).toContain(`${HOSTILE}:conv3×3`.replace(/\s+/g, ''));
    expect(cutNode).toContain('FIX channels 16 → 64');
    expect(cutNode).toContain('CHANGED channels 256 → 16');
    await page.locator('#out').screenshot({ path: join(OUT, 'summary-flowchart.png') });
  });

  test('flowcharts of the example architectures with branches, residual blocks, skips and a sequence', async () => {
    // The architecture's place in each file (see the file's header).
    const corpus: Record<string, string> = {
      'inception-wildlife.yaml': '/pipeline/stages/1/network',
      'resnet18-shelf-products.yaml': '/experiment/model',
      'unet-nuclei-segmentation.yaml': '/model',
      'tcn-fall-detection.yaml': '/model',
    };
    for (const [name, modelPath] of Object.entries(corpus)) {
      const loaded = loadConfigFile(join(REPO, 'examples', 'architectures', name), { modelPath });
      if (!loaded.ok || loaded.model.kind !== 'layered') throw new Error(`${name} does not load as a layered model`);
      // A cut on the input legs and on the last merge (or the last layer): marks on both ends of the chart.
      const layers = loaded.model.layers;
      const last = [...layers].reverse().find((l) => l.kind === 'merge') ?? layers.at(-1)!;
      const cut = [
        { layer: 'input', line: loaded.model.input.span.line, dim: 3, count: 2 },
        { layer: last.name ?? last.index, line: last.span.line, dim: 8, count: 1 },
      ];
      const drawing = drawNetwork(loaded.model);
      const marks = panelMarks({ cut, fixes: [], changes: [] }, drawing);
      expect(marks.unplaced, name).toEqual([]);
      const chart = requirementFlowchart(drawing, marks.placed);
      expect(chart, name).toBeDefined();
      const { labels } = await render(chart!, name.replace(/\W/g, '-'));
      expect(labels.filter((l) => l.includes('✂ CUT')), name).toHaveLength(2);
    }
  });
});

test('the README screenshot is the committed image of the same report', () => {
  // The script that makes it (scripts/picture-screenshot.mjs) uses this same browser set-up.
  const png = readFileSync(join(REPO, 'docs', 'picture-report.png'));
  expect(png.subarray(1, 4).toString('latin1')).toBe('PNG');
  expect(png.length).toBeLessThan(250_000);
});
