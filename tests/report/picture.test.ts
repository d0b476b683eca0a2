/**
 * The pieces of the picture report and of the summary's flowcharts, without a browser: what the
 * drawing folds and how it names nodes, the bar scale, the partition cells, the flowchart's
 * compaction and escaping, and the page's budget and determinism. The rules are derived here
 * (see the header of each module); the browser test (tests/e2e/picture-browser.test.ts) checks
 * the rendered result against the JSON report.
 */
import { describe, expect, test } from 'vitest';
import { INPUT, type LayeredModel } from '../../src/config/model.js';
import { NO_SPAN } from '../../src/diagnostic.js';
import { computeBounds } from '../../src/cut/bounds.js';
import { resolvePartition } from '../../src/partition/partition.js';
import { MAX_DRAWN_NODES, tooLargeText } from '../../src/report/architecture-svg.js';
import { axisFor, boundText, capacityBarsSvg, type BarRow } from '../../src/report/capacity-bars-svg.js';
import { mermaidText, MAX_FLOWCHART_NODES, requirementFlowchart } from '../../src/report/mermaid-flowchart.js';
import { drawNetwork, placeOf } from '../../src/report/network-drawing.js';
import { partitionCells } from '../../src/report/partition-svg.js';
import { boundsPicture, MAX_DRAWN_PANELS } from '../../src/report/picture-html.js';
import { panelMarks } from '../../src/report/picture-panels.js';
import { layered } from '../helpers/models.js';

/** conv → bn → relu, a residual block whose shortcut reads the relu, then a head. */
function residualNet(): LayeredModel {
  return layered([8, 8], 4, [
    { kind: 'conv', channels: 4, name: 'stem' },
    { kind: 'pointwise', op: 'batch_norm', family: 'normalisation' },
    { kind: 'pointwise', op: 'relu' },
    { kind: 'conv', channels: 4 },
    { kind: 'pointwise', op: 'relu' },
    { kind: 'merge', mode: 'sum', origin: 'residual', inputs: [4, 2] },
    { kind: 'pool', global: true },
    { kind: 'dense', units: 2 },
  ]);
}

describe('the drawing of a model', () => {
  test('pointwise layers fold into the one layer they follow, unless another layer also reads it', () => {
    const d = drawNetwork(residualNet());
    // bn and the first relu fold into the stem; the second relu folds into layer 3; the relu at 2
    // is read by layer 3 and the merge, but it follows bn (read once), so it folds too.
    expect(d.nodes.map((n) => n.id)).toEqual(['input', 'l0', 'l3', 'l5', 'l6', 'l7', 'head']);
    expect(d.folded).toBe(3);
    expect(d.nodes[1]!.title).toBe('stem: conv 1×1');
    expect(d.nodes[1]!.details).toEqual(['width 4, grid 8×8', 'line 5', '+ batch_norm, relu']);
    expect(d.nodes[1]!.labels).toEqual(['stem', 1, 2]);
    expect(d.nodes[3]!.title).toBe('layer 5: sum (residual)');
    expect(d.edges.map((e) => `${e.from}>${e.to}:${e.kind}`)).toEqual([
      'input>l0:main',
      'l0>l3:main',
      'l3>l5:main',
      'l0>l5:shortcut',
      'l5>l6:main',
      'l6>l7:main',
      'l7>head:main',
    ]);
  });

  test('a pointwise layer on a layer that two layers read keeps its own node', () => {
    const d = drawNetwork(
      layered([8], 2, [
        { kind: 'conv', channels: 2 },
        { kind: 'pointwise', op: 'relu' },
        { kind: 'merge', mode: 'sum', origin: 'skip', inputs: [1, 0] },
        { kind: 'dense', units: 1 },
      ]),
    );
    expect(d.nodes.map((n) => n.id)).toEqual(['input', 'l0', 'l1', 'l2', 'l3', 'head']);
    expect(d.edges.filter((e) => e.kind === 'skip').map((e) => `${e.from}>${e.to}`)).toEqual(['l0>l2']);
  });

  test('report labels find their node: a layer name or index, a folded layer, input and head', () => {
    const d = drawNetwork(residualNet());
    expect(placeOf(d, 'stem')).toEqual({ node: 'l0' });
    expect(placeOf(d, 2)).toEqual({ node: 'l0' });
    expect(placeOf(d, 4)).toEqual({ node: 'l3' });
    expect(placeOf(d, 'input')).toEqual({ node: 'input' });
    expect(placeOf(d, 'head')).toEqual({ node: 'head' });
    expect(placeOf(d, 99)).toBeUndefined();
  });

  test('an explicit network: legs by the tensor line, a bond by its label and line, a hyperedge as a copy node', () => {
    const d = drawNetwork({
      kind: 'explicit',
      file: 'x.yaml',
      shape: [3],
      span: { ...NO_SPAN, line: 1 },
      tensors: ['a', 'b', 'c'].map((name, i) => ({ name, legs: [{ position: i, dim: 2, span: { ...NO_SPAN, line: 5 + i } }], span: { ...NO_SPAN, line: 5 + i } })),
      bonds: [
        { tensors: ['a', 'b'], dim: 3, span: { ...NO_SPAN, line: 9 } },
        { tensors: ['a', 'b', 'c'], dim: 2, span: { ...NO_SPAN, line: 10 } },
      ],
    });
    expect(placeOf(d, 'legs', 6)).toEqual({ node: 't1' });
    expect(placeOf(d, 'bond a-b', 9)).toEqual({ edge: 'e3' });
    expect(placeOf(d, 'bond a-b-c', 10)).toEqual({ node: 'c1' });
  });
});

