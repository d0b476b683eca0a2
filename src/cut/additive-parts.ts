/**
 * Rule 6 of rank propagation (DEVELOPERS.md, "Rank propagation"; derived here): additive parts.
 * Every node's vector function is written F_v = P_A + P_B + R_v, where P_A reads side A only and
 * P_B side B only (flags say which of them may be nonzero; `span` bounds the dimension of the
 * span of a pure part's coordinates), and μ(v) bounds the separation rank of every functional of
 * the rest R_v. Then every functional of F_v has separation rank ≤ flags + μ(v).
 *
 * - A node that reads one side only (or nothing) is its own pure part: μ = 0.
 * - A linear map applies to every part.
 * - A sum adds the parts term by term: flags unite, spans and μ add.
 * - A product of factors that are all separable (μ = 0), Π_i (P_A^i + P_B^i), expands into
 *   Σ_S (Π_{i∈S} P_A^i) ⊙ (Π_{i∉S} P_B^i). The term S = all reads side A only, S = ∅ side B
 *   only; every other term is a vector of A-functions times a vector of B-functions, whose
 *   functionals have separation rank ≤ min(D, Π_{i∈S} span_A^i, Π_{i∉S} span_B^i) (a functional
 *   Σ_o w_o X_o Y_o is a sum over a basis of either span). A term with a missing part is zero.
 * - Any other product is folded factor by factor: (P_A + P_B + R) ⊙ (Q_A + Q_B + S) has pure parts
 *   P_A ⊙ Q_A and P_B ⊙ Q_B, and a rest of nine terms: P_A ⊙ Q_B and P_B ⊙ Q_A (rank ≤ min(D, σ, σ')
 *   as above), P_s ⊙ S and R ⊙ Q_s (a factor reading one side, whose coordinates span σ functions
 *   g_k, times a rest: Σ_k g_k·⟨w_k, S⟩, rank ≤ σ·μ), and R ⊙ S (rank ≤ D·μ(R)·μ(S), a sum of D
 *   coordinates, each a product of a coordinate of each).
 * Whenever λ(v) < μ(v) the node takes that trivial decomposition (no flags, μ = λ) instead.
 * Each step is an identity between functions, valid for every choice of weights.
 */
import { OP_CONST, OP_INPUT, OP_LINEAR, OP_PRODUCT, OP_SUM, type Circuit } from '../network/circuit.js';
import type { Plan } from './rank-propagation.js';

/**
 * The arithmetic the decomposition runs in: log2 values (the log pass), doubles (exact below 2^53;
 * a value at or above it stands for one at least that large, as in rank propagation's double
 * pass), or exact integers.
 */
export interface Arith<T> {
  readonly one: T;
  /** The empty sum. */
  readonly zero: T;
  /** A fresh array of n ones. */
  ones(n: number): Slots<T>;
  of(n: number): T;
  mul(a: T, b: T): T;
  add(a: T, b: T): T;
  le(a: T, b: T): boolean;
}

/** Indexable storage of per-node values. */
export interface Slots<T> {
  [i: number]: T;
}

export const LOG_ARITH: Arith<number> = {
  one: 0,
  zero: -Infinity,
  ones: (n) => new Float64Array(n),
  of: (n) => Math.log2(n),
  mul: (a, b) => a + b,
  add: (a, b) => (a === -Infinity ? b : b === -Infinity ? a : Math.max(a, b) + Math.log2(1 + 2 ** -Math.abs(a - b))),
  le: (a, b) => a <= b,
};

export const DOUBLE_ARITH: Arith<number> = {
  one: 1,
  zero: 0,
  ones: (n) => new Float64Array(n).fill(1),
  of: (n) => n,
  mul: (a, b) => a * b,
  add: (a, b) => a + b,
  le: (a, b) => a <= b,
};

/** How a node's decomposition was found, for naming the widths behind a bound. */
export const PARTS_FROM_CHILDREN = 0;
export const PARTS_TRIVIAL = 1;
export const PARTS_FOLDED = 2;
export const PARTS_EXPANDED = 3;

/**
 * Products with more factors (counted with multiplicity) are not expanded term by term: 2^k
 * terms. When every factor's spans reach D, every term is D and only the count is needed
 * (up to FULL_SPAN_FACTORS factors).
 */
const MAX_FACTORS = 8;
const FULL_SPAN_FACTORS = 40;

const A = 1;
const B = 2;

const EXPANDED = 0;
const NOT_SEPARABLE = 1;
const OVER = 2;

export class AdditiveParts<T> {
  readonly flags: Uint8Array;
  readonly mu: Slots<T>;
  readonly spanA: Slots<T>;
  readonly spanB: Slots<T>;
  readonly why: Uint8Array;

