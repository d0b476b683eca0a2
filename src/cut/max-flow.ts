/**
 * Maximum flow and a minimum cut on a general directed graph. Networks with loops (user-supplied
 * tensor networks) have no tree structure to exploit, so their min-cut comes from max-flow; the
 * cut engine runs it both on integer capacities (exponents, exact) and on float capacities (log2
 * of bond dimensions). Dinic's algorithm (E. A. Dinic, "Algorithm for solution of a problem of
 * maximum flow in networks with power estimation", 1970): BFS levels, then blocking flows found
 * by a depth-first search kept on an explicit stack, because networks can have 10^5+ nodes and a
 * recursive search would overflow the call stack.
 */

export interface MaxFlowResult {
  /** The flow value, equal to the capacity of the minimum cut (+Infinity if no finite cut exists). */
  readonly value: number;
  /** sourceSide[v] = 1 when v is reachable from the source in the final residual graph. */
  readonly sourceSide: Uint8Array;
}

/**
 * Residual capacities at or below this fraction of the largest finite capacity count as zero.
 * Integer capacities below 2^40 are unaffected; float capacities (sums of log2 values) leave
 * rounding crumbs that would otherwise keep dead arcs alive and let the search wander forever.
 */
const RELATIVE_EPSILON = 1e-12;

export class FlowNetwork {
  readonly nodeCount: number;
  // Arc i and arc i ^ 1 are each other's reverse; `next` threads each node's arcs into a list.
  private readonly to: number[] = [];
  private readonly cap: number[] = [];
  private readonly next: number[] = [];
  private readonly head: Int32Array;

  constructor(nodeCount: number) {
    if (!Number.isInteger(nodeCount) || nodeCount < 0) {
      throw new RangeError(`FlowNetwork needs a non-negative integer node count, got ${nodeCount}`);
    }
    this.nodeCount = nodeCount;
    this.head = new Int32Array(nodeCount).fill(-1);
  }

  /** Number of directed arcs, counting an undirected edge as two. */
  get arcCount(): number {
    return this.to.length;
  }

  /** A directed arc u → v of capacity cap (≥ 0, may be +Infinity). */
  addArc(u: number, v: number, cap: number): void {
    this.push(u, v, cap, 0);
  }

  /**
   * An undirected edge: capacity cap in each direction. One arc pair whose two halves both carry
   * cap is equivalent to two opposite arcs and keeps the graph half the size.
   */
  addUndirected(u: number, v: number, cap: number): void {
    this.push(u, v, cap, cap);
  }

  private push(u: number, v: number, forward: number, backward: number): void {
    this.checkNode(u);
    this.checkNode(v);
    if (!(forward >= 0)) throw new RangeError(`capacity must be >= 0 (or Infinity), got ${forward}`);
    const i = this.to.length;
    this.to.push(v, u);
    this.cap.push(forward, backward);
    this.next.push(this.head[u]!, this.head[v]!);
    this.head[u] = i;
    this.head[v] = i + 1;
  }

  private checkNode(v: number): void {
    if (!Number.isInteger(v) || v < 0 || v >= this.nodeCount) {
      throw new RangeError(`node ${v} is outside 0..${this.nodeCount - 1}`);
    }
  }

  /** Max flow from s to t. The network itself is not changed, so it can be solved again. */
  maxFlow(s: number, t: number): MaxFlowResult {
    this.checkNode(s);
    this.checkNode(t);
    if (s === t) throw new RangeError('max flow needs distinct source and sink');
    const n = this.nodeCount;
    const m = this.to.length;
    const to = Int32Array.from(this.to);
    const next = Int32Array.from(this.next);
    const head = this.head;
    const res = Float64Array.from(this.cap);
    let largest = 0;
    for (let i = 0; i < m; i++) {
      const c = res[i]!;
      if (c !== Infinity && c > largest) largest = c;
    }
    const eps = largest * RELATIVE_EPSILON;

    const level = new Int32Array(n);
    const queue = new Int32Array(n);
    const iter = new Int32Array(n);
    const path = new Int32Array(n); // arcs from s to the current node; a level path has < n arcs
    let value = 0;

    const bfs = (): boolean => {
      level.fill(-1);
      level[s] = 0;
      queue[0] = s;
      let qh = 0;
      let qt = 1;
      while (qh < qt) {
        const u = queue[qh++]!;
        for (let e = head[u]!; e >= 0; e = next[e]!) {
          const v = to[e]!;
          if (level[v]! < 0 && res[e]! > eps) {
            level[v] = level[u]! + 1;
            queue[qt++] = v;
          }
        }
      }
      return level[t]! >= 0;
    };

    while (bfs()) {
      iter.set(head);
      let depth = 0;
      let u = s;
      for (;;) {
        if (u === t) {
          let f = Infinity;
          for (let k = 0; k < depth; k++) f = Math.min(f, res[path[k]!]!);
          if (f === Infinity) {
            // An all-infinite path: no finite cut exists. Report the nodes still reachable.
            return { value: Infinity, sourceSide: this.reach(s, res, eps) };
          }
          value += f;
          let back = -1;
          for (let k = 0; k < depth; k++) {
            const e = path[k]!;
            res[e] = res[e]! - f;
            res[e ^ 1] = res[e ^ 1]! + f;
            if (back < 0 && res[e]! <= eps) back = k;
          }
          // Resume from the tail of the first arc this augmentation saturated.
          depth = back;
          u = depth === 0 ? s : to[path[depth - 1]!]!;
          continue;
        }
        let e = iter[u]!;
        while (e >= 0 && !(res[e]! > eps && level[to[e]!] === level[u]! + 1)) e = next[e]!;
        iter[u] = e;
        if (e >= 0) {
          path[depth++] = e;
          u = to[e]!;
          continue;
        }
        // Dead end: no augmenting path runs through u in this phase.
        level[u] = -1;
        if (depth === 0) break;
        const last = path[--depth]!;
        u = to[last ^ 1]!;
        iter[u] = next[iter[u]!]!;
      }
    }
    return { value, sourceSide: this.reach(s, res, eps) };
  }

  private reach(s: number, res: Float64Array, eps: number): Uint8Array {
    const seen = new Uint8Array(this.nodeCount);
    const stack: number[] = [s];
    seen[s] = 1;
    while (stack.length > 0) {
      const u = stack.pop()!;
      for (let e = this.head[u]!; e >= 0; e = this.next[e]!) {
        const v = this.to[e]!;
        if (!seen[v] && res[e]! > eps) {
          seen[v] = 1;
          stack.push(v);
        }
      }
    }
    return seen;
  }
}
