/**
 * The network of one config drawn from input to head, laid out as a layered graph, with what a
 * reviewer must find on it: the layers (or bonds) of the minimal cut, the fix that would restore
 * the requirement, and the fields the change touched on the cut. Each of those is a mark: a band
 * of text inside the node (`✂ cut: 1 bond × dim 16`, `fix: channels 16 → 64`), with its own fill
 * pattern and a thicker, dashed outline on a cut node, so that neither colour nor shape alone
 * carries it. One mark per cut entry of the JSON report, with the entry's values in data
 * attributes.
 */
import { FONT_PX, LINE_PX, placeDrawing, type Placed } from './graph-layout.js';
import { xmlText } from './junit.js';
import type { DrawnEdge, DrawnPlace, NetworkDrawing } from './network-drawing.js';

export type MarkKind = 'cut' | 'fix' | 'change';

export interface DrawingMark {
  readonly place: DrawnPlace;
  readonly kind: MarkKind;
  readonly text: string;
  /** Written as data-* attributes of the mark (the JSON values it shows). */
  readonly data: Readonly<Record<string, string | number>>;
}

/** Larger drawings are replaced by a sentence: the layout and the file would grow too large. */
export const MAX_DRAWN_NODES = 400;

const PAD_X = 10;
const PAD_Y = 6;

const EDGE_WORDS: Partial<Record<DrawnEdge['kind'], string>> = { shortcut: 'shortcut', skip: 'skip' };

/** A network drawing too large to lay out, said in a sentence. */
export function tooLargeText(drawing: NetworkDrawing): string | undefined {
  return drawing.nodes.length > MAX_DRAWN_NODES
    ? `The network has ${drawing.nodes.length} nodes after folding pointwise layers, more than the ${MAX_DRAWN_NODES} this picture draws.`
    : undefined;
}

/**
 * One layout for every panel of a model, so that the network stands still from one partition to
 * the next: each node and edge label gets room for the most marks any of the panels puts on it.
 */
export function layoutForPanels(drawing: NetworkDrawing, panels: readonly (readonly DrawingMark[])[]): Placed {
  const room = (key: (m: DrawingMark) => string | undefined): Map<string, string[]> => {
    const out = new Map<string, string[]>();
    for (const marks of panels) {
      const here = new Map<string, string[]>();
      for (const m of marks) {
        const k = key(m);
        if (k !== undefined) here.set(k, [...(here.get(k) ?? []), m.text]);
      }
      for (const [k, texts] of here) {
        const had = out.get(k) ?? [];
        // Line i holds the longest i-th text of any panel.
        out.set(k, Array.from({ length: Math.max(had.length, texts.length) }, (_, i) => longest(had[i], texts[i])));
      }
    }
    return out;
  };
  const nodeRoom = room((m) => ('node' in m.place ? m.place.node : undefined));
  const edgeRoom = room((m) => ('edge' in m.place ? m.place.edge : undefined));
  const edges = new Map<string, string[]>();
  for (const e of drawing.edges) {
    const lines = [...edgeWords(e), ...(edgeRoom.get(e.id) ?? [])];
    if (lines.length > 0) edges.set(e.id, lines);
  }
  return placeDrawing(drawing, { nodes: nodeRoom, edges });
}

function longest(a: string | undefined, b: string | undefined): string {
  return (a ?? '').length >= (b ?? '').length ? (a ?? '') : (b ?? '');
}

function edgeWords(e: DrawnEdge): string[] {
  return e.label ? [e.label] : EDGE_WORDS[e.kind] ? [EDGE_WORDS[e.kind]!] : [];
}

