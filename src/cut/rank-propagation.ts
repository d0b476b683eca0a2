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
 * while below 2^53, then bigints); a log2 pass first measures the sizes.
 */
import { OP_CONST, OP_INPUT, OP_LINEAR, OP_PRODUCT, OP_SUM, type Circuit } from '../network/circuit.js';
import type { CutCounts } from './tree-min-cut.js';
import { AdditiveParts, PARTS_EXPANDED, PARTS_FOLDED, PARTS_TRIVIAL, pureFactorOf } from './additive-parts.js';

type Int = number | bigint;

const SAFE = 2 ** 53;

function big(x: Int): bigint {
  return typeof x === 'bigint' ? x : BigInt(x);
}

/**
 * The arithmetic the rules run in: exact integers (numbers while below 2^53, then bigints), or
 * log2 values, which measure the sizes cheaply before the exact pass is attempted.
 */
export interface Arith<T> {
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
export interface Slots<T> {
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

/** Plain doubles, for circuits whose every value is known to be a small integer. */
const PLAIN: Arith<number> = {
  one: 1,
  zero: 0,
  ones: (n) => new Float64Array(n).fill(1),
  of: (n) => n,
  mul: (a, b) => a * b,
  add: (a, b) => a + b,
  le: (a, b) => a <= b,
  symPow: (x, a) => Number(EXACT.symPow(x, a)),
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

export function rankPropagation(c: Circuit, side: Uint8Array): RankPropagation {
  const plan = planOf(c);
  const logs = propagateFloat(c, plan, side, true);
  let largest = 0;
  for (let v = 0; v < c.size; v++) largest = Math.max(largest, logs.ra[v]!, logs.rb[v]!);
  const rank = (): bigint | undefined => {
    if (largest > MAX_BITS) return undefined;
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

/**
 * The rules of `propagate` on doubles, written out for speed (most circuits are large, and this
 * pass runs for every partition): in log2 (`log`) to measure sizes and name the widths, or on
 * the values themselves when all of them are known to be small integers.
 */
function propagateFloat(c: Circuit, plan: Plan, side: Uint8Array, log: boolean): Propagated<number> {
  const n = c.size;
  const { op, dim, childStart, childList } = c;
  const { start, childOf, times, mStart, members } = plan;
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
  const of = (x: number): number => (log ? Math.log2(x) : x);
  const mul = (x: number, y: number): number => (log ? x + y : x * y);
  const add = (x: number, y: number): number => (log ? Math.max(x, y) + Math.log2(1 + 2 ** -Math.abs(x - y)) : x + y);
  const symPow = (x: number, a: number): number => (log ? LOG.symPow(x, a) : Number(EXACT.symPow(x, a)));
  const parts = new AdditiveParts<number>(n, log ? LOG : PLAIN);
  const term = (t: number, r: Float64Array): number => {
    const node = childOf[t]!;
    if (mStart[t + 1] === mStart[t]) return r[node]!;
    let sum = r[members[mStart[t]!]!]!;
    for (let i = mStart[t]! + 1; i < mStart[t + 1]!; i++) sum = add(sum, r[members[i]!]!);
    return Math.min(r[node]!, sum);
  };
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
      const pf = pureFactorOf(plan, dep, v);
      if (pf) {
        // c ⊙ (G_s + G'): the side-s part is one function of x_s; the rest is seen through the
        // span of c's coordinates (DEVELOPERS.md, rank propagation, rule 4).
        const onA = dep[pf.pure] === 1;
        const span = onA ? rb[pf.pure]! : ra[pf.pure]!;
        const alt = add(pureParts[pf.other]! & (onA ? 1 : 2) ? one : zero, mul(span, onA ? lamNoA[pf.other]! : lamNoB[pf.other]!));
        if (alt < l) {
          l = alt;
          lWhy = FROM_PURE_FACTOR;
        }
      }
      noA = l;
      noB = l;
    } else {
      // A sum: the rule of sumRule, on doubles.
      let sides: number;
      [a, b, l, noA, noB, sides] = sumFloat(v, start, childOf, dep, (t) => term(t, ra), (t) => term(t, rb), (t) => term(t, lam), D, log);
      pureParts[v] = sides;
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
  return { dep, ra, rb, lam, whyA, whyB, whyL, whyM: parts.why };
}

/** A running sum of values given as they are (`plain`) or by their log2. */
interface FloatSum {
  add(x: number): void;
  readonly value: number;
}

/** Plain values: exact while every partial sum stays below 2^53. */
class PlainSum implements FloatSum {
  value = 0;
  add(x: number): void {
    this.value += x;
  }
}

/** log2 values: the largest term and Σ 2^(x − largest), one power per term. */
class Log2Sum implements FloatSum {
  private m = -Infinity;
  private s = 0;
  add(x: number): void {
    if (x === -Infinity) return;
    if (x > this.m) {
      this.s = this.m === -Infinity ? 1 : this.s * 2 ** (this.m - x) + 1;
      this.m = x;
    } else this.s += 2 ** (x - this.m);
  }
  /** log2 of the sum; −∞ for an empty sum (zero). */
  get value(): number {
    return this.m === -Infinity ? -Infinity : this.m + Math.log2(this.s);
  }
}

/** The rule of `sumRule` on doubles, for `propagateFloat`: [ρ_A, ρ_B, λ]. */
function sumFloat(
  v: number,
  start: Int32Array,
  childOf: Int32Array,
  dep: Uint8Array,
  termA: (t: number) => number,
  termB: (t: number) => number,
  termL: (t: number) => number,
  D: number,
  log: boolean,
): [number, number, number, number, number, number] {
  const sum = (): FloatSum => (log ? new Log2Sum() : new PlainSum());
  const one = log ? 0 : 1;
  const a = sum();
  const b = sum();
  const l = sum();
  const pureAonB = sum();
  const pureBonA = sum();
  let pureA = false;
  let pureB = false;
  let constant = false;
  for (let t = start[v]!; t < start[v + 1]!; t++) {
    const d = dep[childOf[t]!]!;
    if (d === 0) constant = true;
    else if (d === 1) {
      pureA = true;
      pureAonB.add(termB(t));
    } else if (d === 2) {
      pureB = true;
      pureBonA.add(termA(t));
    } else {
      a.add(termA(t));
      b.add(termB(t));
      l.add(termL(t));
    }
  }

  // λ without the side-A group (a constant joins that group when there is one) and without side B.
  const mixed = l.value;
  const loneConstant = constant && !pureA && !pureB;
  const noA = sum();
  noA.add(mixed);
  const noB = sum();
  noB.add(mixed);
  if (pureB || loneConstant) noA.add(one);
  if (pureA || loneConstant) noB.add(one);
  if (loneConstant) {
    a.add(one);
    b.add(one);
    l.add(one);
  }
  if (pureA) {
    a.add(one);
    b.add(Math.min(D, pureAonB.value));
    l.add(one);
  }
  if (pureB) {
    a.add(Math.min(D, pureBonA.value));
    b.add(one);
    l.add(one);
  }
  return [a.value, b.value, l.value, noA.value, noB.value, (pureA ? 1 : 0) | (pureB ? 2 : 0)];
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
  const { op, childStart, childList } = c;
  const source = new Int32Array(c.size);
  const start = new Int32Array(c.size + 1);
  const childOf: number[] = [];
  const times: number[] = [];
  const mStart: number[] = [0];
  const members: number[] = [];
  for (let v = 0; v < c.size; v++) {
    start[v] = childOf.length;
    source[v] = op[v] === OP_LINEAR ? source[childList[childStart[v]!]!]! : v;
    if (op[v] !== OP_PRODUCT && op[v] !== OP_SUM) continue;
    const counts = new Map<number, number>();
    for (let i = childStart[v]!; i < childStart[v + 1]!; i++) counts.set(childList[i]!, (counts.get(childList[i]!) ?? 0) + 1);
    if (op[v] === OP_PRODUCT) {
      for (const [ch, k] of counts) {
        childOf.push(ch);
        times.push(k);
        mStart.push(members.length);
      }
      continue;
    }
    const bySource = new Map<number, number[]>();
    for (const ch of counts.keys()) {
      const g = bySource.get(source[ch]!);
      if (g) g.push(ch);
      else bySource.set(source[ch]!, [ch]);
    }
    for (const [src, group] of bySource) {
      childOf.push(group.length === 1 ? group[0]! : src);
      times.push(1);
      if (group.length > 1) members.push(...group);
      mStart.push(members.length);
    }
  }
  start[c.size] = childOf.length;
  const plan: Plan = {
    source,
    start,
    childOf: Int32Array.from(childOf),
    times: Int32Array.from(times),
    mStart: Int32Array.from(mStart),
    members: Int32Array.from(members),
  };
  plans.set(c, plan);
  return plan;
}

interface Propagated<T> {
  readonly dep: Uint8Array;
  readonly ra: Slots<T>;
  readonly rb: Slots<T>;
  readonly lam: Slots<T>;
  readonly whyA: Uint8Array;
  readonly whyB: Uint8Array;
  readonly whyL: Uint8Array;
  /** How each node's additive parts were found (additive-parts.ts). */
  readonly whyM: Uint8Array;
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
  const parts = new AdditiveParts<T>(n, ar);
  const min = (a: T, b: T): T => (ar.le(a, b) ? a : b);
  for (let v = 0; v < n; v++) {
    const kind = op[v];
    if (kind === OP_INPUT) {
      const onA = side[c.position[v]!] === 1;
      dep[v] = onA ? 1 : 2;
      if (onA) rb[v] = ar.of(dim[v]!);
      else ra[v] = ar.of(dim[v]!);
      parts.pure(v, dep[v]!, onA ? rb[v]! : ra[v]!);
      continue;
    }
    if (kind === OP_CONST) {
      parts.pure(v, 0, ar.one);
      continue;
    }
    let d = 0;
    for (let i = childStart[v]!; i < childStart[v + 1]!; i++) d |= dep[childList[i]!]!;
    dep[v] = d;
    // A node that reads one side only (or nothing) is a function of that side: ranks 1, except
    // with its output index on the far side, where its dimension caps them.
    if (d !== 3) {
      const own = kind === OP_LINEAR ? childList[childStart[v]!]! : -1;
      if (d === 1) rb[v] = own >= 0 ? min(rb[own]!, ar.of(dim[v]!)) : ar.of(dim[v]!);
      if (d === 2) ra[v] = own >= 0 ? min(ra[own]!, ar.of(dim[v]!)) : ar.of(dim[v]!);
      parts.pure(v, d, d === 2 ? ra[v]! : rb[v]!);
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
      const pf = pureFactorOf(plan, dep, v);
      if (pf) {
        const onA = dep[pf.pure] === 1;
        const span = onA ? rb[pf.pure]! : ra[pf.pure]!;
        const alt = ar.add(pureParts[pf.other]! & (onA ? 1 : 2) ? ar.one : ar.zero, ar.mul(span, onA ? lamNoA[pf.other]! : lamNoB[pf.other]!));
        if (!ar.le(l, alt)) {
          l = alt;
          lWhy = FROM_PURE_FACTOR;
        }
      }
      noA = l;
      noB = l;
    } else if (kind === OP_SUM) {
      let sides: number;
      ({ a, b, l, noA, noB, parts: sides } = sumRule(plan, v, D, dep, ra, rb, lam, ar));
      pureParts[v] = sides;
      k = l;
    } else {
      throw new Error(`rank propagation: unknown node kind ${kind}`);
    }
    const additive = parts.mixed(c, plan, v, D, l);
    if (!ar.le(l, additive)) {
      l = additive;
      lWhy = FROM_ADDITIVE;
      k = min(k, l);
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
    parts.settle(v, l);
  }
  return { dep, ra, rb, lam, whyA, whyB, whyL, whyM: parts.why };
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
  const { dep, whyA, whyB, whyL, whyM } = p;
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
  // μ, the functional rank of the rest after the pure parts (additive-parts.ts).
  const MIX = 4;
  const farSide = (v: number, which: number): boolean => (which === A && dep[v] === 2) || (which === B && dep[v] === 1);
  const stack: [number, number][] = [[c.top, L]];
  while (stack.length > 0) {
    const [v, which] = stack.pop()!;
    const key = v * 5 + which;
    if (seen.has(key)) continue;
    seen.add(key);
    const kind = c.op[v];
    if (kind === OP_CONST) continue;
    if (which === MIX) {
      if (dep[v] !== 3) continue;
      const how = whyM[v];
      if (how === PARTS_TRIVIAL) stack.push([v, L]);
      else if (how === PARTS_EXPANDED) note(v);
      else if (how === PARTS_FOLDED) {
        // The spans of the factors' pure parts (widths) and the factors' rests.
        note(v);
        for (let t = plan.start[v]!; t < plan.start[v + 1]!; t++) if (dep[plan.childOf[t]!] === 3) stack.push([plan.childOf[t]!, MIX]);
      } else if (kind === OP_SUM) {
        for (let t = plan.start[v]!; t < plan.start[v + 1]!; t++) if (dep[plan.childOf[t]!] === 3) stack.push([plan.childOf[t]!, MIX]);
      } else stack.push([c.childList[c.childStart[v]!]!, MIX]);
      continue;
    }
    const why = which === A ? whyA[v]! : which === B ? whyB[v]! : which === L ? whyL[v]! : FROM_CHILDREN;
    if (kind === OP_INPUT || dep[v] !== 3 || why === FROM_PURE) {
      // A one-sided value crosses only through its own index.
      if (farSide(v, which)) note(v);
      continue;
    }
    if (why === FROM_ADDITIVE) {
      stack.push([v, MIX]);
      continue;
    }
    if (why === FROM_SIDE_A || why === FROM_SIDE_B) {
      stack.push([v, why === FROM_SIDE_A ? A : B]);
      continue;
    }
    if (why === FROM_PURE_FACTOR) {
      // The pure factor's span and the other factor's functionals.
      const pf = pureFactorOf(plan, dep, v)!;
      note(pf.pure);
      stack.push([pf.other, L]);
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
