/**
 * What the pictures draw of a model, before any layout: one node per layer (pointwise layers that
 * only follow one layer are folded into it, so that `conv → batch_norm → relu` is one box), the
 * input and the head, and one edge per input a layer reads, shortcut and skip inputs marked as
 * such. Each node carries the labels reports use for its layers (`8`, `stem`, `input`, `head`), so
 * that a cut entry, a fix or a changed field finds the node it belongs to. An explicit network is
 * drawn as its tensors and bonds (a bond of three or more tensors as a copy-tensor node).
 *
 * The HTML picture and the job summary's flowchart both draw from this, so they name and place
 * the same things.
 */
import { INPUT, layerLabel, layerWidth, positionCount, type ExplicitModel, type Layer, type LayeredModel, type Model } from '../config/model.js';
import { inferShapes } from '../config/model-shapes.js';

export type DrawnNodeKind = 'input' | 'head' | 'layer' | 'merge' | 'tensor' | 'copy';

export interface DrawnNode {
  /** Stable within one drawing: `input`, `head`, `l<index>`, `t<index>`, `c<index>`. */
  readonly id: string;
  readonly kind: DrawnNodeKind;
  /** First line: the report label and what the layer is, e.g. `layer 8: conv 3×3`. */
  readonly title: string;
  /** Further lines: width and grid, folded pointwise layers. */
  readonly details: readonly string[];
  /** YAML line (1-based) of the node's own entry; absent for the head. */
  readonly line?: number;
  /** The vector dimension the node leaves at each position, when it has one. */
  readonly width?: number;
  /** Report labels that name this node (layer labels, `input`, `head`, tensor names). */
  readonly labels: readonly (number | string)[];
  /** Lines of the layers folded into the node (its own first). */
  readonly lines: readonly number[];
}

export interface DrawnEdge {
  readonly id: string;
  readonly from: string;
  readonly to: string;
  /** `shortcut` and `skip` edges are the second input of a residual block or a skip merge. */
  readonly kind: 'main' | 'shortcut' | 'skip' | 'bond';
  /** A bond's text (`dim 4`); layer edges have none. */
  readonly label?: string;
  /** For a bond: the YAML line and the label cut entries use (`bond a-b`). */
  readonly line?: number;
  readonly cutLabel?: string;
}

export interface NetworkDrawing {
  readonly nodes: readonly DrawnNode[];
  readonly edges: readonly DrawnEdge[];
  /** Pointwise layers folded into the node before them. */
  readonly folded: number;
}

/** Where a cut entry, a fix or a change sits: a node, or (a bond of an explicit network) an edge. */
export type DrawnPlace = { readonly node: string } | { readonly edge: string };

export function drawNetwork(model: Model): NetworkDrawing {
  return model.kind === 'layered' ? drawLayered(model) : drawExplicit(model);
}

/**
 * The node or edge that a report label names: a layer label, `input`, `head`, an explicit
 * network's `legs` (with the tensor's line) or `bond a-b` (with the bond's line).
 */
export function placeOf(drawing: NetworkDrawing, label: number | string, line?: number): DrawnPlace | undefined {
  if (typeof label === 'string' && label.startsWith('bond ')) {
    const edge = drawing.edges.find((e) => e.cutLabel === label && (line === undefined || e.line === line));
    if (edge) return { edge: edge.id };
    const copy = drawing.nodes.find((n) => n.kind === 'copy' && n.labels.includes(label) && (line === undefined || n.line === line));
    return copy ? { node: copy.id } : undefined;
  }
  if (label === 'legs') {
    const tensor = drawing.nodes.find((n) => n.kind === 'tensor' && n.line === line);
    return tensor ? { node: tensor.id } : undefined;
  }
  const node = drawing.nodes.find((n) => n.labels.includes(label));
  return node ? { node: node.id } : undefined;
}

const POOL_WORDS: Readonly<Record<string, string>> = { max: 'max', average: 'average', sum: 'sum', product: 'product', other: 'lp' };

