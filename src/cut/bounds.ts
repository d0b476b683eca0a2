/**
 * Bounds per partition: the one place that decides which rules apply to which model, combines
 * them (the smallest upper bound, the largest lower bound) and names the status. Every rule used
 * here is sound on its own; when none proves a lower bound, the partition is `upper-only`.
 */
import type { Diagnostic } from '../diagnostic.js';
import { INPUT, representationOf, type ExplicitModel, type LayeredModel, type Model, type RecurrentLayer } from '../config/model.js';
import type { Partition } from '../partition/partition.js';
import { resolvePartition } from '../partition/partition.js';
import { OP_INPUT, OP_LINEAR, type Circuit } from '../network/circuit.js';
import { buildCircuit } from '../network/build-circuit.js';
import { headCone } from '../network/head-cone.js';
import { treeMinCut, type CutCounts } from './tree-min-cut.js';
import { degreeBound, binomial, sideReach, sylvesterPowerSpan } from './degree-bound.js';
import { gradedDegreeBound, totalDegrees } from './graded-degree.js';
import { partnerIdealBound } from './partner-ideal.js';
import { floorLog, powerCandidates } from './power-rounding.js';
import { explicitBounds, type ExplicitBounds } from './explicit-bounds.js';
import { explicitProbe } from './probe/explicit-probe.js';
import { topWindowLower } from './top-window-lower.js';
import { splitWindowLower } from './window-product-lower.js';
import { rankPropagation } from './rank-propagation.js';
import { specialCases } from './special-cases.js';
import { attentionLower, attentionOnInput, perPositionMap } from './attention-lower.js';
import { certifiedProbe } from './probe/certified-probe.js';
import type { ModelShapes } from '../config/model-shapes.js';
import type { PointwiseReading } from '../network/square-rule.js';
import type { Bound, BoundsResult, CutEntry, PartitionBounds, Surrogate } from './types.js';
import { HUGE_RANK, MAX_RANK_BITS, boundsMeet, log2Big } from './types.js';

export interface BoundsOptions {
  readonly surrogate: Surrogate;
  readonly nodeLimit?: number;
  /** Multiply-adds the certified probe may spend per partition (probe/certified-probe.ts); 0: no probe. */
  readonly probeBudget?: number;
  /**
   * Per partition of `computeBounds`, the rank the certified probe has to prove: it runs only when
   * the other rules leave that rank unproven and the upper bound allows it, and stops once it is
   * proven (a policy check needs no more). null: no probe for that partition. Absent (the list or
   * its entry): the probe runs towards the upper bound.
   */
  readonly probeTargets?: readonly (bigint | null | undefined)[];
}

export type BoundsOutcome = { ok: true; result: BoundsResult } | { ok: false; diagnostics: Diagnostic[] };

export { MAX_RANK_BITS } from './types.js';

/**
 * An explicit network's bounds with the certified probe's lower bound where the rules leave a gap
 * (and, with a target, only while the target is unproven and within reach).
 */
function withExplicitProbe(model: ExplicitModel, p: Partition, found: ExplicitBounds, options: BoundsOptions, target: bigint | null | undefined): ExplicitBounds {
  const known = found.lower?.rank ?? 0n;
  if (target === null || known >= found.upper.rank) return found;
  if (target !== undefined && (known >= target || target > found.upper.rank)) return found;
  const probed = explicitProbe(model, p.side, known, options.probeBudget);
  if (!probed) return found;
  if (probed.rank > found.upper.rank) throw new Error(`explicit bounds: probe ${probed.rank} exceeds upper ${found.upper.rank} (bug)`);
  return { upper: found.upper, lower: probed };
}

