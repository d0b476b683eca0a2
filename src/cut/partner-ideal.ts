/**
 * The degree rule sharpened where a frontier node of degree 1 meets the other side in a product
 * (derived here; DEVELOPERS.md, "Partner ideal", has the proof). On a frontier whose degrees are
 * all exact, let w be a node that the output reads once, through linear maps L into one factor of
 * a product q = (L w) ⊙ y. With the frontier values as indeterminates the output is linear in q:
 *
 *     h = Σ_r (L w)_r · y_r · K_r,   y_r ∈ Y_r (dim ≤ m),   K_r ∈ S_{d−e},
 *     rank(h) ≤ Σ_r dim(Y_r · S_{d−e}) ≤ dim(q) · I(m, e, d),
 *
 * with S_δ the forms of degree δ_f in each frontier node f ≠ w, e the degrees of y in them, m the
 * number of the far side's monomials in y (y_r is a combination of m fixed forms of degree e,
 * with coefficients that read the far side only), and I(m, e, d) a bound of dim(Y·S_{d−e}) valid
 * for every space Y of at most m forms of degree e: for linear forms of one node (D variables)
 * exactly C(D+d−1, d) − C(D−m+d−1, d); for one form |S_{d−e}|; for two at most
 * 2·|S_{d−e}| − |S_{d−2e}| (their Koszul syzygy); each further form at most |S_{d−e}| more.
 * The degree rule counts dim(w)·|S_d| there. In a recurrence w is the top state at the cut and y
 * reads the first far input: depth 2 with inputs spanning M = 2 < R = 3 and four steps after the
 * cut gives 3·(15 − 1) = 42 (degree rule 45); depth 3 of width 2, four steps after the cut,
 * 2·(2·40 − 27) = 106 (degree rule 110). Both are the oracle's values.
 */
import { OP_CONST, OP_INPUT, OP_LINEAR, OP_PRODUCT, OP_SUM, type Circuit } from '../network/circuit.js';
import { binomial, frontierCounts, log2Binomial, productTree, sideFrontiers, type SideReach } from './degree-bound.js';
import { log2Big } from './types.js';

export interface PartnerIdealBound {
  /** log2 of the bound, approximate (log-gamma): for choosing between bounds before writing one out. */
  readonly log2: number;
  /** The exact bound, computed on demand. */
  readonly rank: () => bigint;
  /** The frontier of the bound as cut entries. */
  readonly counts: Map<number, Map<number, number>>;
}

/** Frontiers tried per side: the degree rule's best by its count (the recurrences' cuts are among them). */
const FRONTIERS = 4;
/** Nodes visited below the products, per partition and per product: the rule is for the few nodes at a cut. */
const MAX_VISITS = 10_000;
const MAX_CONE = 2_048;

export function partnerIdealBound(c: Circuit, reach: SideReach): PartnerIdealBound | null {
  // The per-circuit arrays are made only once a node of degree 1 is met.
  const scratch = (): Scratch => scratchOf(c);
  const budget = { visits: MAX_VISITS };
  // A side none of whose pure nodes has an exact degree has no frontier the rule reads.
  const sides = [1, 2]
    .filter((mask) => hasExactPure(c, reach, mask))
    .map((mask) => ({ mask, frontiers: sideFrontiers(c, reach, mask, FRONTIERS, false) }))
    .filter((s) => s.frontiers.length > 0);
  if (sides.length === 0) return null;
  // The degree rule's count of each side's best frontier: a candidate that cannot go below the
  // smaller is not worked out. The more promising side is tried first.
  const degreeLog = (f: Map<number, number>): number => {
    let sum = 0;
    for (const [v, d] of f) sum += log2Binomial(c.dim[v]! + d - reach.exact[v]!, d);
    return sum;
  };
  const logs = sides.map((s) => degreeLog(s.frontiers[0]!));
  if (logs.length === 2 && logs[1]! < logs[0]!) sides.reverse();
  let best: Candidate | null = null;
  for (const { mask, frontiers } of sides) {
    for (const frontier of frontiers) {
      const found = frontierBound(c, reach, frontier, mask, scratch, budget, Math.min(best?.log2 ?? Infinity, ...logs));
      if (found && (!best || found.log2 < best.log2)) best = found;
      if (budget.visits <= 0) break;
    }
  }
  if (!best) return null;
  const { frontier, factor, others } = best;
  const rank = (): bigint => factor * productTree([...frontier].filter(([f]) => !others.has(f)).map(([f, d]) => forms(c.dim[f]!, d)));
  return { log2: best.log2, rank, counts: frontierCounts(c, frontier) };
}

