/**
 * Readers of the kinds with few fields: `dense`, `flatten`, `recurrent`, the pointwise functions
 * (`relu`, `batch_norm`, `dropout`, …) and the generic `activation: {fn: …}` layer.
 */
import { displayPath } from './located-value.js';
import { readBoolean, readOnly, readPositiveInteger, readRate } from './field-readers.js';
import type { Template } from './layer-templates.js';
import { chainOf, requireField, type EntryRead, type ReaderContext } from './entry-read.js';
import { readActivation } from './shortcut-fields.js';
import { pointwiseOpOf } from './pointwise-ops.js';

export function readDense(r: EntryRead, ctx: ReaderContext): Template | undefined {
  const ok = requireField(r, 'units', 'output units', ctx);
  const unitsNode = r.fields.get('units');
  const units = unitsNode && readPositiveInteger(unitsNode, ctx);
  const biasNode = r.fields.get('bias');
  const bias = biasNode ? readBoolean(biasNode, ctx) : true;
  if (!ok || units === undefined || bias === undefined) return undefined;
  return chainOf(r, ctx, [{ body: { kind: 'dense', units, ...(bias ? {} : { bias: false as const }) }, site: r.site, labelled: true }], true);
}

export function readFlatten(r: EntryRead, ctx: ReaderContext): Template | undefined {
  return chainOf(r, ctx, [{ body: { kind: 'flatten' }, site: r.site, labelled: true }], false);
}

export function readRecurrent(r: EntryRead, ctx: ReaderContext): Template | undefined {
  let ok = requireField(r, 'hidden', 'hidden state size', ctx);
  const hiddenNode = r.fields.get('hidden');
  const hidden = hiddenNode && readPositiveInteger(hiddenNode, ctx);
  const depthNode = r.fields.get('depth');
  const depth = depthNode ? readPositiveInteger(depthNode, ctx) : 1;
  const bi = r.fields.get('bidirectional');
  if (bi && !readOnly(bi, ctx, false, 'bidirectional recurrent layers are not read yet')) ok = false;
  const seq = r.fields.get('return_sequences');
  if (seq && !readOnly(seq, ctx, false, 'the layer is read as ending on its last state; per-step outputs are not read yet')) ok = false;
  if (!ok || hidden === undefined || depth === undefined) return undefined;
  return chainOf(r, ctx, [{ body: { kind: 'recurrent', hidden, depth }, site: r.site, labelled: true }], false);
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
