/**
 * Bounds for tensor networks that a user writes out tensor by tensor (`network:` configs). Such
 * networks may contain loops, so the min-cut comes from max-flow on a hypergraph: tensors and one
 * terminal per open leg are the nodes, open legs and bonds the hyperedges. The min-cut gives the
 * upper bound; a min-cut of a network whose dimensions are rounded down to powers of one integer
 * gives a proven lower bound. Ranks stay exact bigints; floats only choose the cut.
 */
import type { ExplicitModel } from '../config/model.js';
import type { Partition } from '../partition/partition.js';
import { minHyperCut, type Hyperedge } from './hypergraph-cut.js';
import { log2Big, type Bound, type CutEntry } from './types.js';
import { floorLog, powerCandidates } from './power-rounding.js';

export interface ExplicitBounds {
  readonly upper: Bound;
  /** null when no rule proves a lower bound for this network. */
  readonly lower: Bound | null;
}

interface Edge {
  readonly members: number[];
  readonly dim: number;
  readonly label: string;
  readonly line: number;
}

interface Network {
  readonly nodeCount: number;
  readonly edges: readonly Edge[];
  readonly sideA: number[];
  readonly sideB: number[];
  /** False when the network has a hyperedge and, with each hyperedge as a node, contains a cycle. */
  readonly lowerRuleApplies: boolean;
}

export function explicitBounds(model: ExplicitModel, partition: Partition): ExplicitBounds {
  const net = buildNetwork(model, partition);

  const upperCut = cut(net, net.edges.map((e) => Math.log2(e.dim)));
  let upperRank = 1n;
  for (const i of upperCut) upperRank *= BigInt(net.edges[i]!.dim);
  const upper: Bound = {
    rank: upperRank,
    log2: log2Big(upperRank),
    method: 'min-cut',
    cut: entries(upperCut.map((i) => ({ edge: net.edges[i]!, dim: net.edges[i]!.dim }))),
  };

  if (!net.lowerRuleApplies) return { upper, lower: null };

  // Power rounding. Shrinking a dimension d to q^e(d) ≤ d restricts the tensors to a subspace,
  // so the rounded network's generic rank is at most the original's. With every dimension a
  // power of q, the generic rank equals the min-cut (Cui, Freedman, Sattath, Stong, Minton,
  // "Quantum max-flow/min-cut", 2016); for trees with copy tensors the same equality is claimed
  // by Levine, Yakira, Cohen, Shashua, "Deep learning and quantum entanglement: fundamental
  // connections with implications to network design" (ICLR 2018).
  let lower: Bound | null = null;
  for (const q of powerCandidates(net.edges.map((e) => e.dim))) {
    const exps = net.edges.map((e) => floorLog(e.dim, q));
    const found = cut(net, exps);
    const c = found.reduce((s, i) => s + exps[i]!, 0);
    const rank = BigInt(q) ** BigInt(c);
    if (lower === null || rank > lower.rank) {
      lower = {
        rank,
        log2: log2Big(rank),
        method: `power-rounding q=${q}`,
        cut: entries(found.filter((i) => exps[i]! > 0).map((i) => ({ edge: net.edges[i]!, dim: q ** exps[i]! }))),
      };
      if (rank === upperRank) break;
    }
  }
  if (lower !== null && lower.rank > upperRank) {
    throw new Error(`explicit bounds: lower ${lower.rank} exceeds upper ${upperRank} (bug)`);
  }
  return { upper, lower };
}

function buildNetwork(model: ExplicitModel, partition: Partition): Network {
  const index = new Map<string, number>();
  model.tensors.forEach((t, i) => {
    if (index.has(t.name)) throw new Error(`explicit network: tensor '${t.name}' is defined twice`);
    index.set(t.name, i);
  });
  const edges: Edge[] = [];
  const sideA: number[] = [];
  const sideB: number[] = [];
  let next = model.tensors.length;
  model.tensors.forEach((t, i) => {
    for (const leg of t.legs) {
      const p = leg.position;
      if (!Number.isInteger(p) || p < 0 || p >= partition.side.length) {
        throw new RangeError(`explicit network: tensor '${t.name}' has a leg at position ${p}, outside the partition`);
      }
      const terminal = next++;
      (partition.side[p] === 1 ? sideA : sideB).push(terminal);
      edges.push({ members: [i, terminal], dim: checkDim(leg.dim), label: 'legs', line: t.span.line });
    }
  });

  // Union-find over tensors plus one node per hyperedge: a repeated union is a cycle.
  const parent: number[] = [];
  const find = (x: number): number => {
    while (parent[x] !== x) {
      const up = parent[x]!;
      parent[x] = parent[up]!;
      x = up;
    }
    return x;
  };
  const fresh = (): number => {
    parent.push(parent.length);
    return parent.length - 1;
  };
  for (let i = 0; i < model.tensors.length; i++) fresh();
  let hyper = false;
  let cycle = false;
  const join = (a: number, b: number): void => {
    const ra = find(a);
    const rb = find(b);
    if (ra === rb) cycle = true;
    else parent[ra] = rb;
  };

  for (const bond of model.bonds) {
    if (bond.tensors.length === 0) throw new Error('explicit network: a bond joins no tensor');
    const members = bond.tensors.map((name) => {
      const i = index.get(name);
      if (i === undefined) throw new Error(`explicit network: a bond names unknown tensor '${name}'`);
      return i;
    });
    if (members.length >= 3) {
      hyper = true;
      const h = fresh();
      for (const m of members) join(h, m);
    } else if (members.length === 2) {
      join(members[0]!, members[1]!);
    } else {
      cycle = true; // a bond on one tensor is a trace: a loop in the graph
    }
    edges.push({ members, dim: checkDim(bond.dim), label: `bond ${bond.tensors.join('-')}`, line: bond.span.line });
  }
  return { nodeCount: next, edges, sideA, sideB, lowerRuleApplies: !hyper || !cycle };
}

function checkDim(d: number): number {
  if (!Number.isSafeInteger(d) || d < 1) throw new RangeError(`explicit network: dimension ${d} is not a positive integer`);
  return d;
}

function cut(net: Network, weights: readonly number[]): number[] {
  const hyperedges: Hyperedge[] = net.edges.map((e, i) => ({ members: e.members, weight: weights[i]! }));
  return minHyperCut(net.nodeCount, hyperedges, net.sideA, net.sideB).cutEdges;
}

/** Groups cut edges by (label, line, dim); dimension-1 edges cost nothing and are left out. */
function entries(cutEdges: readonly { edge: Edge; dim: number }[]): CutEntry[] {
  const groups = new Map<string, { layer: string; line: number; dim: number; count: number }>();
  for (const { edge, dim } of cutEdges) {
    if (dim === 1) continue;
    const key = `${edge.label}\u0000${edge.line}\u0000${dim}`;
    const g = groups.get(key);
    if (g) g.count++;
    else groups.set(key, { layer: edge.label, line: edge.line, dim, count: 1 });
  }
  return [...groups.values()].sort(
    (a, b) => a.line - b.line || (a.layer < b.layer ? -1 : a.layer > b.layer ? 1 : 0) || a.dim - b.dim,
  );
}