function hasExactPure(c: Circuit, reach: SideReach, mask: number): boolean {
  for (let v = 0; v < c.size; v++) if (reach.dep[v] === mask && reach.exact[v]) return true;
  return false;
}

/**
 * A bound of the form factor · Π_{f ∉ others} |forms of degree d_f in f|: the frontier nodes the
 * rule does not touch multiply the same way as in the degree rule.
 */
interface Candidate {
  readonly log2: number;
  readonly frontier: Map<number, number>;
  readonly factor: bigint;
  /** w and the partner's frontier nodes, whose count is in `factor`. */
  readonly others: Set<number>;
}

/** The best bound over the frontier's nodes of degree 1 below `threshold` (log2); null when none. */
function frontierBound(
  c: Circuit,
  reach: SideReach,
  frontier: Map<number, number>,
  mask: number,
  scratchFor: () => Scratch,
  budget: { visits: number },
  threshold: number,
): Candidate | null {
  const { op, dim } = c;
  // Every degree must be exact: K_r and y_r are then homogeneous in each frontier node.
  for (const [f] of frontier) if (!reach.exact[f]) return null;
  const logForms = (f: number, d: number): number => log2Binomial(dim[f]! + d - 1, d);
  let logAll: number | undefined;
  let best: Candidate | null = null;
  for (const [w, dw] of frontier) {
    if (dw !== 1 || budget.visits <= 0) continue;
    const scratch = scratchFor();
    const { parent } = scratch;
    // Up the unique path from w through linear maps to the product q that reads it.
    let v = w;
    while (parent[v]! >= 0 && op[parent[v]!] === OP_LINEAR) v = parent[v]!;
    const q = parent[v]!;
    if (q < 0 || op[q] !== OP_PRODUCT) continue;
    const partner = partnerOf(c, reach, frontier, mask, q, v, scratch, budget);
    if (!partner || partner.e.size === 0 || partner.e.has(w)) continue;
    // The bound is at least min(dim q·|S_{d−e}|, dim w·|S_d|) times the other nodes' count (Y·S
    // holds y·S for one nonzero y): skip what cannot beat the threshold before any big integer.
    let logFull = 0;
    let logOnce = 0;
    for (const [f, e] of partner.e) {
      const d = frontier.get(f)!;
      logFull += logForms(f, d);
      logOnce += logForms(f, d - e);
    }
    logAll ??= [...frontier].reduce((sum, [f, d]) => sum + logForms(f, d), 0);
    const logRest = logAll - logForms(w, 1) - logFull;
    const floor = Math.min(Math.log2(dim[q]!) + logOnce, Math.log2(dim[w]!) + logFull) + logRest;
    if (floor >= Math.min(threshold, best?.log2 ?? Infinity) - 1e-9) continue;
    // |S_δ| over the partner's frontier nodes, at δ = d, d − e and d − 2e; the other nodes'
    // factor is the same in all three and kept apart.
    let full = 1n;
    let once = 1n;
    let twice = 1n;
    for (const [f, e] of partner.e) {
      const d = frontier.get(f)!;
      full *= forms(dim[f]!, d);
      once *= forms(dim[f]!, d - e);
      twice *= forms(dim[f]!, d - 2 * e);
    }
    const m = partner.m;
    let ideal: bigint;
    const single = partner.e.size === 1 ? [...partner.e][0]! : undefined;
    if (single && single[1] === 1) {
      // Linear forms of one node: Y = span(z_1 … z_k) in suitable coordinates, and Y·S misses
      // exactly the forms in the other D − k coordinates.
      const f = single[0];
      const k = m < BigInt(dim[f]!) ? Number(m) : dim[f]!;
      ideal = full - forms(dim[f]! - k, frontier.get(f)!);
    } else if (m === 1n) {
      ideal = once;
    } else {
      // Two forms span at most 2·once − twice (their Koszul syzygy); each further one adds once.
      ideal = m * once - twice;
    }
    if (ideal > full) ideal = full;
    const factor = BigInt(dim[q]!) * ideal;
    const plain = BigInt(dim[w]!) * full;
    if (factor >= plain) continue; // nothing gained over the degree rule
    const log2 = log2Big(factor) + logRest;
    if (!best || log2 < best.log2) best = { log2, frontier, factor, others: new Set([w, ...partner.e.keys()]) };
  }
  return best;
}

interface Partner {
  /** Frontier node → the partner's degree in it (nodes of degree 0 left out). */
  readonly e: Map<number, number>;
  /** How many forms y_r can be at most: the far side's monomials in it. */
  readonly m: bigint;
}

