/**
 * The power-rounding lower bound. Round every dimension d down to q^⌊log_q d⌋ for one integer q.
 * The rounded network is a restriction of the original (zero the extra coordinates), so its rank
 * is a lower bound; and when every dimension is a power of one integer, the generic rank equals
 * the min-cut (Cui, Freedman, Sattath, Stong, Minton, "Quantum max-flow/min-cut", 2016; for trees
 * with copy tensors the same is claimed by Levine, Yakira, Cohen, Shashua, "Deep learning and
 * quantum entanglement", ICLR 2018). The min-cut of the rounded network counts exponents of q,
 * so it is an exact integer problem. The best q over a few candidates is kept.
 */

/** ⌊log_q d⌋ by integer arithmetic. */
export function floorLog(d: number, q: number): number {
  let e = 0;
  let p = q;
  while (p <= d) {
    e++;
    p *= q;
  }
  return e;
}

/** ⌊d^(1/k)⌋ by integer arithmetic. */
function integerRoot(d: number, k: number): number {
  let r = Math.max(1, Math.floor(Math.pow(d, 1 / k)));
  while (r > 1 && r ** k > d) r--;
  while ((r + 1) ** k <= d) r++;
  return r;
}

/** Candidate bases: 2, and ⌊d^(1/k)⌋ for every distinct dimension d, at most `limit` of them. */
export function powerCandidates(dims: Iterable<number>, limit = 64): number[] {
  const set = new Set<number>([2]);
  const sorted = [...new Set(dims)].filter((d) => d >= 2).sort((a, b) => a - b);
  for (const d of sorted) {
    for (let k = 1; 2 ** k <= d; k++) {
      const q = integerRoot(d, k);
      if (q >= 2) set.add(q);
    }
  }
  return [...set].sort((a, b) => a - b).slice(0, limit);
}
