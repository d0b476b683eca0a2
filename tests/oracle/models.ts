/**
 * Terse builders for Model literals, so that oracle tests and reference tests can write a network
 * in one line (`layered([8], 3, false, [conv(3), pool([2]), ...])`) instead of spelling out spans,
 * paths, indices and inputs. They build the normalised model directly, without the config loader,
 * so the tests exercise the bound engine and the oracle on exactly the model they describe.
 *
 * A list of items is a chain (each layer reads the one before); blocks (`residual`, `branches`,
 * `skip`) expand into their layers and a merge with the right `inputs`, as the loader does.
 */
import { NO_SPAN } from '../../src/diagnostic.js';
import {
  INPUT,
  type AttentionLayer,
  type ClassTokenLayer,
  type ConvLayer,
  type ConvTransposeLayer,
  type DenseLayer,
  type EmbeddingLayer,
  type ExplicitBond,
  type ExplicitModel,
  type ExplicitTensor,
  type FlattenLayer,
  type Layer,
  type LayeredModel,
  type MergeLayer,
  type Padding,
  type PointwiseFamily,
  type PointwiseLayer,
  type PoolLayer,
  type PositionLayer,
  type PoolMode,
  type RecurrentLayer,
  type Shape,
  type UpsampleLayer,
} from '../../src/config/model.js';
import type { Partition } from '../../src/partition/partition.js';
import { resolvePartition } from '../../src/partition/partition.js';

type Draft<T> = T extends unknown ? Omit<T, 'index' | 'path' | 'inputs'> & { readonly inputs?: readonly number[] } : never;
/** A layer before it is placed: `inputs` absent means "the previous item". */
export type LayerDraft = Draft<Layer>;

/** A block: expands into layers after `entry` and returns the index of its last layer. */
export interface Block {
  readonly block: (g: GraphBuilder, entry: number) => number;
}

export type Item = LayerDraft | Block;

const base = { span: NO_SPAN, fieldSpans: {} } as const;

/** `same`, `valid`, `causal`, or explicit zeros per axis. */
export type PaddingSpec = 'same' | 'valid' | 'causal' | readonly number[];

export function padding(p: PaddingSpec): Padding {
  return typeof p === 'string' ? { mode: p } : { mode: 'explicit', amount: p };
}

const fill = (dims: number, v: number): number[] => new Array<number>(dims).fill(v);

export interface ConvOptions {
  readonly kernel?: readonly number[];
  readonly stride?: readonly number[];
  readonly dilation?: readonly number[];
  readonly padding?: PaddingSpec;
  readonly groups?: number | 'depthwise';
  readonly depthMultiplier?: number;
  /** Grid axes when no per-axis field says (default 1). */
  readonly dims?: number;
  readonly name?: string;
}

function axesOf(opts: { dims?: number; kernel?: readonly number[]; stride?: readonly number[]; dilation?: readonly number[] }, pad?: PaddingSpec): number {
  return opts.dims ?? opts.kernel?.length ?? opts.stride?.length ?? opts.dilation?.length ?? (typeof pad === 'object' ? pad.length : 1);
}

export function conv(channels: number | undefined, opts: ConvOptions = {}): Draft<ConvLayer> {
  const dims = axesOf(opts, opts.padding);
  return {
    ...base,
    ...(opts.name !== undefined ? { name: opts.name } : {}),
    kind: 'conv',
    ...(channels !== undefined ? { channels } : {}),
    kernel: opts.kernel ?? fill(dims, 1),
    stride: opts.stride ?? fill(dims, 1),
    dilation: opts.dilation ?? fill(dims, 1),
    padding: padding(opts.padding ?? 'same'),
    groups: opts.groups ?? 1,
    depthMultiplier: opts.depthMultiplier ?? 1,
  };
}

/** A depthwise conv: one group per input channel; channels = input width × multiplier unless given. */
export function depthwise(opts: Omit<ConvOptions, 'groups'> & { channels?: number } = {}): Draft<ConvLayer> {
  return conv(opts.channels, { ...opts, groups: 'depthwise' });
}

export interface ConvTransposeOptions {
  readonly kernel?: readonly number[];
  readonly stride?: readonly number[];
  readonly dilation?: readonly number[];
  readonly padding?: readonly number[];
  readonly outputPadding?: readonly number[];
  readonly groups?: number;
  readonly dims?: number;
  readonly name?: string;
}

