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

/** Bounds with more bits than this are not written out as integers. */
export const MAX_RANK_BITS = 4_000_000;

/**
 * The `rank` of a huge bound: 2^MAX_RANK_BITS. It is below the bound itself but above every
 * minimum a policy can state (at most 2^1,000,000), so verdicts against minimums stay exact;
 * reports show "more than N bits" and the bound's log2 instead of this number.
 */
export const HUGE_RANK = 1n << BigInt(MAX_RANK_BITS);

export interface Bound {
  /** The bound; `HUGE_RANK` when `huge`. */
  readonly rank: bigint;
  readonly log2: number;
  /** The bound has more than MAX_RANK_BITS bits: only its log2 is known, and `rank` is HUGE_RANK. */
  readonly huge?: boolean;
  /** Which rule gave it, e.g. `min-cut`, `degree`, `power-rounding q=2`, `diagonal`. */
  readonly method: string;
  readonly cut: readonly CutEntry[];
  /** For a lower bound of the certified probe: what re-checks it (DEVELOPERS.md, "Certified probe"). */
  readonly certificate?: ProbeCertificate;
}

/**
 * A non-singular minor of a probe matrix modulo a prime. With the weights and probe inputs named
 * by `seed` (DEVELOPERS.md gives the names and the function that draws them), the matrix is
 * F[i][j] = h(side-A inputs i, side-B inputs j) for i, j < `probes` (a layered model), or the
 * whole matricisation of an explicit network at its drawn tensors (`matricisation`: its rows ×
 * columns); the minor on `rows` × `cols` has the determinant `determinant` ≠ 0 mod `prime`, so
 * some real weights reach rank rows.length.
 */
export type ProbeCertificate = CertificateBase & ({ readonly probes: number } | { readonly matricisation: readonly [number, number] });

interface CertificateBase {
  /** Version of the naming and drawing scheme. */
  readonly scheme: number;
  readonly prime: number;
  readonly seed: number;
  /** Side-A probe inputs (matrix rows) of the minor, ascending. */
  readonly rows: readonly number[];
  /** Side-B probe inputs (matrix columns) of the minor, ascending. */
  readonly cols: readonly number[];
  readonly determinant: number;
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

/**
 * Whether a lower and an upper bound are the same integer. Two bounds beyond the bit limit are
 * never known to meet: only their log2 is known.
 */
export function boundsMeet(lower: Bound, upper: Bound): boolean {
  return !lower.huge && !upper.huge && lower.rank === upper.rank;
}

/** log2 of a positive bigint, accurate for any size. */
export function log2Big(x: bigint): number {
  if (x <= 0n) throw new RangeError('log2Big needs a positive integer');
  const bits = x.toString(2).length;
  if (bits <= 52) return Math.log2(Number(x));
  const shift = BigInt(bits - 52);
  return Math.log2(Number(x >> shift)) + Number(shift);
}
