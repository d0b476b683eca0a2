/**
 * Readers of the convolution kinds: `conv` (grouped and depthwise included), `conv_transpose`,
 * and `separable_conv`, which is two layers — a depthwise conv followed by a 1×1 conv — both
 * pointing at the one YAML entry.
 */
import { displayPath } from './located-value.js';
import type { ConvLayer, ConvTransposeLayer, Padding } from './model.js';
import { readBoolean, readNonNegativeInteger, readPerAxis, readPositiveInteger, type ReadContext } from './field-readers.js';
import { readPadding } from './padding-field.js';
import { extent } from './grid-geometry.js';
import type { MadeLayer, Template } from './layer-templates.js';
import { chainOf, optionalPositive, readBias, requireField, type EntryRead, type ReaderContext } from './entry-read.js';

interface Window {
  readonly kernel: number[];
  readonly stride: number[];
  readonly dilation: number[];
}

/** Kernel, stride and dilation (each 1 per axis by default); undefined after an error. */
function readWindow(r: EntryRead, ctx: ReadContext): Window | undefined {
  const axis = (field: string): number[] | undefined => {
    const node = r.fields.get(field);
    if (!node) return ctx.dims === undefined ? undefined : new Array<number>(ctx.dims).fill(1);
    return readPerAxis(node, ctx);
  };
  const kernel = axis('kernel');
  const stride = axis('stride');
  const dilation = axis('dilation');
  return kernel && stride && dilation ? { kernel, stride, dilation } : undefined;
}

export function readConv(r: EntryRead, ctx: ReaderContext): Template | undefined {
  const window = readWindow(r, ctx);
  const paddingNode = r.fields.get('padding');
  const padding: Padding | undefined = paddingNode ? readPadding(paddingNode, ctx, ['same', 'valid', 'causal']) : { mode: 'same' };
  const groups = readGroups(r, ctx);
  const channels = optionalPositive(r, 'channels', ctx);
  const bias = readBias(r, ctx);
  let ok = window !== undefined && padding !== undefined && groups !== undefined && channels !== false && bias !== undefined;
  if (groups && groups.groups !== 'depthwise' && !r.fields.has('channels')) ok = requireField(r, 'channels', 'output channels', ctx) && ok;
  if (!ok || !window || !padding || !groups || channels === false || !bias) return undefined;
  const body: Omit<ConvLayer, 'index' | 'inputs' | 'name' | 'path' | 'span' | 'fieldSpans' | 'repeatIteration'> = {
    kind: 'conv',
    ...(channels !== undefined ? { channels } : {}),
    ...window,
    padding,
    groups: groups.groups,
    depthMultiplier: groups.depthMultiplier,
    ...bias,
  };
  return chainOf(r, ctx, [{ body, site: r.site, labelled: true }], true);
}

/** `groups` (an integer or `depthwise`), `depthwise: true` or a depthwise kind, and `depth_multiplier`. */
function readGroups(r: EntryRead, ctx: ReadContext): { groups: number | 'depthwise'; depthMultiplier: number } | undefined {
  let depthwise = r.entry.match.depthwise === true;
  let groups: number | 'depthwise' = 1;
  let ok = true;
  const flag = r.fields.get('depthwise');
  if (flag) {
    const v = readBoolean(flag, ctx);
    if (v === undefined) ok = false;
    else if (v) depthwise = true;
  }
  const groupsNode = r.fields.get('groups');
  if (groupsNode) {
    if (groupsNode.kind === 'scalar' && typeof groupsNode.value === 'string' && groupsNode.value.toLowerCase() === 'depthwise') {
      depthwise = true;
    } else if (groupsNode.kind === 'scalar' && typeof groupsNode.value === 'number') {
      const g = readPositiveInteger(groupsNode, ctx);
      if (g === undefined) ok = false;
      else if (depthwise) {
        ctx.sink.error('config/conflicting-fields', `${displayPath(groupsNode)} is ${g}, but the conv is depthwise (one group per input channel); drop one of them`, groupsNode.span);
        ok = false;
      } else groups = g;
    } else {
      ctx.sink.error('config/type', `${displayPath(groupsNode)} must be a positive integer or 'depthwise', got ${groupsNode.kind === 'scalar' ? String(groupsNode.value) : 'a ' + (groupsNode.kind === 'map' ? 'mapping' : 'list')}`, groupsNode.span);
      ok = false;
    }
  }
  const multNode = r.fields.get('depth_multiplier');
  let depthMultiplier = 1;
  if (multNode) {
    const m = readPositiveInteger(multNode, ctx);
    if (m === undefined) ok = false;
    else if (!depthwise) {
      ctx.sink.error('config/conflicting-fields', `${displayPath(multNode)} applies to depthwise convs only; add 'depthwise: true' or drop it`, multNode.span);
      ok = false;
    } else depthMultiplier = m;
  }
  return ok ? { groups: depthwise ? 'depthwise' : groups, depthMultiplier } : undefined;
}

