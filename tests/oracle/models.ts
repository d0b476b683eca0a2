/**
 * Terse builders for Model literals, so that oracle tests and reference tests can write a network
 * in one line (`layered([8], 3, false, [conv(3), pool([2]), ...])`) instead of spelling out spans,
 * paths and indices. They build the normalised model directly, without the config loader, so the
 * tests exercise the bound engine and the oracle on exactly the model they describe.
 */
import { NO_SPAN } from '../../src/diagnostic.js';
import type {
  ConvLayer,
  DenseLayer,
  ExplicitBond,
  ExplicitModel,
  ExplicitTensor,
  Layer,
  LayeredModel,
  PoolLayer,
  RecurrentLayer,
  Shape,
} from '../../src/config/model.js';
import type { Partition } from '../../src/partition/partition.js';
import { resolvePartition } from '../../src/partition/partition.js';

type Unindexed<T> = T extends unknown ? Omit<T, 'index' | 'path'> : never;
export type LayerDraft = Unindexed<Layer>;

const base = { span: NO_SPAN, fieldSpans: {} } as const;

export function conv(
  channels: number,
  opts: { kernel?: readonly number[]; stride?: readonly number[]; padding?: 'same' | 'valid'; dims?: number } = {},
): Unindexed<ConvLayer> {
  const dims = opts.dims ?? opts.kernel?.length ?? opts.stride?.length ?? 1;
  return {
    ...base,
    kind: 'conv',
    channels,
    kernel: opts.kernel ?? new Array<number>(dims).fill(1),
    stride: opts.stride ?? new Array<number>(dims).fill(1),
    padding: opts.padding ?? 'same',
  };
}

export function pool(window: readonly number[]): Unindexed<PoolLayer> {
  return { ...base, kind: 'pool', window, global: false };
}

export function globalPool(): Unindexed<PoolLayer> {
  return { ...base, kind: 'pool', window: [], global: true };
}

export function dense(units: number): Unindexed<DenseLayer> {
  return { ...base, kind: 'dense', units };
}

export function recurrent(hidden: number, depth: number): Unindexed<RecurrentLayer> {
  return { ...base, kind: 'recurrent', hidden, depth };
}

export function layered(
  shape: Shape,
  features: number,
  weightSharing: boolean,
  layers: readonly LayerDraft[],
): LayeredModel {
  return {
    kind: 'layered',
    file: 'oracle.yaml',
    input: { shape, features, span: NO_SPAN, fieldSpans: {} },
    weightSharing,
    layers: layers.map((l, index) => ({ ...l, index, path: `/model/layers/${index}` }) as Layer),
    span: NO_SPAN,
  };
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

/** A short one-line rendering of a model, printed with failing cases. */
export function describeModel(model: LayeredModel | ExplicitModel): string {
  if (model.kind === 'explicit') {
    const t = model.tensors.map((x) => `${x.name}(${x.legs.map((l) => `p${l.position}:${l.dim}`).join(' ')})`);
    const b = model.bonds.map((x) => `${x.tensors.join('-')}:${x.dim}`);
    return `explicit shape=[${model.shape.join(',')}] tensors=${t.join(' ')} bonds=${b.join(' ')}`;
  }
  const ls = model.layers.map((l) => {
    switch (l.kind) {
      case 'conv':
        return `conv(r=${l.channels},k=[${l.kernel.join(',')}],s=[${l.stride.join(',')}],${l.padding})`;
      case 'pool':
        return l.global ? 'pool(global)' : `pool([${l.window.join(',')}])`;
      case 'dense':
        return `dense(${l.units})`;
      case 'recurrent':
        return `recurrent(R=${l.hidden},L=${l.depth})`;
    }
  });
  return `layered shape=[${model.input.shape.join(',')}] M=${model.input.features} shared=${model.weightSharing} ${ls.join(' ')}`;
}
