/**
 * The degree rule's frontiers graded by total degree (derived here; DEVELOPERS.md, "Graded
 * degree"). When the output is a homogeneous polynomial of total degree N in the inputs, its part
 * of degree e in x_A has degree N − e in x_B, and is a combination of the side-A frontier's
 * monomials of x_A-degree e (a_e of them) and of the side-B frontier's monomials of x_B-degree
 * N − e (b_{N−e}): the separation rank is at most Σ_e min(a_e, b_{N−e}).
 */
import { OP_CONST, OP_INPUT, OP_LINEAR, OP_PRODUCT, type Circuit } from '../network/circuit.js';
import { frontierCounts, sideFrontiers, type SideReach } from './degree-bound.js';

/** Total degrees beyond this are not graded (the counts are kept per degree up to N). */
const MAX_DEGREE = 4096;
/** Multiply-adds of big integers the two frontier products may take. */
const MAX_WORK = 300_000;

export interface GradedBound {
  readonly rank: bigint;
  /** The side-A frontier as cut entries. */
  readonly counts: Map<number, Map<number, number>>;
}

/**
 * Total degree of every node in the inputs jointly; -1 for a node that is not homogeneous (a sum
 * of terms of different degrees, or a node reading one).
 */
export function totalDegrees(c: Circuit): Int32Array {
  const { op, childStart, childList } = c;
  const deg = new Int32Array(c.size);
  for (let v = 0; v < c.size; v++) {
    const kind = op[v];
    if (kind === OP_INPUT) deg[v] = 1;
    else if (kind === OP_CONST) deg[v] = 0;
    else {
      let d = kind === OP_PRODUCT ? 0 : -2;
      for (let i = childStart[v]!; i < childStart[v + 1]! && d !== -1; i++) {
        const g = deg[childList[i]!]!;
        if (g < 0) d = -1;
        else if (kind === OP_PRODUCT) d = Math.min(d + g, MAX_DEGREE + 1);
        else if (kind === OP_LINEAR || d === -2) d = g;
        else if (d !== g) d = -1;
      }
      deg[v] = d === -2 ? 0 : d;
    }
  }
  return deg;
}

/** Frontiers counted per side (the best by the ungraded bound, then the side's inputs). */
const FRONTIERS = 4;

export function gradedDegreeBound(c: Circuit, reach: SideReach, deg: Int32Array): GradedBound | null {
  const n = deg[c.top]!;
  if (n < 0 || n > MAX_DEGREE) return null;
  const fa = sideFrontiers(c, reach, 1, FRONTIERS);
  const a = perDegreeMin(fa.map((f) => gradeCounts(c, f, deg, n, reach.exact)));
  const b = a && perDegreeMin(sideFrontiers(c, reach, 2, FRONTIERS).map((f) => gradeCounts(c, f, deg, n, reach.exact)));
  if (!a || !b) return null;
  let rank = 0n;
  for (let e = 0; e <= n; e++) rank += a[e]! < b[n - e]! ? a[e]! : b[n - e]!;
  return rank === 0n ? null : { rank, counts: frontierCounts(c, fa[0]!) };
}

/**
 * Per degree, the smallest count over the frontiers: h_e is a combination of each frontier's
 * monomials of degree e, so of the fewest of them. null when no frontier could be counted.
 */
function perDegreeMin(all: (bigint[] | null)[]): bigint[] | null {
  let out: bigint[] | null = null;
  for (const counts of all) {
    if (!counts) continue;
    if (!out) out = [...counts];
    else for (let e = 0; e < out.length; e++) if (counts[e]! < out[e]!) out[e] = counts[e]!;
  }
  return out;
}

/**
 * The coefficients up to t^N of Π_v Σ_{e_v} C(D_v + e_v − 1, e_v)·t^{e_v·g_v}, e_v from 0 (exactly
 * d_v when no sum lies above v) to d_v: the number of frontier monomials per degree in the
 * side's inputs. Counted in doubles, exact while every count stays below 2^53; null when one does
 * not (the rule is for networks whose ranks are small enough to matter by a few units), when a
 * frontier node is not homogeneous, or when the work would be too large.
 */
function gradeCounts(c: Circuit, frontier: Map<number, number>, deg: Int32Array, n: number, exact: Uint8Array): bigint[] | null {
  let counts = new Float64Array(n + 1);
  let next = new Float64Array(n + 1);
  counts[0] = 1;
  let top = 0; // highest degree with a nonzero count
  let work = 0;
  const monomials: number[] = [];
  for (const [v, d] of frontier) {
    const g = deg[v]!;
    if (g <= 0) return null;
    const dim = c.dim[v]!;
    const lo = exact[v] ? d : 0;
    const hi = Math.min(d, Math.floor(n / g));
    if (lo > hi) return null;
    // The number of monomials of degree e in dim variables, e = 0 … hi (each step's product is
    // divisible by e).
    monomials.length = 0;
    monomials.push(1);
    for (let e = 1; e <= hi; e++) {
      const product = monomials[e - 1]! * (dim + e - 1);
      if (product >= EXACT) return null;
      monomials.push(product / e);
    }
    work += (top + 1) * (hi - lo + 1);
    if (work > MAX_WORK) return null;
    next.fill(0, 0, Math.min(n, top + hi * g) + 1);
    let nextTop = 0;
    for (let x = 0; x <= top; x++) {
      const cx = counts[x]!;
      if (cx === 0) continue;
      for (let e = lo; e <= hi; e++) {
        const y = x + e * g;
        if (y > n) break;
        const sum = next[y]! + cx * monomials[e]!;
        if (sum >= EXACT) return null;
        next[y] = sum;
        if (y > nextTop) nextTop = y;
      }
    }
    [counts, next] = [next, counts];
    top = nextTop;
  }
  // Entries above the top are left over from earlier products in this buffer.
  counts.fill(0, top + 1);
  return Array.from(counts, (x) => BigInt(x));
}

const EXACT = 2 ** 53;
