/**
 * Minimum cut of a hypergraph between two groups of tied nodes. A copy tensor (δ) has the same
 * rank across every split of its legs, so a cut pays its weight once however its members fall:
 * it is a hyperedge, not a clique of edges. Max-flow sees it through the usual gadget (two extra
 * nodes u → v of capacity w, infinite arcs from every member into u and from v to every member),
 * which lets any flow cross the hyperedge at most w in total.
 */
import { FlowNetwork } from './max-flow.js';

export interface Hyperedge {
  readonly members: readonly number[];
  /** Cost of cutting it: finite and ≥ 0. */
  readonly weight: number;
}

export interface HyperCut {
  /** Sum of the weights of `cutEdges`. */
  readonly value: number;
  /** Indices (ascending) of the hyperedges whose members lie on both sides. */
  readonly cutEdges: number[];
  /** side[v] = 1 when node v lies on side A of the cut found. */
  readonly side: Uint8Array;
}

/**
 * A minimum-weight set of hyperedges whose removal separates every node of sideA from every node
 * of sideB. Nodes tied to neither side fall wherever the cut is cheapest.
 */
export function minHyperCut(
  nodeCount: number,
  hyperedges: readonly Hyperedge[],
  sideA: readonly number[],
  sideB: readonly number[],
): HyperCut {
  const tie = new Uint8Array(nodeCount); // 1: side A, 2: side B
  for (const v of sideA) {
    checkNode(v, nodeCount);
    tie[v] = 1;
  }
  for (const v of sideB) {
    checkNode(v, nodeCount);
    if (tie[v] === 1) throw new RangeError(`node ${v} is tied to both sides`);
    tie[v] = 2;
  }

  const distinct: number[][] = hyperedges.map((h, i) => {
    if (!(h.weight >= 0) || h.weight === Infinity) {
      throw new RangeError(`hyperedge ${i} needs a finite weight >= 0, got ${h.weight}`);
    }
    for (const v of h.members) checkNode(v, nodeCount);
    return [...new Set(h.members)];
  });
  let gadgets = 0;
  for (const m of distinct) if (m.length >= 3) gadgets++;

  const source = nodeCount + 2 * gadgets;
  const sink = source + 1;
  const net = new FlowNetwork(sink + 1);
  let nextGadget = nodeCount;
  distinct.forEach((members, i) => {
    const w = hyperedges[i]!.weight;
    // A single member can never be split; two members need no gadget.
    if (members.length === 2) {
      net.addUndirected(members[0]!, members[1]!, w);
    } else if (members.length >= 3) {
      const u = nextGadget++;
      const v = nextGadget++;
      net.addArc(u, v, w);
      for (const x of members) {
        net.addArc(x, u, Infinity);
        net.addArc(v, x, Infinity);
      }
    }
  });
  for (let v = 0; v < nodeCount; v++) {
    if (tie[v] === 1) net.addArc(source, v, Infinity);
    else if (tie[v] === 2) net.addArc(v, sink, Infinity);
  }

  const flow = net.maxFlow(source, sink);
  if (flow.value === Infinity) throw new Error('hypergraph cut: no finite cut exists (bug: every weight is finite)');
  const side = flow.sourceSide.slice(0, nodeCount);

  // Reading the cut from the node sides, not from saturated gadget arcs, reports exactly the
  // hyperedges that are split; on a residual-reachability cut the two readings coincide.
  const cutEdges: number[] = [];
  let value = 0;
  distinct.forEach((members, i) => {
    let a = false;
    let b = false;
    for (const x of members) {
      if (side[x]) a = true;
      else b = true;
    }
    if (a && b) {
      cutEdges.push(i);
      value += hyperedges[i]!.weight;
    }
  });
  const tolerance = 1e-9 * Math.max(1, Math.abs(flow.value));
  if (Math.abs(value - flow.value) > tolerance) {
    throw new Error(`hypergraph cut: split weight ${value} differs from flow ${flow.value} (bug)`);
  }
  return { value, cutEdges, side };
}

function checkNode(v: number, nodeCount: number): void {
  if (!Number.isInteger(v) || v < 0 || v >= nodeCount) {
    throw new RangeError(`node ${v} is outside 0..${nodeCount - 1}`);
  }
}