  constructor(
    n: number,
    private readonly ar: Arith<T>,
    from?: AdditiveParts<number>,
  ) {
    // Starting `from` the double pass: its values are exact below 2^53 (the exact pass then
    // works out again only the nodes at or above it).
    this.flags = from ? Uint8Array.from(from.flags) : new Uint8Array(n);
    this.mu = from ? (Array.from(from.mu as Float64Array) as T[]) : ar.ones(n);
    this.spanA = from ? (Array.from(from.spanA as Float64Array) as T[]) : ar.ones(n);
    this.spanB = from ? (Array.from(from.spanB as Float64Array) as T[]) : ar.ones(n);
    this.why = from ? Uint8Array.from(from.why) : new Uint8Array(n);
  }

  /**
   * A node that reads side A only (dep 1; `span` = the rank of its coordinates as functions of
   * x_A), side B only (dep 2), or nothing (dep 0, a constant: one function, counted with side A).
   */
  pure(v: number, dep: number, span: T): void {
    const ar = this.ar;
    this.flags[v] = dep === 2 ? B : A;
    this.mu[v] = ar.zero;
    this.spanA[v] = dep === 2 ? ar.zero : dep === 0 ? ar.one : span;
    this.spanB[v] = dep === 2 ? span : ar.zero;
    this.why[v] = PARTS_FROM_CHILDREN;
  }

  /**
   * A node that reads both sides: its decomposition from its children's. Returns flags + μ, a
   * bound on the separation rank of its functionals. `cap`: λ(v) as the other rules bound it; once
   * μ passes it the node will take the trivial decomposition anyway (settle), so the work stops
   * there and `cap` is returned.
   */
  mixed(c: Circuit, plan: Plan, v: number, D: T, cap: T): T {
    const ar = this.ar;
    const { flags, mu, spanA, spanB } = this;
    const min = (x: T, y: T): T => (ar.le(x, y) ? x : y);
    const kind = c.op[v];
    // Children that all took the trivial decomposition leave nothing to gain: a sum of their μ = λ
    // is what rule 5 adds up, a product of them what rule 4 multiplies (with κ ≤ λ), a linear map
    // keeps λ.
    if (kind === OP_LINEAR ? this.why[c.childList[c.childStart[v]!]!] === PARTS_TRIVIAL : this.allTrivial(plan, v)) return this.trivial(v, cap);
    if (kind === OP_LINEAR) {
      const ch = c.childList[c.childStart[v]!]!;
      this.set(v, flags[ch]!, mu[ch]!, min(D, spanA[ch]!), min(D, spanB[ch]!), PARTS_FROM_CHILDREN);
    } else if (kind === OP_SUM) {
      // Children that are linear images of one node enter as that node (plan terms).
      let f = 0;
      let m = ar.zero;
      let sa = ar.zero;
      let sb = ar.zero;
      for (let t = plan.start[v]!; t < plan.start[v + 1]!; t++) {
        const node = plan.childOf[t]!;
        f |= flags[node]!;
        m = ar.add(m, mu[node]!);
        if (!ar.le(m, cap)) return this.trivial(v, cap);
        // A span never exceeds D: stop adding once there.
        if (flags[node]! & A && !ar.le(D, sa)) sa = ar.add(sa, spanA[node]!);
        if (flags[node]! & B && !ar.le(D, sb)) sb = ar.add(sb, spanB[node]!);
      }
      this.set(v, f, m, min(D, sa), min(D, sb), PARTS_FROM_CHILDREN);
    } else if (kind === OP_PRODUCT) {
      const expanded = this.expand(plan, v, D, cap);
      if (expanded === OVER || (expanded === NOT_SEPARABLE && !this.fold(plan, v, D, cap))) return this.trivial(v, cap);
    } else if (kind === OP_INPUT || kind === OP_CONST) {
      throw new Error('additive parts: an input or a constant reads one side only');
    }
    const n = (flags[v]! & A ? 1 : 0) + (flags[v]! & B ? 1 : 0);
    return n === 0 ? mu[v]! : ar.add(ar.of(n), mu[v]!);
  }

  private allTrivial(plan: Plan, v: number): boolean {
    for (let t = plan.start[v]!; t < plan.start[v + 1]!; t++) if (this.why[plan.childOf[t]!] !== PARTS_TRIVIAL) return false;
    return true;
  }

  private trivial(v: number, cap: T): T {
    this.why[v] = PARTS_TRIVIAL;
    return cap;
  }

  /** Once λ(v) is final: the trivial decomposition (μ = λ, no flags) when it is better. */
  settle(v: number, lambda: T): void {
    if (this.why[v] === PARTS_TRIVIAL || !this.ar.le(this.mu[v]!, lambda)) {
      const zero = this.ar.zero;
      this.set(v, 0, lambda, zero, zero, PARTS_TRIVIAL);
    }
  }

  private set(v: number, f: number, m: T, sa: T, sb: T, why: number): void {
    this.flags[v] = f;
    this.mu[v] = m;
    this.spanA[v] = sa;
    this.spanB[v] = sb;
    this.why[v] = why;
  }

