/**
 * The tensor network as a graphology graph, for inspection and for library users who want to run
 * their own graph algorithms. Nodes are tensors (a copy tensor δ for each product, a terminal for
 * each open leg); edges are the bonds, directed from producer to consumer, carrying dimension,
 * layer and YAML line. This is the only module that imports graphology. The cut engine works on
 * the compact circuit instead: a graphology graph of a 224×224 network takes seconds to build.
 */
import { MultiDirectedGraph } from 'graphology';
import type { Span } from '../diagnostic.js';
import type { ExplicitModel } from '../config/model.js';
import { OP_INPUT, OP_NAMES, type Circuit } from './circuit.js';

export interface TensorAttributes {
  kind: 'input' | 'const' | 'linear' | 'copy' | 'sum' | 'head' | 'tensor';
  /** Dimension of the tensor's output index (for explicit tensors: number of open legs). */
  dim: number;
  layer: number | string;
  line: number;
  /** The YAML span of the layer or tensor it came from. */
  span: Span;
  /** Input position for open legs, -1 elsewhere. */
  position: number;
}

export interface BondAttributes {
  dim: number;
  layer: number | string;
  line: number;
  span: Span;
}

export type TensorGraph = MultiDirectedGraph<TensorAttributes, BondAttributes>;

export function circuitToGraph(c: Circuit): TensorGraph {
  const g: TensorGraph = new MultiDirectedGraph<TensorAttributes, BondAttributes>();
  for (let v = 0; v < c.size; v++) {
    const tag = c.tags[c.tag[v]!]!;
    const name = OP_NAMES[c.op[v]!]!;
    g.addNode(String(v), {
      kind: name === 'product' ? 'copy' : name,
      dim: c.dim[v]!,
      layer: tag.label,
      line: tag.line,
      span: tag.span,
      position: c.op[v] === OP_INPUT ? c.position[v]! : -1,
    });
  }
  const bond = (v: number): BondAttributes => {
    const tag = c.tags[c.bondTag[v]!]!;
    return { dim: c.dim[v]!, layer: tag.label, line: tag.line, span: tag.span };
  };
  for (let v = 0; v < c.size; v++) {
    for (let i = c.childStart[v]!; i < c.childStart[v + 1]!; i++) {
      const ch = c.childList[i]!;
      g.addDirectedEdge(String(ch), String(v), bond(ch));
    }
  }
  const last = c.tags[c.tag[c.top]!]!;
  g.addNode('head', { kind: 'head', dim: 1, layer: 'head', line: last.line, span: last.span, position: -1 });
  g.addDirectedEdge(String(c.top), 'head', bond(c.top));
  return g;
}

export function explicitToGraph(model: ExplicitModel): TensorGraph {
  const g: TensorGraph = new MultiDirectedGraph<TensorAttributes, BondAttributes>();
  for (const t of model.tensors) {
    g.addNode(t.name, { kind: 'tensor', dim: t.legs.length, layer: t.name, line: t.span.line, span: t.span, position: -1 });
    t.legs.forEach((leg, i) => {
      const id = `${t.name}#leg${i}`;
      g.addNode(id, { kind: 'input', dim: leg.dim, layer: 'input', line: leg.span.line, span: leg.span, position: leg.position });
      g.addDirectedEdge(id, t.name, { dim: leg.dim, layer: 'input', line: leg.span.line, span: leg.span });
    });
  }
  model.bonds.forEach((b, i) => {
    const label = `bond ${b.tensors.join('-')}`;
    if (b.tensors.length === 2) {
      g.addDirectedEdge(b.tensors[0]!, b.tensors[1]!, { dim: b.dim, layer: label, line: b.span.line, span: b.span });
      return;
    }
    const hub = `#copy${i}`;
    g.addNode(hub, { kind: 'copy', dim: b.dim, layer: label, line: b.span.line, span: b.span, position: -1 });
    for (const t of b.tensors) g.addDirectedEdge(t, hub, { dim: b.dim, layer: label, line: b.span.line, span: b.span });
  });
  return g;
}
