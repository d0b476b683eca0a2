/**
 * The layers whose width a cut bond carries. A bond at a layer with a width of its own (a conv,
 * a dense or recurrent layer) carries that width; a bond at a layer without one — a merge, a
 * pool, an upsampling, a pointwise layer, flatten — carries the width of the layers it reads,
 * back to the nearest ones that set a width. A change to any of them changes the bond, so a
 * change there is "on the cut" when a report says which change shrank it.
 */
import { INPUT, layerLabel, layerWidth, type LayeredModel } from './model.js';

/** Labels of the cut's layers and of the layers their widths come from. */
export function widthSources(model: LayeredModel, cut: ReadonlySet<number | string>): Set<number | string> {
  const out = new Set<number | string>(cut);
  const stack = model.layers.filter((l) => cut.has(layerLabel(l)) && layerWidth(l) === undefined).map((l) => l.index);
  const seen = new Set<number>(stack);
  while (stack.length > 0) {
    const layer = model.layers[stack.pop()!]!;
    for (const i of layer.inputs) {
      if (i === INPUT || seen.has(i)) continue;
      seen.add(i);
      const source = model.layers[i]!;
      out.add(layerLabel(source));
      if (layerWidth(source) === undefined) stack.push(i);
    }
  }
  return out;
}
