/**
 * A compact flowchart of one requirement in Mermaid's text form, which GitHub draws in Markdown
 * (the job summary): the network from input to head with the layers of the minimal cut, the fix
 * and the changed fields written into their nodes (`✂ CUT …`, `FIX …`, `CHANGED …`) and outlined,
 * so that the words carry what the style shows. A long network keeps its input, head, marked
 * layers and the points where paths split or meet; each run of other layers between them becomes
 * one node (`⋯ 6 layers, lines 10–16`). When that is still too many nodes, only the input, the
 * head and the marked layers stay.
 *
 * Layer names come from the pull request, so every character of a label outside a small set is
 * written as a Mermaid entity code (`#35;`): no label can hold a quote, a backtick or a line
 * break, and so none can end the label, the statement or the Markdown code block around it.
 */
import type { DrawingMark } from './architecture-svg.js';
import type { DrawnEdge, DrawnNode, NetworkDrawing } from './network-drawing.js';

/** Drawings with at most this many nodes are drawn whole. */
const WHOLE = 12;
/** Kept nodes (besides runs) before the chart falls back to the marked layers only. */
const MAX_KEPT = 40;
/** A chart with more nodes than this is not drawn. */
export const MAX_FLOWCHART_NODES = 80;

/** Every character outside a small safe set. */
const UNSAFE = /[^A-Za-z0-9 _.,:/()[\]+=×·→✂⋯–-]/gu;

/** Text for inside a quoted Mermaid label: anything outside the safe set as an entity code. */
export function mermaidText(s: string): string {
  return s.replace(UNSAFE, (ch) => `#${ch.codePointAt(0)};`);
}

interface ChartNode {
  readonly id: string;
  readonly shape: 'box' | 'round' | 'hexagon' | 'run';
  readonly lines: readonly string[];
  readonly cls?: 'cut' | 'fix' | 'change';
}

interface ChartEdge {
  readonly from: string;
  readonly to: string;
  readonly dotted: boolean;
  readonly label?: string;
}

