/**
 * An upper bound for circuits with sums (residual blocks, branch merges, concatenations,
 * flatten + dense, overlapping convolutions) that propagates four rank bounds per node instead of
 * cutting a tensor network. For the vector function F_v(x_A, x_B) ∈ R^D computed at node v:
 *
 *   ρ_A(v) ≥ rank of F_v as a matrix with rows (x_A, output index) and columns x_B,
 *   ρ_B(v) ≥ rank with rows x_A and columns (x_B, output index),
 *   κ(v)  ≥ the separation rank of each coordinate F_v[o],
 *   λ(v)  ≥ the separation rank of every linear functional ⟨w, F_v⟩.
 *
 * Each rule is an inequality between functions (derived here; DEVELOPERS.md, "Rank
 * propagation"), so the bound holds for every choice of weights, and also when a node is reused:
 * - input on side A: ρ_A = κ = λ = 1, ρ_B ≤ M; any node that reads one side only is alike.
 * - linear map: ρ_s(W F) ≤ ρ_s(F); λ(W F) ≤ λ(F) and κ(W F) ≤ λ(F) (a coordinate of W F and a
 *   functional of it are functionals of F).
 * - product (δ over the output index): ρ_s and κ multiply over the children, a child that appears
 *   a times contributing C(x + a − 1, a) instead of x^a (its a-th power lies in a symmetric
 *   power); λ ≤ D·κ (a functional is a sum over the D coordinates).
 * - sum: children that are linear images of one node count once (a sum of linear images of F is a
 *   linear image of F); the terms that read side A only form one function of x_A, which adds 1
 *   to ρ_A, κ and λ and at most D to ρ_B; likewise side B; every other term adds its ranks
 *   (subadditivity), its λ to κ and λ.
 * - any node: moving the output index across costs its dimension D: ρ_A ≤ D·ρ_B, ρ_A ≤ D·κ;
 *   λ ≤ min(ρ_A, ρ_B) and κ ≤ λ.
 * - additive parts (additive-parts.ts): F_v = P_A + P_B + R_v, parts that read one side only and
 *   a rest whose functionals have separation rank ≤ μ; λ, κ ≤ [P_A ≠ 0] + [P_B ≠ 0] + μ. Sums add
 *   the parts term by term, so a network without products keeps λ ≤ 2, and a product of
 *   separable factors is expanded term by term.
 * The separation rank of h = ⟨w, F_top⟩ is at most λ(top). Values are exact integers (numbers
 * while below 2^53, then bigints); a log2 pass first measures the sizes, and the exact pass runs
 * on doubles, working out again in integers only the nodes whose values reach 2^53.
 */
import { OP_CONST, OP_INPUT, OP_LINEAR, OP_PRODUCT, OP_SUM, type Circuit } from '../network/circuit.js';
import type { CutCounts } from './tree-min-cut.js';
import { AdditiveParts, PARTS_EXPANDED, PARTS_FOLDED, PARTS_TRIVIAL, type Arith } from './additive-parts.js';

/** An exact integer: a number while below 2^53, then a bigint. */
type Int = number | bigint;

const SAFE = 2 ** 53;

function big(x: Int): bigint {
  return typeof x === 'bigint' ? x : BigInt(x);
}

function mulInt(a: Int, b: Int): Int {
  if (typeof a === 'number' && typeof b === 'number') {
    const r = a * b;
    if (r < SAFE) return r;
  }
  return big(a) * big(b);
}

function addInt(a: Int, b: Int): Int {
  if (typeof a === 'number' && typeof b === 'number') {
    const r = a + b;
    if (r < SAFE) return r;
  }
  return big(a) + big(b);
}

function minInt(a: Int, b: Int): Int {
  return a <= b ? a : b;
}



/** C(x + a − 1, a): the dimension of the a-th symmetric power of an x-dimensional space. */
function symPowInt(x: Int, a: number): Int {
  if (a === 1) return x;
  const n = big(x) + BigInt(a - 1);
  let r = 1n;
  for (let i = 0; i < a; i++) r = (r * (n - BigInt(i))) / BigInt(i + 1);
  return r < BigInt(SAFE) ? Number(r) : r;
}

/** log2 C(2^x + a − 1, a), without forming 2^x when it is huge. */
function symPowLog2(x: number, a: number): number {
  let r = 0;
  // log2 Π_{i<a} (2^x + i)/(i + 1)
  for (let i = 0; i < a; i++) r += (x > 50 ? x : Math.log2(2 ** x + i)) - Math.log2(i + 1);
  return r;
}

/** The additive parts' arithmetic (additive-parts.ts): log2 values, for the log pass. */
const LOG_ARITH: Arith<number> = {
  one: 0,
  zero: -Infinity,
  ones: (n) => new Float64Array(n),
  of: (n) => Math.log2(n),
  mul: (a, b) => a + b,
  add: (a, b) => (a === -Infinity ? b : b === -Infinity ? a : Math.max(a, b) + Math.log2(1 + 2 ** -Math.abs(a - b))),
  le: (a, b) => a <= b,
  symPow: symPowLog2,
};

