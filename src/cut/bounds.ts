/**
 * Bounds per partition: the one place that decides which rules apply to which model, combines
 * them (the smallest upper bound, the largest lower bound) and names the status. Every rule used
 * here is sound on its own; when none proves a lower bound, the partition is `upper-only`.
 */
import type { Diagnostic } from '../diagnostic.js';
import type { LayeredModel, Model } from '../config/model.js';
import type { Partition } from '../partition/partition.js';
import { resolvePartition } from '../partition/partition.js';
import { OP_INPUT, type Circuit } from '../network/circuit.js';
import { buildCircuit } from '../network/build-circuit.js';
import { treeMinCut, type CutCounts } from './tree-min-cut.js';
import { degreeBound, binomial } from './degree-bound.js';
import { floorLog, powerCandidates } from './power-rounding.js';
import { explicitBounds } from './explicit-bounds.js';
import { topWindowLower } from './top-window-lower.js';
import type { Bound, BoundsResult, CutEntry, PartitionBounds, Surrogate } from './types.js';
import { log2Big } from './types.js';

export interface BoundsOptions {
  readonly surrogate: Surrogate;
  readonly nodeLimit?: number;
}

export type BoundsOutcome = { ok: true; result: BoundsResult } | { ok: false; diagnostics: Diagnostic[] };

/** Ranks above this many bits are not written out as integers. */
export const MAX_RANK_BITS = 4_000_000;

export function computeBounds(model: Model, partitions: readonly Partition[], options: BoundsOptions): BoundsOutcome {
  if (model.kind === 'explicit') {
    const results = partitions.map((p) => finish(p.label, explicitBounds(model, p)));
    const notes = ['an explicit tensor network is analysed as given: the surrogate setting does not apply to it'];
    return { ok: true, result: { file: model.file, surrogate: options.surrogate, notes, partitions: results } };
  }
  const analysis = analyseLayered(model, options);
  if (!analysis.ok) return analysis;
  const results: PartitionBounds[] = [];
  for (const p of partitions) {
    const r = analysis.bounds(p);
    if ('diagnostic' in r) return { ok: false, diagnostics: [r.diagnostic] };
    results.push(r);
  }
  return { ok: true, result: { file: model.file, surrogate: options.surrogate, notes: analysis.notes, partitions: results } };
}

type LayeredAnalysis =
  | { ok: true; notes: string[]; bounds: (p: Partition) => PartitionBounds | { diagnostic: Diagnostic } }
  | { ok: false; diagnostics: Diagnostic[] };

/** Builds the networks once, then bounds any number of partitions of the model. */
export function analyseLayered(model: LayeredModel, options: BoundsOptions): LayeredAnalysis {
  const built = buildCircuit(model, options);
  if (!built.ok) return built;
  const circuit = built.circuit;
  const notes = [...built.notes];
  // Lower bounds are proven on a tree network: the model's own, or for `overlap` its kernel-1
  // special case (zero every off-centre tap), which exists when every conv keeps the grid.
  let lowerCircuit: Circuit | undefined = circuit.sums ? undefined : circuit;
  if (circuit.sums) {
    const keepsGrid = model.layers.every(
      (l) => l.kind !== 'conv' || (l.stride.every((s) => s === 1) && (l.padding === 'same' || l.kernel.every((k) => k === 1))),
    );
    if (keepsGrid) {
      const tree = buildCircuit(model, { ...options, surrogate: 'tree' });
      if (tree.ok) lowerCircuit = tree.circuit;
    }
    notes.push('overlap surrogate: each index of the min-cut carries one extra constant coordinate (dimension + 1), so that window sums are contractions');
  }
  const augment = circuit.sums ? 1 : 0;
  const upperWeights = new Float64Array(circuit.size);
  for (let v = 0; v < circuit.size; v++) upperWeights[v] = Math.log2(circuit.dim[v]! + augment);
  const hasRecurrent = model.layers.some((l) => l.kind === 'recurrent');
  const rounding = lowerCircuit && !model.weightSharing && !hasRecurrent ? roundingPlan(lowerCircuit) : undefined;
  // Sibling subtrees compute the same function only with shared weights in a uniform tree.
  const symmetric = model.weightSharing && !hasRecurrent && !circuit.sums;

  const bounds = (p: Partition): PartitionBounds | { diagnostic: Diagnostic } => {
    const cut = treeMinCut(circuit, p.side, upperWeights, { symmetric });
    const deg = circuit.reuse ? degreeBound(circuit, p.side) : null;
    // Choose by log2 first: the loser may have millions of digits and is never written out.
    const useDegree = deg !== null && deg.log2 < cut.value - 1e-9;
    if (Math.min(cut.value, deg?.log2 ?? Infinity) > MAX_RANK_BITS) {
      return {
        diagnostic: {
          code: 'network/rank-too-large',
          message: `the bound for partition '${p.label}' has more than ${MAX_RANK_BITS} bits; analyse a smaller input`,
          file: model.file,
          span: model.span,
          severity: 'error',
        },
      };
    }
    let upper = useDegree ? makeBound(deg.rank(), 'degree', circuit, deg.counts, 0) : makeBound(productOf(cut.counts, augment), 'min-cut', circuit, cut.counts, augment);
    if (deg && !useDegree && cut.value - deg.log2 < 1) {
      // Close call in log2 (log-gamma is approximate): compare the exact values.
      const exact = deg.rank();
      if (exact < upper.rank) upper = makeBound(exact, 'degree', circuit, deg.counts, 0);
    }
    const lowers: Bound[] = [];
    if (rounding && lowerCircuit) lowers.push(roundingLower(lowerCircuit, p.side, rounding));
    else if (lowerCircuit) lowers.push(diagonalLower(lowerCircuit, p.side));
    if (lowerCircuit && model.weightSharing && !hasRecurrent) {
      const top = topWindowLower(lowerCircuit, p.side);
      if (top !== undefined) lowers.push({ rank: top, log2: log2Big(top), method: 'top-window span', cut: [] });
    }
    const published = publishedRecurrentLower(model, p);
    if (published) lowers.push(published);
    const shallow = shallowRecurrentLower(model, p);
    if (shallow) lowers.push(shallow);
    let lower: Bound | null = null;
    for (const l of lowers) if (!lower || l.rank > lower.rank) lower = l;
    return finish(p.label, { upper, lower });
  };
  return { ok: true, notes, bounds };
}