  /** A product of separable factors (μ = 0 each), expanded over the subsets S. */
  private expand(plan: Plan, v: number, D: T, cap: T): typeof EXPANDED | typeof NOT_SEPARABLE | typeof OVER {
    const ar = this.ar;
    const { flags, mu, spanA, spanB } = this;
    const factors: number[] = [];
    for (let t = plan.start[v]!; t < plan.start[v + 1]!; t++) {
      const ch = plan.childOf[t]!;
      if (!ar.le(mu[ch]!, ar.zero) || flags[ch] === 0) return NOT_SEPARABLE;
      for (let i = 0; i < plan.times[t]!; i++) factors.push(ch);
      if (factors.length > FULL_SPAN_FACTORS) return NOT_SEPARABLE;
    }
    const k = factors.length;
    const min = (x: T, y: T): T => (ar.le(x, y) ? x : y);
    let allA = true;
    let allB = true;
    let sa = ar.one;
    let sb = ar.one;
    let fullSpans = true;
    let onlyA = 0;
    let onlyB = 0;
    for (const ch of factors) {
      const f = flags[ch]!;
      allA &&= (f & A) !== 0;
      allB &&= (f & B) !== 0;
      if (f === A) onlyA++;
      if (f === B) onlyB++;
      sa = ar.mul(sa, spanA[ch]!);
      sb = ar.mul(sb, spanB[ch]!);
      fullSpans &&= (!(f & A) || ar.le(D, spanA[ch]!)) && (!(f & B) || ar.le(D, spanB[ch]!));
    }
    const flagsOut = (allA ? A : 0) | (allB ? B : 0);
    const spansOut = [allA ? min(D, sa) : ar.zero, allB ? min(D, sb) : ar.zero] as const;
    if (fullSpans) {
      // Every term with both sides present is D: count them. The factors with both parts choose
      // freely; those with one part are fixed; S = all and S = ∅ are the pure parts.
      const terms = 2 ** (k - onlyA - onlyB) - (onlyB === 0 ? 1 : 0) - (onlyA === 0 ? 1 : 0);
      const rest = terms > 0 ? ar.mul(D, ar.of(terms)) : ar.zero;
      if (!ar.le(rest, cap)) return OVER;
      this.set(v, flagsOut, rest, spansOut[0], spansOut[1], PARTS_EXPANDED);
      return EXPANDED;
    }
    if (k > MAX_FACTORS) return NOT_SEPARABLE;
    let rest = ar.zero;
    for (let s = 1; s < (1 << k) - 1; s++) {
      let pa = ar.one;
      let pb = ar.one;
      let zero = false;
      for (let i = 0; i < k && !zero; i++) {
        const ch = factors[i]!;
        if (s & (1 << i)) {
          if (flags[ch]! & A) pa = ar.mul(pa, spanA[ch]!);
          else zero = true;
        } else if (flags[ch]! & B) pb = ar.mul(pb, spanB[ch]!);
        else zero = true;
      }
      if (!zero) rest = ar.add(rest, min(D, min(pa, pb)));
      if (!ar.le(rest, cap)) return OVER;
    }
    this.set(v, flagsOut, rest, spansOut[0], spansOut[1], PARTS_EXPANDED);
    return EXPANDED;
  }

  /** Any product, folded factor by factor (each factor as often as it appears); false once μ passes `cap`. */
  private fold(plan: Plan, v: number, D: T, cap: T): boolean {
    const ar = this.ar;
    const { flags, mu, spanA, spanB } = this;
    const min = (x: T, y: T): T => (ar.le(x, y) ? x : y);
    let f = -1;
    let m = ar.zero;
    let sa = ar.zero;
    let sb = ar.zero;
    for (let t = plan.start[v]!; t < plan.start[v + 1]!; t++) {
      const ch = plan.childOf[t]!;
      for (let i = 0; i < plan.times[t]!; i++) {
        const [g, mg, ga, gb] = [flags[ch]!, mu[ch]!, spanA[ch]!, spanB[ch]!];
        if (f < 0) {
          [f, m, sa, sb] = [g, mg, ga, gb];
          continue;
        }
        let rest = ar.mul(D, ar.mul(m, mg));
        if (f & A && g & B) rest = ar.add(rest, min(D, min(sa, gb)));
        if (f & B && g & A) rest = ar.add(rest, min(D, min(sb, ga)));
        if (f & A) rest = ar.add(rest, ar.mul(sa, mg));
        if (f & B) rest = ar.add(rest, ar.mul(sb, mg));
        if (g & A) rest = ar.add(rest, ar.mul(ga, m));
        if (g & B) rest = ar.add(rest, ar.mul(gb, m));
        const both = f & g;
        sa = both & A ? min(D, ar.mul(sa, ga)) : ar.zero;
        sb = both & B ? min(D, ar.mul(sb, gb)) : ar.zero;
        f = both;
        m = rest;
        if (!ar.le(m, cap)) return false;
      }
    }
    this.set(v, Math.max(f, 0), m, sa, sb, PARTS_FOLDED);
    return true;
  }
}