export function convTranspose(channels: number, opts: ConvTransposeOptions = {}): Draft<ConvTransposeLayer> {
  const dims = opts.dims ?? opts.kernel?.length ?? opts.stride?.length ?? opts.dilation?.length ?? opts.padding?.length ?? 1;
  return {
    ...base,
    ...(opts.name !== undefined ? { name: opts.name } : {}),
    kind: 'conv-transpose',
    channels,
    kernel: opts.kernel ?? fill(dims, 1),
    stride: opts.stride ?? fill(dims, 1),
    dilation: opts.dilation ?? fill(dims, 1),
    padding: opts.padding ?? fill(dims, 0),
    outputPadding: opts.outputPadding ?? fill(dims, 0),
    groups: opts.groups ?? 1,
  };
}

export function pool(window: readonly number[], opts: { stride?: readonly number[]; padding?: PaddingSpec; mode?: PoolMode } = {}): Draft<PoolLayer> {
  return {
    ...base,
    kind: 'pool',
    mode: opts.mode ?? 'product',
    window,
    stride: opts.stride ?? window,
    padding: padding(opts.padding ?? 'valid'),
    global: false,
  };
}

export function globalPool(mode: PoolMode = 'product'): Draft<PoolLayer> {
  return { ...base, kind: 'pool', mode, window: [], stride: [], padding: { mode: 'valid' }, global: true };
}

export function upsample(factor: readonly number[], mode: 'nearest' | 'linear' = 'nearest'): Draft<UpsampleLayer> {
  return { ...base, kind: 'upsample', factor, mode };
}

export function flatten(): Draft<FlattenLayer> {
  return { ...base, kind: 'flatten' };
}

export function dense(units: number): Draft<DenseLayer> {
  return { ...base, kind: 'dense', units };
}

export interface RecurrentOptions {
  readonly cell?: RecurrentLayer['cell'];
  readonly bidirectional?: boolean;
  readonly merge?: RecurrentLayer['merge'];
  /** One output per step (true) or the final state only (false, this builder's default). */
  readonly sequence?: boolean;
}

/**
 * A recurrent layer. This builder's default is the final state only (`sequence: false`), the
 * reading every earlier oracle test was written for; the config's default (per-step outputs) is
 * asked for with `{ sequence: true }`. Unidirectional, joined by `concat` when bidirectional.
 */
export function recurrent(hidden: number, depth: number, opts: RecurrentOptions = {}): Draft<RecurrentLayer> {
  return {
    ...base,
    kind: 'recurrent',
    hidden,
    depth,
    cell: opts.cell ?? 'arithmetic',
    bidirectional: opts.bidirectional ?? false,
    merge: opts.merge ?? 'concat',
    sequence: opts.sequence ?? false,
  };
}

/** A per-position linear map to `dim` (the token embedding on a token input). */
export function embedding(dim: number): Draft<EmbeddingLayer> {
  return { ...base, kind: 'embedding', dim };
}

/** One added vector per position (`fixed` is read as learned). */
export function positions(mode: PositionLayer['mode'] = 'learned'): Draft<PositionLayer> {
  return { ...base, kind: 'position', mode };
}

/** A learned vector prepended as position 0 of a 1D grid of N + 1 positions. */
export function classToken(): Draft<ClassTokenLayer> {
  return { ...base, kind: 'class-token' };
}

export interface AttentionOptions {
  /** Width of each head; absent: the input width divided by the heads. */
  readonly headDim?: number;
  readonly causal?: boolean;
  readonly window?: number;
}

/** Linearised self-attention with `heads` heads. */
export function attention(heads: number, opts: AttentionOptions = {}): Draft<AttentionLayer> {
  return {
    ...base,
    kind: 'attention',
    heads,
    ...(opts.headDim !== undefined ? { headDim: opts.headDim } : {}),
    causal: opts.causal ?? false,
    ...(opts.window !== undefined ? { window: opts.window } : {}),
  };
}

export function pointwise(family: PointwiseFamily, op: string): Draft<PointwiseLayer> {
  return { ...base, kind: 'pointwise', family, op };
}

export const act = (op = 'relu'): Draft<PointwiseLayer> => pointwise('activation', op);
export const norm = (op = 'batch_norm'): Draft<PointwiseLayer> => pointwise('normalisation', op);
export const dropout = (): Draft<PointwiseLayer> => pointwise('dropout', 'dropout');
export const scaling = (): Draft<PointwiseLayer> => pointwise('scaling', 'scale');

/** A merge with explicit inputs (absolute layer indices; INPUT for the model input). */
export function merge(mode: 'sum' | 'concat', inputs: readonly number[], origin: MergeLayer['origin'] = 'branches'): Draft<MergeLayer> {
  return { ...base, kind: 'merge', mode, origin, inputs };
}

/** Gives a layer a name, so that a later `skip` can read it. */
export function named<T extends LayerDraft>(name: string, draft: T): T {
  return { ...draft, name };
}

