/**
 * A batch of samples after the local feature map, in the form the Gram matrices need: for values,
 * the cosine and sine of each scaled value (φ(v) = (cos πt/2, sin πt/2)); for tokens, their ids
 * (indicator features, whose inner product is equality). See DEVELOPERS.md, "Measuring a data
 * domain".
 */

export interface ValueBatch {
  readonly kind: 'values';
  readonly count: number;
  readonly positions: number;
  /** Values per position (1 grey, 3 colour). */
  readonly channels: number;
  /** Index ((s·positions) + p)·channels + c. */
  readonly cos: Float64Array;
  readonly sin: Float64Array;
}

export interface TokenBatch {
  readonly kind: 'tokens';
  readonly count: number;
  readonly positions: number;
  /** Index s·positions + p. */
  readonly ids: Int32Array;
}

export type FeatureBatch = ValueBatch | TokenBatch;

/** The scale of the values: t = (v − lo)/(hi − lo), clamped to [0, 1]. */
export interface ValueRange {
  readonly lo: number;
  readonly hi: number;
}

/** Raw values (count × positions × channels, row-major) → a value batch. */
export function valueBatch(values: Float64Array, count: number, positions: number, channels: number, range: ValueRange): ValueBatch {
  const size = count * positions * channels;
  const cos = new Float64Array(size);
  const sin = new Float64Array(size);
  const width = range.hi - range.lo;
  for (let i = 0; i < size; i++) {
    const t = width > 0 ? Math.min(1, Math.max(0, (values[i]! - range.lo) / width)) : 0;
    // The ends are exact, so that the lowest and the highest value are exactly orthogonal.
    if (t === 0) {
      cos[i] = 1;
      sin[i] = 0;
    } else if (t === 1) {
      cos[i] = 0;
      sin[i] = 1;
    } else {
      cos[i] = Math.cos((Math.PI / 2) * t);
      sin[i] = Math.sin((Math.PI / 2) * t);
    }
  }
  return { kind: 'values', count, positions, channels, cos, sin };
}

export function tokenBatch(ids: Int32Array, count: number, positions: number): TokenBatch {
  return { kind: 'tokens', count, positions, ids };
}