/** The flowchart, or undefined when even the compact chart has more than MAX_FLOWCHART_NODES nodes. */
export function requirementFlowchart(drawing: NetworkDrawing, marks: readonly DrawingMark[]): string | undefined {
  const byNode = new Map<string, DrawingMark[]>();
  const byEdge = new Map<string, DrawingMark[]>();
  for (const m of marks) {
    if ('node' in m.place) byNode.set(m.place.node, [...(byNode.get(m.place.node) ?? []), m]);
    else byEdge.set(m.place.edge, [...(byEdge.get(m.place.edge) ?? []), m]);
  }
  const markedEdges = drawing.edges.filter((e) => byEdge.has(e.id));
  const important = new Set<string>(['input', 'head', ...byNode.keys(), ...markedEdges.flatMap((e) => [e.from, e.to])]);
  const ins = new Map<string, DrawnEdge[]>();
  const outs = new Map<string, DrawnEdge[]>();
  for (const e of drawing.edges) {
    ins.set(e.to, [...(ins.get(e.to) ?? []), e]);
    outs.set(e.from, [...(outs.get(e.from) ?? []), e]);
  }
  let kept: Set<string>;
  if (drawing.nodes.length <= WHOLE) kept = new Set(drawing.nodes.map((n) => n.id));
  else {
    kept = new Set(drawing.nodes.filter((n) => important.has(n.id) || (ins.get(n.id)?.length ?? 0) !== 1 || (outs.get(n.id)?.length ?? 0) !== 1).map((n) => n.id));
    if (kept.size > MAX_KEPT) kept = important;
  }
  const byId = new Map(drawing.nodes.map((n) => [n.id, n]));
  const nodes: ChartNode[] = [];
  const edges: ChartEdge[] = [];
  const label = (e: DrawnEdge): string | undefined => {
    const words = [...(e.label ? [e.label] : e.kind === 'shortcut' || e.kind === 'skip' ? [e.kind] : []), ...(byEdge.get(e.id) ?? []).map(markWords)];
    return words.length > 0 ? words.join(' · ') : undefined;
  };
  for (const n of drawing.nodes) {
    if (!kept.has(n.id)) continue;
    const ms = byNode.get(n.id) ?? [];
    const cls = ms.some((m) => m.kind === 'cut') ? 'cut' : ms.some((m) => m.kind === 'fix') ? 'fix' : ms.length > 0 ? 'change' : undefined;
    nodes.push({ id: n.id, shape: shapeOf(n), lines: [n.title, ...compactDetails(n), ...ms.map(markWords)], ...(cls ? { cls } : {}) });
  }
  // Each kept node's successors: kept ones directly, others as a run up to the next kept nodes.
  for (const n of drawing.nodes) {
    if (!kept.has(n.id)) continue;
    for (const e of outs.get(n.id) ?? []) {
      if (kept.has(e.to)) {
        edges.push({ from: n.id, to: e.to, dotted: e.kind !== 'main' && e.kind !== 'bond', ...optional(label(e)) });
        continue;
      }
      const run = new Set<string>();
      const ends = new Map<string, DrawnEdge>();
      const stack = [e.to];
      while (stack.length > 0) {
        const id = stack.pop()!;
        if (run.has(id)) continue;
        run.add(id);
        for (const next of outs.get(id) ?? []) {
          if (kept.has(next.to)) ends.set(next.to, next);
          else stack.push(next.to);
        }
      }
      const runId = `r${nodes.length}`;
      const lines = [...run].map((id) => byId.get(id)!).flatMap((x) => x.lines);
      const span = lines.length === 0 ? '' : `, lines ${Math.min(...lines)}–${Math.max(...lines)}`;
      nodes.push({ id: runId, shape: 'run', lines: [`⋯ ${run.size} layer${run.size === 1 ? '' : 's'}${span}`] });
      edges.push({ from: n.id, to: runId, dotted: e.kind !== 'main' && e.kind !== 'bond', ...optional(label(e)) });
      for (const [to, last] of ends) edges.push({ from: runId, to, dotted: last.kind !== 'main' && last.kind !== 'bond', ...optional(label(last)) });
    }
  }
  if (nodes.length > MAX_FLOWCHART_NODES) return undefined;
  const ids = new Map(nodes.map((n, i) => [n.id, `n${i}`]));
  const out = ['flowchart TB'];
  for (const n of nodes) out.push(`  ${ids.get(n.id)}${shaped(n.shape, n.lines.map(mermaidText).join('<br>'))}`);
  for (const e of edges) {
    const arrow = e.dotted ? '-.->' : '-->';
    out.push(`  ${ids.get(e.from)} ${arrow}${e.label ? `|"${mermaidText(e.label)}"|` : ''} ${ids.get(e.to)}`);
  }
  out.push(
    '  classDef cut stroke:#b3261e,stroke-width:4px,stroke-dasharray:6 3',
    '  classDef fix stroke:#2f7d32,stroke-width:3px',
    '  classDef change stroke:#8a5a00,stroke-width:3px',
    '  classDef run stroke-dasharray:3 3',
  );
  for (const cls of ['cut', 'fix', 'change'] as const) {
    const of = nodes.filter((n) => n.cls === cls).map((n) => ids.get(n.id));
    if (of.length > 0) out.push(`  class ${of.join(',')} ${cls}`);
  }
  const runs = nodes.filter((n) => n.shape === 'run').map((n) => ids.get(n.id));
  if (runs.length > 0) out.push(`  class ${runs.join(',')} run`);
  return out.join('\n') + '\n';
}

function markWords(m: DrawingMark): string {
  if (m.kind === 'cut') return m.text.replace(/^✂ cut:/, '✂ CUT');
  if (m.kind === 'fix') return m.text.replace(/^fix:/, 'FIX');
  return m.text.replace(/^this change:/, 'CHANGED');
}

function compactDetails(n: DrawnNode): string[] {
  return n.details.length > 0 ? [n.details.join(' · ')] : [];
}

function shapeOf(n: DrawnNode): ChartNode['shape'] {
  if (n.kind === 'input' || n.kind === 'head') return 'round';
  if (n.kind === 'merge' || n.kind === 'copy') return 'hexagon';
  return 'box';
}

function shaped(shape: ChartNode['shape'], text: string): string {
  switch (shape) {
    case 'round':
      return `(["${text}"])`;
    case 'hexagon':
      return `{{"${text}"}}`;
    default:
      return `["${text}"]`;
  }
}

function optional(label: string | undefined): { label?: string } {
  return label === undefined ? {} : { label };
}