describe('capacity bars', () => {
  const row = (series: BarRow['series'], rank: string | null, log2: number): BarRow => ({ series, label: series, value: { rank, log2 } });

  test('values are written as the JSON writes them', () => {
    expect(boundText({ rank: '16', log2: 4 })).toBe('4 bits (rank 16)');
    expect(boundText({ rank: '1011906062395630234792893870709438946804040962424220190795225810283755312774622445245240748203000', log2: 318.922172 })).toBe(
      '318.922172 bits (97 digits)',
    );
    expect(boundText({ rank: null, log2: 14429115.165997 })).toBe('14429115.165997 bits (more than 2^4,000,000)');
  });

  test('the scale keeps the requirement and the proven bounds readable; a far longer bar is broken', () => {
    // Required 6, lower 4, upper 4: everything on a scale of 0-6 in steps of 2.
    expect(axisFor([row('required', '64', 6), row('head-lower', '16', 4), row('head-upper', '16', 4)])).toEqual({ max: 6, step: 2 });
    // Required 4.58, lower 4.58, upper 26443: the upper bar is more than 4 times the anchor and broken.
    const gait = [row('required', '24', 4.584963), row('head-lower', '24', 4.584963), row('head-upper', '9'.repeat(7961), 26442.994341)];
    expect(axisFor(gait)).toEqual({ max: 6, step: 2 });
    const svg = capacityBarsSvg(gait, 't', 'b');
    expect(svg.match(/class="bar bar-head-upper bar-broken"/g)).toHaveLength(1);
    expect(svg).toContain('26442.994341 bits (7961 digits), beyond the axis');
    // A huge upper bound never sets the scale.
    expect(axisFor([row('head-lower', '64', 6), row('head-upper', null, 5_000_000)])).toEqual({ max: 6, step: 2 });
  });

  test('an upper-only bound says so in place of the lower bar', () => {
    const svg = capacityBarsSvg([{ series: 'head-lower', label: 'lower', value: null, missing: 'none proven (upper-only)' }, row('head-upper', '8', 3)], 't', 'b');
    expect(svg).toContain('<g class="bar-row" data-series="head-lower" data-log2="null" data-rank="null"><text class="row-label" x="76" y="46" text-anchor="end">lower</text><text class="bar-missing"');
    expect(svg).toContain('>none proven (upper-only)</text>');
    expect(svg.match(/<rect class="bar /g)).toHaveLength(1);
  });
});

describe('partition cells', () => {
  const side = (spec: string, shape: number[]): Uint8Array => {
    const r = resolvePartition(spec, shape);
    if (!r.ok) throw new Error(r.message);
    return r.partition.side;
  };

  test('a small grid: one cell per position', () => {
    const c = partitionCells([4, 6], side('left-right', [4, 6]));
    expect([c.rows, c.cols, c.block]).toEqual([4, 6, 1]);
    expect([...c.cells.slice(0, 6)]).toEqual([0, 0, 0, 1, 1, 1]);
  });

  test('a large grid in blocks: a block that holds both sides is mixed, never given a side', () => {
    const c = partitionCells([130, 130], side('left-right', [130, 130]));
    // ⌈130 / 64⌉ = 3 positions per block; columns 0-64 are side A, so block 21 (columns 63-65) is mixed.
    expect([c.rows, c.cols, c.block]).toEqual([44, 44, 3]);
    expect([c.cells[20], c.cells[21], c.cells[22]]).toEqual([0, 2, 1]);
    const checker = partitionCells([224, 224], side('checkerboard', [224, 224]));
    expect(new Set(checker.cells)).toEqual(new Set([2]));
  });

  test('a sequence: one row up to 128 steps, then rows of 64, then blocks beyond 4,096 steps', () => {
    const short = partitionCells([100], side('start-end', [100]));
    expect([short.rows, short.cols, short.block, short.wrapped]).toEqual([1, 100, 1, false]);
    const c = partitionCells([256], side('interleaved', [256]));
    expect([c.rows, c.cols, c.block, c.wrapped]).toEqual([4, 64, 1, true]);
    expect([...c.cells.slice(0, 4)]).toEqual([0, 1, 0, 1]);
    const long = partitionCells([10_000], side('start-end', [10_000]));
    // 3 steps a cell: 3,334 cells in rows of 64; the cell of steps 4,998-5,000 holds both sides.
    expect([long.rows, long.cols, long.block]).toEqual([53, 64, 3]);
    expect([long.cells[1665], long.cells[1666], long.cells[1667]]).toEqual([0, 2, 1]);
    expect(long.cells[53 * 64 - 1]).toBe(3);
  });
});

describe('the flowchart', () => {
  test('labels: anything outside a small set becomes an entity code', () => {
    expect(mermaidText('layer 8: conv 3×3')).toBe('layer 8: conv 3×3');
    expect(mermaidText('a"b`c\nd<e>#f;|g{h}&')).toBe('a#34;b#96;c#10;d#60;e#62;#35;f#59;#124;g#123;h#125;#38;');
    expect(mermaidText('🙂')).toBe('#128578;');
  });

  test('a chain of more than 12 nodes keeps input, head and the marked layer; runs between them become one node', () => {
    const model = layered([8], 2, [
      ...Array.from({ length: 12 }, () => ({ kind: 'conv' as const, channels: 2 })),
      { kind: 'dense', units: 1 },
    ]);
    const d = drawNetwork(model);
    const marks = panelMarks({ cut: [{ layer: 5, line: 10, dim: 2, count: 1 }], fixes: [], changes: [] }, d).placed;
    // (The style definitions that follow the edges are the same in every chart.)
    const statements = requirementFlowchart(d, marks)!.split('\n').filter((l) => !l.includes('classDef'));
    expect(statements).toEqual([
      'flowchart TB',
      '  n0(["input 8<br>8 positions, M = 2 · line 2"])',
      '  n1["layer 5: conv 1<br>width 2, grid 8 · line 10<br>✂ CUT 1 bond × dim 2"]',
      '  n2(["head: the analysed score<br>at position 4"])',
      '  n3["⋯ 5 layers, lines 5–9"]',
      '  n4["⋯ 7 layers, lines 11–17"]',
      '  n0 --> n3',
      '  n3 --> n1',
      '  n1 --> n4',
      '  n4 --> n2',
      '  class n1 cut',
      '  class n3,n4 run',
      '',
    ]);
  });

  test('a residual net keeps its merge and the shortcut, dotted and named', () => {
    const body = Array.from({ length: 6 }, () => ({ kind: 'conv' as const, channels: 4 }));
    const model = layered([8, 8], 4, [...body, { kind: 'merge', mode: 'sum', origin: 'residual', inputs: [5, 0] }, { kind: 'pool', global: true }, { kind: 'dense', units: 2 }]);
    const chart = requirementFlowchart(drawNetwork(model), [])!;
    expect(chart).toContain(' -.->|"shortcut"| ');
    expect(chart).toContain('{{"layer 6: sum (residual)<br>');
  });

  test('too many marked layers to draw compactly: no chart', () => {
    const model = layered([8], 2, [...Array.from({ length: 100 }, () => ({ kind: 'conv' as const, channels: 2 })), { kind: 'dense', units: 1 }]);
    const d = drawNetwork(model);
    const cut = Array.from({ length: MAX_FLOWCHART_NODES }, (_, i) => ({ layer: i, line: i + 5, dim: 2, count: 1 }));
    expect(requirementFlowchart(d, panelMarks({ cut, fixes: [], changes: [] }, d).placed)).toBeUndefined();
  });
});

describe('the page', () => {
  test('too many nodes to lay out: a sentence instead of a drawing, the cut listed in words', () => {
    const model = layered([8], 2, [...Array.from({ length: MAX_DRAWN_NODES }, () => ({ kind: 'conv' as const, channels: 2 })), { kind: 'dense', units: 1 }]);
    expect(tooLargeText(drawNetwork(model))).toBe(`The network has ${MAX_DRAWN_NODES + 3} nodes after folding pointwise layers, more than the ${MAX_DRAWN_NODES} this picture draws.`);
    const p = resolvePartition('start-end', [8]);
    if (!p.ok) throw new Error(p.message);
    const bounds = computeBounds(model, [p.partition], { surrogate: 'tree' });
    if (!bounds.ok) throw new Error('no bounds');
    const html = boundsPicture(bounds.result, model, [p.partition]);
    expect(html).not.toContain('<svg class="architecture"');
    expect(html).toContain(`<p class="too-large">The network has ${MAX_DRAWN_NODES + 3} nodes`);
    const cut = bounds.result.partitions[0]!.upper.cut;
    expect(html.match(/<li class="cut-mark"/g)).toHaveLength(cut.length);
  });

  test('at most MAX_DRAWN_PANELS panels drawn, every requirement in the table; the same bytes twice; nothing to fetch', () => {
    const model = residualNet();
    const partitions = Array.from({ length: MAX_DRAWN_PANELS + 2 }, (_, i) => {
      const r = resolvePartition(`positions:${i % 64}`, [8, 8]);
      if (!r.ok) throw new Error(r.message);
      return r.partition;
    });
    const bounds = computeBounds(model, partitions, { surrogate: 'tree' });
    if (!bounds.ok) throw new Error('no bounds');
    const html = boundsPicture(bounds.result, model, partitions);
    expect(html.match(/<section class="panel /g)).toHaveLength(MAX_DRAWN_PANELS);
    expect(html.match(/<tr class="state-/g)).toHaveLength(MAX_DRAWN_PANELS + 2);
    expect(html).toContain(`<p class="note">The first ${MAX_DRAWN_PANELS} of ${MAX_DRAWN_PANELS + 2} requirements are drawn below;`);
    expect(boundsPicture(bounds.result, model, partitions)).toBe(html);
    expect(html).not.toMatch(/<script|<link|<img|<iframe|<object|<embed|\ssrc=|\shref="(?!#)/);
    expect(html.match(/url\((?!#rf-)/g)).toBeNull();
    expect(html).toContain(`content="default-src 'none'; style-src 'unsafe-inline'; img-src data:"`);
    expect(INPUT).toBe(-1);
  });

  test('names from the file are text, in content and attributes', () => {
    const model = { ...residualNet(), file: 'models/<b>"x"&.yaml' };
    const p = resolvePartition('left-right', [8, 8]);
    if (!p.ok) throw new Error(p.message);
    const bounds = computeBounds(model, [p.partition], { surrogate: 'tree' });
    if (!bounds.ok) throw new Error('no bounds');
    const html = boundsPicture(bounds.result, model, [p.partition]);
    expect(html).toContain('data-file="models/&lt;b&gt;&quot;x&quot;&amp;.yaml"');
    expect(html).not.toContain('<b>');
  });
});
