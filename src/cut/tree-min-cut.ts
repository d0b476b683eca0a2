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
import { OP_CONST, OP_INPUT, OP_LINEAR, OP_PRODUCT, type Circuit } from '../network/circuit.js';
import { binomial } from './degree-bound.js';

/** Cut bonds grouped by (layer tag, weight key): tag → key → count of copies cut. */
export type CutCounts = Map<number, Map<number, number>>;

export interface TreeCut {
  /** Sum of the weights of the cut indices. */
  readonly value: number;
  /** Which indices were cut, keyed by the node that produces them: tag → node dim → count (recovered on first use). */
  readonly counts: CutCounts;
}

const A = 0;
const B = 1;

export interface TreeCutOptions {
  /**
   * The children of a window compute the same function on their own inputs (shared weights, a
   * uniform tree): a group of a pure children on the far side of the window's copy tensor then
   * passes only the symmetric power, C(D + a − 1, a), instead of D^a (see symmetricGroupCost).
   */
  readonly symmetric?: boolean;
}

/**
 * @param side side[p] = 1 when position p is on side A
 * @param weight weight[v]: cost of cutting node v's output index
 */
export function treeMinCut(c: Circuit, side: Uint8Array, weight: Float64Array, options: TreeCutOptions = {}): TreeCut {
  const n = c.size;
  const sym = options.symmetric ? new SymmetricGroups(c, side) : undefined;
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
      if (sym) {
        sa = sym.choose(v, A, sa, fa);
        sb = sym.choose(v, B, sb, fb);
      }
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
  let counts: CutCounts | undefined;
  return {
    value,
    get counts(): CutCounts {
      return (counts ??= recoverCut(c, weight, fa, fb, free, headA <= headB ? A : B, sym));
    },
  };
}

/**
 * Derived here: if the a children c_1..c_a of a window compute the same vector function f on
 * their own inputs, their componentwise product is Π_j f_k(y_j) = ⟨e_k^{⊗a}, f(y_1) ⊗ … ⊗ f(y_a)⟩,
 * which depends on the inputs only through the symmetrised tensor product, an element of
 * Sym^a(R^D) of dimension C(D + a − 1, a); when f = L·g with g narrower, through Sym^a of g's space. So the group can be cut through one index of that
 * dimension (the children's subtrees stay whole on their own side).
 */
export function symmetricGroupDim(d: number, a: number): number | undefined {
  const r = binomial(d + a - 1, a);
  return r <= BigInt(Number.MAX_SAFE_INTEGER) ? Number(r) : undefined;
}

/** Per window: the pure children of each side that form one group, and whether it was used. */
class SymmetricGroups {
  private readonly dep: Uint8Array;
  /** used[s][v]: with members on side s, window v cut its far-side group symmetrically. */
  readonly used: [Uint8Array, Uint8Array];
  /** groupDim[v]: the dimension of the symmetric index of window v's far-side group (per side). */
  readonly groupDim: [Float64Array, Float64Array];

  constructor(
    private readonly c: Circuit,
    side: Uint8Array,
  ) {
    this.dep = new Uint8Array(c.size);
    for (let v = 0; v < c.size; v++) {
      if (c.op[v] === OP_INPUT) this.dep[v] = side[c.position[v]!] === 1 ? 1 : 2;
      else for (let i = c.childStart[v]!; i < c.childStart[v + 1]!; i++) this.dep[v] = this.dep[v]! | this.dep[c.childList[i]!]!;
    }
    this.used = [new Uint8Array(c.size), new Uint8Array(c.size)];
    this.groupDim = [new Float64Array(c.size), new Float64Array(c.size)];
  }

  /** Children of window v that are pure on the side opposite to s and alike, or undefined. */
  group(v: number, s: number): number[] | undefined {
    const far = s === A ? 2 : 1;
    const c = this.c;
    const members: number[] = [];
    for (let i = c.childStart[v]!; i < c.childStart[v + 1]!; i++) {
      const ch = c.childList[i]!;
      if (this.dep[ch] !== far || c.op[ch] === OP_PRODUCT) continue;
      const first = members[0];
      if (first !== undefined && (c.op[ch] !== c.op[first] || c.tag[ch] !== c.tag[first] || c.dim[ch] !== c.dim[first])) return undefined;
      members.push(ch);
    }
    return members.length >= 2 ? members : undefined;
  }

  /**
   * The node of narrowest output along the chain of single-input linear maps below a child: the
   * child's function factors through it, f = L·g, so the group factors through Sym^a of g's space.
   */
  narrowest(child: number): number {
    const c = this.c;
    let best = child;
    let v = child;
    while (c.op[v] === OP_LINEAR && c.childStart[v + 1]! - c.childStart[v]! === 1) {
      v = c.childList[c.childStart[v]!]!;
      if (c.dim[v]! < c.dim[best]!) best = v;
    }
    return best;
  }

  /** The cost of window v with its members on side s: the plain sum, or the group cut if cheaper. */
  choose(v: number, s: number, plain: number, f: Float64Array): number {
    const g = this.group(v, s);
    if (!g) return plain;
    const dim = symmetricGroupDim(this.c.dim[this.narrowest(g[0]!)]!, g.length);
    if (dim === undefined) return plain;
    let groupOnS = 0;
    for (const ch of g) groupOnS += f[ch]!;
    const alt = plain - groupOnS + Math.log2(dim);
    if (alt < plain - 1e-9) {
      this.used[s]![v] = 1;
      this.groupDim[s]![v] = dim;
      return alt;
    }
    return plain;
  }
}

/** Walks the DP's choices from the head down, counting how many copies of each index are cut. */
function recoverCut(
  c: Circuit,
  weight: Float64Array,
  fa: Float64Array,
  fb: Float64Array,
  free: Float64Array,
  headSide: number,
  sym: SymmetricGroups | undefined,
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
  const addGroup = (members: Set<number>, dim: number, k: number): void => {
    const first = members.values().next().value as number;
    const tag = c.bondTag[sym!.narrowest(first)]!;
    let byDim = counts.get(tag);
    if (!byDim) counts.set(tag, (byDim = new Map()));
    byDim.set(dim, (byDim.get(dim) ?? 0) + k);
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
      // A symmetric group stays whole on its own side; the window pays its symmetric index.
      const groupA = onA > 0 && sym?.used[A][v] ? new Set(sym.group(v, A)) : undefined;
      const groupB = onB > 0 && sym?.used[B][v] ? new Set(sym.group(v, B)) : undefined;
      if (groupA) addGroup(groupA, sym!.groupDim[A][v]!, onA);
      if (groupB) addGroup(groupB, sym!.groupDim[B][v]!, onB);
      const end = childStart[v + 1]!;
      for (let i = childStart[v]!; i < end; i++) {
        const ch = childList[i]!;
        if (groupA?.has(ch)) tenB[ch] = tenB[ch]! + onA;
        else tenA[ch] = tenA[ch]! + onA;
        if (groupB?.has(ch)) tenA[ch] = tenA[ch]! + onB;
        else tenB[ch] = tenB[ch]! + onB;
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