export function readConvTranspose(r: EntryRead, ctx: ReaderContext): Template | undefined {
  const window = readWindow(r, ctx);
  const channels = optionalPositive(r, 'channels', ctx);
  const groups = optionalPositive(r, 'groups', ctx);
  const bias = readBias(r, ctx);
  let ok = requireField(r, 'channels', 'output channels', ctx);
  const pads = window && readTransposePadding(r, window, ctx);
  ok = ok && window !== undefined && pads !== undefined && channels !== undefined && channels !== false && groups !== false && bias !== undefined;
  if (!ok || !window || !pads || channels === undefined || channels === false || groups === false || !bias) return undefined;
  const body: Omit<ConvTransposeLayer, 'index' | 'inputs' | 'name' | 'path' | 'span' | 'fieldSpans' | 'repeatIteration'> = {
    kind: 'conv-transpose',
    channels,
    ...window,
    padding: pads.padding,
    outputPadding: pads.outputPadding,
    groups: groups ?? 1,
    ...bias,
  };
  return chainOf(r, ctx, [{ body, site: r.site, labelled: true }], true);
}

/**
 * Padding of a transposed conv: zeros removed per axis (default 0) and `output_padding`, or a
 * word: `same` makes the output n·s long (p = ⌈(e−s)/2⌉ removed per side, the rest added at the
 * end), `valid` removes nothing (and pads the end up to n·s when the kernel spans less than the
 * stride), as frameworks that take these words compute them.
 */
function readTransposePadding(r: EntryRead, w: Window, ctx: ReadContext): { padding: number[]; outputPadding: number[] } | undefined {
  const node = r.fields.get('padding');
  const outNode = r.fields.get('output_padding');
  const dims = w.kernel.length;
  const outputPadding = outNode ? readPerAxis(outNode, ctx, 0) : new Array<number>(dims).fill(0);
  if (!node || node.kind === 'seq' || (node.kind === 'scalar' && typeof node.value === 'number')) {
    const padding = node ? readPerAxis(node, ctx, 0) : new Array<number>(dims).fill(0);
    return padding && outputPadding ? { padding, outputPadding } : undefined;
  }
  const word = readPadding(node, ctx, ['same', 'valid']);
  if (!word || !outputPadding) return undefined;
  if (outNode) {
    ctx.sink.error('config/conflicting-fields', `${displayPath(outNode)} cannot be combined with padding '${word.mode}', which sets the output length itself; give padding as zeros per side instead`, outNode.span);
    return undefined;
  }
  const padding: number[] = [];
  const extra: number[] = [];
  for (let a = 0; a < dims; a++) {
    const e = extent(w.kernel[a]!, w.dilation[a]!);
    const s = w.stride[a]!;
    if (word.mode === 'same' && e >= s) {
      const p = Math.ceil((e - s) / 2);
      padding.push(p);
      extra.push(2 * p - (e - s));
    } else {
      padding.push(0);
      extra.push(Math.max(s - e, 0));
    }
  }
  return { padding, outputPadding: extra };
}

export function readSeparableConv(r: EntryRead, ctx: ReaderContext): Template | undefined {
  const window = readWindow(r, ctx);
  const paddingNode = r.fields.get('padding');
  const padding: Padding | undefined = paddingNode ? readPadding(paddingNode, ctx, ['same', 'valid', 'causal']) : { mode: 'same' };
  const channels = optionalPositive(r, 'channels', ctx);
  const mult = optionalPositive(r, 'depth_multiplier', ctx);
  const bias = readBias(r, ctx);
  const ok = requireField(r, 'channels', 'output channels of the 1×1 conv', ctx);
  if (!ok || !window || !padding || channels === undefined || channels === false || mult === false || !bias) return undefined;
  const ones = window.kernel.map(() => 1);
  const spans = (names: string[]) => ({ ...r.site, fieldSpans: r.fields.spans(names) });
  const depthwise: MadeLayer = {
    body: { kind: 'conv', ...window, padding, groups: 'depthwise', depthMultiplier: mult ?? 1, bias: false },
    site: spans(['kernel', 'stride', 'dilation', 'padding', 'depth_multiplier']),
  };
  const pointwise: MadeLayer = {
    body: { kind: 'conv', channels, kernel: ones, stride: ones, dilation: ones, padding: { mode: 'valid' }, groups: 1, depthMultiplier: 1, ...bias },
    site: spans(['channels', 'bias']),
    labelled: true,
  };
  return chainOf(r, ctx, [depthwise, pointwise], true);
}
