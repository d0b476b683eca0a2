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
 * - A product of factors that are all separable (μ = 0), factor i appearing a_i times,
 *   Π_i (P_A^i + P_B^i)^{a_i}, expands into Σ_j c_j·(Π_i (P_A^i)^{j_i}) ⊙ (Π_i (P_B^i)^{a_i − j_i})
 *   (elementwise products commute). The term j = a reads side A only, j = 0 side B only; every
 *   other term is a vector of A-functions times a vector of B-functions, whose functionals have
 *   separation rank ≤ min(D, Π_i C(σ_A^i + j_i − 1, j_i), Π_i C(σ_B^i + a_i − j_i − 1, a_i − j_i))
 *   (a functional Σ_o w_o X_o Y_o is a sum over a basis of either span; a power's coordinates lie
 *   in a symmetric power). A term that needs a missing part is zero.
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
  /** C(x + a − 1, a): the dimension of the a-th symmetric power of an x-dimensional space. */
  symPow(x: T, a: number): T;
}

/** Indexable storage of per-node values. */
export interface Slots<T> {
  [i: number]: T;
}

/** How a node's decomposition was found, for naming the widths behind a bound. */
export const PARTS_FROM_CHILDREN = 0;
export const PARTS_TRIVIAL = 1;
export const PARTS_FOLDED = 2;
export const PARTS_EXPANDED = 3;

/**
 * A product of separable factors is expanded while its terms (a choice of how many copies of
 * each distinct factor take the side-A part) number at most MAX_TERMS; when every factor's spans
 * reach D every term is D and only the count is needed, else the terms are listed, at most
 * MAX_LISTED_TERMS of them.
 */
const MAX_TERMS = 2 ** 40;
const MAX_LISTED_TERMS = 4096;

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

  /**
   * A product of separable factors (μ = 0 each), expanded: factor i, appearing a_i times, gives
   * (P_A^i + P_B^i)^{a_i} = Σ_j C(a_i, j)·(P_A^i)^j ⊙ (P_B^i)^{a_i − j} (elementwise products
   * commute), so a term is a choice of j_i per distinct factor, and the coordinates of (P_A^i)^j
   * span at most C(σ + j − 1, j) functions (a symmetric power).
   */
  private expand(plan: Plan, v: number, D: T, cap: T): typeof EXPANDED | typeof NOT_SEPARABLE | typeof OVER {
    const ar = this.ar;
    const { flags, mu, spanA, spanB } = this;
    const min = (x: T, y: T): T => (ar.le(x, y) ? x : y);
    const from = plan.start[v]!;
    const to = plan.start[v + 1]!;
    let allA = true;
    let allB = true;
    let sa = ar.one;
    let sb = ar.one;
    let fullSpans = true;
    // Terms: the choices of j per distinct factor (a + 1 with both parts, 1 with one).
    let choices = 1;
    for (let t = from; t < to; t++) {
      const ch = plan.childOf[t]!;
      const f = flags[ch]!;
      if (!ar.le(mu[ch]!, ar.zero) || f === 0) return NOT_SEPARABLE;
      const a = plan.times[t]!;
      allA &&= (f & A) !== 0;
      allB &&= (f & B) !== 0;
      if (f & A) sa = ar.mul(sa, ar.symPow(spanA[ch]!, a));
      if (f & B) sb = ar.mul(sb, ar.symPow(spanB[ch]!, a));
      fullSpans &&= (!(f & A) || ar.le(D, spanA[ch]!)) && (!(f & B) || ar.le(D, spanB[ch]!));
      if (f === (A | B)) choices *= a + 1;
      if (choices > MAX_TERMS) return NOT_SEPARABLE;
    }
    const flagsOut = (allA ? A : 0) | (allB ? B : 0);
    const spanOutA = allA ? min(D, sa) : ar.zero;
    const spanOutB = allB ? min(D, sb) : ar.zero;
    // The all-A and all-B choices are the pure parts (when every factor has that part).
    const mixedTerms = choices - (allA ? 1 : 0) - (allB ? 1 : 0);
    if (fullSpans) {
      // Every term with both sides present is D (each power's span is at least its base's).
      const rest = mixedTerms > 0 ? ar.mul(D, ar.of(mixedTerms)) : ar.zero;
      if (!ar.le(rest, cap)) return OVER;
      this.set(v, flagsOut, rest, spanOutA, spanOutB, PARTS_EXPANDED);
      return EXPANDED;
    }
    if (mixedTerms > MAX_LISTED_TERMS) return NOT_SEPARABLE;
    // Walk the choices as a mixed-radix counter over the distinct factors.
    const n = to - from;
    const j = new Int32Array(n);
    const lo = new Int32Array(n);
    const hi = new Int32Array(n);
    for (let x = 0; x < n; x++) {
      const ch = plan.childOf[from + x]!;
      const a = plan.times[from + x]!;
      lo[x] = flags[ch]! & B ? 0 : a;
      hi[x] = flags[ch]! & A ? a : 0;
      j[x] = lo[x]!;
    }
    let rest = ar.zero;
    for (;;) {
      let pa = ar.one;
      let pb = ar.one;
      let atA = true;
      let atB = true;
      for (let x = 0; x < n; x++) {
        const ch = plan.childOf[from + x]!;
        const a = plan.times[from + x]!;
        if (j[x]! > 0) pa = ar.mul(pa, ar.symPow(spanA[ch]!, j[x]!));
        if (j[x]! < a) pb = ar.mul(pb, ar.symPow(spanB[ch]!, a - j[x]!));
        atA &&= j[x] === a;
        atB &&= j[x] === 0;
      }
      if (!atA && !atB) {
        rest = ar.add(rest, min(D, min(pa, pb)));
        if (!ar.le(rest, cap)) return OVER;
      }
      let x = 0;
      while (x < n && j[x] === hi[x]) {
        j[x] = lo[x]!;
        x++;
      }
      if (x === n) break;
      j[x]!++;
    }
    this.set(v, flagsOut, rest, spanOutA, spanOutB, PARTS_EXPANDED);
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
