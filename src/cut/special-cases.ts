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
import { INPUT, WEIGHTED_KINDS, type ConvLayer, type Layer, type LayeredModel } from '../config/model.js';
import { extent, windowAxis } from '../config/grid-geometry.js';
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

const ZERO_PRESERVING: ReadonlySet<Layer['kind']> = new Set<Layer['kind']>(['pointwise', 'pool', 'upsample', 'flatten']);

export function specialCases(original: LayeredModel, surrogate: Surrogate, shapes: ModelShapes, reading: PointwiseReading): SpecialCase[] {
  let model = original;
  let under: Surrogate = surrogate;
  const steps: string[] = [];
  if (surrogate === 'overlap') {
    const tapped = treeSpecialCase(model, shapes);
    if (!tapped) return [];
    under = 'tree';
    steps.push(tapped === model ? 'off-centre taps zeroed' : 'all taps but one zeroed');
    model = tapped;
  }
  // Position vectors: learned ones can be zero (the layer is then the identity); fixed ones cannot.
  if (model.layers.some((l) => l.kind === 'position' && l.mode === 'fixed')) return [];
  const pinned: LayeredModel = {
    ...model,
    input: { ...model.input, representation: shapes.representation },
    output: { ...model.output, position: shapes.output.position },
  };
  const base = bypass(pinned, (l) => l.kind === 'position');
  const verified = (r: Reduction | undefined): LayeredModel | undefined => (r ? readSame(r, shapes, reading) : undefined);
  if (!model.layers.some((l) => l.kind === 'merge')) {
    const only = verified(base);
    return only ? [{ model: only, surrogate: under, how: steps.join(', ') }] : [];
  }
  const cases: SpecialCase[] = [];
  for (const pick of ['first', 'last'] as const) {
    const reduced = keepOneInput(base.model, pick);
    const found = verified(reduced && { model: reduced.model, from: reduced.from.map((k) => base.from[k]!) });
    if (found) cases.push({ model: found, surrogate: under, how: [...steps, `merges keep their ${pick} input where the others can be zeroed`].join(', ') });
  }
  return cases;
}

/** A reduced model and, for each of its layers, the index of the layer of the original it is. */
interface Reduction {
  readonly model: LayeredModel;
  readonly from: readonly number[];
}

/** The reduced model when every layer it keeps is read as in the original (square rule, dense readings). */
function readSame(r: Reduction, shapes: ModelShapes, reading: PointwiseReading): LayeredModel | undefined {
  const shaped = inferShapes(r.model);
  if (!shaped.ok) return undefined;
  const again = readPointwise(r.model, shaped.shapes);
  for (let k = 0; k < r.from.length; k++) {
    const i = r.from[k]!;
    if (reading.squared.has(i) !== again.squared.has(k) || reading.ignored.has(i) !== again.ignored.has(k)) return undefined;
    if (shapes.denseReading[i] !== shaped.shapes.denseReading[k]) return undefined;
  }
  return r.model;
}

/** The model with the chosen layers replaced by the identity (their readers read their input). */
function bypass(model: LayeredModel, drop: (l: Layer) => boolean): Reduction {
  const through = new Map<number, number>();
  const resolve = (i: number): number => (i === INPUT ? INPUT : (through.get(i) ?? i));
  const kept: Layer[] = [];
  const newIndex = new Map<number, number>();
  for (const l of model.layers) {
    if (drop(l)) {
      through.set(l.index, resolve(l.inputs[0]!));
      continue;
    }
    newIndex.set(l.index, kept.length);
    kept.push(l);
  }
  const renumber = (i: number): number => {
    const r = resolve(i);
    return r === INPUT ? INPUT : newIndex.get(r)!;
  };
  return {
    model: { ...model, layers: kept.map((l, k) => ({ ...l, index: k, inputs: l.inputs.map(renumber) })) },
    from: kept.map((l) => l.index),
  };
}

/**
 * The tree-surrogate model that zeroing taps turns the model into, or undefined when zeroing taps
 * does not make every overlapping window its tree counterpart. A stride-1 conv keeps its centre
 * tap, the tree's own conv. A strided conv keeps one tap t per strided axis: output j then reads
 * the single position j·s − left + t·d, which is the tree's conv with kernel 1 and stride s when
 * that conv reads the same position and has the same output length (the returned model has such
 * a layer in its place).
 */
