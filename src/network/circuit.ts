/**
 * The tensor network of a layered model in compact form: a DAG of operations whose outputs are
 * indices (bonds). Large inputs (a 224×224 image has 10^5 tensors) rule out an object per tensor,
 * so nodes live in typed arrays; `toGraph` turns a circuit into a graphology graph for inspection.
 *
 * Node kinds and the tensor-network piece each one stands for:
 * - input: the open leg of one position (dimension M);
 * - const: a learned vector with no inputs (the initial state of a recurrent layer);
 * - linear: a matrix applied to one child;
 * - product: a copy tensor δ joining its children and its output — a hyperedge, not a tensor;
 * - sum: a linear map over several children (an overlapping convolution window).
 * A node consumed by several parents is reused: the network it stands for is the tree in which
 * every use has its own copy (Levine, Sharir, Cohen, Shashua, "Quantum entanglement in deep
 * learning architectures", PRL 2019), and every algorithm here works on that duplicated tree.
 */
import type { Span } from '../diagnostic.js';

export const OP_INPUT = 0;
export const OP_CONST = 1;
export const OP_LINEAR = 2;
export const OP_PRODUCT = 3;
export const OP_SUM = 4;
export type OpKind = typeof OP_INPUT | typeof OP_CONST | typeof OP_LINEAR | typeof OP_PRODUCT | typeof OP_SUM;

export const OP_NAMES = ['input', 'const', 'linear', 'product', 'sum'] as const;

/** Where a group of nodes came from, for cut reports: a layer label and its YAML line. */
export interface LayerTag {
  readonly label: number | string;
  readonly line: number;
  /** The YAML span of the layer (or of `input`). */
  readonly span: Span;
  /** Index of the model layer, or -1 for the input legs and the head. */
  readonly layerIndex: number;
}

export interface Circuit {
  readonly size: number;
  readonly op: Uint8Array;
  /** Dimension of each node's output index. */
  readonly dim: Int32Array;
  /** Input position of input nodes, -1 elsewhere. */
  readonly position: Int32Array;
  /** Index into `tags`: the layer that built the node. */
  readonly tag: Int32Array;
  /**
   * Index into `tags` of the layer that set the node's output dimension: its own for tensors;
   * for a copy tensor, the layer that produced its children (a pool passes channels through), so
   * that a cut names the layer whose width a reviewer would change.
   */
  readonly bondTag: Int32Array;
  /** Children of node v: childList[childStart[v] .. childStart[v+1]). */
  readonly childStart: Int32Array;
  readonly childList: Int32Array;
  /** The node whose output the head vector contracts with. */
  readonly top: number;
  readonly tags: readonly LayerTag[];
  readonly positions: number;
  /** Some node is consumed more than once (overlap windows, deep recurrence). */
  readonly reuse: boolean;
  /** Some node is a sum over several children. */
  readonly sums: boolean;
  /** No sums, so the function is multi-homogeneous in every node's output. */
  readonly homogeneous: boolean;
}

/** Growable builder; nodes must be added children-first, so node order is topological. */
export class CircuitBuilder {
  private op: Uint8Array;
  private dim: Int32Array;
  private position: Int32Array;
  private tag: Int32Array;
  private childStart: Int32Array;
  private childList: Int32Array;
  private uses: Uint8Array;
  private n = 0;
  private m = 0;
  private reuse = false;
  private sums = false;
  readonly tags: LayerTag[] = [];

  constructor(
    readonly positions: number,
    /** Refuse to grow beyond this many nodes or child links. */
    readonly limit: number,
    /** Nodes to make room for at the start (the arrays grow beyond as needed). */
    capacity = 1024,
  ) {
    const nodes = Math.max(1024, capacity);
    this.op = new Uint8Array(nodes);
    this.dim = new Int32Array(nodes);
    this.position = new Int32Array(nodes);
    this.tag = new Int32Array(nodes);
    this.uses = new Uint8Array(nodes);
    this.childStart = new Int32Array(nodes + 1);
    this.childList = new Int32Array(4 * nodes);
  }

  get size(): number {
    return this.n;
  }

  get links(): number {
    return this.m;
  }

  addTag(tag: LayerTag): number {
    this.tags.push(tag);
    return this.tags.length - 1;
  }

  add(op: OpKind, dim: number, tag: number, children: readonly number[], position = -1): number {
    if (this.n >= this.limit || this.m + children.length > this.limit * 4) {
      throw new NetworkTooLarge(this.limit);
    }
    if (this.n + 1 >= this.op.length) this.growNodes();
    while (this.m + children.length > this.childList.length) this.childList = grow(this.childList, this.childList.length * 2);
    const v = this.n++;
    this.op[v] = op;
    this.dim[v] = dim;
    this.position[v] = position;
    this.tag[v] = tag;
    this.childStart[v] = this.m;
    for (const c of children) {
      this.childList[this.m++] = c;
      if (this.uses[c]! > 0) this.reuse = true;
      this.uses[c] = 1;
    }
    this.childStart[v + 1] = this.m;
    if (op === OP_SUM && children.length > 1) this.sums = true;
    return v;
  }

  finish(top: number): Circuit {
    const bondTag = this.tag.slice(0, this.n);
    for (let v = 0; v < this.n; v++) {
      if (this.op[v] === OP_PRODUCT && this.childStart[v + 1]! > this.childStart[v]!) bondTag[v] = bondTag[this.childList[this.childStart[v]!]!]!;
    }
    return {
      bondTag,
      size: this.n,
      op: this.op.slice(0, this.n),
      dim: this.dim.slice(0, this.n),
      position: this.position.slice(0, this.n),
      tag: this.tag.slice(0, this.n),
      childStart: this.childStart.slice(0, this.n + 1),
      childList: this.childList.slice(0, this.m),
      top,
      tags: this.tags,
      positions: this.positions,
      reuse: this.reuse,
      sums: this.sums,
      homogeneous: !this.sums,
    };
  }

  private growNodes(): void {
    const size = this.op.length * 2;
    this.op = grow(this.op, size);
    this.dim = grow(this.dim, size);
    this.position = grow(this.position, size);
    this.tag = grow(this.tag, size);
    this.uses = grow(this.uses, size);
    this.childStart = grow(this.childStart, size + 1);
  }
}

/** Thrown by the builder when a model is over the node limit; the loader turns it into a diagnostic. */
export class NetworkTooLarge extends Error {
  override readonly name = 'NetworkTooLarge';
  constructor(readonly limit: number) {
    super(`the tensor network would exceed ${limit} nodes`);
  }
}

function grow<T extends Uint8Array | Int32Array>(a: T, size: number): T {
  const b = new (a.constructor as new (n: number) => T)(size);
  b.set(a);
  return b;
}