function drawLayered(model: LayeredModel): NetworkDrawing {
  const inferred = inferShapes(model);
  const shapes = inferred.ok ? inferred.shapes : undefined;
  const consumers: number[][] = model.layers.map(() => []);
  const inputConsumers: number[] = [];
  for (const l of model.layers) for (const i of l.inputs) (i === INPUT ? inputConsumers : consumers[i]!).push(l.index);

  // A pointwise layer joins the node of the one layer it reads when nothing else reads that layer.
  const owner = new Map<number, string>();
  const ownerOf = (i: number): string => (i === INPUT ? 'input' : owner.get(i)!);
  const folded = new Map<string, Layer[]>();
  const own: Layer[] = [];
  for (const l of model.layers) {
    const src = l.inputs[0]!;
    const single = l.inputs.length === 1 && (src === INPUT ? inputConsumers.length === 1 : consumers[src]!.length === 1);
    if (l.kind === 'pointwise' && single) {
      const id = ownerOf(src);
      owner.set(l.index, id);
      folded.set(id, [...(folded.get(id) ?? []), l]);
    } else {
      owner.set(l.index, `l${l.index}`);
      own.push(l);
    }
  }
  const foldedText = (id: string): string[] => {
    const f = folded.get(id);
    return f ? [`+ ${f.map((l) => (l.kind === 'pointwise' ? l.op : l.kind)).join(', ')}`] : [];
  };
  const foldedLabels = (id: string): (number | string)[] => (folded.get(id) ?? []).map(layerLabel);
  const foldedLines = (id: string): number[] => (folded.get(id) ?? []).map((l) => l.span.line);

  const m = shapes?.representation;
  const inShape = model.input.shape;
  const nodes: DrawnNode[] = [
    {
      id: 'input',
      kind: 'input',
      title: `input ${gridText(inShape)}`,
      details: [`${positionCount(inShape).toLocaleString('en-US')} positions${m !== undefined ? `, M = ${m}` : ''}`, `line ${model.input.span.line}`, ...foldedText('input')],
      line: model.input.span.line,
      ...(m !== undefined ? { width: m } : {}),
      labels: ['input', ...foldedLabels('input')],
      lines: [model.input.span.line, ...foldedLines('input')],
    },
  ];
  const edges: DrawnEdge[] = [];
  for (const l of own) {
    const id = `l${l.index}`;
    const shape = shapes?.layers[l.index];
    const width = shape?.width ?? layerWidth(l);
    const grid = shape ? `, grid ${gridText(shape.shape)}` : '';
    nodes.push({
      id,
      kind: l.kind === 'merge' ? 'merge' : 'layer',
      title: `${reportName(l)}: ${kindText(l)}`,
      details: [`${width !== undefined ? `width ${width}` : 'width ?'}${grid}`, `line ${l.span.line}`, ...foldedText(id)],
      line: l.span.line,
      ...(width !== undefined ? { width } : {}),
      labels: [layerLabel(l), ...foldedLabels(id)],
      lines: [l.span.line, ...foldedLines(id)],
    });
    l.inputs.forEach((i, k) => {
      const kind = l.kind === 'merge' && k > 0 && l.origin !== 'branches' ? (l.origin === 'residual' ? 'shortcut' : 'skip') : 'main';
      edges.push({ id: `e${edges.length}`, from: ownerOf(i), to: id, kind });
    });
  }
  const last = model.layers.at(-1);
  nodes.push({
    id: 'head',
    kind: 'head',
    title: 'head: the analysed score',
    details: shapes && shapes.layers.at(-1)!.shape.length > 0 && positionCount(shapes.layers.at(-1)!.shape) > 1 ? [`at position ${shapes.output.position.join(', ')}`] : [],
    labels: ['head'],
    lines: [],
  });
  if (last) edges.push({ id: `e${edges.length}`, from: ownerOf(last.index), to: 'head', kind: 'main' });
  return { nodes, edges, folded: model.layers.length - own.length };
}

