/**
 * Parameter counts of the real network a config describes (kernels included, one weight set per
 * position when weights are not shared). Fixes are ranked by how many parameters they add, the
 * cost a reviewer weighs against the capacity they buy.
 */
import type { LayeredModel } from '../config/model.js';

export function parameterCount(model: LayeredModel): bigint {
  let shape = [...model.input.shape];
  let dim = model.input.features;
  let total = 0n;
  const positions = (): bigint => BigInt(shape.reduce((a, b) => a * b, 1));
  for (const layer of model.layers) {
    switch (layer.kind) {
      case 'conv': {
        shape = shape.map((n, i) => {
          const s = layer.stride[i]!;
          return layer.padding === 'same' ? Math.ceil(n / s) : Math.max(1, Math.floor((n - layer.kernel[i]!) / s) + 1);
        });
        const perPosition = BigInt(layer.kernel.reduce((a, b) => a * b, 1) * dim) * BigInt(layer.channels) + BigInt(layer.channels);
        total += model.weightSharing ? perPosition : perPosition * positions();
        dim = layer.channels;
        break;
      }
      case 'pool':
        shape = layer.global ? shape.map(() => 1) : shape.map((n, i) => Math.max(1, Math.floor(n / layer.window[i]!)));
        break;
      case 'dense':
        total += BigInt(dim) * BigInt(layer.units) + BigInt(layer.units);
        dim = layer.units;
        break;
      case 'recurrent':
        for (let l = 0; l < layer.depth; l++) {
          const h = BigInt(layer.hidden);
          total += h * h + h * BigInt(l === 0 ? dim : layer.hidden) + h;
        }
        shape = [1];
        dim = layer.hidden;
        break;
    }
  }
  return total;
}
