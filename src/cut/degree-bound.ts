/**
 * Upper bounds by polynomial degree, for networks that reuse inputs or states (overlapping
 * windows, deep recurrence). There the min-cut of the duplicated tree can be very loose, and the
 * input-side cap M^|A| is not even valid: one reused input can carry more than M functions.
 *
 * Take a frontier F of nodes that depend on side-A inputs only, such that every path from an A
 * input to the output passes through F. The output is then a polynomial in the values of F (with
 * coefficients depending on x_B), of degree at most d_v in node v, where d_v counts the paths from
 * v to the output that leave the pure region at once. The functions of x_A that can appear are
 * spanned by monomials, so the separation rank is at most Π_v C(D_v + d_v, d_v), or
 * Π_v C(D_v + d_v − 1, d_v) when the function is homogeneous in each v (no sum on a path from v to
 * the output; per node). The frontier is
 * swept over every down-closed prefix of the pure nodes in topological order; the best is kept.
 * `graded-degree.ts` grades the same frontiers by total degree.
 */
import { OP_CONST, OP_INPUT, OP_SUM, type Circuit } from '../network/circuit.js';

export interface DegreeBound {
  /** log2 of the bound, approximate (log-gamma): for choosing between bounds before writing one out. */
  readonly log2: number;
  /** The exact bound; computed on demand since it can have millions of digits. */
  readonly rank: () => bigint;
  /** The frontier: tag → node dim → number of frontier nodes. */
  readonly counts: Map<number, Map<number, number>>;
}

const SAFE = 2 ** 52;

export function degreeBound(c: Circuit, side: Uint8Array, reach: SideReach | null = sideReach(c, side)): DegreeBound | null {
  if (!reach) return null;
  const { dep, paths } = reach;
  let best: { step: number; mask: number; log: number } | null = null;
  for (const mask of [1, 2]) {
    const found = sweepOf(c, reach, mask).best;
    if (found && (!best || found.log < best.log)) best = { step: found.step, mask, log: found.log };
  }
  if (!best) return null;
  const degrees = frontierAt(c, dep, paths, best.mask, best.step);
  const rank = (): bigint => productTree([...degrees].map(([v, d]) => binomial(c.dim[v]! + d - reach.exact[v]!, d)));
  return { log2: best.log, rank, counts: frontierCounts(c, degrees) };
}

/**
 * Per node: which sides its value reads (1 = A, 2 = B, 3 = both), its number of paths to the
 * output, and whether every such path is free of sums (`exact`: the output is then homogeneous of
 * degree exactly d_v in the node's value, since a product adds its children's degrees and a linear
 * map keeps them; only a sum can join terms of different degrees).
 */
export interface SideReach {
  readonly dep: Uint8Array;
  readonly paths: Float64Array;
  readonly exact: Uint8Array;
}

/** null when some path count is too large to hold exactly. */
export function sideReach(c: Circuit, side: Uint8Array): SideReach | null {
  const n = c.size;
  const dep = new Uint8Array(n);
  const { op, childStart, childList } = c;
  for (let v = 0; v < n; v++) {
    if (op[v] === OP_INPUT) dep[v] = side[c.position[v]!] === 1 ? 1 : 2;
    else if (op[v] !== OP_CONST) {
      let m = 0;
      for (let i = childStart[v]!; i < childStart[v + 1]!; i++) m |= dep[childList[i]!]!;
      dep[v] = m;
    }
  }
  const paths = new Float64Array(n);
  const sumAbove = new Uint8Array(n);
  paths[c.top] = 1;
  for (let v = n - 1; v >= 0; v--) {
    const p = paths[v]!;
    if (p === 0) continue;
    if (p > SAFE) return null;
    const below = sumAbove[v]! | (op[v] === OP_SUM ? 1 : 0);
    for (let i = childStart[v]!; i < childStart[v + 1]!; i++) {
      const ch = childList[i]!;
      paths[ch] = paths[ch]! + p;
      sumAbove[ch] = sumAbove[ch]! | below;
    }
  }
  const exact = new Uint8Array(n);
  for (let v = 0; v < n; v++) exact[v] = paths[v]! > 0 && sumAbove[v] === 0 ? 1 : 0;
  return { dep, paths, exact };
}

/**
 * Frontiers of one side (mask 1 = A, 2 = B), node → its degree d_v: the `count` with the smallest
 * ungraded bounds among the sweep's steps, best first, then (with `ends`) the earliest one (the
 * side's inputs, which come first in topological order) and the latest one (the side's whole
 * pure region) when they are not among them; empty when the side reaches nothing.
 */