function finish(label: string, b: { upper: Bound; lower: Bound | null }): PartitionBounds {
  if (b.lower && b.lower.rank > b.upper.rank) {
    throw new Error(`unsound bounds for '${label}': lower ${b.lower.rank} (${b.lower.method}) > upper ${b.upper.rank} (${b.upper.method})`);
  }
  const status = !b.lower ? 'upper-only' : b.lower.rank === b.upper.rank ? 'exact' : 'bounded';
  return { partition: label, upper: b.upper, lower: b.lower, status };
}

function productOf(counts: CutCounts, augment: number): bigint {
  const byDim = new Map<number, bigint>();
  for (const m of counts.values()) {
    for (const [dim, k] of m) {
      // A bond of dimension 1 is a factor 1 however often the duplicated tree cuts it (deep
      // recurrence with width 1 cuts exponentially many copies at no cost).
      if (dim + augment === 1) continue;
      if (!Number.isSafeInteger(k)) throw new Error('cut multiplicity beyond exact integers');
      byDim.set(dim + augment, (byDim.get(dim + augment) ?? 0n) + BigInt(k));
    }
  }
  let r = 1n;
  for (const [d, k] of byDim) r *= BigInt(d) ** k;
  return r;
}

function makeBound(rank: bigint, method: string, c: Circuit, counts: CutCounts, augment: number): Bound {
  return { rank, log2: log2Big(rank), method, cut: cutEntries(c, counts, augment) };
}

export function cutEntries(c: Circuit, counts: CutCounts, augment: number): CutEntry[] {
  const entries: CutEntry[] = [];
  for (const [tag, byDim] of counts) {
    const t = c.tags[tag]!;
    for (const [dim, count] of byDim) {
      // Width-1 bonds cost nothing, so the cut may take exponentially many copies of them; such
      // a count is no exact integer and says nothing, and the rank does not depend on it.
      if (dim + augment === 1 && !Number.isSafeInteger(count)) continue;
      entries.push({ layer: t.label, line: t.line, dim: dim + augment, count });
    }
  }
  return entries.sort((a, b) => a.line - b.line || a.dim - b.dim || String(a.layer).localeCompare(String(b.layer)));
}

interface RoundingPlan {
  readonly candidates: { q: number; weights: Float64Array }[];
}

function roundingPlan(c: Circuit): RoundingPlan {
  const qs = powerCandidates(c.dim);
  return {
    candidates: qs.map((q) => {
      const w = new Float64Array(c.size);
      for (let v = 0; v < c.size; v++) w[v] = floorLog(c.dim[v]!, q);
      return { q, weights: w };
    }),
  };
}

