/**
 * Places a network drawing with a layout library made for layered graphs (Sugiyama's method:
 * ranks, crossing reduction, coordinates; the only importer of that library), from the input at the top to the
 * head at the bottom, so that residual, branch and skip edges run beside the main path instead of
 * through it. Node sizes follow their text in a monospace font of a fixed size, so the layout is a
 * pure function of the drawing: the same model gives the same coordinates.
 */
import { Graph, layout } from '@dagrejs/dagre';
import type { NetworkDrawing } from './network-drawing.js';

/** Text metrics of the node labels (monospace: every character is 0.6 em wide). */
export const FONT_PX = 11;
export const LINE_PX = 14;
const CHAR_PX = FONT_PX * 0.6;
const PAD_X = 10;
const PAD_Y = 6;

export interface PlacedBox {
  /** Centre. */
  readonly x: number;
  readonly y: number;
  readonly width: number;
  readonly height: number;
}

export interface Placed {
  readonly width: number;
  readonly height: number;
  readonly nodes: ReadonlyMap<string, PlacedBox>;
  /** Polyline of each edge, by edge id. */
  readonly edges: ReadonlyMap<string, readonly { readonly x: number; readonly y: number }[]>;
  /** The box reserved for an edge's label lines, by edge id (edges given lines only). */
  readonly edgeLabels: ReadonlyMap<string, PlacedBox>;
}

/** Text lines a picture adds to nodes and edges (marks, edge labels), which the layout makes room for. */
export interface ExtraLines {
  readonly nodes?: ReadonlyMap<string, readonly string[]>;
  readonly edges?: ReadonlyMap<string, readonly string[]>;
}

export function textWidth(s: string): number {
  return [...s].length * CHAR_PX;
}

/** The size of a box that holds these lines. */
export function boxSize(lines: readonly string[]): { width: number; height: number } {
  return { width: Math.ceil(Math.max(0, ...lines.map(textWidth)) + 2 * PAD_X), height: lines.length * LINE_PX + 2 * PAD_Y };
}

export function placeDrawing(drawing: NetworkDrawing, extra: ExtraLines = {}): Placed {
  const g = new Graph({ multigraph: true });
  g.setGraph({ rankdir: 'TB', nodesep: 28, ranksep: 34, edgesep: 12, marginx: 8, marginy: 8 });
  for (const n of drawing.nodes) {
    g.setNode(n.id, boxSize([n.title, ...n.details, ...(extra.nodes?.get(n.id) ?? [])]));
  }
  for (const e of drawing.edges) {
    const lines = extra.edges?.get(e.id);
    const label = lines && lines.length > 0 ? { ...boxSize(lines), labelpos: 'c' as const } : {};
    g.setEdge(e.from, e.to, { minlen: 1, weight: e.kind === 'main' ? 2 : 1, ...label }, e.id);
  }
  layout(g);
  const nodes = new Map<string, PlacedBox>();
  for (const n of drawing.nodes) {
    const p = g.node(n.id);
    nodes.set(n.id, { x: round(p.x ?? 0), y: round(p.y ?? 0), width: p.width, height: p.height });
  }
  const edges = new Map<string, { x: number; y: number }[]>();
  const edgeLabels = new Map<string, PlacedBox>();
  for (const e of drawing.edges) {
    const label = g.edge(e.from, e.to, e.id);
    edges.set(e.id, (label.points ?? []).map((p: { x: number; y: number }) => ({ x: round(p.x), y: round(p.y) })));
    if (extra.edges?.get(e.id)?.length) edgeLabels.set(e.id, { x: round(label.x ?? 0), y: round(label.y ?? 0), width: label.width ?? 0, height: label.height ?? 0 });
  }
  const graph = g.graph();
  return { width: Math.ceil(graph.width ?? 0), height: Math.ceil(graph.height ?? 0), nodes, edges, edgeLabels };
}

function round(x: number): number {
  return Math.round(x * 10) / 10;
}
