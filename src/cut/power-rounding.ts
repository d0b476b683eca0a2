/**
 * The power-rounding lower bound. Round every dimension d down to q^⌊log_q d⌋ for one integer q.
 * The rounded network is a restriction of the original (zero the extra coordinates), so its rank
 * is a lower bound; and when every dimension is a power of one integer, the generic rank equals
 * the min-cut (Cui, Freedman, Sattath, Stong, Minton, "Quantum max-flow/min-cut", 2016; for trees
 * with copy tensors the same is claimed by Levine, Yakira, Cohen, Shashua, "Deep learning and
 * quantum entanglement", ICLR 2018). The min-cut of the rounded network counts exponents of q,
 * so it is an exact integer problem. The best q over a few candidates is kept.
 */

/** How many candidate bases are tried at most. */
export const MAX_CANDIDATES = 64;

/** ⌊log_q d⌋ by repeated multiplication in bigints, so no float logarithm can round it wrong. */
export function floorLog(d: number, q: number): number {
  const big = BigInt(d);
  const base = BigInt(q);
  let e = 0;
  for (let p = base; p <= big; p *= base) e++;
  return e;
}

/** ⌊d^(1/k)⌋ exactly: a float guess corrected by bigint powers. */
function integerRoot(d: number, k: number): number {
  const big = BigInt(d);
  const kk = BigInt(k);
  let r = Math.max(1, Math.floor(Math.pow(d, 1 / k)));
  while (BigInt(r + 1) ** kk <= big) r++;
  while (r > 1 && BigInt(r) ** kk > big) r--;
  return r;
}

/**
 * 2, then the k-th roots of every dimension for k = 1, 2, ...: a base that is a dimension (or
 * one of its roots) keeps that dimension unrounded. Capped so that huge networks with many
 * distinct dimensions stay cheap.
 */
export function powerCandidates(dims: Iterable<number>): number[] {
  const distinct = [...new Set(dims)].filter((d) => d >= 2).sort((a, b) => b - a);
  const out = new Set<number>([2]);
  const maxK = distinct.length === 0 ? 0 : Math.floor(Math.log2(distinct[0]!)) + 1;
  for (let k = 1; k <= maxK && out.size < MAX_CANDIDATES; k++) {
    for (const d of distinct) {
      if (out.size >= MAX_CANDIDATES) break;
      if (2 ** k > d) continue;
      const r = integerRoot(d, k);
      if (r >= 2) out.add(r);
    }
  }
  return [...out];
}