/** Doubles, for the double pass: exact below 2^53, and a value at or above it stands for one at least that large. */
const DOUBLE_ARITH: Arith<number> = {
  one: 1,
  zero: 0,
  ones: (n) => new Float64Array(n).fill(1),
  of: (n) => n,
  mul: (a, b) => a * b,
  add: (a, b) => a + b,
  le: (a, b) => a <= b,
  symPow: (x, a) => (x >= SAFE ? x : Number(symPowInt(x, a))),
};

/** Exact integers, for the nodes the exact pass works out again. */
const INT_ARITH: Arith<Int> = {
  one: 1,
  zero: 0,
  ones: (n) => new Array<Int>(n).fill(1),
  of: (n) => n,
  mul: mulInt,
  add: addInt,
  le: (a, b) => a <= b,
  symPow: symPowInt,
};

/** Why a node's value is what it is, for naming the layers whose widths enter the bound. */
const FROM_CHILDREN = 0;
const FROM_DIM_OTHER = 1;
const FROM_DIM_KAPPA = 2;
const FROM_PURE = 3;
const FROM_SIDE_A = 4;
const FROM_SIDE_B = 5;
const FROM_PURE_FACTOR = 6;
const FROM_ADDITIVE = 7;

export interface RankPropagation {
  /** log2 of the bound (from the log pass; the exact value may differ in the last digits). */
  readonly log2: number;
  /** The exact bound, or undefined when some node's value exceeds the bit limit (computed on demand). */
  readonly rank: () => bigint | undefined;
  /** The widths that enter the bound: tag → dimension → count (found on first use). */
  readonly counts: CutCounts;
}

/** The exact pass is skipped when any node's value would exceed this many bits. */
const MAX_BITS = 4_000_000;

/**
 * @param whole the circuit that `c` was cut from (`headCone`): the bit limit of the exact pass
 *   looks at all of its nodes, as it did before the cone was cut, so that cutting it changes no
 *   bound.
 */
export function rankPropagation(c: Circuit, side: Uint8Array, whole: Circuit = c): RankPropagation {
  const plan = planOf(c);
  const logs = propagateFloat(c, plan, side, true);
  let largest = 0;
  for (let v = 0; v < c.size; v++) largest = Math.max(largest, logs.ra[v]!, logs.rb[v]!);
  const tooLarge = (): boolean => {
    if (largest > MAX_BITS) return true;
    // The margin covers the rounding of the ceiling and of the log pass.
    if (whole === c || ceilingOf(whole) * (1 + 1e-9) + 1 <= MAX_BITS) return false;
    // The ceiling cannot rule it out: the log pass over the whole circuit says.
    const all = propagateFloat(whole, planOf(whole), side, true);
    let most = 0;
    for (let v = 0; v < whole.size; v++) most = Math.max(most, all.ra[v]!, all.rb[v]!);
    return most > MAX_BITS;
  };
  const rank = (): bigint | undefined => (tooLarge() ? undefined : exactTop(c, plan, side));
  let counts: CutCounts | undefined;
  return {
    log2: logs.lam[c.top]!,
    rank,
    get counts(): CutCounts {
      return (counts ??= recordWidths(c, plan, logs));
    },
  };
}

const ceilings = new WeakMap<Circuit, number>();

/**
 * A log2 ceiling on ρ_A and ρ_B of every node for every partition: the rules with every minimum
 * left out. An input, or a node that reads one side only, is at most its dimension; a product at
 * most the product of its children (C(x + a − 1, a) ≤ x^a); a sum of k children at most k + 2
 * times the largest (the pure groups and a constant add at most two terms). Computed once per
 * circuit.
 */
function ceilingOf(c: Circuit): number {
  const hit = ceilings.get(c);
  if (hit !== undefined) return hit;
  const { op, dim, childStart, childList } = c;
  const w = new Float64Array(c.size);
  let most = 0;
  // Neighbouring nodes mostly share a dimension (one layer makes them): its log2 is kept.
  let lastDim = 1;
  let lastLog = 0;
  for (let v = 0; v < c.size; v++) {
    if (dim[v] !== lastDim) {
      lastDim = dim[v]!;
      lastLog = Math.log2(lastDim);
    }
    let x = lastLog;
    const kind = op[v];
    if (kind === OP_LINEAR) x = Math.max(x, w[childList[childStart[v]!]!]!);
    else if (kind === OP_PRODUCT) {
      let s = 0;
      for (let i = childStart[v]!; i < childStart[v + 1]!; i++) s += w[childList[i]!]!;
      x = Math.max(x, s);
    } else if (kind === OP_SUM) {
      let m = 0;
      for (let i = childStart[v]!; i < childStart[v + 1]!; i++) m = Math.max(m, w[childList[i]!]!);
      x = Math.max(x, m + Math.log2(childStart[v + 1]! - childStart[v]! + 2));
    }
    w[v] = x;
    most = Math.max(most, x);
  }
  ceilings.set(c, most);
  return most;
}

