/**
 * What the cut engine promises, as types. A bound is an exact integer rank (a bigint) with its
 * log2 for display, the rule that proved it, and the cut that gave it, so that a reviewer can see
 * which layers form the bottleneck.
 */

export type Surrogate = 'tree' | 'overlap';

/** One group of cut bonds: `count` bonds of dimension `dim` produced by one layer. */
export interface CutEntry {
  /** Layer index or user-given name; `"input"` for open legs, `"head"` for the output vector. */
  readonly layer: number | string;
  /** YAML line of that layer (1-based). */
  readonly line: number;
  readonly dim: number;
  readonly count: number;
}

export interface Bound {
  readonly rank: bigint;
  readonly log2: number;
  /** Which rule gave it, e.g. `min-cut`, `degree`, `power-rounding q=2`, `diagonal`. */
  readonly method: string;
  readonly cut: readonly CutEntry[];
}

export type BoundStatus = 'exact' | 'bounded' | 'upper-only';

export interface PartitionBounds {
  /** The partition as the user wrote it. */
  readonly partition: string;
  readonly upper: Bound;
  readonly lower: Bound | null;
  readonly status: BoundStatus;
}

export interface BoundsResult {
  readonly file: string;
  readonly surrogate: Surrogate;
  /** Statements about how the config was read (kernel ignored, implicit global pool, ...). */
  readonly notes: readonly string[];
  readonly partitions: readonly PartitionBounds[];
}

/** log2 of a positive bigint, accurate for any size. */
export function log2Big(x: bigint): number {
  if (x <= 0n) throw new RangeError('log2Big needs a positive integer');
  const bits = x.toString(2).length;
  if (bits <= 52) return Math.log2(Number(x));
  const shift = BigInt(bits - 52);
  return Math.log2(Number(x >> shift)) + Number(shift);
}