export function sideFrontiers(c: Circuit, reach: SideReach, mask: number, count: number, ends = true): Map<number, number>[] {
  const steps = sweepOf(c, reach, mask).steps;
  const chosen = smallest(steps, count);
  if (ends) for (const end of [steps[0], steps[steps.length - 1]]) if (end && !chosen.includes(end)) chosen.push(end);
  // The graded and partner-ideal rules read the same frontiers: each is made once per partition.
  let bySide = frontierCache.get(reach);
  if (!bySide) frontierCache.set(reach, (bySide = [new Map(), new Map(), new Map()]));
  const made = bySide[mask]!;
  const missing = chosen.map((s) => s.step).filter((step) => !made.has(step));
  if (missing.length > 0) for (const [step, f] of frontiersAt(c, reach.dep, reach.paths, mask, missing)) made.set(step, f);
  return chosen.map((s) => made.get(s.step)!);
}

/** The `count` steps of smallest log2 bound, smallest first, the earlier of equal ones first (a stable sort's prefix). */
function smallest(steps: SweepResult[], count: number): SweepResult[] {
  const out: SweepResult[] = [];
  if (count <= 0) return out;
  for (const s of steps) {
    if (out.length === count && s.log >= out[count - 1]!.log) continue;
    let i = out.length;
    while (i > 0 && out[i - 1]!.log > s.log) i--;
    out.splice(i, 0, s);
    if (out.length > count) out.pop();
  }
  return out;
}

const frontierCache = new WeakMap<SideReach, Map<number, Map<number, number>>[]>();

/** `frontierAt` for several steps in one pass of the sweep, read off at each step asked for. */
function frontiersAt(c: Circuit, dep: Uint8Array, paths: Float64Array, mask: number, steps: number[]): Map<number, Map<number, number>> {
  const { childStart, childList } = c;
  const wanted = [...new Set(steps)].sort((x, y) => x - y);
  const out = new Map<number, Map<number, number>>();
  const d = new Float64Array(c.size);
  let next = 0;
  for (let v = 0; v < c.size && next < wanted.length; v++) {
    if (dep[v] === mask && paths[v] !== 0) {
      for (let i = childStart[v]!; i < childStart[v + 1]!; i++) {
        const ch = childList[i]!;
        if (d[ch]! > 0) d[ch] = d[ch]! - paths[v]!;
      }
      d[v] = paths[v]!;
    }
    if (wanted[next] !== v) continue;
    const degrees = new Map<number, number>();
    for (let u = 0; u <= v; u++) if (d[u]! > 0) degrees.set(u, d[u]!);
    out.set(wanted[next++]!, degrees);
  }
  return out;
}

/** The frontier as cut entries: tag → node dim → number of frontier nodes. */
export function frontierCounts(c: Circuit, degrees: Map<number, number>): Map<number, Map<number, number>> {
  const counts = new Map<number, Map<number, number>>();
  for (const [v] of degrees) {
    const tag = c.bondTag[v]!;
    let byDim = counts.get(tag);
    if (!byDim) counts.set(tag, (byDim = new Map()));
    byDim.set(c.dim[v]!, (byDim.get(c.dim[v]!) ?? 0) + 1);
  }
  return counts;
}

interface SweepResult {
  step: number;
  log: number;
}

/** The sweep of one side, made once per partition (the degree and graded rules both read it). */
const sweeps = new WeakMap<SideReach, { best: SweepResult | null; steps: SweepResult[] }[]>();

function sweepOf(c: Circuit, reach: SideReach, mask: number): { best: SweepResult | null; steps: SweepResult[] } {
  let bySide = sweeps.get(reach);
  if (!bySide) sweeps.set(reach, (bySide = []));
  let done = bySide[mask];
  if (!done) {
    const steps: SweepResult[] = [];
    done = bySide[mask] = { best: sweep(c, reach, mask, steps), steps };
  }
  return done;
}