function treeSpecialCase(model: LayeredModel, shapes: ModelShapes): LayeredModel | undefined {
  let changed = false;
  const layers: Layer[] = [];
  for (const l of model.layers) {
    const before = l.inputs[0] === INPUT ? model.input.shape : shapes.layers[l.inputs[0]!]?.shape;
    if (l.kind === 'conv') {
      if (l.stride.some((s) => s !== 1)) {
        const one = before && keepOneTap(l, before);
        if (!one) return undefined;
        layers.push(one);
        changed = true;
        continue;
      }
      if (l.padding.mode !== 'causal' && l.kernel.some((k, a) => !centreIsTap(k, l.dilation[a]!))) return undefined;
    } else if (l.kind === 'conv-transpose') {
      const after = shapes.layers[l.index]!.shape;
      for (let a = 0; a < after.length; a++) {
        const s = l.stride[a]!;
        const d = l.dilation[a]!;
        const p = l.padding[a]!;
        if (after[a]! > before![a]! * s) return undefined;
        for (let u = 0; u < Math.min(s, after[a]!); u++) {
          if ((u + p) % d !== 0 || (u + p) / d >= l.kernel[a]!) return undefined;
        }
      }
    } else if (l.kind === 'upsample' && l.mode === 'linear') {
      return undefined;
    }
    layers.push(l);
  }
  return changed ? { ...model, layers } : model;
}

/** The tree's position j − left + ⌊(e−1)/2⌋ is a tap j − left + t·d of a stride-1 conv. */
function centreIsTap(k: number, d: number): boolean {
  return Math.floor((extent(k, d) - 1) / 2) % d === 0;
}

/**
 * A strided conv with all taps but one zeroed on each strided axis, as the tree's conv of kernel
 * 1 there (stride-1 axes keep their kernel and centre tap): the kept tap t reads j·s − left + t·d,
 * the kernel-1 conv reads j·s − left′; they agree when t·d = left − left′ with 0 ≤ t < k, and the
 * output lengths must agree too. Padding: `same` (left′ = 0), `causal` (t = k − 1), `valid`
 * (t = 0, when the lengths agree), `explicit` (a smaller amount left′ = left − t·d per strided axis).
 */
function keepOneTap(l: ConvLayer, before: readonly number[]): ConvLayer | undefined {
  const kernel = [...l.kernel];
  const dilation = [...l.dilation];
  const amount = l.padding.mode === 'explicit' ? [...l.padding.amount] : [];
  for (let a = 0; a < kernel.length; a++) {
    const s = l.stride[a]!;
    const n = before[a]!;
    const k = l.kernel[a]!;
    const d = l.dilation[a]!;
    if (s === 1) {
      if (l.padding.mode !== 'causal' && !centreIsTap(k, d)) return undefined;
      continue;
    }
    const wide = windowAxis(n, k, s, d, l.padding, a);
    if (typeof wide === 'string') return undefined;
    let found = false;
    for (let t = 0; t < k && !found; t++) {
      const padding = l.padding.mode === 'explicit' ? { mode: 'explicit' as const, amount: amount.map((x, i) => (i === a ? wide.left - t * d : x)) } : l.padding;
      if (l.padding.mode === 'explicit' && wide.left - t * d < 0) continue;
      const one = windowAxis(n, 1, s, 1, padding, a);
      if (typeof one === 'string' || one.out !== wide.out || one.left !== wide.left - t * d) continue;
      if (l.padding.mode === 'explicit') amount[a] = wide.left - t * d;
      found = true;
    }
    if (!found) return undefined;
    kernel[a] = 1;
    dilation[a] = 1;
  }
  return { ...l, kernel, dilation, ...(l.padding.mode === 'explicit' ? { padding: { mode: 'explicit', amount } } : {}) };
}

/** The model with every merge replaced by one of its inputs, or undefined when that is not a special case. */
function keepOneInput(model: LayeredModel, pick: 'first' | 'last'): Reduction | undefined {
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
    inputs: l.inputs.map((j) => {
      const r = resolve(j);
      return r === INPUT ? INPUT : newIndex.get(r)!;
    }),
  }));
  if (kept.length === 0) return undefined;
  return { model: { ...model, layers: kept }, from: order.map((l) => l.index) };
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
    if (WEIGHTED_KINDS.has(l.kind)) return true;
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
      if (WEIGHTED_KINDS.has(l.kind)) continue;
      if (!ZERO_PRESERVING.has(l.kind)) return false;
      stack.push(c);
    }
  }
  return true;
}
