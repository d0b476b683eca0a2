/**
 * Model → tensor network of the chosen surrogate (see DEVELOPERS.md for the exact functions).
 * This is where shapes are followed layer by layer, so this is also where a model whose windows
 * do not tile its grid, or whose head comes too early, is rejected with the span of the layer.
 */
import type { Diagnostic, Span } from '../diagnostic.js';
import type { ConvLayer, Layer, LayeredModel } from '../config/model.js';
import { layerLabel, positionCount } from '../config/model.js';
import type { Surrogate } from '../cut/types.js';
import {
  CircuitBuilder,
  NetworkTooLarge,
  OP_CONST,
  OP_INPUT,
  OP_LINEAR,
  OP_PRODUCT,
  OP_SUM,
  type Circuit,
} from './circuit.js';

/** Largest network (in nodes) that rankfloor builds; child links may be four times as many. */
export const NODE_LIMIT = 4_000_000;

export interface BuildOptions {
  readonly surrogate: Surrogate;
  readonly nodeLimit?: number;
}

export type BuildResult =
  | { ok: true; circuit: Circuit; notes: string[] }
  | { ok: false; diagnostics: Diagnostic[] };

interface Grid {
  shape: number[];
  nodes: number[];
  dim: number;
}

export function buildCircuit(model: LayeredModel, options: BuildOptions): BuildResult {
  const limit = options.nodeLimit ?? NODE_LIMIT;
  const fail = (span: Span, code: string, message: string): BuildResult => ({
    ok: false,
    diagnostics: [{ code, message, file: model.file, span, severity: 'error' }],
  });
  const positions = positionCount(model.input.shape);
  if (positions > limit) {
    return fail(
      model.input.fieldSpans['shape'] ?? model.input.span,
      'network/too-large',
      `the input has ${positions} positions; rankfloor builds networks of at most ${limit} nodes`,
    );
  }
  const notes = new Set<string>();
  const b = new CircuitBuilder(positions, limit);
  try {
    const inputTag = b.addTag({ label: 'input', line: model.input.span.line, span: model.input.span, layerIndex: -1 });
    const grid: Grid = { shape: [...model.input.shape], nodes: [], dim: model.input.features };
    for (let p = 0; p < positions; p++) grid.nodes.push(b.add(OP_INPUT, grid.dim, inputTag, [], p));

    for (const layer of model.layers) {
      const tag = b.addTag({ label: layerLabel(layer), line: layer.span.line, span: layer.span, layerIndex: layer.index });
      const problem = applyLayer(b, grid, layer, tag, options.surrogate, notes);
      if (problem) return fail(problem.span, problem.code, problem.message);
    }
    if (grid.nodes.length > 1) {
      const last = model.layers[model.layers.length - 1]!;
      notes.add(
        `the ${grid.nodes.length} positions left after the last layer are joined by a global product pool before the head`,
      );
      const tag = b.addTag({ label: layerLabel(last), line: last.span.line, span: last.span, layerIndex: last.index });
      grid.nodes = [b.add(OP_PRODUCT, grid.dim, tag, grid.nodes)];
    }
    return { ok: true, circuit: b.finish(grid.nodes[0]!), notes: [...notes] };
  } catch (e) {
    if (e instanceof NetworkTooLarge) {
      return fail(
        model.input.fieldSpans['shape'] ?? model.input.span,
        'network/too-large',
        `this model's tensor network would exceed ${limit} nodes or ${limit * 4} links; analyse a smaller input shape`,
      );
    }
    throw e;
  }
}

interface Problem {
  span: Span;
  code: string;
  message: string;
}

function applyLayer(
  b: CircuitBuilder,
  grid: Grid,
  layer: Layer,
  tag: number,
  surrogate: Surrogate,
  notes: Set<string>,
): Problem | undefined {
  const where = `layer ${layerLabel(layer)} (line ${layer.span.line})`;
  switch (layer.kind) {
    case 'conv': {
      if (layer.stride.length !== grid.shape.length || layer.kernel.length !== grid.shape.length) {
        return { span: layer.span, code: 'network/rank-mismatch', message: `${where}: kernel and stride need one entry per input dimension` };
      }
      if (surrogate === 'overlap') return convOverlap(b, grid, layer, tag);
      if (layer.kernel.some((k, i) => k > (layer.stride[i] as number))) {
        notes.add('the tree surrogate uses each convolution as a per-position map: kernels wider than their stride are not used by the bound');
      }
      grid.nodes = grid.nodes.map((v) => b.add(OP_LINEAR, layer.channels, tag, [v]));
      grid.dim = layer.channels;
      if (layer.stride.some((s) => s > 1)) {
        return productWindows(b, grid, layer.stride, tag, layer.fieldSpans['stride'] ?? layer.span, `${where}: stride`);
      }
      return undefined;
    }
    case 'pool': {
      const window = layer.global ? [...grid.shape] : [...layer.window];
      if (window.length !== grid.shape.length) {
        return { span: layer.fieldSpans['window'] ?? layer.span, code: 'network/rank-mismatch', message: `${where}: the window needs one entry per input dimension` };
      }
      return productWindows(b, grid, window, tag, layer.fieldSpans['window'] ?? layer.span, `${where}: window`);
    }
    case 'dense': {
      if (grid.nodes.length !== 1) {
        return {
          span: layer.span,
          code: 'network/dense-too-early',
          message: `${where}: dense needs a single remaining position, but the grid is [${grid.shape.join(', ')}] here; add 'pool: {global: true}' before it`,
        };
      }
      // One class score is a linear functional of the last state whatever the head's widths
      // (w^T W_k … W_1 is an arbitrary vector), so dense layers are part of the head vector.
      notes.add('dense layers come after the last pooling, so they are part of the head: one class score is a linear functional of the last state');
      return undefined;
    }
    case 'recurrent': {
      if (grid.shape.length !== 1) {
        return {
          span: layer.span,
          code: 'network/recurrent-needs-sequence',
          message: `${where}: a recurrent layer needs a 1D sequence, but the grid is [${grid.shape.join(', ')}] here`,
        };
      }
      let below = grid.nodes;
      for (let l = 0; l < layer.depth; l++) {
        let prev = b.add(OP_CONST, layer.hidden, tag, []);
        const states: number[] = [];
        for (const x of below) {
          const carried = b.add(OP_LINEAR, layer.hidden, tag, [prev]);
          const fed = b.add(OP_LINEAR, layer.hidden, tag, [x]);
          prev = b.add(OP_PRODUCT, layer.hidden, tag, [carried, fed]);
          states.push(prev);
        }
        below = states;
      }
      grid.nodes = [below[below.length - 1]!];
      grid.shape = [1];
      grid.dim = layer.hidden;
      return undefined;
    }
  }
}

