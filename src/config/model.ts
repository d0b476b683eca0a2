/**
 * The normalised architecture that every later stage reads. The config loader produces it from
 * YAML (aliases resolved, defaults filled, `repeat` blocks expanded, blocks such as `residual`
 * and `branches` turned into merge nodes); nothing after the loader sees raw YAML.
 *
 * A layered model is a small directed acyclic graph: `layers` is in topological order and every
 * layer names the layers it reads (`inputs`), `INPUT` standing for the model's input grid. A plain
 * YAML list of layers becomes a chain (each layer reads the one before it), so the common case
 * reads exactly as the file does. Each layer keeps the span of the YAML it came from so that
 * bounds, verdicts and fixes can point at the line a reviewer must look at. The exact function of
 * every kind under each surrogate is written in DEVELOPERS.md.
 */
import type { Span } from '../diagnostic.js';

/** `[length]` for sequences and 1D signals, `[height, width]` for images. */
export type Shape = readonly number[];

/** Stands in a layer's `inputs` for the model's input grid. */
export const INPUT = -1;

export interface InputSpec {
  readonly shape: Shape;
  /**
   * M, the number of representation functions per position (the dimension of each open leg),
   * when the config sets it (`input.representation`). When absent, M is the width of the first
   * layer that reads the input: see `representationOf`.
   */
  readonly representation?: number;
  /** The data's raw channel count (1 for grayscale, 3 for RGB), when the config states it. Not M. */
  readonly channels?: number;
  /**
   * A token input: each position holds one of V tokens, read as its indicator vector, so M = V
   * exactly (the representation functions of a discrete position are its V indicators).
   */
  readonly vocabulary?: number;
  /** The config gave the raw channels under `features`, which earlier versions read as M. */
  readonly featuresAsChannels?: boolean;
  readonly span: Span;
  /** Spans of the individual fields (`shape`, `representation`, `channels`) for reports. */
  readonly fieldSpans: Readonly<Record<string, Span>>;
  /** Built from an architecture definition: the parameters each field was computed from (see `LayerBase`). */
  readonly fieldParams?: FieldParameters;
}

/** A parameter of an architecture definition that a value was computed from. */
export interface ParameterUse {
  readonly name: string;
  /** Where the config sets it; absent when the definition's default was used. */
  readonly span?: Span;
}

/** Per canonical field, the parameters its value was computed from (fields written as plain values are absent). */
export type FieldParameters = Readonly<Record<string, readonly ParameterUse[]>>;

/** Which output a dense-prediction model is analysed at. */
export interface OutputSpec {
  /** One index per axis of the last layer's grid; absent: the documented default. */
  readonly position?: readonly number[];
  readonly span?: Span;
}

interface LayerBase {
  /** Position in `layers` (topological order), from 0. */
  readonly index: number;
  /** Layers this one reads, by index; `INPUT` for the model input. Merges read two or more. */
  readonly inputs: readonly number[];
  /**
   * User-given name, unique in the model. Copies made by `repeat` get the iteration appended
   * (`stage[2]`, nested: `stage[2][1]`) so that every layer has one label.
   */
  readonly name?: string;
  /** JSON-pointer-like path of the YAML node, e.g. `/model/layers/2/residual/layers/0`. */
  readonly path: string;
  /** Span of the whole layer entry (for a field such as `activation: relu`: of that field). */
  readonly span: Span;
  /** Span of each field's value, keyed by canonical field name (`channels`, `window`, ...). */
  readonly fieldSpans: Readonly<Record<string, Span>>;
  /** For layers produced by `repeat`: the 0-based iteration of the innermost repeat, else undefined. */
  readonly repeatIteration?: number;
  /**
   * Only in a model built from an architecture definition (`LayeredModel.architecture`), whose
   * `span` and `fieldSpans` point into the definition file: per field, the parameters (with their
   * lines in the config) its value was computed from; under `layer`, those that decide how often
   * the layer is made (the `repeat` counts around it).
   */
  readonly fieldParams?: FieldParameters;
}