/**
 * The rules on doubles, written out for speed (most circuits are large, and this pass runs for
 * every partition): in log2 (`log`) to measure sizes and name the widths, or on the values
 * themselves, which are exact while below 2^53 (see `exactTop`). Nothing is allocated per node:
 * sums run in `FloatSums` slots.
 */
function propagateFloat(c: Circuit, plan: Plan, side: Uint8Array, log: boolean): Propagated {
  const n = c.size;
  const { op, dim, childStart, childList } = c;
  const { start, childOf, times } = plan;
  const dep = new Uint8Array(n);
  // The same arithmetic as the additive parts': log2 values, or doubles (a value at or above 2^53
  // only stands for one that large, see `exactTop`, and its power is not formed).
  const ar = log ? LOG_ARITH : DOUBLE_ARITH;
  const { one, zero, of, mul, add, symPow } = ar;
  const ra = new Float64Array(n).fill(one);
  const rb = new Float64Array(n).fill(one);
  const kap = new Float64Array(n).fill(one);
  const lam = new Float64Array(n).fill(one);
  const whyA = new Uint8Array(n).fill(FROM_PURE);
  const whyB = new Uint8Array(n).fill(FROM_PURE);
  const whyL = new Uint8Array(n).fill(FROM_PURE);
  // λ with the terms that read side A only (resp. B) left out, and whether there are such terms.
  const lamNoA = new Float64Array(n).fill(one);
  const lamNoB = new Float64Array(n).fill(one);
  const pureParts = new Uint8Array(n);
  const sums = new FloatSums(log);
  const parts = new AdditiveParts<number>(n, ar);
  for (let v = 0; v < n; v++) {
    const kind = op[v];
    if (kind === OP_INPUT) {
      const onA = side[c.position[v]!] === 1;
      dep[v] = onA ? 1 : 2;
      if (onA) rb[v] = of(dim[v]!);
      else ra[v] = of(dim[v]!);
      parts.pure(v, dep[v]!, onA ? rb[v]! : ra[v]!);
      continue;
    }
    if (kind === OP_CONST) {
      parts.pure(v, 0, one);
      continue;
    }
    let d = 0;
    for (let i = childStart[v]!; i < childStart[v + 1]!; i++) d |= dep[childList[i]!]!;
    dep[v] = d;
    const D = of(dim[v]!);
    if (d !== 3) {
      const own = kind === OP_LINEAR ? childList[childStart[v]!]! : -1;
      if (d === 1) rb[v] = own >= 0 ? Math.min(rb[own]!, D) : D;
      if (d === 2) ra[v] = own >= 0 ? Math.min(ra[own]!, D) : D;
      parts.pure(v, d, d === 2 ? ra[v]! : rb[v]!);
      continue;
    }
    let a: number;
    let b: number;
    let k: number;
    let l: number;
    let lWhy = FROM_CHILDREN;
    let noA: number;
    let noB: number;
    if (kind === OP_LINEAR) {
      const ch = childList[childStart[v]!]!;
      a = ra[ch]!;
      b = rb[ch]!;
      l = lam[ch]!;
      k = l;
      noA = lamNoA[ch]!;
      noB = lamNoB[ch]!;
      pureParts[v] = pureParts[ch]!;
    } else if (kind === OP_PRODUCT) {
      a = one;
      b = one;
      k = one;
      for (let t = start[v]!; t < start[v + 1]!; t++) {
        const ch = childOf[t]!;
        const m = times[t]!;
        a = mul(a, m === 1 ? ra[ch]! : symPow(ra[ch]!, m));
        b = mul(b, m === 1 ? rb[ch]! : symPow(rb[ch]!, m));
        k = mul(k, m === 1 ? kap[ch]! : symPow(kap[ch]!, m));
      }
      l = mul(D, k);
      lWhy = FROM_DIM_KAPPA;
      const pure = pureFactor(start, childOf, times, dep, v);
      if (pure >= 0) {
        // c ⊙ (G_s + G'): the side-s part is one function of x_s; the rest is seen through the
        // span of c's coordinates (DEVELOPERS.md, rank propagation, rule 4).
        const other = otherFactor(start, childOf, v, pure);
        const onA = dep[pure] === 1;
        const span = onA ? rb[pure]! : ra[pure]!;
        const alt = add(pureParts[other]! & (onA ? 1 : 2) ? one : zero, mul(span, onA ? lamNoA[other]! : lamNoB[other]!));
        if (alt < l) {
          l = alt;
          lWhy = FROM_PURE_FACTOR;
        }
      }
      noA = l;
      noB = l;
    } else {
      // A sum: the rule of sumExact, on doubles.
      pureParts[v] = sumFloat(v, plan, dep, ra, rb, lam, D, sums);
      a = sums.value(SUM_A);
      b = sums.value(SUM_B);
      l = sums.value(SUM_L);
      noA = sums.value(SUM_NO_A);
      noB = sums.value(SUM_NO_B);
      k = l;
    }
    const additive = parts.mixed(c, plan, v, D, l);
    if (additive < l) {
      l = additive;
      lWhy = FROM_ADDITIVE;
      k = Math.min(k, l);
    }
    whyA[v] = FROM_CHILDREN;
    whyB[v] = FROM_CHILDREN;
    whyL[v] = lWhy;
    const viaB = mul(D, b);
    const viaA = mul(D, a);
    const viaK = mul(D, k);
    if (a > Math.min(viaB, viaK)) {
      whyA[v] = viaB <= viaK ? FROM_DIM_OTHER : FROM_DIM_KAPPA;
      a = Math.min(viaB, viaK);
    }
    if (b > Math.min(viaA, viaK)) {
      whyB[v] = viaA <= viaK ? FROM_DIM_OTHER : FROM_DIM_KAPPA;
      b = Math.min(viaA, viaK);
    }
    if (l > Math.min(a, b)) {
      whyL[v] = a <= b ? FROM_SIDE_A : FROM_SIDE_B;
      l = Math.min(a, b);
    }
    ra[v] = a;
    rb[v] = b;
    lam[v] = l;
    kap[v] = Math.min(k, l);
    lamNoA[v] = Math.min(noA, l);
    lamNoB[v] = Math.min(noB, l);
    parts.settle(v, l);
  }
  return { dep, pureParts, ra, rb, kap, lam, lamNoA, lamNoB, whyA, whyB, whyL, parts };
}