/**
 * The product of q's children other than one occurrence of `via`, as a polynomial in the frontier
 * and the far side's pure nodes: its degree in each frontier node (paths from it), and the number
 * of far-side monomials (a far node whose values span s dimensions, reached by n paths, gives
 * C(s + n − 1, n)). null when it reads the frontier's side other than through the frontier, holds
 * a sum, or the visit budget runs out.
 */
function partnerOf(
  c: Circuit,
  reach: SideReach,
  frontier: Map<number, number>,
  mask: number,
  q: number,
  via: number,
  scratch: Scratch,
  budget: { visits: number },
): Partner | null {
  const { op, childStart, childList } = c;
  const { dep } = reach;
  const { mark, paths, span } = scratch;
  const far = 3 - mask;
  const stamp = ++scratch.stamp;
  // The cone below the partner, stopped at the frontier, the far side's pure nodes and constants.
  const cone: number[] = [];
  const stack: number[] = [];
  const leaf = (v: number): boolean => frontier.has(v) || dep[v] === 0 || dep[v] === far;
  let skipped = false;
  for (let i = childStart[q]!; i < childStart[q + 1]!; i++) {
    const ch = childList[i]!;
    if (ch === via && !skipped) {
      skipped = true;
      continue;
    }
    if (mark[ch] !== stamp) {
      mark[ch] = stamp;
      paths[ch] = 0;
      stack.push(ch);
    }
    paths[ch] = paths[ch]! + 1;
  }
  while (stack.length > 0) {
    const v = stack.pop()!;
    if (--budget.visits < 0 || cone.length >= MAX_CONE) return null;
    cone.push(v);
    if (leaf(v)) continue;
    if (op[v] === OP_INPUT || op[v] === OP_SUM) return null;
    for (let i = childStart[v]!; i < childStart[v + 1]!; i++) {
      const ch = childList[i]!;
      if (mark[ch] !== stamp) {
        mark[ch] = stamp;
        paths[ch] = 0;
        stack.push(ch);
      }
    }
  }
  // Paths to the partner, parents first (node order is topological).
  cone.sort((a, b) => b - a);
  const e = new Map<number, number>();
  let m = 1n;
  for (const v of cone) {
    const p = paths[v]!;
    if (frontier.has(v)) e.set(v, p);
    else if (dep[v] === far) m *= forms(span[v]!, p);
    else if (dep[v] !== 0) {
      for (let i = childStart[v]!; i < childStart[v + 1]!; i++) paths[childList[i]!] = paths[childList[i]!]! + p;
    }
  }
  return { e, m };
}

/** The number of monomials of degree d in D variables, C(D + d − 1, d); 0 for d < 0. */
function forms(D: number, d: number): bigint {
  if (d < 0) return 0n;
  if (d === 0) return 1n;
  return binomial(D + d - 1, d);
}

/** Per circuit: parents, spans, and the marks and path counts of the cone walks. */
interface Scratch {
  /** The parent of every node read exactly once (−1 for the top and nodes read several times). */
  readonly parent: Int32Array;
  /**
   * A bound on the dimension of the span of each node's values: an input its dimension, a
   * constant 1, a linear map at most its child's, a product at most the product of its
   * children's (a ⊙ b = Σ α_i β_j (u_i ⊙ v_j) over bases of their spans), a sum the sum; never
   * more than the node's dimension.
   */
  readonly span: Float64Array;
  readonly mark: Int32Array;
  readonly paths: Float64Array;
  stamp: number;
}

const scratches = new WeakMap<Circuit, Scratch>();

function scratchOf(c: Circuit): Scratch {
  let s = scratches.get(c);
  if (s) return s;
  const parent = new Int32Array(c.size).fill(-1);
  const seen = new Uint8Array(c.size);
  const span = new Float64Array(c.size);
  for (let v = 0; v < c.size; v++) {
    const kind = c.op[v];
    let x = kind === OP_INPUT ? c.dim[v]! : kind === OP_CONST ? 1 : kind === OP_PRODUCT ? 1 : 0;
    for (let i = c.childStart[v]!; i < c.childStart[v + 1]!; i++) {
      const ch = c.childList[i]!;
      parent[ch] = seen[ch] ? -1 : v;
      seen[ch] = 1;
      x = kind === OP_PRODUCT ? x * span[ch]! : x + span[ch]!;
    }
    span[v] = Math.min(x, c.dim[v]!);
  }
  s = { parent, span, mark: new Int32Array(c.size), paths: new Float64Array(c.size), stamp: 0 };
  scratches.set(c, s);
  return s;
}