/**
 * How a window op pads its grid. `same`: output length ⌈n/s⌉ with the padding split as evenly as
 * possible (left gets the smaller half); `valid`: no padding; `causal` (1D): all padding on the
 * left, so no output reads a later position; `explicit`: `amount[axis]` zeros on both sides.
 */
export type Padding =
  | { readonly mode: 'same' }
  | { readonly mode: 'valid' }
  | { readonly mode: 'causal' }
  | { readonly mode: 'explicit'; readonly amount: readonly number[] };

export interface ConvLayer extends LayerBase {
  readonly kind: 'conv';
  /**
   * Output channels. Absent only for a depthwise conv that gives none: it then has the input
   * width times `depthMultiplier` (resolved by `inferShapes`).
   */
  readonly channels?: number;
  /** One entry per grid axis (a scalar in YAML is broadcast); likewise stride and dilation. */
  readonly kernel: readonly number[];
  readonly stride: readonly number[];
  readonly dilation: readonly number[];
  readonly padding: Padding;
  /**
   * Input and output channels split into this many blocks, block b of the output reading block b
   * of the input; `depthwise`: one group per input channel.
   */
  readonly groups: number | 'depthwise';
  /** Output channels per input channel of a depthwise conv (1 unless the config says otherwise). */
  readonly depthMultiplier: number;
  /**
   * The real layer's bias, when the config turns it off (`bias: false`); absent means it has one.
   * The surrogate has no biases: only the parameter count reads this.
   */
  readonly bias?: false;
}

export interface ConvTransposeLayer extends LayerBase {
  readonly kind: 'conv-transpose';
  readonly channels: number;
  readonly kernel: readonly number[];
  readonly stride: readonly number[];
  readonly dilation: readonly number[];
  /** Zeros removed from both ends of the output, per axis (the usual `padding` of a transposed conv). */
  readonly padding: readonly number[];
  /** Extra positions added at the end of each axis. */
  readonly outputPadding: readonly number[];
  readonly groups: number;
  /**
   * The real layer's bias, when the config turns it off (`bias: false`); absent means it has one.
   * The surrogate has no biases: only the parameter count reads this.
   */
  readonly bias?: false;
}

/** What the real network computes in a pool; every mode is a product in the arithmetic surrogate. */
export type PoolMode = 'max' | 'average' | 'sum' | 'product' | 'other';

export interface PoolLayer extends LayerBase {
  readonly kind: 'pool';
  readonly mode: PoolMode;
  /** One entry per grid axis. Empty when `global`. */
  readonly window: readonly number[];
  /** One entry per grid axis; equals the window unless the config says otherwise. Empty when `global`. */
  readonly stride: readonly number[];
  /** `valid` unless the config says otherwise (`causal` is not allowed for pools). */
  readonly padding: Padding;
  /** Pools every position that is left into one. */
  readonly global: boolean;
}

export interface DenseLayer extends LayerBase {
  readonly kind: 'dense';
  readonly units: number;
  /**
   * The real layer's bias, when the config turns it off (`bias: false`); absent means it has one.
   * The surrogate has no biases: only the parameter count reads this.
   */
  readonly bias?: false;
}

/** Turns the grid into one position holding every position's vector, in row-major order. */
export interface FlattenLayer extends LayerBase {
  readonly kind: 'flatten';
}

export interface UpsampleLayer extends LayerBase {
  readonly kind: 'upsample';
  /** Integer factor per grid axis. */
  readonly factor: readonly number[];
  /** `nearest` copies; `linear` interpolates between the two nearest positions per axis. */
  readonly mode: 'nearest' | 'linear';
}

export interface RecurrentLayer extends LayerBase {
  readonly kind: 'recurrent';
  readonly hidden: number;
  readonly depth: number;
  /** The real network's cell; every cell is read as the recurrent arithmetic circuit. */
  readonly cell: 'arithmetic' | 'rnn' | 'lstm' | 'gru';
  readonly bidirectional: boolean;
  /** How a bidirectional layer joins its two directions at each step. */
  readonly merge: 'concat' | 'sum';
  /** true: one output per step (the grid keeps its length); false: the final state only. */
  readonly sequence: boolean;
  /**
   * The real layer's biases, when the config turns them off (`bias: false`); absent means it has
   * them. The surrogate has no biases: only the parameter count reads this.
   */
  readonly bias?: false;
}