/**
 * A product of exactly two distinct children, once each, of which one reads one side only and
 * the other both: the pure one (the other is `otherFactor`), else −1.
 */
function pureFactor(start: Int32Array, childOf: Int32Array, times: Int32Array, dep: Uint8Array, v: number): number {
  const t = start[v]!;
  if (start[v + 1]! - t !== 2 || times[t] !== 1 || times[t + 1] !== 1) return -1;
  const x = childOf[t]!;
  const y = childOf[t + 1]!;
  const dx = dep[x]!;
  const dy = dep[y]!;
  if ((dx === 1 || dx === 2) && dy === 3) return x;
  if ((dy === 1 || dy === 2) && dx === 3) return y;
  return -1;
}

/** The factor of a two-factor product that is not `pure`. */
function otherFactor(start: Int32Array, childOf: Int32Array, v: number, pure: number): number {
  const x = childOf[start[v]!]!;
  return x === pure ? childOf[start[v]! + 1]! : x;
}

/** The slots of `FloatSums` that `sumFloat` fills. */
const SUM_A = 0;
const SUM_B = 1;
const SUM_L = 2;
const SUM_NO_A = 3;
const SUM_NO_B = 4;
const SUM_PURE_A_ON_B = 5;
const SUM_PURE_B_ON_A = 6;

/**
 * Running sums in reusable slots, of values given as they are (exact while every partial sum
 * stays below 2^53) or by their log2 (the largest term m and Σ 2^(x − m), one power per term).
 */
class FloatSums {
  private readonly m = new Float64Array(7);
  private readonly s = new Float64Array(7);
  constructor(readonly log: boolean) {}

  clear(i: number): void {
    this.m[i] = -Infinity;
    this.s[i] = 0;
  }

  add(i: number, x: number): void {
    if (!this.log) {
      this.s[i] = this.s[i]! + x;
      return;
    }
    if (x === -Infinity) return;
    const m = this.m[i]!;
    if (x > m) {
      this.s[i] = m === -Infinity ? 1 : this.s[i]! * 2 ** (m - x) + 1;
      this.m[i] = x;
    } else this.s[i] = this.s[i]! + 2 ** (x - m);
  }

  /** The sum (its log2, −∞ for an empty sum, when `log`). */
  value(i: number): number {
    if (!this.log) return this.s[i]!;
    const m = this.m[i]!;
    return m === -Infinity ? -Infinity : m + Math.log2(this.s[i]!);
  }
}

/** A term's rank (`termExact`) on doubles. */
function termFloat(plan: Plan, t: number, r: Float64Array, log: boolean): number {
  const { childOf, mStart, members } = plan;
  const node = childOf[t]!;
  const from = mStart[t]!;
  const to = mStart[t + 1]!;
  if (from === to) return r[node]!;
  let sum = r[members[from]!]!;
  for (let i = from + 1; i < to; i++) {
    const x = r[members[i]!]!;
    sum = log ? Math.max(sum, x) + Math.log2(1 + 2 ** -Math.abs(sum - x)) : sum + x;
  }
  return Math.min(r[node]!, sum);
}

/**
 * The rule of `sumExact` on doubles, for `propagateFloat`: leaves ρ_A, ρ_B, λ and λ without the
 * side-A (side-B) group in the slots SUM_A, SUM_B, SUM_L, SUM_NO_A, SUM_NO_B of `sums`, and
 * returns which pure groups there are (bit 1: side A, bit 2: side B).
 */
