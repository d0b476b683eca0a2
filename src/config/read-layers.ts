/**
 * Reads a YAML list of layers into templates: each entry's form (`layer-entry.ts`), its fields
 * against its kind's row of the table (`layer-fields.ts`), then the kind's reader. Every entry is
 * read even after an error, so one pass reports everything; an entry inside a `repeat` is read
 * once, however often it is copied.
 */
import type { Located } from './located-value.js';
import { describeValue, displayPath, pointerOf } from './located-value.js';
import type { ReadContext } from './field-readers.js';
import { readText } from './field-readers.js';
import { readLayerEntry } from './layer-entry.js';
import { LayerFields } from './layer-fields.js';
import { fieldsOf } from './layer-vocabulary.js';
import type { ReaderKind } from './kind-names.js';
import type { Site, Template } from './layer-templates.js';
import type { EntryRead, ReaderContext } from './entry-read.js';
import { readConv, readConvTranspose, readSeparableConv } from './read-conv-layers.js';
import { readPool, readUpsample } from './read-grid-layers.js';
import { readActivationLayer, readDense, readFlatten, readPointwise } from './read-plain-layers.js';
import { readAttention, readClassToken, readEmbedding, readPosition, readRecurrent } from './read-sequence-layers.js';
import { readTransformerBlock } from './read-transformer-block.js';
import { readBranches, readRepeat, readResidual, readSequence, readSkip } from './read-blocks.js';

type KindReader = (r: EntryRead, ctx: ReaderContext) => Template | undefined;

const READERS: Record<ReaderKind, KindReader> = {
  conv: readConv,
  conv_transpose: readConvTranspose,
  separable_conv: readSeparableConv,
  pool: readPool,
  upsample: readUpsample,
  dense: readDense,
  flatten: readFlatten,
  recurrent: readRecurrent,
  embedding: readEmbedding,
  position: readPosition,
  class_token: readClassToken,
  attention: readAttention,
  transformer_block: readTransformerBlock,
  pointwise: readPointwise,
  activation: readActivationLayer,
  repeat: readRepeat,
  sequence: readSequence,
  residual: readResidual,
  branches: readBranches,
  add: readSkip,
  concat: readSkip,
};

/** Kinds whose whole body may be a scalar: `- activation: relu`, `- dropout: 0.1`. */
const SCALAR_BODIES = new Set<ReaderKind>(['activation', 'pointwise']);

/** Names that reports make up or that `from:` gives a meaning of its own. */
const RESERVED = new Set(['input']);

export function readLayerList(node: Located, ctx: ReadContext, allowEmpty = false): Template[] | undefined {
  const rc: ReaderContext = {
    ...ctx,
    readList: (n, empty) => readLayerList(n, ctx, empty),
    readPath: (n) => {
      if (n.kind === 'seq') return readLayerList(n, ctx, true);
      if (n.kind === 'scalar' && n.value === null) return [];
      const one = readLayer(n, rc);
      return one ? [one] : undefined;
    },
  };
  if (node.kind !== 'seq') {
    const got = node.kind === 'map' ? 'a mapping' : node.value === null ? 'nothing' : String(node.value);
    ctx.sink.error('config/type', `${displayPath(node)} must be a list of layers, got ${got}`, node.span);
    return undefined;
  }
  if (node.items.length === 0 && !allowEmpty) {
    ctx.sink.error('config/empty-layers', `${displayPath(node)} is empty; list at least one layer`, node.span);
    return undefined;
  }
  let ok = true;
  const out: Template[] = [];
  for (const item of node.items) {
    const t = readLayer(item, rc);
    if (t) out.push(t);
    else ok = false;
  }
  return ok ? out : undefined;
}

function readLayer(item: Located, ctx: ReaderContext): Template | undefined {
  const entry = readLayerEntry(item, ctx.sink);
  if (!entry) return undefined;
  if (entry.scalar && !SCALAR_BODIES.has(entry.match.reader)) {
    const s = entry.scalar;
    ctx.sink.error('config/type', `${displayPath(s)} must be a mapping of the layer's fields, got ${describeValue(s)}; e.g. '- ${entry.kindWritten}: {…}'`, s.span);
    return undefined;
  }
  const fields = new LayerFields(entry.body, entry.fields, fieldsOf(entry.match.reader, entry.match.op?.family), ctx.sink);
  const nameNode = fields.get('name');
  const text = nameNode ? readName(nameNode, ctx) : undefined;
  const fieldParams = ctx.paramsOf ? fields.provenance(ctx.paramsOf) : {};
  const site: Site = { path: pointerOf(item), span: item.span, fieldSpans: fields.spans(), ...(Object.keys(fieldParams).length > 0 ? { fieldParams } : {}) };
  const read: EntryRead = { entry, fields, site, ...(text !== undefined && nameNode ? { name: { text, span: nameNode.span } } : {}) };
  const t = READERS[entry.match.reader](read, ctx);
  return t && fields.ok && (nameNode === undefined || text !== undefined) ? t : undefined;
}

function readName(node: Located, ctx: ReadContext): string | undefined {
  const text = readText(node, ctx);
  if (text === undefined) return undefined;
  if (/[[\]]/.test(text) || RESERVED.has(text)) {
    const why = RESERVED.has(text) ? `'${text}' is reserved (it means the model input in 'from')` : "'[' and ']' are kept for the copies a repeat makes (name[1], name[2], …)";
    ctx.sink.error('config/invalid-name', `${displayPath(node)} is '${text}', which cannot name a layer: ${why}`, node.span);
    return undefined;
  }
  return text;
}

