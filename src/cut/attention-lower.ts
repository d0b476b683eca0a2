/**
 * Lower bound through one linearised attention layer (derived here; DEVELOPERS.md, "One attention
 * layer, the rest passed through"): when the first attention layer reads the input through
 * per-position linear maps and everything after it that the output reads is per-position, a merge
 * or an attention layer that can be zeroed, the separation rank across any partition whose side
 * without the analysed position o holds a position that o attends to is at least k + 1, k or
 * k − 1 (k = min(H·a, D, m): H heads of width a, input width D, m the dimension the maps before it
 * pass; which of the three, by the input kind and the partition, is argued in DEVELOPERS.md).
 */
import type { Layer, LayeredModel } from '../config/model.js';
import type { ModelShapes } from '../config/model-shapes.js';
import type { PointwiseReading } from '../network/square-rule.js';
import type { Partition } from '../partition/partition.js';
import type { Bound } from './types.js';
import { log2Big } from './types.js';

/** What a layer's output is, per position, at the chosen weights. */
const ZERO = 0; // identically zero
const BEFORE = 1; // a linear map of the input vector at the same position (P x_t)
const MIXED = 2; // a linear map of the attention output and the input vector at the same position

export interface AttentionOnInput {
  /** min(H·a, D, m): the rank of the coupling the chosen weights give. */
  readonly k: number;
  /** The vocabulary of a token input, else undefined. */
  readonly vocabulary: number | undefined;
  /** The analysed position, row-major in the input grid (which every layer keeps). */
  readonly output: number;
  readonly causal: boolean;
  readonly window: number | undefined;
}

/**
 * A weighted layer that maps each position's vector by one matrix, reading no other position: an
 * embedding, a dense layer that does not read the whole input, a 1×1 conv of stride 1 without
 * groups. The rules that pass such maps through choose them as partial identities.
 */
export function perPositionMap(l: Layer, shapes: ModelShapes): boolean {
  return (
    l.kind === 'embedding' ||
    (l.kind === 'dense' && shapes.denseReading[l.index] !== 'input') ||
    (l.kind === 'conv' && l.groups === 1 && l.kernel.every((k) => k === 1) && l.stride.every((s) => s === 1))
  );
}

/** The model's shape for the rule, or undefined when it does not apply. */
export function attentionOnInput(model: LayeredModel, shapes: ModelShapes, reading: PointwiseReading): AttentionOnInput | undefined {
  const state: number[] = [];
  let m = shapes.representation;
  let found: { k: number; causal: boolean; window: number | undefined } | undefined;
  const inputState = (i: number): number => (i < 0 ? BEFORE : state[i]!);
  for (const l of model.layers) {
    const ins = l.inputs.map(inputState);
    if (l.kind === 'merge') {
      // Sums and concatenations of per-position linear maps are per-position linear maps. Before
      // the attention layer the prefix must be a chain: m counts the dimensions of one path.
      if (!found) return undefined;
      state.push(Math.max(...ins));
      continue;
    }
    if (ins.length !== 1) return undefined;
    const s = ins[0]!;
    if (l.kind === 'attention') {
      if (found) {
        state.push(ZERO); // O_h = 0
        continue;
      }
      if (s !== BEFORE) return undefined;
      const d = l.inputs[0]! < 0 ? shapes.representation : shapes.layers[l.inputs[0]!]!.width;
      const s2 = l.heads * shapes.headDims[l.index]!;
      found = { k: Math.min(s2, d, m), causal: l.causal, window: l.window };
      state.push(MIXED);
      continue;
    }
    // A pointwise layer read as the square v ⊙ v (inside a fully connected stack) is not linear.
    if (l.kind === 'pointwise' && reading.squared.has(l.index)) return undefined;
    if (l.kind === 'pointwise' || l.kind === 'position') {
      state.push(s);
      continue;
    }
    if (!perPositionMap(l, shapes)) return undefined;
    if (!found) m = Math.min(m, shapes.layers[l.index]!.width);
    state.push(s);
  }
  if (!found || state[state.length - 1] !== MIXED) return undefined;
  const last = shapes.layers[shapes.layers.length - 1]!.shape;
  if (last.length !== model.input.shape.length || last.some((n, i) => n !== model.input.shape[i])) return undefined;
  let output = 0;
  for (let axis = 0; axis < last.length; axis++) output = output * last[axis]! + shapes.output.position[axis]!;
  return { ...found, output, vocabulary: model.input.vocabulary };
}

/** The bound for one partition, or undefined when the rule proves no more than 1. */
export function attentionLower(on: AttentionOnInput, p: Partition, oneDimensional: boolean): Bound | undefined {
  const o = on.output;
  const near = p.side[o]!;
  const attends = (j: number): boolean => !(on.causal && j > o) && !(on.window !== undefined && oneDimensional && Math.abs(o - j) > on.window);
  let far = false;
  let nearOther = false;
  for (let j = 0; j < p.side.length; j++) {
    if (!attends(j)) continue;
    if (p.side[j] !== near) far = true;
    else if (j !== o) nearOther = true;
  }
  if (!far) return undefined;
  const k = BigInt(on.k);
  let rank: bigint;
  if (on.vocabulary === undefined) rank = k + 1n;
  else if (on.k < on.vocabulary) rank = nearOther ? k + 1n : k;
  else rank = k - 1n;
  if (rank <= 1n) return undefined;
  return { rank, log2: log2Big(rank), method: 'one attention layer, the rest passed through', cut: [] };
}