function sumFloat(v: number, plan: Plan, dep: Uint8Array, ra: Float64Array, rb: Float64Array, lam: Float64Array, D: number, sums: FloatSums): number {
  const log = sums.log;
  const { start, childOf } = plan;
  const one = log ? 0 : 1;
  for (let i = SUM_A; i <= SUM_PURE_B_ON_A; i++) sums.clear(i);
  let pureA = false;
  let pureB = false;
  let constant = false;
  for (let t = start[v]!; t < start[v + 1]!; t++) {
    const d = dep[childOf[t]!]!;
    if (d === 0) constant = true;
    else if (d === 1) {
      pureA = true;
      sums.add(SUM_PURE_A_ON_B, termFloat(plan, t, rb, log));
    } else if (d === 2) {
      pureB = true;
      sums.add(SUM_PURE_B_ON_A, termFloat(plan, t, ra, log));
    } else {
      sums.add(SUM_A, termFloat(plan, t, ra, log));
      sums.add(SUM_B, termFloat(plan, t, rb, log));
      sums.add(SUM_L, termFloat(plan, t, lam, log));
    }
  }

  // λ without the side-A group (a constant joins that group when there is one) and without side B.
  const mixed = sums.value(SUM_L);
  const loneConstant = constant && !pureA && !pureB;
  sums.add(SUM_NO_A, mixed);
  sums.add(SUM_NO_B, mixed);
  if (pureB || loneConstant) sums.add(SUM_NO_A, one);
  if (pureA || loneConstant) sums.add(SUM_NO_B, one);
  if (loneConstant) {
    sums.add(SUM_A, one);
    sums.add(SUM_B, one);
    sums.add(SUM_L, one);
  }
  if (pureA) {
    sums.add(SUM_A, one);
    sums.add(SUM_B, Math.min(D, sums.value(SUM_PURE_A_ON_B)));
    sums.add(SUM_L, one);
  }
  if (pureB) {
    sums.add(SUM_A, Math.min(D, sums.value(SUM_PURE_B_ON_A)));
    sums.add(SUM_B, one);
    sums.add(SUM_L, one);
  }
  return (pureA ? 1 : 0) | (pureB ? 2 : 0);
}

/**
 * What the passes need about the circuit's shape, computed once per circuit: the linear source of
 * every node, the distinct children of each product with their multiplicities, and the terms of
 * each sum (children grouped by their linear source).
 */
export interface Plan {
  readonly source: Int32Array;
  /** Product v: children childOf[start[v] .. start[v+1]) with multiplicity times[...]. */
  readonly start: Int32Array;
  readonly childOf: Int32Array;
  readonly times: Int32Array;
  /** Sum v: terms [start[v] .. start[v+1]); term t carries node childOf[t] and members members[mStart[t] .. mStart[t+1]). */
  readonly mStart: Int32Array;
  readonly members: Int32Array;
}

const plans = new WeakMap<Circuit, Plan>();

function planOf(c: Circuit): Plan {
  const hit = plans.get(c);
  if (hit) return hit;
  const n = c.size;
  const { op, childStart, childList } = c;
  const source = new Int32Array(n);
  const start = new Int32Array(n + 1);
  // At most one term per child link.
  const links = childList.length;
  const childOf = new Int32Array(links);
  const times = new Int32Array(links);
  const mStart = new Int32Array(links + 1);
  const members = new Int32Array(links);
  // Scratch indexed by node, valid where `seen` (resp. `grouped`) holds the current node + 1:
  // the slot of a child among the distinct children, and per linear source the size of its
  // group, its first child and the next free place of its members.
  const seen = new Int32Array(n);
  const slot = new Int32Array(n);
  const grouped = new Int32Array(n);
  const size = new Int32Array(n);
  const first = new Int32Array(n);
  const place = new Int32Array(n);
  const distinct = new Int32Array(n === 0 ? 0 : maxChildren(c));
  const order = new Int32Array(distinct.length);
  let terms = 0;
  let used = 0;
  for (let v = 0; v < n; v++) {
    start[v] = terms;
    source[v] = op[v] === OP_LINEAR ? source[childList[childStart[v]!]!]! : v;
    if (op[v] !== OP_PRODUCT && op[v] !== OP_SUM) continue;
    const stamp = v + 1;
    // The distinct children in order of first appearance, with their multiplicities.
    let k = 0;
    for (let i = childStart[v]!; i < childStart[v + 1]!; i++) {
      const ch = childList[i]!;
      if (seen[ch] === stamp) {
        if (op[v] === OP_PRODUCT) times[slot[ch]!]!++;
        continue;
      }
      seen[ch] = stamp;
      if (op[v] === OP_PRODUCT) {
        slot[ch] = terms;
        childOf[terms] = ch;
        times[terms] = 1;
        mStart[++terms] = used;
      } else distinct[k++] = ch;
    }
    if (op[v] === OP_PRODUCT) continue;
    // A sum: the distinct children grouped by linear source, groups in order of first appearance.
    let groups = 0;
    for (let j = 0; j < k; j++) {
      const ch = distinct[j]!;
      const src = source[ch]!;
      if (grouped[src] !== stamp) {
        grouped[src] = stamp;
        size[src] = 0;
        first[src] = ch;
        order[groups++] = src;
      }
      size[src]!++;
    }
    for (let g = 0; g < groups; g++) {
      const src = order[g]!;
      const alone = size[src] === 1;
      childOf[terms] = alone ? first[src]! : src;
      times[terms] = 1;
      place[src] = used;
      if (!alone) used += size[src]!;
      mStart[++terms] = used;
    }
    for (let j = 0; j < k; j++) {
      const src = source[distinct[j]!]!;
      if (size[src]! > 1) members[place[src]!++] = distinct[j]!;
    }
  }
  start[n] = terms;
  const plan: Plan = {
    source,
    start,
    childOf: childOf.slice(0, terms),
    times: times.slice(0, terms),
    mStart: mStart.slice(0, terms + 1),
    members: members.slice(0, used),
  };
  plans.set(c, plan);
  return plan;
}