export function computeBounds(model: Model, partitions: readonly Partition[], options: BoundsOptions): BoundsOutcome {
  if (model.kind === 'explicit') {
    const results = partitions.map((p, i) => finish(p.label, withExplicitProbe(model, p, explicitBounds(model, p), options, options.probeTargets?.[i])));
    const notes = ['an explicit tensor network is analysed as given: the surrogate setting does not apply to it'];
    return { ok: true, result: { file: model.file, surrogate: options.surrogate, notes, partitions: results } };
  }
  const analysis = analyseLayered(model, options);
  if (!analysis.ok) return analysis;
  const results: PartitionBounds[] = [];
  for (const [i, p] of partitions.entries()) {
    const r = analysis.bounds(p, options.probeTargets?.[i]);
    if ('diagnostic' in r) return { ok: false, diagnostics: [r.diagnostic] };
    results.push(r);
  }
  return { ok: true, result: { file: model.file, surrogate: options.surrogate, notes: analysis.notes, partitions: results } };
}

type LayeredAnalysis =
  | { ok: true; notes: string[]; bounds: (p: Partition, probeTarget?: bigint | null) => PartitionBounds | { diagnostic: Diagnostic } }
  | { ok: false; diagnostics: Diagnostic[] };

/** Builds the networks once, then bounds any number of partitions of the model. */
export function analyseLayered(model: LayeredModel, options: BoundsOptions): LayeredAnalysis {
  const built = buildCircuit(model, options);
  if (!built.ok) return built;
  // The upper-bound rules read only what the head reads.
  const circuit = headCone(built.circuit);
  const notes = [...built.notes];
  if (circuit.sums) {
    notes.push('the network has sums (overlapping windows, merges, flatten + dense): a min-cut index carries one extra constant coordinate (dimension + 1), and rank propagation adds the ranks of summed terms');
  }
  const augment = circuit.sums ? 1 : 0;
  const upperWeights = new Float64Array(circuit.size);
  for (let v = 0; v < circuit.size; v++) upperWeights[v] = Math.log2(circuit.dim[v]! + augment);
  const hasRecurrent = model.layers.some((l) => l.kind === 'recurrent');
  // Sibling subtrees compute the same function only with shared weights in a uniform tree.
  const symmetric = model.weightSharing && !hasRecurrent && !circuit.sums;
  const lowerNetworks = lowerCircuits(model, options, built.shapes, built.pointwise, hasRecurrent);
  const probe = certifiedProbe(model, built.shapes, built.pointwise, options.surrogate, options.probeBudget);

  // Total degree of every node, for the graded degree rule: computed on first use.
  let degrees: Int32Array | undefined;
  const bounds = (p: Partition, probeTarget?: bigint | null): PartitionBounds | { diagnostic: Diagnostic } => {
    const cut = treeMinCut(circuit, p.side, upperWeights, { symmetric });
    // A cut of weight 0 is rank 1, which no other rule improves on: skip them.
    const reach = circuit.reuse && cut.value > 0 ? sideReach(circuit, p.side) : null;
    const deg = reach && degreeBound(circuit, p.side, reach);
    const graded = reach && gradedDegreeBound(circuit, reach, (degrees ??= totalDegrees(circuit)));
    const gradedLog2 = graded ? log2Big(graded.rank) : Infinity;
    const ideal = reach && partnerIdealBound(circuit, reach);
    const prop = circuit.sums && cut.value > 0 ? rankPropagation(circuit, p.side, built.circuit) : null;
    // Token inputs: the function lives on V^N sequences, so its matrix has V^|A| rows and V^|B|
    // columns, whatever the network does with them (reuse included).
    const vocabulary = model.input.vocabulary;
    const tokenSide = vocabulary === undefined ? 0 : Math.min(...sideSizes(p.side));
    const tokens = vocabulary === undefined ? Infinity : tokenSide * Math.log2(vocabulary);
    const best = Math.min(cut.value, deg?.log2 ?? Infinity, gradedLog2, ideal?.log2 ?? Infinity, prop?.log2 ?? Infinity, tokens);
    if (best > MAX_RANK_BITS) {
      // A result, not an error: the log2 of the smallest bound, reported as more than the limit.
      const method = best === cut.value ? 'min-cut' : best === prop?.log2 ? 'rank propagation' : best === deg?.log2 ? 'degree' : best === gradedLog2 ? 'graded degree' : best === ideal?.log2 ? 'partner ideal' : 'token count';
      const counts = method === 'min-cut' ? cut.counts : method === 'rank propagation' ? prop!.counts : method === 'degree' ? deg!.counts : method === 'graded degree' ? graded!.counts : method === 'partner ideal' ? ideal!.counts : new Map();
      const upper: Bound = { rank: HUGE_RANK, log2: best, huge: true, method, cut: cutEntries(circuit, counts, method === 'min-cut' ? augment : 0) };
      return finish(p.label, { upper, lower: bestLower(p, upper, probeTarget) });
    }
    // Choose by log2 first: the losers may have millions of digits and are never written out.
    // Close calls (log-gamma and log-sum are approximate) are settled on the exact values.
    const candidates: { log2: number; make: () => Bound | undefined }[] = [
      { log2: cut.value, make: () => makeBound(productOf(cut.counts, augment), 'min-cut', circuit, cut.counts, augment) },
    ];
    if (deg) candidates.push({ log2: deg.log2, make: () => makeBound(deg.rank(), 'degree', circuit, deg.counts, 0) });
    if (graded) candidates.push({ log2: gradedLog2, make: () => makeBound(graded.rank, 'graded degree', circuit, graded.counts, 0) });
    if (ideal) candidates.push({ log2: ideal.log2, make: () => makeBound(ideal.rank(), 'partner ideal', circuit, ideal.counts, 0) });
    if (vocabulary !== undefined) {
      candidates.push({
        log2: tokens,
        make: () => ({ rank: BigInt(vocabulary) ** BigInt(tokenSide), log2: tokens, method: 'token count', cut: [{ layer: 'input', line: model.input.span.line, dim: vocabulary, count: tokenSide }] }),
      });
    }
    if (prop) {
      candidates.push({
        log2: prop.log2,
        make: () => {
          const rank = prop.rank();
          return rank === undefined ? undefined : makeBound(rank, 'rank propagation', circuit, prop.counts, 0);
        },
      });
    }
    let upper: Bound | undefined;
    for (const c of candidates) {
      if (c.log2 > best + 1) continue;
      const b = c.make();
      if (b && (!upper || b.rank < upper.rank)) upper = b;
    }
    return finish(p.label, { upper: upper!, lower: bestLower(p, upper!, probeTarget) });
  };
  const attentionModel = attentionOnInput(model, built.shapes, built.pointwise);
  const recurrent = recurrentOnInput(model, built.shapes);
  const bestLower = (p: Partition, upper: Bound, probeTarget: bigint | null | undefined): Bound | null => {
    const lowers: Bound[] = [];
    for (const net of lowerNetworks) lowers.push(...net.lower(p.side));
    for (const chain of recurrent?.chains ?? []) {
      const side = chainSide(p.side, chain);
      const published = publishedRecurrentLower(recurrent!, chain, side);
      if (published) lowers.push(published);
      const shallow = shallowRecurrentLower(recurrent!, chain, side);
      if (shallow) lowers.push(shallow);
    }
    const attention = attentionModel && attentionLower(attentionModel, p, model.input.shape.length === 1);
    if (attention) lowers.push(attention);
    let lower: Bound | null = null;
    for (const l of lowers) if (!lower || l.rank > lower.rank) lower = l;
    // The probe runs last, from just above what the rules proved, and only while it can improve:
    // up to the upper bound, or to the target when one is given.
    if (!probe || probeTarget === null) return lower;
    // A target above the upper bound is provably out of reach: nothing for the probe to prove.
    if (probeTarget !== undefined && probeTarget > upper.rank) return lower;
    const goal = probeTarget ?? upper.rank;
    if (!lower || lower.rank < goal) return probe(p.side, lower?.rank ?? 0n, goal) ?? lower;
    return lower;
  };
  return { ok: true, notes, bounds };
}

