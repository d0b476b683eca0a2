/**
 * Minimum cut of a circuit's tensor network by dynamic programming over its (duplicated) tree.
 *
 * Every tensor is placed on side A or B; an index is cut when the tensors it joins are on both
 * sides, and the cut pays the index's weight (log2 of its dimension) once — also for a copy
 * tensor δ, which is a hyperedge: its rank is r across any split of its legs. The rank of the
 * network's function across (A, B) is at most the product of the cut dimensions.
 *
 * Reused nodes stand for independent copies (each use may choose its own side), so the DP value
 * of a node is computed once and used for every copy: linear in the size of the DAG.
 */
import { OP_CONST, OP_INPUT, OP_PRODUCT, type Circuit } from '../network/circuit.js';

/** Cut bonds grouped by (layer tag, weight key): tag → key → count of copies cut. */
export type CutCounts = Map<number, Map<number, number>>;

export interface TreeCut {
  /** Sum of the weights of the cut indices. */
  readonly value: number;
  /** Which indices were cut, keyed by the node that produces them: tag → node dim → count. */
  readonly counts: CutCounts;
}

const A = 0;
const B = 1;

/**
 * @param side side[p] = 1 when position p is on side A
 * @param weight weight[v]: cost of cutting node v's output index
 */
export function treeMinCut(c: Circuit, side: Uint8Array, weight: Float64Array): TreeCut {
  const n = c.size;
  // For tensors: cost of the subtree with the tensor on side A / B. For products (hyperedges):
  // cost with every member on side A / B (onA/onB) and with members free (free, index unpaid).
  const fa = new Float64Array(n);
  const fb = new Float64Array(n);
  const free = new Float64Array(n);
  const { op, childStart, childList } = c;
  const link = (v: number, s: number): number => {
    if (op[v] === OP_PRODUCT) return Math.min(s === A ? fa[v]! : fb[v]!, weight[v]! + free[v]!);
    return s === A ? Math.min(fa[v]!, fb[v]! + weight[v]!) : Math.min(fb[v]!, fa[v]! + weight[v]!);
  };
  for (let v = 0; v < n; v++) {
    const kind = op[v];
    if (kind === OP_INPUT) {
      const onA = side[c.position[v]!] === 1;
      fa[v] = onA ? 0 : Infinity;
      fb[v] = onA ? Infinity : 0;
      continue;
    }
    if (kind === OP_CONST) continue;
    let sa = 0;
    let sb = 0;
    let sf = 0;
    const end = childStart[v + 1]!;
    if (kind === OP_PRODUCT) {
      for (let i = childStart[v]!; i < end; i++) {
        const ch = childList[i]!;
        sa += fa[ch]!;
        sb += fb[ch]!;
        sf += op[ch] === OP_PRODUCT ? free[ch]! : Math.min(fa[ch]!, fb[ch]!);
      }
      free[v] = sf;
    } else {
      for (let i = childStart[v]!; i < end; i++) {
        const ch = childList[i]!;
        sa += link(ch, A);
        sb += link(ch, B);
      }
    }
    fa[v] = sa;
    fb[v] = sb;
  }
  const top = c.top;
  const headA = link(top, A);
  const headB = link(top, B);
  const value = Math.min(headA, headB);
  if (!Number.isFinite(value)) throw new Error('tree min-cut: no finite cut (a bug in the circuit)');
  return { value, counts: recoverCut(c, weight, fa, fb, free, headA <= headB ? A : B) };
}

/** Walks the DP's choices from the head down, counting how many copies of each index are cut. */
function recoverCut(
  c: Circuit,
  weight: Float64Array,
  fa: Float64Array,
  fb: Float64Array,
  free: Float64Array,
  headSide: number,
): CutCounts {
  const n = c.size;
  const { op, childStart, childList } = c;
  // Multiplicities: index consumed by a tensor on side s (link), tensor placed on side s (tensor),
  // hyperedge members forced to side s (on), hyperedge members free (free).
  const linkA = new Float64Array(n);
  const linkB = new Float64Array(n);
  const tenA = new Float64Array(n);
  const tenB = new Float64Array(n);
  const freeCnt = new Float64Array(n);
  const counts: CutCounts = new Map();
  const addCut = (v: number, k: number): void => {
    const tag = c.bondTag[v]!;
    let byDim = counts.get(tag);
    if (!byDim) counts.set(tag, (byDim = new Map()));
    byDim.set(c.dim[v]!, (byDim.get(c.dim[v]!) ?? 0) + k);
  };
  (headSide === A ? linkA : linkB)[c.top] = 1;
  for (let v = n - 1; v >= 0; v--) {
    const kind = op[v];
    const la = linkA[v]!;
    const lb = linkB[v]!;
    if (kind === OP_PRODUCT) {
      // tenA/tenB hold "members forced to side s" for products.
      let onA = tenA[v]!;
      let onB = tenB[v]!;
      let fr = freeCnt[v]!;
      const cutCost = weight[v]! + free[v]!;
      if (la > 0) {
        if (fa[v]! <= cutCost) onA += la;
        else {
          addCut(v, la);
          fr += la;
        }
      }
      if (lb > 0) {
        if (fb[v]! <= cutCost) onB += lb;
        else {
          addCut(v, lb);
          fr += lb;
        }
      }
      if (onA === 0 && onB === 0 && fr === 0) continue;
      const end = childStart[v + 1]!;
      for (let i = childStart[v]!; i < end; i++) {
        const ch = childList[i]!;
        tenA[ch] = tenA[ch]! + onA;
        tenB[ch] = tenB[ch]! + onB;
        if (fr > 0) {
          if (op[ch] === OP_PRODUCT) freeCnt[ch] = freeCnt[ch]! + fr;
          else if (fa[ch]! <= fb[ch]!) tenA[ch] = tenA[ch]! + fr;
          else tenB[ch] = tenB[ch]! + fr;
        }
      }
      continue;
    }
    let ta = tenA[v]!;
    let tb = tenB[v]!;
    const w = weight[v]!;
    if (la > 0) {
      if (fa[v]! <= fb[v]! + w) ta += la;
      else {
        tb += la;
        addCut(v, la);
      }
    }
    if (lb > 0) {
      if (fb[v]! <= fa[v]! + w) tb += lb;
      else {
        ta += lb;
        addCut(v, lb);
      }
    }
    if (kind === OP_INPUT || kind === OP_CONST) continue;
    const end = childStart[v + 1]!;
    for (let i = childStart[v]!; i < end; i++) {
      const ch = childList[i]!;
      linkA[ch] = linkA[ch]! + ta;
      linkB[ch] = linkB[ch]! + tb;
    }
  }
  return counts;
}
