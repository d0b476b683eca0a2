/**
 * Readers of the kinds with few fields: `dense`, `flatten`, the pointwise functions
 * (`relu`, `batch_norm`, `dropout`, …) and the generic `activation: {fn: …}` layer.
 */
import { displayPath } from './located-value.js';
import { readPositiveInteger, readRate } from './field-readers.js';
import type { Template } from './layer-templates.js';
import { chainOf, readBias, requireField, type EntryRead, type ReaderContext } from './entry-read.js';
import { readActivation } from './shortcut-fields.js';
import { pointwiseOpOf } from './pointwise-ops.js';

export function readDense(r: EntryRead, ctx: ReaderContext): Template | undefined {
  const ok = requireField(r, 'units', 'output units', ctx);
  const unitsNode = r.fields.get('units');
  const units = unitsNode && readPositiveInteger(unitsNode, ctx);
  const bias = readBias(r, ctx);
  if (!ok || units === undefined || !bias) return undefined;
  return chainOf(r, ctx, [{ body: { kind: 'dense', units, ...bias }, site: r.site, labelled: true }], true);
}

export function readFlatten(r: EntryRead, ctx: ReaderContext): Template | undefined {
  return chainOf(r, ctx, [{ body: { kind: 'flatten' }, site: r.site, labelled: true }], false);
}

export function readPointwise(r: EntryRead, ctx: ReaderContext): Template | undefined {
  const op = r.entry.match.op!;
  let ok = true;
  const rateNode = r.fields.get('rate') ?? r.entry.scalar;
  if (r.entry.scalar && op.family !== 'dropout') {
    ctx.sink.error('config/type', `${displayPath(r.entry.scalar)} must be a mapping of the layer's fields (or nothing), got ${String(r.entry.scalar.value)}`, r.entry.scalar.span);
    ok = false;
  } else if (rateNode && readRate(rateNode, ctx) === undefined) ok = false;
  if (!ok) return undefined;
  return chainOf(r, ctx, [{ body: { kind: 'pointwise', family: op.family, op: op.op }, site: r.site, labelled: true }], false);
}

export function readActivationLayer(r: EntryRead, ctx: ReaderContext): Template | undefined {
  const fnNode = r.fields.get('fn') ?? r.entry.scalar;
  if (!fnNode) {
    requireField(r, 'fn', 'the function, e.g. relu', ctx);
    return undefined;
  }
  // `linear` and `none` name the identity here (a layer that is written is kept).
  const read = readActivation(fnNode, ctx);
  if (read === undefined) return undefined;
  const op = read ?? pointwiseOpOf('identity')!;
  return chainOf(r, ctx, [{ body: { kind: 'pointwise', family: op.family, op: op.op }, site: r.site, labelled: true }], false);
}