/** Adds the pure nodes of one side in topological order, keeping the frontier and its log2 bound: the best step. */
function sweep(c: Circuit, reach: SideReach, mask: number, all?: SweepResult[]): SweepResult | null {
  const { op, childStart, childList, dim } = c;
  const { dep, paths, exact } = reach;
  const d = new Float64Array(c.size);
  // The current log2 term of each frontier node, kept so that removing it costs no log-gamma.
  const held = new Float64Array(c.size);
  const term = (v: number): number => (held[v] = log2Binomial(dim[v]! + d[v]! - exact[v]!, d[v]!));
  let inputsLeft = 0;
  for (let v = 0; v < c.size; v++) if (op[v] === OP_INPUT && dep[v] === mask && paths[v]! > 0) inputsLeft++;
  if (inputsLeft === 0) return null;
  let total = 0;
  let best: SweepResult | null = null;
  for (let v = 0; v < c.size; v++) {
    if (dep[v] !== mask || paths[v] === 0) continue;
    for (let i = childStart[v]!; i < childStart[v + 1]!; i++) {
      const ch = childList[i]!;
      if (d[ch]! > 0) {
        total -= held[ch]!;
        d[ch] = d[ch]! - paths[v]!;
        if (d[ch]! > 0) total += term(ch);
      }
    }
    d[v] = paths[v]!;
    total += term(v);
    if (op[v] === OP_INPUT) inputsLeft--;
    if (inputsLeft === 0) all?.push({ step: v, log: total });
    if (inputsLeft === 0 && (!best || total < best.log - 1e-9)) best = { step: v, log: total };
  }
  return best;
}

/** The frontier of `sweep` after the given step: node → degree (the same steps, without the log2 terms). */
function frontierAt(c: Circuit, dep: Uint8Array, paths: Float64Array, mask: number, step: number): Map<number, number> {
  const { childStart, childList } = c;
  const d = new Float64Array(c.size);
  for (let v = 0; v <= step; v++) {
    if (dep[v] !== mask || paths[v] === 0) continue;
    for (let i = childStart[v]!; i < childStart[v + 1]!; i++) {
      const ch = childList[i]!;
      if (d[ch]! > 0) d[ch] = d[ch]! - paths[v]!;
    }
    d[v] = paths[v]!;
  }
  const degrees = new Map<number, number>();
  for (let u = 0; u <= step; u++) if (d[u]! > 0) degrees.set(u, d[u]!);
  return degrees;
}

/** log2 C(n, k) through log-factorials; only used to choose a frontier, never as the reported value. */
export function log2Binomial(n: number, k: number): number {
  if (k <= 0 || k >= n) return 0;
  return (lnFactorial(n) - lnFactorial(k) - lnFactorial(n - k)) / Math.LN2;
}

const TABLE_SIZE = 4096;
const LN_FACTORIAL = (() => {
  const t = new Float64Array(TABLE_SIZE);
  for (let i = 2; i < TABLE_SIZE; i++) t[i] = t[i - 1]! + Math.log(i);
  return t;
})();

/** ln n!: a table below 4096, Stirling's series above (error below 1e-15 relative there). */
function lnFactorial(n: number): number {
  if (n < TABLE_SIZE) return LN_FACTORIAL[n]!;
  const x = n + 1;
  return (x - 0.5) * Math.log(x) - x + 0.9189385332046728 + 1 / (12 * x) - 1 / (360 * x * x * x);
}

/** Product of many integers, multiplied pairwise so that the operands stay balanced. */
export function productTree(xs: bigint[]): bigint {
  if (xs.length === 0) return 1n;
  let level = xs;
  while (level.length > 1) {
    const next: bigint[] = [];
    for (let i = 0; i < level.length; i += 2) next.push(i + 1 < level.length ? level[i]! * level[i + 1]! : level[i]!);
    level = next;
  }
  return level[0]!;
}

/**
 * min(cap, C(k + count − 1, count)): the dimension of the span of the count-th tensor powers of
 * `cap` generic points of a k-dimensional space (the Veronese variety spans the symmetric power).
 */
export function powerSpan(k: number, count: number, cap: bigint): bigint {
  const sym = binomial(k + count - 1, count);
  return sym < cap ? sym : cap;
}

/**
 * Sylvester's inequality for Σ_{c<r} f_c(x_A)·g_c(x_B) whose f_c are products of a factors
 * ⟨w_c, x_p⟩ and g_c of b, with r generic rows w_c in a k-dimensional space: the rank is at least
 * powerSpan(a) + powerSpan(b) − r (may be ≤ 1: nothing proven).
 */
export function sylvesterPowerSpan(k: number, a: number, b: number, r: bigint): bigint {
  return powerSpan(k, a, r) + powerSpan(k, b, r) - r;
}

/** Exact C(n, k) for non-negative integers. */
export function binomial(n: number, k: number): bigint {
  if (k < 0 || k > n) return 0n;
  const kk = Math.min(k, n - k);
  let r = 1n;
  for (let i = 1; i <= kk; i++) r = (r * BigInt(n - kk + i)) / BigInt(i);
  return r;
}
