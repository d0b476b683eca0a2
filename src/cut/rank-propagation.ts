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
 * The separation rank of h = ⟨w, F_top⟩ is at most λ(top). Values are exact integers (numbers
 * while below 2^53, then bigints); a log2 pass first measures the sizes.
 */
import { OP_CONST, OP_INPUT, OP_LINEAR, OP_PRODUCT, OP_SUM, type Circuit } from '../network/circuit.js';
import type { CutCounts } from './tree-min-cut.js';

type Int = number | bigint;

const SAFE = 2 ** 53;

function big(x: Int): bigint {
  return typeof x === 'bigint' ? x : BigInt(x);
}

/**
 * The arithmetic the rules run in: exact integers (numbers while below 2^53, then bigints), or
 * log2 values, which measure the sizes cheaply before the exact pass is attempted.
 */
interface Arith<T> {
  readonly one: T;
  /** The empty sum. */
  readonly zero: T;
  /** A fresh array of n ones (typed for log2 values). */
  ones(n: number): Slots<T>;
  of(n: number): T;
  mul(a: T, b: T): T;
  add(a: T, b: T): T;
  le(a: T, b: T): boolean;
  /** C(x + a − 1, a): the dimension of the a-th symmetric power of an x-dimensional space. */
  symPow(x: T, a: number): T;
}

/** Indexable storage of per-node values. */
interface Slots<T> {
  [i: number]: T;
}

const EXACT: Arith<Int> = {
  one: 1,
  zero: 0,
  ones: (n) => new Array<Int>(n).fill(1),
  of: (n) => n,
  mul: (a, b) => {
    if (typeof a === 'number' && typeof b === 'number') {
      const r = a * b;
      if (r < SAFE) return r;
    }
    return big(a) * big(b);
  },
  add: (a, b) => {
    if (typeof a === 'number' && typeof b === 'number') {
      const r = a + b;
      if (r < SAFE) return r;
    }
    return big(a) + big(b);
  },
  le: (a, b) => a <= b,
  symPow: (x, a) => {
    if (a === 1) return x;
    const n = big(x) + BigInt(a - 1);
    let r = 1n;
    for (let i = 0; i < a; i++) r = (r * (n - BigInt(i))) / BigInt(i + 1);
    return r < BigInt(SAFE) ? Number(r) : r;
  },
};

const LOG: Arith<number> = {
  one: 0,
  zero: -Infinity,
  ones: (n) => new Float64Array(n),
  of: (n) => Math.log2(n),
  mul: (a, b) => a + b,
  add: (a, b) => (a === -Infinity ? b : b === -Infinity ? a : Math.max(a, b) + Math.log2(1 + 2 ** -Math.abs(a - b))),
  le: (a, b) => a <= b,
  symPow: (x, a) => {
    let r = 0;
    // log2 Π_{i<a} (2^x + i)/(i + 1), without forming 2^x when it is huge.
    for (let i = 0; i < a; i++) r += (x > 50 ? x : Math.log2(2 ** x + i)) - Math.log2(i + 1);
    return r;
  },
};

