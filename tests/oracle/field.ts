/**
 * Exact arithmetic modulo a prime, a seeded random source and matrix rank by Gaussian elimination:
 * the ground floor of the rank oracle. Everything the oracle certifies rests on these few lines,
 * so they are kept free of any dependency on the product.
 *
 * Choice of prime. P = 67108859 = 2^26 − 5, the largest prime below 2^26. Every residue is below
 * 2^26, so a product of two residues is below 2^52 and a product plus a residue is below 2^53:
 * both are exact in a double, and one floor division reduces them. A 31-bit prime would need a
 * split multiplication (about three times slower, measured) or BigInt (more than ten times
 * slower), and the oracle performs tens of millions of multiplications per run.
 *
 * Why 2^26 is enough. A k×k minor of a probe matrix is a polynomial in the weights and the probe
 * inputs of degree at most k·d, where d is the total degree of the network function: d is below
 * ~50 for the convolutional nets tested here, and below ~500 for the deepest recurrences (depth 3,
 * T = 8: the degree of h^l_t grows like t^l/l!), with k ≤ 408. By the Schwartz–Zippel lemma
 * (Schwartz, "Fast probabilistic algorithms for verification of polynomial identities"; Zippel,
 * "Probabilistic algorithms for sparse polynomials") a non-zero such polynomial vanishes at a
 * uniform random point with probability at most k·d/P: below 3.5·10^-3 in the very worst case,
 * below 10^-5 for a typical case (k, d ≈ 20), and the lemma is a crude worst-case bound. Failure only ever
 * makes the oracle read too LOW (a non-zero minor mod P is a non-zero integer polynomial, so the
 * rank mod P never exceeds the generic rank): it can never hide an upper bound that is too small.
 * When a reading would contradict a claimed lower bound, the caller re-draws (twice at most) and
 * keeps the maximum, which is still a certified value; a spurious failure then needs three
 * independent unlucky draws.
 */

/** The modulus. */
export const P = 67108859;

/** (a·b + c) mod P for residues a, b, c (all in [0, P)). */
export function mulAdd(a: number, b: number, c: number): number {
  const x = a * b + c;
  let r = x - Math.floor(x / P) * P;
  if (r < 0) r += P;
  else if (r >= P) r -= P;
  return r;
}

/** a·b mod P for residues a, b. */
export function mul(a: number, b: number): number {
  return mulAdd(a, b, 0);
}

export function add(a: number, b: number): number {
  const s = a + b;
  return s >= P ? s - P : s;
}

/** Multiplicative inverse by Fermat: a^(P−2). Throws on 0. */
export function inv(a: number): number {
  if (a === 0) throw new RangeError('inverse of 0 mod P');
  let result = 1;
  let base = a;
  let e = P - 2;
  while (e > 0) {
    if (e % 2 === 1) result = mul(result, base);
    base = mul(base, base);
    e = Math.floor(e / 2);
  }
  return result;
}

/**
 * xoshiro128** (Blackman & Vigna, "Scrambled linear pseudorandom number generators"), seeded
 * through splitmix32 so that any 32-bit seed gives a well-mixed state. Deterministic: a failing
 * case is reproduced from its printed seed.
 */
export class Rng {
  private s0: number;
  private s1: number;
  private s2: number;
  private s3: number;

  constructor(readonly seed: number) {
    let z = seed >>> 0;
    const next = (): number => {
      z = (z + 0x9e3779b9) >>> 0;
      let t = z;
      t = Math.imul(t ^ (t >>> 16), 0x21f0aaad);
      t = Math.imul(t ^ (t >>> 15), 0x735a2d97);
      return (t ^ (t >>> 15)) >>> 0;
    };
    this.s0 = next();
    this.s1 = next();
    this.s2 = next();
    this.s3 = next();
    if ((this.s0 | this.s1 | this.s2 | this.s3) === 0) this.s0 = 1;
  }

  /** A uniform 32-bit unsigned integer. */
  u32(): number {
    const result = Math.imul(rotl(Math.imul(this.s1, 5), 7), 9) >>> 0;
    const t = this.s1 << 9;
    this.s2 ^= this.s0;
    this.s3 ^= this.s1;
    this.s1 ^= this.s2;
    this.s0 ^= this.s3;
    this.s2 ^= t;
    this.s3 = rotl(this.s3, 11);
    return result;
  }

  /** A uniform residue mod P (rejection sampling on 26 bits). */
  residue(): number {
    for (;;) {
      const x = this.u32() & 0x3ffffff;
      if (x < P) return x;
    }
  }

  /** A uniform integer in [lo, hi] (inclusive). */
  int(lo: number, hi: number): number {
    const span = hi - lo + 1;
    return lo + Math.floor((this.u32() / 4294967296) * span);
  }

  pick<T>(items: readonly T[]): T {
    if (items.length === 0) throw new RangeError('pick from an empty list');
    return items[this.int(0, items.length - 1)] as T;
  }

  /** true with probability q. */
  chance(q: number): boolean {
    return this.u32() / 4294967296 < q;
  }

  /** A fresh seed for a sub-stream. */
  fork(): number {
    return this.u32();
  }
}

function rotl(x: number, k: number): number {
  return (x << k) | (x >>> (32 - k));
}

/** Fills a new array with uniform residues. */
export function randomVector(rng: Rng, length: number): Float64Array {
  const v = new Float64Array(length);
  for (let i = 0; i < length; i++) v[i] = rng.residue();
  return v;
}

/**
 * Rank mod P of a rows×cols matrix stored row-major. The array is overwritten (it becomes the
 * row-echelon form).
 */
export function rankInPlace(m: Float64Array, rows: number, cols: number): number {
  let rank = 0;
  for (let c = 0; c < cols && rank < rows; c++) {
    let pivot = -1;
    for (let r = rank; r < rows; r++) {
      if (m[r * cols + c] !== 0) {
        pivot = r;
        break;
      }
    }
    if (pivot < 0) continue;
    const po = rank * cols;
    if (pivot !== rank) {
      const qo = pivot * cols;
      for (let k = c; k < cols; k++) {
        const t = m[qo + k] as number;
        m[qo + k] = m[po + k] as number;
        m[po + k] = t;
      }
    }
    const scale = inv(m[po + c] as number);
    for (let k = c; k < cols; k++) m[po + k] = mul(m[po + k] as number, scale);
    for (let r = rank + 1; r < rows; r++) {
      const ro = r * cols;
      const f = m[ro + c] as number;
      if (f === 0) continue;
      const nf = P - f;
      for (let k = c; k < cols; k++) {
        // m[ro+k] + nf·m[po+k] < 2^26 + 2^52 < 2^53: exact before the reduction.
        const x = (m[ro + k] as number) + nf * (m[po + k] as number);
        let y = x - Math.floor(x / P) * P;
        if (y < 0) y += P;
        else if (y >= P) y -= P;
        m[ro + k] = y;
      }
    }
    rank++;
  }
  return rank;
}

/** Rank mod P without touching the input. */
export function rank(m: Float64Array, rows: number, cols: number): number {
  return rankInPlace(Float64Array.from(m), rows, cols);
}