/** Places items into a layer list, chaining plain layers and expanding blocks. */
export class GraphBuilder {
  readonly layers: Layer[] = [];
  private readonly names = new Map<string, number>();

  add(draft: LayerDraft, inputs: readonly number[]): number {
    const index = this.layers.length;
    this.layers.push({ ...draft, inputs, index, path: `/model/layers/${index}` } as Layer);
    if (draft.name !== undefined) {
      if (this.names.has(draft.name)) throw new Error(`layer name ${draft.name} used twice`);
      this.names.set(draft.name, index);
    }
    return index;
  }

  /** Places a chain after `entry`; returns its last index (`entry` for an empty chain). */
  chain(items: readonly Item[], entry: number): number {
    let cur = entry;
    for (const it of items) cur = 'block' in it ? it.block(this, cur) : this.add(it, it.inputs ?? [cur]);
    return cur;
  }

  byName(name: string): number {
    const i = this.names.get(name);
    if (i === undefined) throw new Error(`no layer named ${name}`);
    return i;
  }
}

/** output = main(x) + shortcut(x); the shortcut is the identity when empty. */
export function residual(main: readonly Item[], shortcut: readonly Item[] = []): Block {
  return {
    block: (g, entry) => {
      const a = g.chain(main, entry);
      const b = g.chain(shortcut, entry);
      return g.add(merge('sum', [a, b], 'residual'), [a, b]);
    },
  };
}

/** Parallel paths from one grid, merged by sum or channel concatenation (an empty path: identity). */
export function branches(mode: 'sum' | 'concat', paths: readonly (readonly Item[])[]): Block {
  return {
    block: (g, entry) => {
      const ends = paths.map((p) => g.chain(p, entry));
      return g.add(merge(mode, ends, 'branches'), ends);
    },
  };
}

/** Merges the current grid with the output of the layer named `from` (current first). */
export function skip(mode: 'sum' | 'concat', from: string): Block {
  return {
    block: (g, entry) => {
      const ins = [entry, g.byName(from)];
      return g.add(merge(mode, ins, 'skip'), ins);
    },
  };
}

export interface LayeredOptions {
  /** The analysed output position (one index per axis of the last grid). */
  readonly output?: readonly number[];
  /** The data's raw channel count (reported only). */
  readonly channels?: number;
  /** A token input of this vocabulary: M = V, each position an indicator vector. */
  readonly vocabulary?: number;
}

/**
 * A layered model. `representation` is M when a number; undefined leaves it to the model's
 * default (the widest first map).
 */
export function layered(
  shape: Shape,
  representation: number | undefined,
  weightSharing: boolean,
  items: readonly Item[],
  opts: LayeredOptions = {},
): LayeredModel {
  const g = new GraphBuilder();
  g.chain(items, INPUT);
  return {
    kind: 'layered',
    file: 'oracle.yaml',
    input: {
      shape,
      ...(representation !== undefined ? { representation } : {}),
      ...(opts.channels !== undefined ? { channels: opts.channels } : {}),
      ...(opts.vocabulary !== undefined ? { vocabulary: opts.vocabulary } : {}),
      span: NO_SPAN,
      fieldSpans: {},
    },
    weightSharing,
    layers: g.layers,
    output: opts.output !== undefined ? { position: opts.output } : {},
    span: NO_SPAN,
  };
}

/** The same model with another analysed output position. */
export function withOutput(model: LayeredModel, position: readonly number[]): LayeredModel {
  return { ...model, output: { position } };
}

export interface TensorDraft {
  readonly name: string;
  /** [position, dim] per open leg. */
  readonly legs: readonly (readonly [number, number])[];
}

export interface BondDraft {
  readonly tensors: readonly string[];
  readonly dim: number;
}

export function explicit(shape: Shape, tensors: readonly TensorDraft[], bonds: readonly BondDraft[]): ExplicitModel {
  const ts: ExplicitTensor[] = tensors.map((t) => ({
    name: t.name,
    legs: t.legs.map(([position, dim]) => ({ position, dim, span: NO_SPAN })),
    span: NO_SPAN,
  }));
  const bs: ExplicitBond[] = bonds.map((b) => ({ tensors: b.tensors, dim: b.dim, span: NO_SPAN }));
  return { kind: 'explicit', file: 'oracle.yaml', shape, tensors: ts, bonds: bs, span: NO_SPAN };
}

/** A built-in or `positions:` partition; throws when the spec does not fit (a test bug). */
export function partition(spec: string, shape: Shape): Partition {
  const r = resolvePartition(spec, shape);
  if (!r.ok) throw new Error(`bad partition ${spec} for [${shape.join(',')}]: ${r.message}`);
  return r.partition;
}

