/**
 * Readers of the kinds that change the grid without weights: `pool` (every pooling kind and its
 * spelling: max, average, global, adaptive to size 1) and `upsample`.
 */
import { displayPath } from './located-value.js';
import type { Padding, PoolMode } from './model.js';
import { readBoolean, readChoice, readOnly, readPerAxis } from './field-readers.js';
import { readPadding } from './padding-field.js';
import type { Template } from './layer-templates.js';
import { chainOf, requireField, type EntryRead, type ReaderContext } from './entry-read.js';

const POOL_MODES = new Map<string, PoolMode>([
  ['max', 'max'],
  ['average', 'average'],
  ['avg', 'average'],
  ['mean', 'average'],
  ['sum', 'sum'],
  ['product', 'product'],
  ['prod', 'product'],
  ['lp', 'other'],
]);
const POOL_MODE_WORDS = ['max', 'average', 'avg', 'mean', 'sum', 'product', 'lp'];

export function readPool(r: EntryRead, ctx: ReaderContext): Template | undefined {
  const { match } = r.entry;
  let ok = true;
  let mode: PoolMode = match.poolMode ?? 'max';
  const modeNode = r.fields.get('mode');
  if (modeNode) {
    const m = readChoice(modeNode, ctx, POOL_MODES, POOL_MODE_WORDS);
    if (m === undefined) ok = false;
    else if (match.poolMode !== undefined && m !== match.poolMode) {
      ctx.sink.error('config/conflicting-fields', `${displayPath(modeNode)} says ${m}, but '${r.entry.kindWritten}' is a ${match.poolMode} pool; drop one of them`, modeNode.span);
      ok = false;
    } else mode = m;
  }

  let global = match.global === true;
  const globalNode = r.fields.get('global');
  if (globalNode) {
    const g = readBoolean(globalNode, ctx);
    if (g === undefined) ok = false;
    else if (match.global && !g) {
      ctx.sink.error('config/conflicting-fields', `${displayPath(globalNode)} is false, but '${r.entry.kindWritten}' is a global pool; drop it`, globalNode.span);
      ok = false;
    } else global = g;
  }
  const sizeNode = r.fields.get('output_size');
  if (sizeNode) {
    global = true;
    const size = readPerAxis(sizeNode, ctx);
    if (size === undefined) ok = false;
    else if (size.some((n) => n !== 1)) {
      ctx.sink.error(
        'config/adaptive-pool',
        `${displayPath(sizeNode)} is [${size.join(', ')}]: adaptive pooling is read only to size 1 (a global pool), because its windows depend on the input size; write a pool with a fixed window instead (window = input size / output size, e.g. window: 2 to go from 14 to 7)`,
        sizeNode.span,
      );
      ok = false;
    }
  } else if (match.adaptive) {
    ok = requireField(r, 'output_size', 'the output size; only 1 is read', ctx) && ok;
  }
  const ceil = r.fields.get('ceil_mode');
  if (ceil && !readOnly(ceil, ctx, false, 'rounding the output length up changes the grid; give the padding instead')) ok = false;

  const windowNode = r.fields.get('window');
  const strideNode = r.fields.get('stride');
  const paddingNode = r.fields.get('padding');
  if (global) {
    for (const [node, field] of [
      [windowNode, 'window'],
      [strideNode, 'stride'],
      [paddingNode, 'padding'],
    ] as const) {
      if (!node) continue;
      ctx.sink.error('config/conflicting-fields', `${displayPath(r.entry.body)} has both '${r.fields.written(field)}' and a global pool; give a window or pool globally, not both`, r.fields.keySpan(field) ?? node.span);
      ok = false;
    }
    if (!ok) return undefined;
    return chainOf(r, ctx, [{ body: { kind: 'pool', mode, window: [], stride: [], padding: { mode: 'valid' }, global: true }, site: r.site, labelled: true }], false);
  }
  if (!windowNode) {
    if (r.fields.wasSuggested('window')) return undefined;
    ctx.sink.error('config/missing-field', `${displayPath(r.entry.body)} needs 'window' (the pooling window, e.g. 2 or [2, 2]) or 'global: true'`, r.entry.body.span);
    return undefined;
  }
  const window = readPerAxis(windowNode, ctx);
  const stride = strideNode ? readPerAxis(strideNode, ctx) : window;
  const padding: Padding | undefined = paddingNode ? readPadding(paddingNode, ctx, ['valid', 'same']) : { mode: 'valid' };
  if (!ok || !window || !stride || !padding) return undefined;
  return chainOf(r, ctx, [{ body: { kind: 'pool', mode, window, stride, padding, global: false }, site: r.site, labelled: true }], false);
}

const UPSAMPLE_MODES = new Map<string, 'nearest' | 'linear'>([
  ['nearest', 'nearest'],
  ['linear', 'linear'],
  ['bilinear', 'linear'],
]);

export function readUpsample(r: EntryRead, ctx: ReaderContext): Template | undefined {
  let ok = true;
  let mode = r.entry.match.upsampleMode ?? 'nearest';
  const modeNode = r.fields.get('mode');
  if (modeNode) {
    const m = readChoice(modeNode, ctx, UPSAMPLE_MODES, ['nearest', 'linear', 'bilinear']);
    if (m === undefined) ok = false;
    else mode = m;
  }
  const align = r.fields.get('align_corners');
  if (align && !readOnly(align, ctx, false, 'linear upsampling is read with half-pixel centres (align_corners false)')) ok = false;
  const factorNode = r.fields.get('factor');
  const factor = factorNode ? readPerAxis(factorNode, ctx) : ctx.dims === undefined ? undefined : new Array<number>(ctx.dims).fill(2);
  if (!ok || !factor) return undefined;
  return chainOf(r, ctx, [{ body: { kind: 'upsample', factor, mode }, site: r.site, labelled: true }], false);
}