/** Why a node's value is what it is, for naming the layers whose widths enter the bound. */
const FROM_CHILDREN = 0;
const FROM_DIM_OTHER = 1;
const FROM_DIM_KAPPA = 2;
const FROM_PURE = 3;
const FROM_SIDE_A = 4;
const FROM_SIDE_B = 5;
const FROM_PURE_FACTOR = 6;

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
    if (whole === c || ceilingOf(whole) * (1 + 1e-9) + 1 <= MAX_BITS) return false;
    // The ceiling cannot rule it out: the log pass over the whole circuit says.
    const all = propagateFloat(whole, planOf(whole), side, true);
    let most = 0;
    for (let v = 0; v < whole.size; v++) most = Math.max(most, all.ra[v]!, all.rb[v]!);
    return most > MAX_BITS;
  };
  const rank = (): bigint | undefined => {
    if (tooLarge()) return undefined;
    // Below 2^40 every value, and every step of a symmetric power, is an exact double.
    if (largest < 40) return BigInt(propagateFloat(c, plan, side, false).lam[c.top]!);
    return big(propagate(c, plan, side, EXACT).lam[c.top]!);
  };
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
  for (let v = 0; v < c.size; v++) {
    let x = Math.log2(dim[v]!);
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
 * The rules of `propagate` on doubles, written out for speed (most circuits are large, and this
 * pass runs for every partition): in log2 (`log`) to measure sizes and name the widths, or on
 * the values themselves when all of them are known to be small integers. Nothing is allocated per
 * node: sums run in `FloatSums` slots.
 */
function propagateFloat(c: Circuit, plan: Plan, side: Uint8Array, log: boolean): Propagated<number> {
  const n = c.size;
  const { op, dim, childStart, childList } = c;
  const { start, childOf, times } = plan;
  const dep = new Uint8Array(n);
  const one = log ? 0 : 1;
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
  const zero = log ? -Infinity : 0;
  const sums = new FloatSums(log);
  const of = (x: number): number => (log ? Math.log2(x) : x);
  const mul = (x: number, y: number): number => (log ? x + y : x * y);
  const add = (x: number, y: number): number => (log ? Math.max(x, y) + Math.log2(1 + 2 ** -Math.abs(x - y)) : x + y);
  const symPow = (x: number, a: number): number => (log ? LOG.symPow(x, a) : Number(EXACT.symPow(x, a)));
  for (let v = 0; v < n; v++) {
    const kind = op[v];
    if (kind === OP_INPUT) {
      const onA = side[c.position[v]!] === 1;
      dep[v] = onA ? 1 : 2;
      if (onA) rb[v] = of(dim[v]!);
      else ra[v] = of(dim[v]!);
      continue;
    }
    if (kind === OP_CONST) continue;
    let d = 0;
    for (let i = childStart[v]!; i < childStart[v + 1]!; i++) d |= dep[childList[i]!]!;
    dep[v] = d;
    const D = of(dim[v]!);
    if (d !== 3) {
      const own = kind === OP_LINEAR ? childList[childStart[v]!]! : -1;
      if (d === 1) rb[v] = own >= 0 ? Math.min(rb[own]!, D) : D;
      if (d === 2) ra[v] = own >= 0 ? Math.min(ra[own]!, D) : D;
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
      // A sum: the rule of sumRule, on doubles.
      pureParts[v] = sumFloat(v, plan, dep, ra, rb, lam, D, sums);
      a = sums.value(SUM_A);
      b = sums.value(SUM_B);
      l = sums.value(SUM_L);
      noA = sums.value(SUM_NO_A);
      noB = sums.value(SUM_NO_B);
      k = l;
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
  }
  return { dep, ra, rb, lam, whyA, whyB, whyL };
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

/** `termRank` on doubles. */
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
 * The rule of `sumRule` on doubles, for `propagateFloat`: leaves ρ_A, ρ_B, λ and λ without the
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
interface Plan {
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

interface Propagated<T> {
  readonly dep: Uint8Array;
  readonly ra: Slots<T>;
  readonly rb: Slots<T>;
  readonly lam: Slots<T>;
  readonly whyA: Uint8Array;
  readonly whyB: Uint8Array;
  readonly whyL: Uint8Array;
}

function propagate<T>(c: Circuit, plan: Plan, side: Uint8Array, ar: Arith<T>): Propagated<T> {
  const n = c.size;
  const { op, dim, childStart, childList } = c;
  const { start, childOf, times } = plan;
  const dep = new Uint8Array(n);
  const ra = ar.ones(n);
  const rb = ar.ones(n);
  const kap = ar.ones(n);
  const lam = ar.ones(n);
  const whyA = new Uint8Array(n).fill(FROM_PURE);
  const whyB = new Uint8Array(n).fill(FROM_PURE);
  const whyL = new Uint8Array(n).fill(FROM_PURE);
  const lamNoA = ar.ones(n);
  const lamNoB = ar.ones(n);
  const pureParts = new Uint8Array(n);
  const min = (a: T, b: T): T => (ar.le(a, b) ? a : b);
  for (let v = 0; v < n; v++) {
    const kind = op[v];
    if (kind === OP_INPUT) {
      const onA = side[c.position[v]!] === 1;
      dep[v] = onA ? 1 : 2;
      if (onA) rb[v] = ar.of(dim[v]!);
      else ra[v] = ar.of(dim[v]!);
      continue;
    }
    if (kind === OP_CONST) continue;
    let d = 0;
    for (let i = childStart[v]!; i < childStart[v + 1]!; i++) d |= dep[childList[i]!]!;
    dep[v] = d;
    // A node that reads one side only (or nothing) is a function of that side: ranks 1, except
    // with its output index on the far side, where its dimension caps them.
    if (d !== 3) {
      const own = kind === OP_LINEAR ? childList[childStart[v]!]! : -1;
      if (d === 1) rb[v] = own >= 0 ? min(rb[own]!, ar.of(dim[v]!)) : ar.of(dim[v]!);
      if (d === 2) ra[v] = own >= 0 ? min(ra[own]!, ar.of(dim[v]!)) : ar.of(dim[v]!);
      continue;
    }
    const D = ar.of(dim[v]!);
    let a: T;
    let b: T;
    let k: T;
    let l: T;
    let lWhy = FROM_CHILDREN;
    let noA: T;
    let noB: T;
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
      a = ar.one;
      b = ar.one;
      k = ar.one;
      for (let t = start[v]!; t < start[v + 1]!; t++) {
        const ch = childOf[t]!;
        const m = times[t]!;
        a = ar.mul(a, m === 1 ? ra[ch]! : ar.symPow(ra[ch]!, m));
        b = ar.mul(b, m === 1 ? rb[ch]! : ar.symPow(rb[ch]!, m));
        k = ar.mul(k, m === 1 ? kap[ch]! : ar.symPow(kap[ch]!, m));
      }
      l = ar.mul(D, k);
      lWhy = FROM_DIM_KAPPA;
      const pure = pureFactor(start, childOf, times, dep, v);
      if (pure >= 0) {
        const other = otherFactor(start, childOf, v, pure);
        const onA = dep[pure] === 1;
        const span = onA ? rb[pure]! : ra[pure]!;
        const alt = ar.add(pureParts[other]! & (onA ? 1 : 2) ? ar.one : ar.zero, ar.mul(span, onA ? lamNoA[other]! : lamNoB[other]!));
        if (!ar.le(l, alt)) {
          l = alt;
          lWhy = FROM_PURE_FACTOR;
        }
      }
      noA = l;
      noB = l;
    } else if (kind === OP_SUM) {
      let parts: number;
      ({ a, b, l, noA, noB, parts } = sumRule(plan, v, D, dep, ra, rb, lam, ar));
      pureParts[v] = parts;
      k = l;
    } else {
      throw new Error(`rank propagation: unknown node kind ${kind}`);
    }
    whyA[v] = FROM_CHILDREN;
    whyB[v] = FROM_CHILDREN;
    whyL[v] = lWhy;
    const viaB = ar.mul(D, b);
    const viaA = ar.mul(D, a);
    const viaK = ar.mul(D, k);
    if (!ar.le(a, min(viaB, viaK))) {
      whyA[v] = ar.le(viaB, viaK) ? FROM_DIM_OTHER : FROM_DIM_KAPPA;
      a = min(viaB, viaK);
    }
    if (!ar.le(b, min(viaA, viaK))) {
      whyB[v] = ar.le(viaA, viaK) ? FROM_DIM_OTHER : FROM_DIM_KAPPA;
      b = min(viaA, viaK);
    }
    if (!ar.le(l, min(a, b))) {
      whyL[v] = ar.le(a, b) ? FROM_SIDE_A : FROM_SIDE_B;
      l = min(a, b);
    }
    ra[v] = a;
    rb[v] = b;
    lam[v] = l;
    kap[v] = min(k, l);
    lamNoA[v] = min(noA, l);
    lamNoB[v] = min(noB, l);
  }
  return { dep, ra, rb, lam, whyA, whyB, whyL };
}

/** A term's rank: its node's, or, for several linear images of one node, the smaller of that and their sum. */
function termRank<T>(plan: Plan, t: number, r: Slots<T>, ar: Arith<T>): T {
  const { childOf, mStart, members } = plan;
  const node = childOf[t]!;
  if (mStart[t + 1] === mStart[t]) return r[node]!;
  let sum: T = r[members[mStart[t]!]!]!;
  for (let i = mStart[t]! + 1; i < mStart[t + 1]!; i++) sum = ar.add(sum, r[members[i]!]!);
  return ar.le(r[node]!, sum) ? r[node]! : sum;
}

function sumRule<T>(
  plan: Plan,
  v: number,
  D: T,
  dep: Uint8Array,
  ra: Slots<T>,
  rb: Slots<T>,
  lam: Slots<T>,
  ar: Arith<T>,
): { a: T; b: T; l: T; noA: T; noB: T; parts: number } {
  const min = (x: T, y: T): T => (ar.le(x, y) ? x : y);
  let a = ar.zero;
  let b = ar.zero;
  let l = ar.zero;
  let pureA = false;
  let pureB = false;
  let constant = false;
  let pureAonB = ar.zero;
  let pureBonA = ar.zero;
  for (let t = plan.start[v]!; t < plan.start[v + 1]!; t++) {
    const d = dep[plan.childOf[t]!]!;
    if (d === 0) constant = true;
    else if (d === 1) {
      pureA = true;
      pureAonB = ar.add(pureAonB, termRank(plan, t, rb, ar));
    } else if (d === 2) {
      pureB = true;
      pureBonA = ar.add(pureBonA, termRank(plan, t, ra, ar));
    } else {
      a = ar.add(a, termRank(plan, t, ra, ar));
      b = ar.add(b, termRank(plan, t, rb, ar));
      l = ar.add(l, termRank(plan, t, lam, ar));
    }
  }
  // λ without the side-A group (a constant joins that group when there is one) and without side B.
  const loneConstant = constant && !pureA && !pureB;
  const noA = pureB || loneConstant ? ar.add(l, ar.one) : l;
  const noB = pureA || loneConstant ? ar.add(l, ar.one) : l;
  if (loneConstant) {
    a = ar.add(a, ar.one);
    b = ar.add(b, ar.one);
    l = ar.add(l, ar.one);
  }
  if (pureA) {
    a = ar.add(a, ar.one);
    b = ar.add(b, min(D, pureAonB));
    l = ar.add(l, ar.one);
  }
  if (pureB) {
    a = ar.add(a, min(D, pureBonA));
    b = ar.add(b, ar.one);
    l = ar.add(l, ar.one);
  }
  return { a, b, l, noA, noB, parts: (pureA ? 1 : 0) | (pureB ? 2 : 0) };
}

/**
 * The widths behind the bound: walks the choices from the head down and counts each node whose
 * dimension multiplied in. A bound that is a sum of terms names the widths of every term.
 */
function recordWidths<T>(c: Circuit, plan: Plan, p: Propagated<T>): CutCounts {
  const { dep, whyA, whyB, whyL } = p;
  const counts: CutCounts = new Map();
  const seen = new Set<number>();
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
  const farSide = (v: number, which: number): boolean => (which === A && dep[v] === 2) || (which === B && dep[v] === 1);
  const stack: [number, number][] = [[c.top, L]];
  while (stack.length > 0) {
    const [v, which] = stack.pop()!;
    const key = v * 4 + which;
    if (seen.has(key)) continue;
    seen.add(key);
    const kind = c.op[v];
    if (kind === OP_CONST) continue;
    const why = which === A ? whyA[v]! : which === B ? whyB[v]! : which === L ? whyL[v]! : FROM_CHILDREN;
    if (kind === OP_INPUT || dep[v] !== 3 || why === FROM_PURE) {
      // A one-sided value crosses only through its own index.
      if (farSide(v, which)) note(v);
      continue;
    }
    if (why === FROM_SIDE_A || why === FROM_SIDE_B) {
      stack.push([v, why === FROM_SIDE_A ? A : B]);
      continue;
    }
    if (why === FROM_PURE_FACTOR) {
      // The pure factor's span and the other factor's functionals.
      const pure = pureFactor(plan.start, plan.childOf, plan.times, dep, v);
      note(pure);
      stack.push([otherFactor(plan.start, plan.childOf, v, pure), L]);
      continue;
    }
    if (why === FROM_DIM_OTHER || why === FROM_DIM_KAPPA) {
      note(v);
      stack.push([v, why === FROM_DIM_KAPPA ? K : which === A ? B : A]);
      continue;
    }
    if (kind === OP_SUM) {
      const sub = which === K ? L : which;
      for (let t = plan.start[v]!; t < plan.start[v + 1]!; t++) {
        const node = plan.childOf[t]!;
        if (dep[node] === 3) stack.push([node, sub]);
        else if (farSide(node, sub)) note(v);
      }
      continue;
    }
    if (kind === OP_PRODUCT) {
      for (let t = plan.start[v]!; t < plan.start[v + 1]!; t++) stack.push([plan.childOf[t]!, which]);
      continue;
    }
    stack.push([c.childList[c.childStart[v]!]!, which === K ? L : which]);
  }
  return counts;
}
