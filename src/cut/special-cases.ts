/**
 * Lower bounds for models with blocks come from special cases: choices of weights under which the
 * model computes exactly the function of a simpler model, one whose network has no sums, where
 * the lower-bound rules are proven. Any lower bound of a special case is a lower bound of the
 * model, since the capacity is a maximum over weights. Derived here (DEVELOPERS.md, "Special
 * cases for lower bounds"):
 * - `overlap` → `tree`: with every off-centre tap zeroed, a stride-1 conv is its centre tap, which
 *   is the tree surrogate's conv; a transposed conv keeps one tap per output offset when those
 *   taps exist. Pools, upsampling, dense layers and merges are the same in both surrogates.
 * - a merge keeps one of its inputs: the other inputs of a sum are zeroed at a weighted layer that
 *   feeds only them (zero passes through pointwise layers, pools and upsampling); the other inputs
 *   of a concatenation are ignored by the weighted layer that reads it, whose columns for them are
 *   zero, when nothing but coordinatewise layers lies between.
 * The reduced model pins M and the analysed output position of the original, and is used only if
 * every layer it keeps is read the same way (pointwise readings, dense readings).
 */
import { INPUT, type Layer, type LayeredModel } from '../config/model.js';
import { extent } from '../config/grid-geometry.js';
import type { ModelShapes } from '../config/model-shapes.js';
import { inferShapes } from '../config/model-shapes.js';
import { readPointwise, type PointwiseReading } from '../network/square-rule.js';
import type { Surrogate } from './types.js';

export interface SpecialCase {
  readonly model: LayeredModel;
  /** The surrogate the special case is built under. */
  readonly surrogate: Surrogate;
  /** How it was obtained, for the bound's method text. */
  readonly how: string;
}

const WEIGHTED: ReadonlySet<Layer['kind']> = new Set<Layer['kind']>(['conv', 'conv-transpose', 'dense', 'recurrent']);
const ZERO_PRESERVING: ReadonlySet<Layer['kind']> = new Set<Layer['kind']>(['pointwise', 'pool', 'upsample', 'flatten']);

export function specialCases(model: LayeredModel, surrogate: Surrogate, shapes: ModelShapes, reading: PointwiseReading): SpecialCase[] {
  let under: Surrogate = surrogate;
  const steps: string[] = [];
  if (surrogate === 'overlap') {
    if (!treeIsSpecialCase(model, shapes)) return [];
    under = 'tree';
    steps.push('off-centre taps zeroed');
  }
  const pinned: LayeredModel = {
    ...model,
    input: { ...model.input, representation: shapes.representation },
    output: { ...model.output, position: shapes.output.position },
  };
  if (!model.layers.some((l) => l.kind === 'merge')) return [{ model: pinned, surrogate: under, how: steps.join(', ') }];
  const cases: SpecialCase[] = [];
  for (const pick of ['first', 'last'] as const) {
    const reduced = keepOneInput(pinned, pick, reading, shapes);
    if (reduced) cases.push({ model: reduced, surrogate: under, how: [...steps, `merges keep their ${pick} input where the others can be zeroed`].join(', ') });
  }
  return cases;
}

/** Whether zeroing taps turns every overlapping window of the model into its tree counterpart. */
function treeIsSpecialCase(model: LayeredModel, shapes: ModelShapes): boolean {
  for (const l of model.layers) {
    if (l.kind === 'conv') {
      if (l.stride.some((s) => s !== 1)) return false;
      if (l.padding.mode === 'causal') continue;
      // The tree's position j − left + ⌊(e−1)/2⌋ must be a tap j − left + t·d.
      if (l.kernel.some((k, a) => Math.floor((extent(k, l.dilation[a]!) - 1) / 2) % l.dilation[a]! !== 0)) return false;
    } else if (l.kind === 'conv-transpose') {
      const before = l.inputs[0] === INPUT ? model.input.shape : shapes.layers[l.inputs[0]!]!.shape;
      const after = shapes.layers[l.index]!.shape;
      for (let a = 0; a < after.length; a++) {
        const s = l.stride[a]!;
        const d = l.dilation[a]!;
        const p = l.padding[a]!;
        if (after[a]! > before[a]! * s) return false;
        for (let u = 0; u < Math.min(s, after[a]!); u++) {
          if ((u + p) % d !== 0 || (u + p) / d >= l.kernel[a]!) return false;
        }
      }
    } else if (l.kind === 'upsample' && l.mode === 'linear') {
      return false;
    }
  }
  return true;
}

