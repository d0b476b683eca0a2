/**
 * The normalised architecture that every later stage reads. The config loader produces it from
 * YAML (aliases resolved, defaults filled, `repeat` blocks expanded); nothing after the loader
 * sees raw YAML. Each layer keeps the span of the YAML it came from so that bounds, verdicts and
 * fixes can point at the line a reviewer must look at.
 */
import type { Span } from '../diagnostic.js';

/** `[length]` for sequences and 1D signals, `[height, width]` for images. */
export type Shape = readonly number[];

export interface InputSpec {
  readonly shape: Shape;
  /** M: representation functions per position, the dimension of each open leg. */
  readonly features: number;
  readonly span: Span;
  /** Spans of the individual fields (`shape`, `features`) for fix suggestions. */
  readonly fieldSpans: Readonly<Record<string, Span>>;
}

interface LayerBase {
  /** Position in the flattened layer list (after `repeat` expansion), from 0. */
  readonly index: number;
  /** Optional user-given name; reports show it instead of the index. */
  readonly name?: string;
  /** JSON-pointer-like path of the YAML node, e.g. `/model/layers/2/repeat/layers/0`. */
  readonly path: string;
  /** Span of the whole layer entry. */
  readonly span: Span;
  /** Span of each field's value, keyed by canonical field name (`channels`, `window`, ...). */
  readonly fieldSpans: Readonly<Record<string, Span>>;
  /** For layers produced by `repeat`: the 0-based iteration, else undefined. */
  readonly repeatIteration?: number;
}

export interface ConvLayer extends LayerBase {
  readonly kind: 'conv';
  readonly channels: number;
  /** One entry per input dimension (a scalar in YAML is broadcast). */
  readonly kernel: readonly number[];
  readonly stride: readonly number[];
  readonly padding: 'same' | 'valid';
}

export interface PoolLayer extends LayerBase {
  readonly kind: 'pool';
  /** One entry per input dimension; stride equals the window. Empty when `global`. */
  readonly window: readonly number[];
  /** Pools every position that is left. */
  readonly global: boolean;
}

export interface DenseLayer extends LayerBase {
  readonly kind: 'dense';
  readonly units: number;
}

export interface RecurrentLayer extends LayerBase {
  readonly kind: 'recurrent';
  readonly hidden: number;
  readonly depth: number;
}

export type Layer = ConvLayer | PoolLayer | DenseLayer | RecurrentLayer;

export interface LayeredModel {
  readonly kind: 'layered';
  readonly file: string;
  readonly input: InputSpec;
  /** true: convolution (one weight set per layer); false: locally connected. */
  readonly weightSharing: boolean;
  readonly layers: readonly Layer[];
  /** Span of the `model` mapping (or of the node the model path points at). */
  readonly span: Span;
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

/** How a layer is named in reports: its user-given name, else its flattened index. */
export function layerLabel(layer: Layer): string | number {
  return layer.name ?? layer.index;
}