/** A partition from a side-A mask (1 = side A). */
export function maskPartition(side: Uint8Array): Partition {
  const a: number[] = [];
  side.forEach((s, p) => {
    if (s === 1) a.push(p);
  });
  return {
    label: `positions:${a.join(',')}`,
    kind: 'positions',
    side,
    description: `positions ${a.join(', ')} against the rest`,
  };
}

const list = (xs: readonly number[]): string => `[${xs.join(',')}]`;

function paddingText(p: Padding): string {
  return p.mode === 'explicit' ? `pad${list(p.amount)}` : p.mode;
}

const ones = (xs: readonly number[]): boolean => xs.every((x) => x === 1);

/** One layer in a few characters; fields at their defaults are left out. */
export function describeLayer(l: Layer | LayerDraft): string {
  switch (l.kind) {
    case 'conv': {
      const parts = [`r=${l.channels ?? '·'}`, `k=${list(l.kernel)}`];
      if (!ones(l.stride)) parts.push(`s=${list(l.stride)}`);
      if (!ones(l.dilation)) parts.push(`d=${list(l.dilation)}`);
      parts.push(paddingText(l.padding));
      if (l.groups !== 1) parts.push(`g=${l.groups}`);
      if (l.depthMultiplier !== 1) parts.push(`x${l.depthMultiplier}`);
      return `conv(${parts.join(',')})`;
    }
    case 'conv-transpose': {
      const parts = [`r=${l.channels}`, `k=${list(l.kernel)}`, `s=${list(l.stride)}`];
      if (!ones(l.dilation)) parts.push(`d=${list(l.dilation)}`);
      if (l.padding.some((x) => x !== 0)) parts.push(`p=${list(l.padding)}`);
      if (l.outputPadding.some((x) => x !== 0)) parts.push(`q=${list(l.outputPadding)}`);
      if (l.groups !== 1) parts.push(`g=${l.groups}`);
      return `convT(${parts.join(',')})`;
    }
    case 'pool':
      if (l.global) return 'pool(global)';
      return `pool(${list(l.window)}${l.stride.every((s, a) => s === l.window[a]) ? '' : `,s=${list(l.stride)}`}${l.padding.mode === 'valid' ? '' : `,${paddingText(l.padding)}`})`;
    case 'upsample':
      return `upsample(${list(l.factor)},${l.mode})`;
    case 'flatten':
      return 'flatten';
    case 'dense':
      return `dense(${l.units})`;
    case 'recurrent': {
      const parts = [`R=${l.hidden}`, `L=${l.depth}`];
      if (l.bidirectional) parts.push(`bi-${l.merge}`);
      parts.push(l.sequence ? 'seq' : 'last');
      return `recurrent(${parts.join(',')})`;
    }
    case 'embedding':
      return `embedding(${l.dim})`;
    case 'position':
      return l.mode === 'learned' ? 'position' : 'position(fixed)';
    case 'class-token':
      return 'class-token';
    case 'attention': {
      const parts = [`H=${l.heads}`];
      if (l.headDim !== undefined) parts.push(`a=${l.headDim}`);
      if (l.causal) parts.push('causal');
      if (l.window !== undefined) parts.push(`w=${l.window}`);
      return `attention(${parts.join(',')})`;
    }
    case 'pointwise':
      return l.op;
    case 'merge':
      return `${l.mode}`;
  }
}

/** A short one-line rendering of a model, printed with failing cases. */
export function describeModel(model: LayeredModel | ExplicitModel): string {
  if (model.kind === 'explicit') {
    const t = model.tensors.map((x) => `${x.name}(${x.legs.map((l) => `p${l.position}:${l.dim}`).join(' ')})`);
    const b = model.bonds.map((x) => `${x.tensors.join('-')}:${x.dim}`);
    return `explicit shape=[${model.shape.join(',')}] tensors=${t.join(' ')} bonds=${b.join(' ')}`;
  }
  const ls = model.layers.map((l) => {
    const chained = l.inputs.length === 1 && l.inputs[0] === l.index - 1;
    const from = chained ? '' : `${list(l.inputs.map((i) => (i === INPUT ? 'in' : i) as number))}>`;
    return `${l.index}:${from}${describeLayer(l)}${l.name !== undefined ? `@${l.name}` : ''}`;
  });
  const m = model.input.vocabulary !== undefined ? `V${model.input.vocabulary}` : (model.input.representation ?? 'default');
  const out = model.output.position ? ` output=${list(model.output.position)}` : '';
  return `layered shape=[${model.input.shape.join(',')}] M=${m} shared=${model.weightSharing}${out} ${ls.join(' ')}`;
}