/** Best power-rounding bound: q^(integer min-cut of the rounded network). */
function roundingLower(c: Circuit, side: Uint8Array, plan: RoundingPlan): Bound {
  let best: Bound | undefined;
  for (const { q, weights } of plan.candidates) {
    const cut = treeMinCut(c, side, weights);
    const rank = BigInt(q) ** BigInt(cut.value);
    if (!best || rank > best.rank) {
      const counts: CutCounts = new Map();
      for (const [tag, byDim] of cut.counts) {
        const m = new Map<number, number>();
        for (const [dim, k] of byDim) m.set(q ** floorLog(dim, q), (m.get(q ** floorLog(dim, q)) ?? 0) + k);
        counts.set(tag, m);
      }
      best = { rank, log2: log2Big(rank), method: `power-rounding q=${q}`, cut: cutEntries(c, counts, 0) };
    }
  }
  return best!;
}

/**
 * Derived here: with every map a partial identity of width q (the smallest dimension in the
 * network's reachable part) and learned initial states all-ones, the function is
 * Σ_k w_k Π_p x_{p,k}^{c_p} over the inputs p that reach the output (c_p ≥ 1 paths), whose rank is
 * q when both sides hold such an input. Valid with shared weights.
 */
function diagonalLower(c: Circuit, side: Uint8Array): Bound {
  // Only inputs that reach the output count (a stride larger than its kernel can drop some):
  // when one side has none, the function does not depend on it and the rank is 1.
  const reached = new Uint8Array(c.size);
  reached[c.top] = 1;
  let q = Infinity;
  let sides = 0;
  for (let v = c.size - 1; v >= 0; v--) {
    if (!reached[v]) continue;
    q = Math.min(q, c.dim[v]!);
    if (c.op[v] === OP_INPUT) sides |= side[c.position[v]!] === 1 ? 1 : 2;
    for (let i = c.childStart[v]!; i < c.childStart[v + 1]!; i++) reached[c.childList[i]!] = 1;
  }
  const rank = sides === 3 ? BigInt(q) : 1n;
  return { rank, log2: log2Big(rank), method: 'diagonal', cut: [] };
}

/**
 * Depth-2 recurrent arithmetic circuit over the raw inputs, start-end partition of an even length
 * T: separation rank ≥ C(min(M, R) + T/2 − 1, T/2) (Levine, Sharir, Ziv, Shashua, "Benefits of
 * depth for long-term memory of recurrent networks").
 */
function publishedRecurrentLower(model: LayeredModel, p: Partition): Bound | undefined {
  const [first, ...rest] = model.layers;
  if (!first || first.kind !== 'recurrent' || first.depth !== 2) return undefined;
  if (rest.some((l) => l.kind !== 'dense')) return undefined;
  if (model.input.shape.length !== 1) return undefined;
  const t = model.input.shape[0]!;
  if (t % 2 !== 0) return undefined;
  const startEnd = resolvePartition('start-end', model.input.shape);
  if (!startEnd.ok || !sameMask(startEnd.partition.side, p.side)) return undefined;
  const m = Math.min(model.input.features, first.hidden);
  const rank = binomial(m + t / 2 - 1, t / 2);
  return { rank, log2: log2Big(rank), method: 'published depth-2 recurrent', cut: [] };
}

/**
 * Derived here: a depth-1 recurrent arithmetic circuit over the raw inputs with W_H = I computes
 * Σ_r c_r Π_t ⟨a_r, x_t⟩ (a_r the rows of W_I, c_r = w_r·(h_0)_r). Across (A, B) that is
 * L·diag(c)·Rᵀ with L[x_A, r] = Π_{t∈A} ⟨a_r, x_t⟩ = ⟨a_r^{⊗|A|}, ⊗_t x_t⟩: for generic rows these
 * span min(R, C(M + |A| − 1, |A|)) dimensions (the Veronese variety spans the symmetric power), so
 * by Sylvester's inequality rank ≥ ρ_A + ρ_B − R. One weight choice suffices for a lower bound.
 */
function shallowRecurrentLower(model: LayeredModel, p: Partition): Bound | undefined {
  const [first, ...rest] = model.layers;
  if (!first || first.kind !== 'recurrent' || first.depth !== 1) return undefined;
  if (rest.some((l) => l.kind !== 'dense')) return undefined;
  let a = 0;
  for (const x of p.side) a += x;
  const b = p.side.length - a;
  if (a === 0 || b === 0) return undefined;
  const r = BigInt(first.hidden);
  const m = model.input.features;
  const span = (count: number): bigint => {
    const sym = binomial(m + count - 1, count);
    return sym < r ? sym : r;
  };
  const bound = span(a) + span(b) - r;
  if (bound <= 1n) return undefined;
  return { rank: bound, log2: log2Big(bound), method: 'shallow recurrent span', cut: [] };
}

function sameMask(a: Uint8Array, b: Uint8Array): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}
