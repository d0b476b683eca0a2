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
  of(n: number): T;
  mul(a: T, b: T): T;
  add(a: T, b: T): T;
  le(a: T, b: T): boolean;
  /** C(x + a − 1, a): the dimension of the a-th symmetric power of an x-dimensional space. */
  symPow(x: T, a: number): T;
}

const EXACT: Arith<Int> = {
  one: 1,
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
  of: (n) => Math.log2(n),
  mul: (a, b) => a + b,
  add: (a, b) => Math.max(a, b) + Math.log2(1 + 2 ** -Math.abs(a - b)),
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

export interface RankPropagation {
  /** log2 of the bound (from the log pass; the exact value may differ in the last digits). */
  readonly log2: number;
  /** The exact bound, or undefined when some node's value exceeds the bit limit. */
  readonly rank: bigint | undefined;
  /** The widths that enter the bound: tag → dimension → count. */
  readonly counts: CutCounts;
}

/** The exact pass is skipped when any node's value would exceed this many bits. */
const MAX_BITS = 4_000_000;

export function rankPropagation(c: Circuit, side: Uint8Array): RankPropagation {
  const logs = propagate(c, side, LOG);
  let largest = 0;
  for (let v = 0; v < c.size; v++) largest = Math.max(largest, logs.ra[v]!, logs.rb[v]!);
  const log2 = logs.lam[c.top]!;
  if (largest > MAX_BITS) return { log2, rank: undefined, counts: recordWidths(c, logs) };
  const exact = propagate(c, side, EXACT);
  return { log2, rank: big(exact.lam[c.top]!), counts: recordWidths(c, exact) };
}

interface Propagated<T> {
  readonly dep: Uint8Array;
  readonly ra: T[];
  readonly rb: T[];
  readonly kap: T[];
  readonly lam: T[];
  readonly whyA: Uint8Array;
  readonly whyB: Uint8Array;
  readonly whyL: Uint8Array;
  readonly source: Int32Array;
}

function propagate<T>(c: Circuit, side: Uint8Array, ar: Arith<T>): Propagated<T> {
  const n = c.size;
  const { op, dim, childStart, childList } = c;
  const dep = new Uint8Array(n);
  const ra: T[] = new Array<T>(n).fill(ar.one);
  const rb: T[] = new Array<T>(n).fill(ar.one);
  const kap: T[] = new Array<T>(n).fill(ar.one);
  const lam: T[] = new Array<T>(n).fill(ar.one);
  const whyA = new Uint8Array(n).fill(FROM_PURE);
  const whyB = new Uint8Array(n).fill(FROM_PURE);
  const whyL = new Uint8Array(n).fill(FROM_PURE);
  const source = new Int32Array(n);
  const min = (a: T, b: T): T => (ar.le(a, b) ? a : b);
  for (let v = 0; v < n; v++) {
    const kind = op[v];
    source[v] = kind === OP_LINEAR ? source[childList[childStart[v]!]!]! : v;
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
    const D = ar.of(dim[v]!);
    let a: T;
    let b: T;
    let k: T;
    let l: T;
    let lWhy = FROM_CHILDREN;
    if (kind === OP_LINEAR) {
      const ch = childList[childStart[v]!]!;
      a = ra[ch]!;
      b = rb[ch]!;
      l = lam[ch]!;
      k = l;
    } else if (kind === OP_PRODUCT) {
      a = ar.one;
      b = ar.one;
      k = ar.one;
      for (const [ch, times] of multiplicities(c, v)) {
        a = ar.mul(a, ar.symPow(ra[ch]!, times));
        b = ar.mul(b, ar.symPow(rb[ch]!, times));
        k = ar.mul(k, ar.symPow(kap[ch]!, times));
      }
      l = ar.mul(D, k);
      lWhy = FROM_DIM_KAPPA;
    } else if (kind === OP_SUM) {
      ({ a, b, l } = sumRule(c, v, dep, ra, rb, lam, source, ar));
      k = l;
    } else {
      throw new Error(`rank propagation: unknown node kind ${kind}`);
    }
    if (d !== 3) {
      // A node that reads one side only (or nothing) is a function of that side.
      k = ar.one;
      l = ar.one;
      if (d !== 2) a = ar.one;
      if (d !== 1) b = ar.one;
    }
    const why = d === 3 ? FROM_CHILDREN : FROM_PURE;
    whyA[v] = why;
    whyB[v] = why;
    whyL[v] = d === 3 ? lWhy : FROM_PURE;
    const viaB = ar.mul(D, b);
    const viaA = ar.mul(D, a);
    const viaK = ar.mul(D, k);
    let na = a;
    let nb = b;
    if (!ar.le(na, min(viaB, viaK))) {
      na = min(viaB, viaK);
      whyA[v] = ar.le(viaB, viaK) ? FROM_DIM_OTHER : FROM_DIM_KAPPA;
    }
    if (!ar.le(nb, min(viaA, viaK))) {
      nb = min(viaA, viaK);
      whyB[v] = ar.le(viaA, viaK) ? FROM_DIM_OTHER : FROM_DIM_KAPPA;
    }
    if (!ar.le(l, min(na, nb))) {
      l = min(na, nb);
      whyL[v] = ar.le(na, nb) ? FROM_SIDE_A : FROM_SIDE_B;
    }
    ra[v] = na;
    rb[v] = nb;
    lam[v] = l;
    kap[v] = min(k, l);
  }
  return { dep, ra, rb, kap, lam, whyA, whyB, whyL, source };
}

/** Each distinct child of v with the number of times it appears. */
function multiplicities(c: Circuit, v: number): Map<number, number> {
  const m = new Map<number, number>();
  for (let i = c.childStart[v]!; i < c.childStart[v + 1]!; i++) {
    const ch = c.childList[i]!;
    m.set(ch, (m.get(ch) ?? 0) + 1);
  }
  return m;
}

interface Term {
  /** The node whose ranks the term carries. */
  readonly node: number;
  /** Several children that are linear images of `node`: the term is min(node, their sum). */
  readonly members: readonly number[];
}

/** The terms of a sum: children grouped by the node they are linear images of. */
function sumTerms(c: Circuit, v: number, source: Int32Array): Term[] {
  const bySource = new Map<number, number[]>();
  for (const ch of multiplicities(c, v).keys()) {
    const s = source[ch]!;
    const g = bySource.get(s);
    if (g) g.push(ch);
    else bySource.set(s, [ch]);
  }
  const terms: Term[] = [];
  for (const [s, members] of bySource) terms.push(members.length === 1 ? { node: members[0]!, members: [] } : { node: s, members });
  return terms;
}

function termRank<T>(t: Term, r: T[], ar: Arith<T>): T {
  if (t.members.length === 0) return r[t.node]!;
  let sum: T = r[t.members[0]!]!;
  for (const m of t.members.slice(1)) sum = ar.add(sum, r[m]!);
  return ar.le(r[t.node]!, sum) ? r[t.node]! : sum;
}

function sumRule<T>(
  c: Circuit,
  v: number,
  dep: Uint8Array,
  ra: T[],
  rb: T[],
  lam: T[],
  source: Int32Array,
  ar: Arith<T>,
): { a: T; b: T; l: T } {
  const D = ar.of(c.dim[v]!);
  const min = (x: T, y: T): T => (ar.le(x, y) ? x : y);
  let a: T | undefined;
  let b: T | undefined;
  let l: T | undefined;
  const plus = (x: T | undefined, y: T): T => (x === undefined ? y : ar.add(x, y));
  let pureA = false;
  let pureB = false;
  let constant = false;
  let pureAonB: T | undefined;
  let pureBonA: T | undefined;
  for (const t of sumTerms(c, v, source)) {
    const d = dep[t.node]!;
    if (d === 0) constant = true;
    else if (d === 1) {
      pureA = true;
      pureAonB = plus(pureAonB, termRank(t, rb, ar));
    } else if (d === 2) {
      pureB = true;
      pureBonA = plus(pureBonA, termRank(t, ra, ar));
    } else {
      a = plus(a, termRank(t, ra, ar));
      b = plus(b, termRank(t, rb, ar));
      l = plus(l, termRank(t, lam, ar));
    }
  }
  // A constant term is a function of either side: it joins a pure group when there is one.
  if (constant && !pureA && !pureB) {
    a = plus(a, ar.one);
    b = plus(b, ar.one);
    l = plus(l, ar.one);
  }
  if (pureA) {
    a = plus(a, ar.one);
    b = plus(b, min(D, pureAonB!));
    l = plus(l, ar.one);
  }
  if (pureB) {
    a = plus(a, min(D, pureBonA!));
    b = plus(b, ar.one);
    l = plus(l, ar.one);
  }
  return { a: a ?? ar.one, b: b ?? ar.one, l: l ?? ar.one };
}

/**
 * The widths behind the bound: walks the choices from the head down and counts each node whose
 * dimension multiplied in. A bound that is a sum of terms names the widths of every term.
 */
function recordWidths<T>(c: Circuit, p: Propagated<T>): CutCounts {
  const { dep, whyA, whyB, whyL, source } = p;
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
    if (kind === OP_INPUT || why === FROM_PURE) {
      // A one-sided value crosses only through its own index.
      if (farSide(v, which)) note(v);
      continue;
    }
    if (why === FROM_SIDE_A || why === FROM_SIDE_B) {
      stack.push([v, why === FROM_SIDE_A ? A : B]);
      continue;
    }
    if (why === FROM_DIM_OTHER || why === FROM_DIM_KAPPA) {
      note(v);
      stack.push([v, why === FROM_DIM_KAPPA ? K : which === A ? B : A]);
      continue;
    }
    if (kind === OP_SUM) {
      const sub = which === K ? L : which;
      for (const t of sumTerms(c, v, source)) {
        if (dep[t.node] === 3) stack.push([t.node, sub]);
        else if (farSide(t.node, sub)) note(v);
      }
      continue;
    }
    for (let i = c.childStart[v]!; i < c.childStart[v + 1]!; i++) {
      const ch = c.childList[i]!;
      stack.push([ch, kind === OP_LINEAR && which === K ? L : which]);
    }
  }
  return counts;
}
