/**
 * Model literals for tests that exercise the engine without going through YAML, and a seeded
 * PRNG so that random cases are reproducible. Layers form a chain unless a body gives `inputs`
 * (indices of earlier layers; -1 is the model input), so a DAG is one literal too.
 */
import { NO_SPAN } from '../../src/diagnostic.js';
import { INPUT, type Layer, type LayeredModel, type Padding, type PointwiseFamily, type PoolMode } from '../../src/config/model.js';

type Wiring = { inputs?: number[]; name?: string };

type LayerBody = Wiring &
  (
    | {
        kind: 'conv';
        channels?: number;
        kernel?: number[];
        stride?: number[];
        dilation?: number[];
        padding?: 'same' | 'valid' | 'causal' | number[];
        groups?: number | 'depthwise';
        depthMultiplier?: number;
      }
    | { kind: 'conv-transpose'; channels: number; kernel?: number[]; stride?: number[]; padding?: number[]; outputPadding?: number[] }
    | { kind: 'pool'; window?: number[]; stride?: number[]; mode?: PoolMode; global?: boolean }
    | { kind: 'dense'; units: number }
    | { kind: 'flatten' }
    | { kind: 'upsample'; factor: number[]; mode?: 'nearest' | 'linear' }
    | { kind: 'recurrent'; hidden: number; depth?: number; cell?: 'arithmetic' | 'rnn' | 'lstm' | 'gru'; bidirectional?: boolean; merge?: 'concat' | 'sum'; sequence?: boolean }
    | { kind: 'pointwise'; op: string; family?: PointwiseFamily }
    | { kind: 'merge'; mode: 'sum' | 'concat'; inputs: number[]; origin?: 'residual' | 'branches' | 'skip' }
  );

function paddingOf(p: 'same' | 'valid' | 'causal' | number[] | undefined): Padding {
  if (Array.isArray(p)) return { mode: 'explicit', amount: p };
  return { mode: p ?? 'same' };
}

/** `representation` is M (set explicitly, as the engine tests need an exact M). */
export function layered(shape: number[], representation: number, bodies: LayerBody[], weightSharing = true): LayeredModel {
  const ones = shape.map(() => 1);
  const layers: Layer[] = bodies.map((b, index) => {
    const base = {
      index,
      inputs: b.inputs ?? [index === 0 ? INPUT : index - 1],
      path: `/model/layers/${index}`,
      span: { ...NO_SPAN, line: index + 5 },
      fieldSpans: {},
      ...(b.name !== undefined ? { name: b.name } : {}),
    };
    switch (b.kind) {
      case 'conv':
        return {
          ...base,
          kind: 'conv',
          ...(b.channels !== undefined ? { channels: b.channels } : {}),
          kernel: b.kernel ?? ones,
          stride: b.stride ?? ones,
          dilation: b.dilation ?? ones,
          padding: paddingOf(b.padding),
          groups: b.groups ?? 1,
          depthMultiplier: b.depthMultiplier ?? 1,
        };
      case 'conv-transpose':
        return {
          ...base,
          kind: 'conv-transpose',
          channels: b.channels,
          kernel: b.kernel ?? ones,
          stride: b.stride ?? ones,
          dilation: ones,
          padding: b.padding ?? shape.map(() => 0),
          outputPadding: b.outputPadding ?? shape.map(() => 0),
          groups: 1,
        };
      case 'pool': {
        const global = b.global ?? false;
        const window = global ? [] : (b.window ?? []);
        return { ...base, kind: 'pool', mode: b.mode ?? 'product', window, stride: global ? [] : (b.stride ?? window), padding: { mode: 'valid' }, global };
      }
      case 'dense':
        return { ...base, kind: 'dense', units: b.units };
      case 'flatten':
        return { ...base, kind: 'flatten' };
      case 'upsample':
        return { ...base, kind: 'upsample', factor: b.factor, mode: b.mode ?? 'nearest' };
      case 'recurrent':
        // Defaults: the arithmetic cell, one direction, the final state only (as engine tests were written).
        return {
          ...base,
          kind: 'recurrent',
          hidden: b.hidden,
          depth: b.depth ?? 1,
          cell: b.cell ?? 'arithmetic',
          bidirectional: b.bidirectional ?? false,
          merge: b.merge ?? 'concat',
          sequence: b.sequence ?? false,
        };
      case 'pointwise':
        return { ...base, kind: 'pointwise', op: b.op, family: b.family ?? 'activation' };
      case 'merge':
        return { ...base, kind: 'merge', mode: b.mode, origin: b.origin ?? 'skip' };
    }
  });
  return {
    kind: 'layered',
    file: 'test.yaml',
    input: { shape, representation, span: { ...NO_SPAN, line: 2 }, fieldSpans: {} },
    weightSharing,
    layers,
    output: {},
    span: NO_SPAN,
  };
}

/** Mulberry32: small, fast, deterministic; uniform in [0, 1). */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export function prng(seed: number): { int: (n: number) => number; pick: <T>(xs: readonly T[]) => T } {
  const next = mulberry32(seed);
  const int = (n: number): number => Math.floor(next() * n);
  return { int, pick: (xs) => xs[int(xs.length)]! };
}