export function architectureSvg(drawing: NetworkDrawing, placed: Placed, marks: readonly DrawingMark[], title: string, id: string): string {
  const nodeMarks = new Map<string, DrawingMark[]>();
  const edgeMarks = new Map<string, DrawingMark[]>();
  for (const m of marks) {
    if ('node' in m.place) nodeMarks.set(m.place.node, [...(nodeMarks.get(m.place.node) ?? []), m]);
    else edgeMarks.set(m.place.edge, [...(edgeMarks.get(m.place.edge) ?? []), m]);
  }
  const cutNodes = new Set([...nodeMarks].filter(([, ms]) => ms.some((m) => m.kind === 'cut')).map(([k]) => k));
  const out: string[] = [
    `<svg class="architecture" id="${id}" xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${placed.width} ${placed.height}" width="${placed.width}" height="${placed.height}" role="img" aria-labelledby="${id}-title">`,
    `<title id="${id}-title">${xmlText(title)}</title>`,
    '<g class="edges">',
  ];
  for (const e of drawing.edges) out.push(edgeSvg(e, placed, isCutEdge(e, drawing, cutNodes, edgeMarks)));
  out.push('</g><g class="edge-labels">');
  for (const e of drawing.edges) {
    const box = placed.edgeLabels.get(e.id);
    if (!box) continue;
    const left = box.x - box.width / 2;
    let y = box.y - box.height / 2 + PAD_Y;
    out.push(`<g class="edge-label">`);
    for (const w of edgeWords(e)) {
      out.push(`<text x="${box.x}" y="${y + FONT_PX}" text-anchor="middle">${xmlText(w)}</text>`);
      y += LINE_PX;
    }
    for (const m of edgeMarks.get(e.id) ?? []) {
      out.push(markSvg(m, left, y, box.width));
      y += LINE_PX;
    }
    out.push('</g>');
  }
  out.push('</g><g class="nodes">');
  for (const n of drawing.nodes) {
    const box = placed.nodes.get(n.id)!;
    const ms = nodeMarks.get(n.id) ?? [];
    const kinds = new Set(ms.map((m) => m.kind));
    const cls = ['node', `node-${n.kind}`, ...(kinds.has('cut') ? ['on-cut'] : []), ...(kinds.has('fix') ? ['has-fix'] : []), ...(kinds.has('change') ? ['has-change'] : [])];
    const left = box.x - box.width / 2;
    const top = box.y - box.height / 2;
    const data = `data-node="${n.id}"${n.line !== undefined ? ` data-line="${n.line}"` : ''}${n.width !== undefined ? ` data-width="${n.width}"` : ''}`;
    out.push(`<g class="${cls.join(' ')}" ${data}>`);
    out.push(`<rect class="node-box" x="${left}" y="${top}" width="${box.width}" height="${box.height}" rx="4"/>`);
    let y = top + PAD_Y;
    out.push(`<text class="node-title" x="${left + PAD_X}" y="${y + FONT_PX}">${xmlText(n.title)}</text>`);
    y += LINE_PX;
    for (const d of n.details) {
      out.push(`<text class="node-detail" x="${left + PAD_X}" y="${y + FONT_PX}">${xmlText(d)}</text>`);
      y += LINE_PX;
    }
    for (const m of ms) {
      out.push(markSvg(m, left, y, box.width));
      y += LINE_PX;
    }
    out.push('</g>');
  }
  out.push('</g></svg>');
  return out.join('');
}

/**
 * The bonds a cut entry stands for: a layer's (or the input's) are its outputs; a tensor's legs
 * are the edge from the input; a bond of an explicit network is its edge, or every edge of its
 * copy-tensor node.
 */
function isCutEdge(e: DrawnEdge, drawing: NetworkDrawing, cutNodes: ReadonlySet<string>, edgeMarks: ReadonlyMap<string, readonly DrawingMark[]>): boolean {
  if (edgeMarks.get(e.id)?.some((m) => m.kind === 'cut')) return true;
  const kind = (id: string): string | undefined => drawing.nodes.find((n) => n.id === id)?.kind;
  if (cutNodes.has(e.to) && (kind(e.to) === 'copy' || (kind(e.to) === 'tensor' && e.from === 'input'))) return true;
  return cutNodes.has(e.from) && kind(e.from) !== 'tensor';
}

function edgeSvg(e: DrawnEdge, placed: Placed, cut: boolean): string {
  const pts = placed.edges.get(e.id) ?? [];
  if (pts.length === 0) return '';
  const d = pts.map((p, i) => `${i === 0 ? 'M' : 'L'}${p.x} ${p.y}`).join('');
  const arrow = e.kind === 'bond' ? '' : ' marker-end="url(#rf-arrow)"';
  return `<path class="edge edge-${e.kind}${cut ? ' cut-edge' : ''}" data-edge="${e.id}" d="${d}"${arrow}/>`;
}

function markSvg(m: DrawingMark, left: number, y: number, width: number): string {
  const data = Object.entries(m.data)
    .map(([k, v]) => ` data-${k}="${xmlText(String(v))}"`)
    .join('');
  return (
    `<g class="${m.kind}-mark"${data}>` +
    `<rect class="mark-band" x="${left + 2}" y="${y - 1}" width="${width - 4}" height="${LINE_PX}" fill="url(#rf-pat-${m.kind})"/>` +
    `<text class="mark-text" x="${left + PAD_X}" y="${y + FONT_PX - 1}">${xmlText(m.text)}</text></g>`
  );
}
