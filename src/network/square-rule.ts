/**
 * How the surrogate reads each pointwise layer (DEVELOPERS.md, "pointwise"): the identity, the
 * elementwise square (an activation right after a dense layer that mixes positions, so that a
 * fully connected stack keeps a non-linearity), or not at all (after the last weighted layer,
 * where it would act on the score itself). Kept apart from the builder because the reports and
 * the lower-bound reductions need the same reading.
 */
import { INPUT, WEIGHTED_KINDS, positionCount, type LayeredModel } from '../config/model.js';
import type { ModelShapes } from '../config/model-shapes.js';

export interface PointwiseReading {
  /** Activation layers read as v ⊙ v. */
  readonly squared: ReadonlySet<number>;
  /** Pointwise layers from which no weighted layer can be reached: not part of the score. */
  readonly ignored: ReadonlySet<number>;
  /** Dense and merge layers that mix positions (read a flattened grid of several positions, or follow one). */
  readonly mixing: ReadonlySet<number>;
}


export function readPointwise(model: LayeredModel, shapes: ModelShapes): PointwiseReading {
  const layers = model.layers;
  const reachesWeighted = new Uint8Array(layers.length);
  for (let i = layers.length - 1; i >= 0; i--) {
    for (const j of layers[i]!.inputs) {
      if (j === INPUT) continue;
      if (WEIGHTED_KINDS.has(layers[i]!.kind) || reachesWeighted[i]) reachesWeighted[j] = 1;
    }
  }
  /** The nearest layer at or above `i` that is not pointwise, and whether an activation lies between. */
  const nearest = (i: number): { at: number; activation: boolean } => {
    let activation = false;
    while (i !== INPUT && layers[i]!.kind === 'pointwise') {
      const l = layers[i]!;
      if (l.kind === 'pointwise' && l.family === 'activation') activation = true;
      i = l.inputs[0]!;
    }
    return { at: i, activation };
  };
  const positionsBefore = (i: number): number => positionCount(i === INPUT ? model.input.shape : shapes.layers[i]!.shape);

  const mixing = new Set<number>();
  const squared = new Set<number>();
  const ignored = new Set<number>();
  const mixes = (i: number): boolean => {
    const { at } = nearest(i);
    return at !== INPUT && mixing.has(at);
  };
  for (const layer of layers) {
    if (layer.kind === 'dense') {
      const reading = shapes.denseReading[layer.index];
      if (reading === 'input') mixing.add(layer.index);
      else if (reading === 'vector') {
        const { at } = nearest(layer.inputs[0]!);
        const above = at === INPUT ? undefined : layers[at]!;
        if (above?.kind === 'flatten' && positionsBefore(above.inputs[0]!) > 1) mixing.add(layer.index);
        else if (above && mixing.has(above.index)) mixing.add(layer.index);
      }
    } else if (layer.kind === 'merge') {
      // A residual or branch merge inside a fully connected stack stays in it.
      if (layer.inputs.every(mixes)) mixing.add(layer.index);
    } else if (layer.kind === 'pointwise') {
      if (!reachesWeighted[layer.index]) {
        ignored.add(layer.index);
        continue;
      }
      if (layer.family !== 'activation') continue;
      const { at, activation } = nearest(layer.inputs[0]!);
      if (!activation && at !== INPUT && mixing.has(at)) squared.add(layer.index);
    }
  }
  return { squared, ignored, mixing };
}