interface LowerNetwork {
  readonly lower: (side: Uint8Array) => Bound[];
}

/**
 * The sum-free networks whose lower bounds are lower bounds of the model: the model's own network
 * when it has no sums, else its special cases (special-cases.ts) that have none.
 */
function lowerCircuits(model: LayeredModel, options: BoundsOptions, shapes: ModelShapes, reading: PointwiseReading, hasRecurrent: boolean): LowerNetwork[] {
  const out: LowerNetwork[] = [];
  for (const sc of specialCases(model, options.surrogate, shapes, reading)) {
    // Grouped maps are not generic: the rules run on the special case where they are identities.
    const built = buildCircuit(sc.model, { ...options, surrogate: sc.surrogate, groupedAsIdentity: true });
    if (!built.ok || built.circuit.sums) continue;
    // h = ⟨w, L_k⋯L_1 v⟩ = ⟨w', v⟩, and w' = L_1ᵀ⋯L_kᵀw can be any vector (generic maps, even
    // of width 1): the lower-bound rules read the head from the last node that is not a linear map.
    let top = built.circuit.top;
    while (built.circuit.op[top] === OP_LINEAR) top = built.circuit.childList[built.circuit.childStart[top]!]!;
    // The rules read only what that node reads.
    const c = headCone({ ...built.circuit, top });
    const suffix = sc.how ? ` (${sc.how})` : '';
    // Power rounding needs a tensor network: no reuse, no shared weights, no recurrence. Its bases
    // come from every dimension of the special case, read or not.
    const rounding = !model.weightSharing && !hasRecurrent && !c.reuse ? roundingPlan(c, built.circuit.dim) : undefined;
    const topWindow = model.weightSharing && !hasRecurrent && !c.reuse;
    out.push({
      lower: (side) => {
        const found: Bound[] = [];
        const tag = (b: Bound): Bound => ({ ...b, method: b.method + suffix });
        if (rounding) found.push(tag(roundingLower(c, side, rounding)));
        found.push(tag(diagonalLower(c, side)));
        if (topWindow) {
          const top = topWindowLower(c, side);
          if (top !== undefined) found.push(tag({ rank: top, log2: log2Big(top), method: 'top-window span', cut: [] }));
          const split = splitWindowLower(c, side);
          if (split !== undefined && split > 1n) found.push(tag({ rank: split, log2: log2Big(split), method: 'split windows', cut: [] }));
        }
        return found;
      },
    });
  }
  return out;
}