function maxChildren(c: Circuit): number {
  let most = 0;
  for (let v = 0; v < c.size; v++) most = Math.max(most, c.childStart[v + 1]! - c.childStart[v]!);
  return most;
}

/** The values of the double pass, per node. */
interface Propagated {
  readonly dep: Uint8Array;
  /** Which pure groups a node's λ holds (bit 1: side A, bit 2: side B). */
  readonly pureParts: Uint8Array;
  readonly ra: Float64Array;
  readonly rb: Float64Array;
  readonly kap: Float64Array;
  readonly lam: Float64Array;
  readonly lamNoA: Float64Array;
  readonly lamNoB: Float64Array;
  readonly whyA: Uint8Array;
  readonly whyB: Uint8Array;
  readonly whyL: Uint8Array;
  /** The additive parts of every node (additive-parts.ts). */
  readonly parts: AdditiveParts<number>;
}

/**
 * λ(top) exactly. The rules run on doubles first: each step (a sum, a product, a symmetric power,
 * a minimum) is monotone on non-negative integers, and so is rounding to a double, so a value
 * that comes out below 2^53 is exact, and one at or above 2^53 stands for a value at least that
 * large, which never wins a minimum against an exact one. Only the nodes with a value at or above
 * 2^53 are then worked out again, in order, in exact integers from their children's values.
 */
function exactTop(c: Circuit, plan: Plan, side: Uint8Array): bigint {
  const small = propagateFloat(c, plan, side, false);
  const { ra, rb, kap, lam, lamNoA, lamNoB } = small;
  const large: number[] = [];
  for (let v = 0; v < c.size; v++) {
    if (ra[v]! >= SAFE || rb[v]! >= SAFE || kap[v]! >= SAFE || lam[v]! >= SAFE || lamNoA[v]! >= SAFE || lamNoB[v]! >= SAFE) large.push(v);
  }
  if (large.length === 0) return BigInt(lam[c.top]!);
  return big(propagateExact(c, plan, small, large));
}

/** Exact values of some nodes; every other node has its (exact) doubles in a `Propagated`. */
interface ExactValues {
  /** slot[v]: where node v's values are, or −1 when they are the doubles. */
  readonly slot: Int32Array;
  readonly ra: Int[];
  readonly rb: Int[];
  readonly kap: Int[];
  readonly lam: Int[];
  readonly lamNoA: Int[];
  readonly lamNoB: Int[];
}

/**
 * The rules in exact integers for the nodes `large` (in order, each reading both sides), with
 * every other node's values taken from the double pass `small`: returns λ(top).
 */