function drawExplicit(model: ExplicitModel): NetworkDrawing {
  const nodes: DrawnNode[] = [
    {
      id: 'input',
      kind: 'input',
      title: `input ${gridText(model.shape)}`,
      details: [`${positionCount(model.shape).toLocaleString('en-US')} positions (open legs)`],
      labels: ['input'],
      lines: [],
    },
  ];
  const edges: DrawnEdge[] = [];
  const index = new Map<string, number>();
  model.tensors.forEach((t, i) => {
    index.set(t.name, i);
    const legs = t.legs.map((g) => `${g.position}`).join(', ');
    nodes.push({
      id: `t${i}`,
      kind: 'tensor',
      title: `tensor ${t.name}`,
      details: [t.legs.length > 0 ? `legs at ${legs} (dim ${[...new Set(t.legs.map((g) => g.dim))].join('/')})` : 'no open legs', `line ${t.span.line}`],
      line: t.span.line,
      labels: [t.name],
      lines: [t.span.line],
    });
    if (t.legs.length > 0) edges.push({ id: `e${edges.length}`, from: 'input', to: `t${i}`, kind: 'main' });
  });
  model.bonds.forEach((b, k) => {
    const cutLabel = `bond ${b.tensors.join('-')}`;
    const members = b.tensors.map((name) => index.get(name)).filter((i): i is number => i !== undefined);
    if (members.length === 2) {
      edges.push({ id: `e${edges.length}`, from: `t${members[0]}`, to: `t${members[1]}`, kind: 'bond', label: `dim ${b.dim}`, line: b.span.line, cutLabel });
      return;
    }
    const id = `c${k}`;
    nodes.push({ id, kind: 'copy', title: `copy tensor (${cutLabel})`, details: [`dim ${b.dim}`, `line ${b.span.line}`], line: b.span.line, width: b.dim, labels: [cutLabel], lines: [b.span.line] });
    for (const m of members) edges.push({ id: `e${edges.length}`, from: `t${m}`, to: id, kind: 'bond' });
  });
  return { nodes, edges, folded: 0 };
}

function reportName(l: Layer): string {
  return l.name !== undefined ? l.name : `layer ${l.index}`;
}

function gridText(shape: readonly number[]): string {
  return shape.length === 0 ? '1' : shape.join('×');
}

function axes(xs: readonly number[]): string {
  return xs.length === 0 ? '' : xs.every((x) => x === xs[0]) && xs.length > 1 ? `${xs[0]}×${xs[0]}` : xs.join('×');
}

function kindText(l: Layer): string {
  switch (l.kind) {
    case 'conv': {
      const dw = l.groups === 'depthwise' ? 'depthwise ' : l.groups !== 1 ? `grouped (${l.groups}) ` : '';
      const stride = l.stride.some((s) => s > 1) ? ` /${axes(l.stride)}` : '';
      return `${dw}conv ${axes(l.kernel)}${stride}`;
    }
    case 'conv-transpose':
      return `conv-transpose ${axes(l.kernel)} ×${axes(l.stride)}`;
    case 'pool':
      return l.global ? `global ${POOL_WORDS[l.mode]} pool` : `${POOL_WORDS[l.mode]} pool ${axes(l.window)}`;
    case 'dense':
      return 'dense';
    case 'flatten':
      return 'flatten';
    case 'upsample':
      return `upsample ×${axes(l.factor)} (${l.mode})`;
    case 'recurrent': {
      const cell = l.cell === 'arithmetic' ? 'recurrent' : l.cell.toUpperCase();
      return `${l.bidirectional ? `bidirectional ${cell} (${l.merge})` : cell}, depth ${l.depth}${l.sequence ? ', every step' : ''}`;
    }
    case 'embedding':
      return 'embedding';
    case 'position':
      return `position vectors (${l.mode})`;
    case 'class-token':
      return 'class token';
    case 'attention': {
      const mask = l.causal ? ', causal' : '';
      const window = l.window !== undefined ? `, window ${l.window}` : '';
      return `attention, ${l.heads} head${l.heads === 1 ? '' : 's'}${l.headDim !== undefined ? ` of ${l.headDim}` : ''}${mask}${window}`;
    }
    case 'pointwise':
      return l.op;
    case 'merge':
      return `${l.mode} (${l.origin})`;
  }
}