/**
 * Rank 1 is proven for every model the engine accepts: a layered model whose analysed output is
 * zero for every choice of weights is refused, and an explicit network of generic tensors is not
 * zero. So an upper bound of 1 is exact.
 */
const NOT_ZERO: Bound = { rank: 1n, log2: 0, method: 'the output is not zero', cut: [] };

function finish(label: string, b: { upper: Bound; lower: Bound | null }): PartitionBounds {
  const upper = b.upper;
  // A lower bound beyond the bit limit is reported like a huge upper bound: by its log2.
  const found = b.lower && !b.lower.huge && b.lower.log2 > MAX_RANK_BITS ? { ...b.lower, rank: HUGE_RANK, huge: true } : b.lower;
  const lower = !found && !upper.huge && upper.rank === 1n ? NOT_ZERO : found;
  const above = lower && (lower.huge || upper.huge ? lower.log2 > upper.log2 + 1e-9 * upper.log2 : lower.rank > upper.rank);
  const shown = (x: Bound): string => (x.huge ? `2^${x.log2}` : String(x.rank));
  if (above) throw new Error(`unsound bounds for '${label}': lower ${shown(lower)} (${lower.method}) > upper ${shown(upper)} (${upper.method})`);
  const status = !lower ? 'upper-only' : boundsMeet(lower, upper) ? 'exact' : 'bounded';
  return { partition: label, upper, lower, status };
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

function roundingPlan(c: Circuit, dims: Int32Array): RoundingPlan {
  const qs = powerCandidates(dims);
  return {
    candidates: qs.map((q) => {
      // A network has few distinct dimensions: each exponent is worked out once.
      const exponent = new Map<number, number>();
      const w = new Float64Array(c.size);
      for (let v = 0; v < c.size; v++) {
        const d = c.dim[v]!;
        let e = exponent.get(d);
        if (e === undefined) exponent.set(d, (e = floorLog(d, q)));
        w[v] = e;
      }
      return { q, weights: w };
    }),
  };
}

/** Best power-rounding bound: q^(integer min-cut of the rounded network). */
function roundingLower(c: Circuit, side: Uint8Array, plan: RoundingPlan): Bound {
  let best: Bound | undefined;
  for (const { q, weights } of plan.candidates) {
    const cut = treeMinCut(c, side, weights);
    // Beyond the bit limit the bound is a result known by its log2: the power is not formed.
    const log2 = cut.value * Math.log2(q);
    if (log2 > MAX_RANK_BITS) {
      if (!best || log2 > best.log2) best = { rank: HUGE_RANK, log2, huge: true, method: `power-rounding q=${q}`, cut: [] };
      continue;
    }
    if (best?.huge) continue;
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
 * depth for long-term memory of recurrent networks"). At depth L ≥ 3 the same bound holds for the
 * top two levels once levels 1 … L−2 pass their input through (derived here; DEVELOPERS.md,
 * "Deep recurrences: passing the lower levels through"). `side` is the partition on the steps
 * the chain reads, in the chain's order.
 */
function publishedRecurrentLower(on: RecurrentOnInput, chain: RecurrentChain, side: Uint8Array): Bound | undefined {
  const first = on.layer;
  if (first.depth < 2) return undefined;
  const t = side.length;
  if (t % 2 !== 0) return undefined;
  const startEnd = resolvePartition('start-end', [t]);
  if (!startEnd.ok || !sameMask(startEnd.partition.side, side)) return undefined;
  const m = Math.min(on.m, first.hidden);
  const rank = binomial(m + t / 2 - 1, t / 2);
  const method = first.depth === 2 ? 'published depth-2 recurrent' : 'published depth-2 recurrent, lower levels passed through';
  return { rank, log2: log2Big(rank), method: chainMethod(method, on, chain), cut: [] };
}

/**
 * Derived here: a depth-1 recurrent arithmetic circuit over the raw inputs with W_H = I computes
 * Σ_r c_r Π_t ⟨a_r, x_t⟩ (a_r the rows of W_I, c_r = w_r·(h_0)_r). Across (A, B) that is
 * L·diag(c)·Rᵀ with L[x_A, r] = Π_{t∈A} ⟨a_r, x_t⟩ = ⟨a_r^{⊗|A|}, ⊗_t x_t⟩: for generic rows these
 * span min(R, C(M + |A| − 1, |A|)) dimensions (the Veronese variety spans the symmetric power), so
 * by Sylvester's inequality rank ≥ ρ_A + ρ_B − R. One weight choice suffices for a lower bound.
 * At depth L ≥ 2 the top level is such a layer once levels 1 … L−1 pass their input through, on
 * inputs spanning min(M, R) dimensions (DEVELOPERS.md, "Deep recurrences: passing the lower levels
 * through").
 */
function shallowRecurrentLower(on: RecurrentOnInput, chain: RecurrentChain, side: Uint8Array): Bound | undefined {
  const first = on.layer;
  if (first.depth < 1) return undefined;
  const [a, b] = sideSizes(side);
  if (a === 0 || b === 0) return undefined;
  const r = BigInt(first.hidden);
  const m = first.depth === 1 ? on.m : Math.min(on.m, first.hidden);
  const bound = sylvesterPowerSpan(m, a, b, r);
  if (bound <= 1n) return undefined;
  const method = first.depth === 1 ? 'shallow recurrent span' : 'recurrent span, lower levels passed through';
  return { rank: bound, log2: log2Big(bound), method: chainMethod(method, on, chain), cut: [] };
}

/** A recurrent rule's name, saying which chain of a bidirectional layer it keeps, and on which steps. */
function chainMethod(method: string, on: RecurrentOnInput, chain: RecurrentChain): string {
  const steps = chain.from === 0 && chain.to === on.steps - 1 ? '' : `, steps ${chain.from}-${chain.to}`;
  if (!on.layer.bidirectional) return `${method}${steps}`;
  return `${method}, ${chain.backward ? 'forward' : 'backward'} chains zeroed${steps}`;
}

/**
 * The steps one chain of the analysed output reads: the forward chain reads steps from … to in
 * order, the backward chain (of a bidirectional layer) reads them from `to` down to `from`.
 */
interface RecurrentChain {
  readonly from: number;
  readonly to: number;
  readonly backward: boolean;
}

/** The partition restricted to a chain's steps, in the chain's order. */
function chainSide(side: Uint8Array, chain: RecurrentChain): Uint8Array {
  const out = side.slice(chain.from, chain.to + 1);
  return chain.backward ? out.reverse() : out;
}

interface RecurrentOnInput {
  readonly layer: RecurrentLayer;
  /** The dimension the recurrent layer's inputs span: M, cut by the per-position maps before it. */
  readonly m: number;
  /** T, the layer's steps. */
  readonly steps: number;
  /**
   * The chains whose rules hold: the forward chain up to the analysed step, and for a bidirectional
   * layer the backward chain from it (each with the other direction zeroed).
   */
  readonly chains: readonly RecurrentChain[];
}

/**
 * A model that is one recurrent layer reading the input through per-position linear maps
 * (embeddings, per-position dense layers, 1×1 convs; learned position vectors, which may be
 * zero), followed only by a head (dense and pointwise layers). The maps before it can be partial
 * identities (a special case), so the recurrent rules hold with M replaced by the narrowest of M
 * and their widths. The output the head reads is the final state, or with per-step outputs the
 * state at the analysed step o: that is the final state of the same layer over steps 0 … o, and
 * the steps after o do not enter it (their side does not change the rank). A bidirectional layer
 * is read with one direction zeroed (DEVELOPERS.md, "Bidirectional layers and per-step
 * outputs"): with its backward chains zeroed it is the unidirectional layer over steps 0 … o
 * (final state: all steps); with its forward chains zeroed, the unidirectional layer over steps
 * T−1 down to o (final state b_1: all steps, reversed).
 */
function recurrentOnInput(model: LayeredModel, shapes: ModelShapes): RecurrentOnInput | undefined {
  let m = shapes.representation;
  let recurrent: RecurrentLayer | undefined;
  for (const l of model.layers) {
    if (l.inputs.length !== 1 || l.inputs[0] !== l.index - 1) return undefined;
    if (l.kind === 'pointwise') continue;
    if (!recurrent) {
      if (l.kind === 'recurrent') {
        recurrent = l;
        continue;
      }
      if (l.kind === 'position' && l.mode === 'learned') continue;
      if (!perPositionMap(l, shapes)) return undefined;
      m = Math.min(m, shapes.layers[l.index]!.width);
      continue;
    }
    if (l.kind !== 'dense') return undefined;
  }
  if (!recurrent || model.input.shape.length !== 1) return undefined;
  // The maps before the layer keep the positions: it runs over the input's T steps.
  const steps = model.input.shape[0]!;
  if (recurrent.sequence && shapes.layers[shapes.layers.length - 1]!.shape[0] !== steps) return undefined;
  const o = recurrent.sequence ? shapes.output.position[0]! : steps - 1;
  const chains: RecurrentChain[] = [{ from: 0, to: o, backward: false }];
  if (recurrent.bidirectional) chains.push({ from: recurrent.sequence ? o : 0, to: steps - 1, backward: true });
  return { layer: recurrent, m, steps, chains };
}

/** Positions on side A and on side B. */
function sideSizes(side: Uint8Array): [number, number] {
  let a = 0;
  for (const x of side) a += x;
  return [a, side.length - a];
}

function sameMask(a: Uint8Array, b: Uint8Array): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}
