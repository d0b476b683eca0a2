/**
 * What a spectrum says: the entanglement entropy in bits of the normalised squared singular
 * values, and the ε-rank (how many of the largest hold 1 − ε of the weight).
 */

/** −Σ p_i log2 p_i with p_i = λ_i / Σ λ; 0 for an all-zero spectrum (a tensor of norm 0). */
export function entropyBits(eigenvalues: ArrayLike<number>): number {
  let total = 0;
  for (let i = 0; i < eigenvalues.length; i++) total += Math.max(0, eigenvalues[i]!);
  if (!(total > 0)) return 0;
  let h = 0;
  for (let i = 0; i < eigenvalues.length; i++) {
    const p = Math.max(0, eigenvalues[i]!) / total;
    if (p > 0) h -= p * Math.log2(p);
  }
  return Math.max(0, h);
}

/**
 * The smallest k such that the k largest normalised values sum to at least 1 − ε (0 for an
 * all-zero spectrum). A tiny slack absorbs rounding in the cumulative sum.
 */
export function epsilonRank(eigenvalues: ArrayLike<number>, epsilon: number): number {
  const sorted = Array.from(eigenvalues, (v) => Math.max(0, v)).sort((x, y) => y - x);
  const total = sorted.reduce((a, b) => a + b, 0);
  if (!(total > 0)) return 0;
  const target = (1 - epsilon) * total * (1 - 1e-12);
  let sum = 0;
  for (let k = 0; k < sorted.length; k++) {
    sum += sorted[k]!;
    if (sum >= target) return k + 1;
  }
  return sorted.length;
}