/** Non-overlapping product windows (δ tensors); the window must tile the grid exactly. */
function productWindows(b: CircuitBuilder, grid: Grid, window: readonly number[], tag: number, span: Span, what: string): Problem | undefined {
  if (window.some((w, i) => (grid.shape[i] as number) % w !== 0)) {
    return {
      span,
      code: 'network/window-does-not-tile',
      message: `${what} [${window.join(', ')}] does not tile the grid [${grid.shape.join(', ')}] that reaches it; use a window that divides every side`,
    };
  }
  if (window.every((w) => w === 1)) return undefined;
  const out = grid.shape.map((n, i) => n / (window[i] as number));
  const nodes: number[] = [];
  if (grid.shape.length === 1) {
    const w = window[0]!;
    for (let j = 0; j < out[0]!; j++) nodes.push(b.add(OP_PRODUCT, grid.dim, tag, grid.nodes.slice(j * w, j * w + w)));
  } else {
    const [wh, ww] = [window[0]!, window[1]!];
    const width = grid.shape[1]!;
    for (let i = 0; i < out[0]!; i++) {
      for (let j = 0; j < out[1]!; j++) {
        const children: number[] = [];
        for (let a = 0; a < wh; a++) for (let c = 0; c < ww; c++) children.push(grid.nodes[(i * wh + a) * width + j * ww + c]!);
        nodes.push(b.add(OP_PRODUCT, grid.dim, tag, children));
      }
    }
  }
  grid.nodes = nodes;
  grid.shape = out;
  return undefined;
}

interface AxisPlan {
  out: number;
  left: number;
}

/** Output length and left padding along one axis, as DEVELOPERS.md defines them. */
function axisPlan(n: number, k: number, s: number, padding: 'same' | 'valid'): AxisPlan | undefined {
  if (padding === 'valid') {
    if (n < k) return undefined;
    return { out: Math.floor((n - k) / s) + 1, left: 0 };
  }
  const out = Math.ceil(n / s);
  const total = Math.max((out - 1) * s + k - n, 0);
  return { out, left: Math.floor(total / 2) };
}

function convOverlap(b: CircuitBuilder, grid: Grid, layer: ConvLayer, tag: number): Problem | undefined {
  const plans = grid.shape.map((n, i) => axisPlan(n, layer.kernel[i]!, layer.stride[i]!, layer.padding));
  if (plans.some((p) => p === undefined)) {
    return {
      span: layer.fieldSpans['kernel'] ?? layer.span,
      code: 'network/kernel-too-large',
      message: `layer ${layerLabel(layer)} (line ${layer.span.line}): kernel [${layer.kernel.join(', ')}] with valid padding is larger than the grid [${grid.shape.join(', ')}] that reaches it`,
    };
  }
  const p = plans as AxisPlan[];
  const nodes: number[] = [];
  const taps = (axis: number, j: number): number[] => {
    // Only the taps that land inside the grid: a kernel may be far wider than the grid.
    const res: number[] = [];
    const from = j * layer.stride[axis]! - p[axis]!.left;
    const first = Math.max(0, from);
    const end = Math.min(grid.shape[axis]!, from + layer.kernel[axis]!);
    for (let at = first; at < end; at++) res.push(at);
    return res;
  };
  if (grid.shape.length === 1) {
    for (let j = 0; j < p[0]!.out; j++) {
      nodes.push(b.add(OP_SUM, layer.channels, tag, taps(0, j).map((at) => grid.nodes[at]!)));
    }
  } else {
    const width = grid.shape[1]!;
    for (let i = 0; i < p[0]!.out; i++) {
      const rows = taps(0, i);
      for (let j = 0; j < p[1]!.out; j++) {
        const cols = taps(1, j);
        const children: number[] = [];
        for (const r of rows) for (const c of cols) children.push(grid.nodes[r * width + c]!);
        nodes.push(b.add(OP_SUM, layer.channels, tag, children));
      }
    }
  }
  grid.nodes = nodes;
  grid.shape = p.map((a) => a.out);
  grid.dim = layer.channels;
  return undefined;
}
