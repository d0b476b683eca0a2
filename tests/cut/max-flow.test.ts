/**
 * Max-flow and hypergraph cut are checked against answers computed without them: an independent
 * Ford–Fulkerson implementation for plain graphs, and exhaustive enumeration of every two-sided
 * assignment for small hypergraphs. Random instances come from a seeded generator so that a
 * failure can be replayed.
 */
import { describe, expect, it } from 'vitest';
import { createRequire } from 'node:module';
import { FlowNetwork } from '../../src/cut/max-flow.js';
import { minHyperCut, type Hyperedge } from '../../src/cut/hypergraph-cut.js';
import { mulberry32 } from '../helpers/models.js';

// The package is CommonJS with `export =` typings; require keeps its real shape under NodeNext.
const jsgraphs = createRequire(import.meta.url)('js-graph-algorithms') as typeof import('js-graph-algorithms');

const rng = mulberry32;
const int = (r: () => number, lo: number, hi: number): number => lo + Math.floor(r() * (hi - lo + 1));

interface Arc {
  u: number;
  v: number;
  cap: number;
  undirected: boolean;
}

function randomGraph(r: () => number): { n: number; arcs: Arc[] } {
  const n = int(r, 2, 30);
  const m = int(r, 0, n * 4);
  const arcs: Arc[] = [];
  for (let i = 0; i < m; i++) {
    const u = int(r, 0, n - 1);
    let v = int(r, 0, n - 2);
    if (v >= u) v++;
    arcs.push({ u, v, cap: int(r, 0, 20), undirected: r() < 0.25 });
  }
  return { n, arcs };
}

function build(n: number, arcs: readonly Arc[], scale = 1): FlowNetwork {
  const net = new FlowNetwork(n);
  for (const a of arcs) {
    if (a.undirected) net.addUndirected(a.u, a.v, a.cap * scale);
    else net.addArc(a.u, a.v, a.cap * scale);
  }
  return net;
}

function cutCapacity(arcs: readonly Arc[], side: Uint8Array, scale = 1): number {
  let c = 0;
  for (const a of arcs) {
    if (side[a.u] && !side[a.v]) c += a.cap * scale;
    else if (a.undirected && side[a.v] && !side[a.u]) c += a.cap * scale;
  }
  return c;
}

describe('FlowNetwork (Dinic)', () => {
  it('matches an independent Ford–Fulkerson on 600 random graphs, and its cut has the flow value', () => {
    const r = rng(20240611);
    let positive = 0;
    for (let trial = 0; trial < 600; trial++) {
      const { n, arcs } = randomGraph(r);
      const s = int(r, 0, n - 1);
      let t = int(r, 0, n - 2);
      if (t >= s) t++;
      const ours = build(n, arcs).maxFlow(s, t);

      // Reference: FordFulkerson from the npm package js-graph-algorithms 1.0.18 (Xianshun Chen).
      const g = new jsgraphs.FlowNetwork(n);
      for (const a of arcs) {
        g.addEdge(new jsgraphs.FlowEdge(a.u, a.v, a.cap));
        if (a.undirected) g.addEdge(new jsgraphs.FlowEdge(a.v, a.u, a.cap));
      }
      const reference = new jsgraphs.FordFulkerson(g, s, t).value;

      expect(ours.value, `trial ${trial}`).toBe(reference);
      expect(ours.sourceSide[s]).toBe(1);
      expect(ours.sourceSide[t]).toBe(0);
      expect(cutCapacity(arcs, ours.sourceSide), `trial ${trial}`).toBe(ours.value);
      if (ours.value > 0) positive++;
    }
    // Guards against a generator that only makes trivial instances.
    expect(positive).toBeGreaterThan(300);
  });

  it('handles float capacities (log2 weights) to within rounding', () => {
    const r = rng(7);
    for (let trial = 0; trial < 200; trial++) {
      const { n, arcs } = randomGraph(r);
      const exact = build(n, arcs).maxFlow(0, n - 1);
      const scale = Math.log2(3);
      const float = build(n, arcs, scale).maxFlow(0, n - 1);
      expect(float.value).toBeCloseTo(exact.value * scale, 9);
      expect(cutCapacity(arcs, float.sourceSide, scale)).toBeCloseTo(float.value, 9);
    }
  });

  it('treats Infinity as unbounded: finite cuts avoid infinite arcs, and an all-infinite path gives Infinity', () => {
    const net = new FlowNetwork(4);
    net.addArc(0, 1, Infinity);
    net.addArc(1, 2, 5);
    net.addArc(1, 3, 2);
    net.addArc(2, 3, Infinity);
    const f = net.maxFlow(0, 3);
    expect(f.value).toBe(7);
    expect([...f.sourceSide]).toEqual([1, 1, 0, 0]);

    const open = new FlowNetwork(3);
    open.addArc(0, 1, Infinity);
    open.addArc(1, 2, Infinity);
    open.addArc(0, 2, 4);
    expect(open.maxFlow(0, 2).value).toBe(Infinity);
  });

  it('does not change the network, so it can be solved twice', () => {
    const net = new FlowNetwork(3);
    net.addUndirected(0, 1, 3);
    net.addArc(1, 2, 2);
    expect(net.maxFlow(0, 2).value).toBe(2);
    expect(net.maxFlow(0, 2).value).toBe(2);
    // The undirected edge carries flow both ways.
    expect(net.maxFlow(1, 0).value).toBe(3);
  });

  it('runs on a path of 200000 nodes without recursion', () => {
    const n = 200_000;
    const net = new FlowNetwork(n);
    for (let v = 0; v + 1 < n; v++) net.addArc(v, v + 1, v === 123_456 ? 3 : 10 + (v % 7));
    const f = net.maxFlow(0, n - 1);
    expect(f.value).toBe(3);
    expect(f.sourceSide[123_456]).toBe(1);
    expect(f.sourceSide[123_457]).toBe(0);
  });

  it('rejects bad input', () => {
    const net = new FlowNetwork(2);
    expect(() => net.addArc(0, 2, 1)).toThrow(RangeError);
    expect(() => net.addArc(0, 1, -1)).toThrow(RangeError);
    expect(() => net.addArc(0, 1, Number.NaN)).toThrow(RangeError);
    expect(() => net.maxFlow(1, 1)).toThrow(RangeError);
  });
});