/** The model with every merge replaced by one of its inputs, or undefined when that is not a special case. */
function keepOneInput(model: LayeredModel, pick: 'first' | 'last', reading: PointwiseReading, shapes: ModelShapes): LayeredModel | undefined {
  const layers = model.layers;
  const consumers: number[][] = layers.map(() => []);
  for (const l of layers) for (const i of l.inputs) if (i !== INPUT) consumers[i]!.push(l.index);
  const replaced = new Map<number, number>();
  const resolve = (i: number): number => replaced.get(i) ?? i;
  for (const l of layers) {
    if (l.kind !== 'merge') continue;
    const coordinatewise = l.mode === 'concat' && onlyCoordinatewiseUntilWeighted(layers, consumers, l.index);
    const canKeep = (keptAt: number): boolean =>
      coordinatewise || l.inputs.every((d, k) => k === keptAt || zeroable(layers, consumers, d, l.index));
    // The preferred input when the others can be dropped, else the input at the other end.
    const ends = pick === 'first' ? [0, l.inputs.length - 1] : [l.inputs.length - 1, 0];
    const keptAt = ends.find(canKeep);
    if (keptAt === undefined) return undefined;
    replaced.set(l.index, resolve(l.inputs[keptAt]!));
  }
  const last = resolve(layers.length - 1);
  // Keep what the output still reads.
  const live = new Set<number>();
  const stack = [last];
  while (stack.length > 0) {
    const i = stack.pop()!;
    if (i === INPUT || live.has(i)) continue;
    live.add(i);
    for (const j of layers[i]!.inputs) stack.push(resolve(j));
  }
  const order = layers.filter((l) => live.has(l.index) && l.kind !== 'merge');
  const newIndex = new Map<number, number>(order.map((l, k) => [l.index, k]));
  const kept: Layer[] = order.map((l, k) => ({
    ...l,
    index: k,
    inputs: l.inputs.map((j) => (j === INPUT ? INPUT : newIndex.get(resolve(j))!)),
  }));
  const reduced: LayeredModel = { ...model, layers: kept };
  const shaped = inferShapes(reduced);
  if (!shaped.ok) return undefined;
  const again = readPointwise(reduced, shaped.shapes);
  for (const l of order) {
    const k = newIndex.get(l.index)!;
    if (reading.squared.has(l.index) !== again.squared.has(k) || reading.ignored.has(l.index) !== again.ignored.has(k)) return undefined;
    if (shapes.denseReading[l.index] !== shaped.shapes.denseReading[k]) return undefined;
  }
  return reduced;
}

/** Zero can be set on this input of a merge by zeroing a weighted layer that feeds nothing else. */
function zeroable(layers: readonly Layer[], consumers: readonly number[][], input: number, merge: number): boolean {
  let at = input;
  let reader = merge;
  for (;;) {
    if (at === INPUT) return false;
    const uses = consumers[at]!;
    if (uses.length !== 1 || uses[0] !== reader) return false;
    const l = layers[at]!;
    if (WEIGHTED.has(l.kind)) return true;
    if (!ZERO_PRESERVING.has(l.kind)) return false;
    reader = at;
    at = l.inputs[0]!;
  }
}

/** Every path from the layer reaches a weighted layer, or the output, through coordinatewise layers only. */
function onlyCoordinatewiseUntilWeighted(layers: readonly Layer[], consumers: readonly number[][], from: number): boolean {
  const stack = [from];
  const seen = new Set<number>();
  while (stack.length > 0) {
    const i = stack.pop()!;
    if (seen.has(i)) continue;
    seen.add(i);
    for (const c of consumers[i]!) {
      const l = layers[c]!;
      if (WEIGHTED.has(l.kind)) continue;
      if (!ZERO_PRESERVING.has(l.kind)) return false;
      stack.push(c);
    }
  }
  return true;
}
