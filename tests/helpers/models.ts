/**
 * Model literals for tests that exercise the engine without going through YAML, and a seeded
 * PRNG so that random cases are reproducible.
 */
import { NO_SPAN } from '../../src/diagnostic.js';
import type { Layer, LayeredModel } from '../../src/config/model.js';

type LayerBody =
  | { kind: 'conv'; channels: number; kernel?: number[]; stride?: number[]; padding?: 'same' | 'valid' }
  | { kind: 'pool'; window?: number[]; global?: boolean }
  | { kind: 'dense'; units: number }
  | { kind: 'recurrent'; hidden: number; depth?: number };

export function layered(shape: number[], features: number, bodies: LayerBody[], weightSharing = true): LayeredModel {
  const layers: Layer[] = bodies.map((b, index) => {
    const base = { index, path: `/model/layers/${index}`, span: { ...NO_SPAN, line: index + 5 }, fieldSpans: {} };
    switch (b.kind) {
      case 'conv':
        return {
          ...base,
          kind: 'conv',
          channels: b.channels,
          kernel: b.kernel ?? shape.map(() => 1),
          stride: b.stride ?? shape.map(() => 1),
          padding: b.padding ?? 'same',
        };
      case 'pool':
        return { ...base, kind: 'pool', window: b.global ? [] : (b.window ?? []), global: b.global ?? false };
      case 'dense':
        return { ...base, kind: 'dense', units: b.units };
      case 'recurrent':
        return { ...base, kind: 'recurrent', hidden: b.hidden, depth: b.depth ?? 1 };
    }
  });
  return {
    kind: 'layered',
    file: 'test.yaml',
    input: { shape, features, span: { ...NO_SPAN, line: 2 }, fieldSpans: {} },
    weightSharing,
    layers,
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