/** Every assignment of the free nodes; the cheapest total weight of split hyperedges. */
function bruteForce(n: number, edges: readonly Hyperedge[], a: readonly number[], b: readonly number[]): number {
  let best = Infinity;
  for (let mask = 0; mask < 1 << n; mask++) {
    if (a.some((v) => !(mask & (1 << v))) || b.some((v) => mask & (1 << v))) continue;
    let cost = 0;
    for (const e of edges) {
      const inA = e.members.some((v) => mask & (1 << v));
      const inB = e.members.some((v) => !(mask & (1 << v)));
      if (inA && inB) cost += e.weight;
    }
    best = Math.min(best, cost);
  }
  return best;
}

/** True when side A and side B are disconnected once the given hyperedges are removed. */
function separates(n: number, edges: readonly Hyperedge[], removed: ReadonlySet<number>, a: readonly number[], b: readonly number[]): boolean {
  const seen = new Uint8Array(n);
  const stack = [...a];
  for (const v of a) seen[v] = 1;
  while (stack.length > 0) {
    const u = stack.pop()!;
    edges.forEach((e, i) => {
      if (removed.has(i) || !e.members.includes(u)) return;
      for (const v of e.members) {
        if (!seen[v]) {
          seen[v] = 1;
          stack.push(v);
        }
      }
    });
  }
  return b.every((v) => !seen[v]);
}

describe('minHyperCut', () => {
  it('equals brute force on 500 random hypergraphs with up to 10 nodes', () => {
    const r = rng(99);
    let nonTrivial = 0;
    for (let trial = 0; trial < 500; trial++) {
      const n = int(r, 2, 10);
      const edges: Hyperedge[] = [];
      const m = int(r, 1, 12);
      for (let i = 0; i < m; i++) {
        const size = int(r, 1, Math.min(n, 5));
        const members = Array.from({ length: size }, () => int(r, 0, n - 1));
        edges.push({ members, weight: int(r, 0, 9) });
      }
      const order = Array.from({ length: n }, (_, i) => i);
      for (let i = n - 1; i > 0; i--) {
        const j = int(r, 0, i);
        [order[i], order[j]] = [order[j]!, order[i]!];
      }
      const na = int(r, 1, n - 1);
      const nb = int(r, 1, n - na);
      const a = order.slice(0, na);
      const b = order.slice(na, na + nb);

      const cut = minHyperCut(n, edges, a, b);
      const expected = bruteForce(n, edges, a, b);
      expect(cut.value, `trial ${trial}`).toBe(expected);
      expect(cut.cutEdges.reduce((s, i) => s + edges[i]!.weight, 0)).toBe(cut.value);
      expect(separates(n, edges, new Set(cut.cutEdges), a, b), `trial ${trial}`).toBe(true);
      for (const v of a) expect(cut.side[v]).toBe(1);
      for (const v of b) expect(cut.side[v]).toBe(0);
      if (expected > 0) nonTrivial++;
    }
    expect(nonTrivial).toBeGreaterThan(200);
  });

  it('pays a hyperedge once, however many members lie on each side', () => {
    // Four leaves joined by one hyperedge of weight 5, two tied to each side; each leaf also
    // hangs on its own edge of weight 3. Cutting the hyperedge (5) beats two leaf edges (6).
    const edges: Hyperedge[] = [
      { members: [0, 1, 2, 3], weight: 5 },
      { members: [0, 4], weight: 3 },
      { members: [1, 5], weight: 3 },
      { members: [2, 6], weight: 3 },
      { members: [3, 7], weight: 3 },
    ];
    const cut = minHyperCut(8, edges, [4, 5], [6, 7]);
    expect(cut.value).toBe(5);
    expect(cut.cutEdges).toEqual([0]);
  });

  it('rejects a node tied to both sides and bad weights', () => {
    expect(() => minHyperCut(2, [], [0], [0])).toThrow(RangeError);
    expect(() => minHyperCut(2, [{ members: [0, 1], weight: -1 }], [0], [1])).toThrow(RangeError);
    expect(() => minHyperCut(2, [{ members: [0, 1], weight: Infinity }], [0], [1])).toThrow(RangeError);
  });
});
