/**
 * The rule that turns a measurement into a recommended minimum (stated in the README, "Choosing
 * minimums"): a rank of at least 2^(bits + 2·spread), rounded up, where bits is the mean measured
 * entanglement entropy and spread its bootstrap standard error. A matricisation with entropy H has
 * rank at least 2^H, so a model below that rank cannot represent the data tensor across the
 * partition; two standard errors cover the sampling noise of the mean (common practice for a
 * ≈95% upper bound). Nothing is recommended for a saturated measurement, for a single batch (no
 * spread), or when the rule gives rank 1 (no dependency to keep).
 */
import type { PartitionMeasurement } from './measure.js';

export const SPREADS = 2;

export type Recommendation =
  | { readonly minRank: bigint; readonly bits: number }
  | { readonly minRank: null; readonly reason: 'saturated' | 'one-batch' | 'no-dependency' };

export function recommend(m: PartitionMeasurement): Recommendation {
  if (m.saturated) return { minRank: null, reason: 'saturated' };
  if (m.spread === undefined) return { minRank: null, reason: 'one-batch' };
  const bits = m.bits + SPREADS * m.spread;
  // The rounding guard keeps 2^H for H a whole number from becoming 2^H + 1 through rounding.
  const rank = Math.ceil(2 ** bits * (1 - 1e-12));
  if (rank <= 1) return { minRank: null, reason: 'no-dependency' };
  return { minRank: BigInt(rank), bits };
}
