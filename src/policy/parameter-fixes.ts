/**
 * Fixes for a config built from an architecture definition, searched over its parameters before
 * any layer field: for each parameter (each entry of a list parameter) that feeds a layer on or
 * next to the minimal cut, the smallest value on its grid (multiples of its declared step, above
 * the current value, up to the maximum the judging side declares) with which the definition makes
 * a model that restores the requirement. A doubling probe and a bisection over the grid find it
 * with a few evaluations; that is the smallest value when the layers grow with the parameter
 * (every width written as `ceil(64 * width)`, every count as `stages[i]`), and in any case a value
 * that restores it, checked on the engine. The caller ranks them by the parameters each adds to
 * the real network.
 */
import { div, floor, mul, toNumber, type Exact } from '../config/exact-number.js';
import type { LayeredModel } from '../config/model.js';
import type { ParameterChoice, ParameterSpace } from '../config/parameter-space.js';
import type { PartitionBounds } from '../cut/types.js';
import type { Fix } from './fix-search.js';
import { parameterCount } from './parameters.js';

/** More grid points than this between the value and the maximum are not searched. */
const MAX_GRID = 1 << 20;
/**
 * At most this many parameters (list entries counted one by one) are searched, in the
 * definition's order: each costs up to ~40 evaluations (a doubling probe and a bisection over at
 * most 2^20 grid points), and a definition may come from a pull request.
 */
export const MAX_SEARCHED_PARAMETERS = 32;

/**
 * `restoring` gives the bounds of a model that restores the requirement (else undefined);
 * `minRank` says whether the lower bound then proves it.
 */
export function searchParameterFixes(
  model: LayeredModel,
  space: ParameterSpace,
  near: ReadonlySet<number>,
  inputCut: boolean,
  restoring: (m: LayeredModel) => PartitionBounds | undefined,
  minRank: bigint,
): Fix[] {
  const fed = new Set<string>();
  for (const i of near) for (const uses of Object.values(model.layers[i]!.fieldParams ?? {})) for (const u of uses) fed.add(u.name);
  if (inputCut) for (const uses of Object.values(model.input.fieldParams ?? {})) for (const u of uses) fed.add(u.name);
  const baseParams = parameterCount(model);
  const fixes: Fix[] = [];
  for (const choice of space.choices.filter((c) => fed.has(c.name)).slice(0, MAX_SEARCHED_PARAMETERS)) {
    const found = smallestRestoring(choice, space, restoring);
    if (!found) continue;
    fixes.push({
      layer: 'parameter',
      field: choice.label,
      line: choice.span.line,
      column: choice.span.column,
      ...(choice.set ? {} : { added: true as const }),
      from: toNumber(choice.value),
      to: toNumber(found.value),
      addedParameters: parameterCount(found.model) - baseParams,
      verdict: found.bounds.lower !== null && found.bounds.lower.rank >= minRank ? 'pass' : 'unproven',
    });
  }
  return fixes;
}

interface Found {
  readonly value: Exact;
  readonly model: LayeredModel;
  readonly bounds: PartitionBounds;
}

function smallestRestoring(choice: ParameterChoice, space: ParameterSpace, restoring: (m: LayeredModel) => PartitionBounds | undefined): Found | undefined {
  // Grid points k·step with value < k·step ≤ max.
  const step = choice.step;
  const first = floor(div(choice.value, step)).n + 1n;
  const last = floor(div(choice.max, step)).n;
  if (first > last || last - first > BigInt(MAX_GRID)) return undefined;
  const at = (k: bigint): Found | undefined => {
    const value = mul({ n: k, d: 1n }, step);
    const m = space.withValue(choice, value);
    const b = m && restoring(m);
    return m && b ? { value, model: m, bounds: b } : undefined;
  };
  let lo = first - 1n; // at or below the current value, which fails
  let hi = first;
  let found: Found | undefined;
  for (let gap = 1n; ; gap *= 2n) {
    found = at(hi);
    if (found) break;
    if (hi >= last) return undefined;
    lo = hi;
    hi = hi + gap > last ? last : hi + gap;
  }
  while (hi - lo > 1n) {
    const mid = (lo + hi) / 2n;
    const f = at(mid);
    if (f) [hi, found] = [mid, f];
    else lo = mid;
  }
  return found;
}