/** A per-position linear map to `dim` (on a token input: the token embedding). */
export interface EmbeddingLayer extends LayerBase {
  readonly kind: 'embedding';
  readonly dim: number;
}

/** Adds one vector per position (position embeddings; `fixed` encodings are read as learned). */
export interface PositionLayer extends LayerBase {
  readonly kind: 'position';
  readonly mode: 'learned' | 'fixed';
}

/** Prepends a learned vector as position 0; the grid becomes a 1D sequence of N + 1 positions. */
export interface ClassTokenLayer extends LayerBase {
  readonly kind: 'class-token';
}

/** Linearised multi-head self-attention over the positions of the grid (row-major). */
export interface AttentionLayer extends LayerBase {
  readonly kind: 'attention';
  readonly heads: number;
  /** Width of each head's queries, keys and values; absent: the input width divided by `heads`. */
  readonly headDim?: number;
  /** Position i attends only to j ≤ i. */
  readonly causal: boolean;
  /** 1D: position i attends only to j with |i − j| ≤ window. */
  readonly window?: number;
  /**
   * The real layer's biases (of the query, key, value and output maps), when the config turns them
   * off (`bias: false`); absent means it has them. Only the parameter count reads this.
   */
  readonly bias?: false;
}

/**
 * Layers that act on each value or each position alone and carry no width: activation functions,
 * normalisation, dropout, scaling. Kept in the model so that reports can say how the surrogate
 * read them.
 */
export type PointwiseFamily = 'activation' | 'normalisation' | 'dropout' | 'scaling';

export interface PointwiseLayer extends LayerBase {
  readonly kind: 'pointwise';
  readonly family: PointwiseFamily;
  /** The function as the config names it, lower case (`relu`, `batch_norm`, `dropout`). */
  readonly op: string;
}

/**
 * Where two or more paths meet: `sum` adds vectors of equal width (residual blocks, summed
 * branches, additive skips), `concat` joins the vectors of each position (widths add).
 */
export interface MergeLayer extends LayerBase {
  readonly kind: 'merge';
  readonly mode: 'sum' | 'concat';
  /**
   * The YAML construct that made it, for reports. Input order: a residual block reads
   * [main path, shortcut]; branches read their paths in order; a skip reads [the current grid,
   * the named layer].
   */
  readonly origin: 'residual' | 'branches' | 'skip';
}

export type Layer =
  | ConvLayer
  | ConvTransposeLayer
  | PoolLayer
  | DenseLayer
  | FlattenLayer
  | UpsampleLayer
  | RecurrentLayer
  | EmbeddingLayer
  | PositionLayer
  | ClassTokenLayer
  | AttentionLayer
  | PointwiseLayer
  | MergeLayer;

export type LayerKind = Layer['kind'];

export interface LayeredModel {
  readonly kind: 'layered';
  readonly file: string;
  readonly input: InputSpec;
  /** true: convolution (one weight set per layer); false: locally connected. */
  readonly weightSharing: boolean;
  /** Topological order; the last layer produces the model's output. */
  readonly layers: readonly Layer[];
  readonly output: OutputSpec;
  /** Span of the `model` mapping (or of the node the model path points at). */
  readonly span: Span;
  /**
   * Set when the config names an architecture definition and sets its parameters instead of
   * listing layers. The spans of the layers, the input and the output then point into the
   * definition file; `span` stays the config's.
   */
  readonly architecture?: ArchitectureUse;
}

/** Which architecture definition a config uses, and with which parameter values. */
export interface ArchitectureUse {
  /** The definition as diagnostics name it. */
  readonly file: string;
  /** Root-relative, forward slashes. */
  readonly path: string;
  /** The definition's `name`. */
  readonly name: string;
  /** The config's `architecture` value. */
  readonly span: Span;
  /** Every declared parameter with the value used, in the definition's order. */
  readonly parameters: readonly ParameterSetting[];
}