function propagateExact(c: Circuit, plan: Plan, small: Propagated, large: readonly number[]): Int {
  const { op, dim, childStart, childList } = c;
  const { start, childOf, times } = plan;
  const { dep, pureParts } = small;
  const slot = new Int32Array(c.size).fill(-1);
  large.forEach((v, i) => (slot[v] = i));
  const m = large.length;
  const ex: ExactValues = {
    slot,
    ra: new Array<Int>(m),
    rb: new Array<Int>(m),
    kap: new Array<Int>(m),
    lam: new Array<Int>(m),
    lamNoA: new Array<Int>(m),
    lamNoB: new Array<Int>(m),
  };
  const at = (doubles: Float64Array, exact: Int[], v: number): Int => valueAt(doubles, exact, slot, v);
  const parts = new AdditiveParts<Int>(c.size, INT_ARITH, small.parts);
  const sum = { a: 0 as Int, b: 0 as Int, l: 0 as Int, noA: 0 as Int, noB: 0 as Int };
  for (let i = 0; i < m; i++) {
    const v = large[i]!;
    const kind = op[v];
    const D = dim[v]!;
    let a: Int;
    let b: Int;
    let k: Int;
    let l: Int;
    let noA: Int;
    let noB: Int;
    if (kind === OP_LINEAR) {
      const ch = childList[childStart[v]!]!;
      a = at(small.ra, ex.ra, ch);
      b = at(small.rb, ex.rb, ch);
      l = at(small.lam, ex.lam, ch);
      k = l;
      noA = at(small.lamNoA, ex.lamNoA, ch);
      noB = at(small.lamNoB, ex.lamNoB, ch);
    } else if (kind === OP_PRODUCT) {
      a = 1;
      b = 1;
      k = 1;
      for (let t = start[v]!; t < start[v + 1]!; t++) {
        const ch = childOf[t]!;
        const mult = times[t]!;
        a = mulInt(a, symPowInt(at(small.ra, ex.ra, ch), mult));
        b = mulInt(b, symPowInt(at(small.rb, ex.rb, ch), mult));
        k = mulInt(k, symPowInt(at(small.kap, ex.kap, ch), mult));
      }
      l = mulInt(D, k);
      const pure = pureFactor(start, childOf, times, dep, v);
      if (pure >= 0) {
        const other = otherFactor(start, childOf, v, pure);
        const onA = dep[pure] === 1;
        const span = onA ? at(small.rb, ex.rb, pure) : at(small.ra, ex.ra, pure);
        const alt = addInt(pureParts[other]! & (onA ? 1 : 2) ? 1 : 0, mulInt(span, onA ? at(small.lamNoA, ex.lamNoA, other) : at(small.lamNoB, ex.lamNoB, other)));
        if (!(l <= alt)) l = alt;
      }
      noA = l;
      noB = l;
    } else if (kind === OP_SUM) {
      sumExact(plan, v, D, dep, small, ex, sum);
      ({ a, b, l, noA, noB } = sum);
      k = l;
    } else {
      throw new Error(`rank propagation: node kind ${kind} with a value beyond 2^53`);
    }
    const additive = parts.mixed(c, plan, v, D, l);
    if (!(l <= additive)) {
      l = additive;
      k = minInt(k, l);
    }
    const viaB = mulInt(D, b);
    const viaA = mulInt(D, a);
    const viaK = mulInt(D, k);
    if (!(a <= minInt(viaB, viaK))) a = minInt(viaB, viaK);
    if (!(b <= minInt(viaA, viaK))) b = minInt(viaA, viaK);
    if (!(l <= minInt(a, b))) l = minInt(a, b);
    ex.ra[i] = a;
    ex.rb[i] = b;
    ex.lam[i] = l;
    ex.kap[i] = minInt(k, l);
    ex.lamNoA[i] = minInt(noA, l);
    ex.lamNoB[i] = minInt(noB, l);
    parts.settle(v, l);
  }
  return at(small.lam, ex.lam, c.top);
}

/** Node v's value: its exact one when it has a slot, else its double. */
function valueAt(doubles: Float64Array, exact: Int[], slot: Int32Array, v: number): Int {
  const i = slot[v]!;
  return i >= 0 ? exact[i]! : doubles[v]!;
}

/** A term's rank: its node's, or, for several linear images of one node, the smaller of that and their sum. */
function termExact(plan: Plan, t: number, doubles: Float64Array, exact: Int[], slot: Int32Array): Int {
  const { childOf, mStart, members } = plan;
  const node = valueAt(doubles, exact, slot, childOf[t]!);
  if (mStart[t + 1] === mStart[t]) return node;
  let sum = valueAt(doubles, exact, slot, members[mStart[t]!]!);
  for (let i = mStart[t]! + 1; i < mStart[t + 1]!; i++) sum = addInt(sum, valueAt(doubles, exact, slot, members[i]!));
  return minInt(node, sum);
}

/** The sum rule in exact integers: leaves ρ_A, ρ_B, λ and λ without the side-A (side-B) group in `out`. */
function sumExact(
  plan: Plan,
  v: number,
  D: number,
  dep: Uint8Array,
  small: Propagated,
  ex: ExactValues,
  out: { a: Int; b: Int; l: Int; noA: Int; noB: Int },
): void {
  const slot = ex.slot;
  let a: Int = 0;
  let b: Int = 0;
  let l: Int = 0;
  let pureA = false;
  let pureB = false;
  let constant = false;
  let pureAonB: Int = 0;
  let pureBonA: Int = 0;
  for (let t = plan.start[v]!; t < plan.start[v + 1]!; t++) {
    const d = dep[plan.childOf[t]!]!;
    if (d === 0) constant = true;
    else if (d === 1) {
      pureA = true;
      pureAonB = addInt(pureAonB, termExact(plan, t, small.rb, ex.rb, slot));
    } else if (d === 2) {
      pureB = true;
      pureBonA = addInt(pureBonA, termExact(plan, t, small.ra, ex.ra, slot));
    } else {
      a = addInt(a, termExact(plan, t, small.ra, ex.ra, slot));
      b = addInt(b, termExact(plan, t, small.rb, ex.rb, slot));
      l = addInt(l, termExact(plan, t, small.lam, ex.lam, slot));
    }
  }
  // λ without the side-A group (a constant joins that group when there is one) and without side B.
  const loneConstant = constant && !pureA && !pureB;
  out.noA = pureB || loneConstant ? addInt(l, 1) : l;
  out.noB = pureA || loneConstant ? addInt(l, 1) : l;
  if (loneConstant) {
    a = addInt(a, 1);
    b = addInt(b, 1);
    l = addInt(l, 1);
  }
  if (pureA) {
    a = addInt(a, 1);
    b = addInt(b, minInt(D, pureAonB));
    l = addInt(l, 1);
  }
  if (pureB) {
    a = addInt(a, minInt(D, pureBonA));
    b = addInt(b, 1);
    l = addInt(l, 1);
  }
  out.a = a;
  out.b = b;
  out.l = l;
}

/**
 * The widths behind the bound: walks the choices from the head down and counts each node whose
 * dimension multiplied in. A bound that is a sum of terms names the widths of every term.
 */
function recordWidths(c: Circuit, plan: Plan, p: Propagated): CutCounts {
  const { dep, whyA, whyB, whyL } = p;
  const whyM = p.parts.why;
  const counts: CutCounts = new Map();
  // Which (node, value) pairs were visited, keyed node · 8 + value; the stack holds such keys.
  const seen = new Uint8Array(8 * c.size);
  const note = (v: number): void => {
    const tag = c.bondTag[v]!;
    let byDim = counts.get(tag);
    if (!byDim) counts.set(tag, (byDim = new Map()));
    byDim.set(c.dim[v]!, (byDim.get(c.dim[v]!) ?? 0) + 1);
  };
  const A = 0;
  const B = 1;
  const K = 2;
  const L = 3;
  // μ, the functional rank of the rest after the pure parts (additive-parts.ts).
  const MIX = 4;
  const farSide = (v: number, which: number): boolean => (which === A && dep[v] === 2) || (which === B && dep[v] === 1);
  const stack: number[] = [c.top * 8 + L];
  const push = (v: number, which: number): void => {
    stack.push(v * 8 + which);
  };
  while (stack.length > 0) {
    const key = stack.pop()!;
    if (seen[key] === 1) continue;
    seen[key] = 1;
    const v = key >>> 3;
    const which = key & 7;
    const kind = c.op[v];
    if (kind === OP_CONST) continue;
    if (which === MIX) {
      if (dep[v] !== 3) continue;
      const how = whyM[v];
      if (how === PARTS_TRIVIAL) push(v, L);
      else if (how === PARTS_EXPANDED) note(v);
      else if (how === PARTS_FOLDED) {
        // The spans of the factors' pure parts (widths) and the factors' rests.
        note(v);
        for (let t = plan.start[v]!; t < plan.start[v + 1]!; t++) if (dep[plan.childOf[t]!] === 3) push(plan.childOf[t]!, MIX);
      } else if (kind === OP_SUM) {
        for (let t = plan.start[v]!; t < plan.start[v + 1]!; t++) if (dep[plan.childOf[t]!] === 3) push(plan.childOf[t]!, MIX);
      } else push(c.childList[c.childStart[v]!]!, MIX);
      continue;
    }
    const why = which === A ? whyA[v]! : which === B ? whyB[v]! : which === L ? whyL[v]! : FROM_CHILDREN;
    if (kind === OP_INPUT || dep[v] !== 3 || why === FROM_PURE) {
      // A one-sided value crosses only through its own index.
      if (farSide(v, which)) note(v);
      continue;
    }
    if (why === FROM_ADDITIVE) {
      push(v, MIX);
      continue;
    }
    if (why === FROM_SIDE_A || why === FROM_SIDE_B) {
      push(v, why === FROM_SIDE_A ? A : B);
      continue;
    }
    if (why === FROM_PURE_FACTOR) {
      // The pure factor's span and the other factor's functionals.
      const pure = pureFactor(plan.start, plan.childOf, plan.times, dep, v);
      note(pure);
      push(otherFactor(plan.start, plan.childOf, v, pure), L);
      continue;
    }
    if (why === FROM_DIM_OTHER || why === FROM_DIM_KAPPA) {
      note(v);
      push(v, why === FROM_DIM_KAPPA ? K : which === A ? B : A);
      continue;
    }
    if (kind === OP_SUM) {
      const sub = which === K ? L : which;
      for (let t = plan.start[v]!; t < plan.start[v + 1]!; t++) {
        const node = plan.childOf[t]!;
        if (dep[node] === 3) push(node, sub);
        else if (farSide(node, sub)) note(v);
      }
      continue;
    }
    if (kind === OP_PRODUCT) {
      for (let t = plan.start[v]!; t < plan.start[v + 1]!; t++) push(plan.childOf[t]!, which);
      continue;
    }
    push(c.childList[c.childStart[v]!]!, which === K ? L : which);
  }
  return counts;
}