export interface ParameterSetting {
  readonly name: string;
  /** Exact decimal text: `0.5`, `[2, 2, 2, 2]`. */
  readonly value: string;
  /** Where the config sets it; absent when the definition's default is used. */
  readonly span?: Span;
  /** The parameter's name in the definition. */
  readonly declared: Span;
}

/** An open leg of an explicit tensor: it belongs to one input position. */
export interface ExplicitLeg {
  readonly position: number;
  readonly dim: number;
  readonly span: Span;
}

export interface ExplicitTensor {
  readonly name: string;
  readonly legs: readonly ExplicitLeg[];
  readonly span: Span;
}

/**
 * An index shared by tensors. Two tensors: an ordinary bond. Three or more: a hyperedge (a copy
 * tensor, δ), which a cut pays for once.
 */
export interface ExplicitBond {
  readonly tensors: readonly string[];
  readonly dim: number;
  readonly span: Span;
}

export interface ExplicitModel {
  readonly kind: 'explicit';
  readonly file: string;
  /** Shape used to number positions and to resolve named partitions. */
  readonly shape: Shape;
  readonly tensors: readonly ExplicitTensor[];
  readonly bonds: readonly ExplicitBond[];
  readonly span: Span;
}

export type Model = LayeredModel | ExplicitModel;

export function positionCount(shape: Shape): number {
  return shape.reduce((a, b) => a * b, 1);
}

/** How a layer is named in reports: its user-given name, else its index. */
export function layerLabel(layer: Layer): string | number {
  return layer.name ?? layer.index;
}

/** The width a layer maps to, for kinds that have one (`channels`, `units`, `hidden`). */
export function layerWidth(layer: Layer): number | undefined {
  switch (layer.kind) {
    case 'conv':
    case 'conv-transpose':
      return layer.channels;
    case 'dense':
      return layer.units;
    case 'recurrent':
      return layer.hidden;
    case 'embedding':
      return layer.dim;
    default:
      return undefined;
  }
}

/** Kinds with weights: a value can be set to zero there, and a pointwise layer before one is analysed. */
export const WEIGHTED_KINDS: ReadonlySet<LayerKind> = new Set<LayerKind>(['conv', 'conv-transpose', 'dense', 'recurrent', 'embedding', 'attention']);

/** Kinds a value passes through unchanged in width on its way from the input to the first map. */
const PASS_THROUGH: ReadonlySet<LayerKind> = new Set<LayerKind>(['pointwise', 'pool', 'upsample', 'flatten', 'position', 'class-token']);

/**
 * The layers that first map the input to a width: reached from the input through pointwise,
 * pool, upsample and flatten layers only. Merges stop the walk (a merge reading the raw input
 * beside a mapped path takes its width from that path).
 */
export function firstMaps(model: LayeredModel): Layer[] {
  const reached = new Set<number>([INPUT]);
  const maps: Layer[] = [];
  for (const layer of model.layers) {
    if (layer.kind === 'merge' || !layer.inputs.some((i) => reached.has(i))) continue;
    if (PASS_THROUGH.has(layer.kind)) reached.add(layer.index);
    else if (layerWidth(layer) !== undefined) maps.push(layer);
  }
  return maps;
}

/**
 * M: the vocabulary of a token input; else `input.representation` when the config sets it, else
 * the largest width among the first
 * layers that map the input (the representation layer of the real network: a continuous value
 * supports any number of functions, and the first layer with its non-linearity computes them).
 * Undefined when no layer maps the input (the loader reports that).
 */
export function representationOf(model: LayeredModel): number | undefined {
  if (model.input.vocabulary !== undefined) return model.input.vocabulary;
  if (model.input.representation !== undefined) return model.input.representation;
  let best: number | undefined;
  for (const layer of firstMaps(model)) {
    const w = layerWidth(layer)!;
    if (best === undefined || w > best) best = w;
  }
  return best;
}
