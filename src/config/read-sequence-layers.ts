/**
 * Readers of the sequence kinds: recurrent layers (`recurrent`, `rnn`, `lstm`, `gru`: every cell
 * is read as the recurrent arithmetic circuit of the same width and depth), `embedding`,
 * `position` (position vectors), `class_token` and `attention` (linearised multi-head
 * self-attention). Sizes these kinds state beside the ones they are read by (`embed_dim`,
 * `max_len`, `num_embeddings`) are checked once widths are known (`resolve-pending.ts`). Fields
 * whose value would change the function beyond what the surrogate models (`proj_size`,
 * `go_backwards`, `add_bias_kv`, rotary schemes) are read only at their neutral value.
 */
import { displayPath, type Located } from './located-value.js';
import type { AttentionLayer, PositionLayer, RecurrentLayer } from './model.js';
import { lookupChoice, readBoolean, readChoice, readNonNegativeInteger, readOnly, readPositiveInteger, type ReadContext } from './field-readers.js';
import type { DeclaredSize, MadeLayer, Stated, Template } from './layer-templates.js';
import { chainOf, optionalPositive, readBias, requireField, type EntryRead, type ReaderContext } from './entry-read.js';

/** The value as stated, for checks after expansion. */
export function stated(node: Located, value: number): Stated {
  return { value, span: node.span, where: displayPath(node) };
}

/** A size checked against the layer's input once known; [] when the field is absent. */
function declaredOf(r: EntryRead, field: string, against: DeclaredSize['against'], ctx: ReadContext): DeclaredSize[] | undefined {
  const node = r.fields.get(field);
  if (!node) return [];
  const v = readPositiveInteger(node, ctx);
  return v === undefined ? undefined : [{ ...stated(node, v), against }];
}

const MERGE_MODES = new Map<string, 'concat' | 'sum'>([
  ['concat', 'concat'],
  ['concatenate', 'concat'],
  ['cat', 'concat'],
  ['sum', 'sum'],
  ['add', 'sum'],
]);
/** Joins of the two directions that frameworks offer and the surrogate does not read. */
const OTHER_MERGES = new Set(['mul', 'multiply', 'product', 'prod', 'ave', 'avg', 'average', 'mean', 'none', 'null']);

function readMerge(node: Located, ctx: ReadContext): 'concat' | 'sum' | undefined {
  const word = node.kind === 'scalar' ? (node.value === null ? 'null' : typeof node.value === 'string' ? node.value : undefined) : undefined;
  if (word !== undefined && lookupChoice(word, MERGE_MODES) === undefined && OTHER_MERGES.has(word.toLowerCase())) {
    const none = word.toLowerCase() === 'none' || word === 'null';
    ctx.sink.error(
      'config/unsupported-value',
      `${displayPath(node)} is ${node.kind === 'scalar' && node.value === null ? 'empty' : `'${word}'`}, which is not read: ${none ? 'the two directions returned separately cannot be read by the next layer of a list' : 'a product or an average of the two directions is not modelled'}; write 'concat' (the width doubles) or 'sum'`,
      node.span,
    );
    return undefined;
  }
  return readChoice(node, ctx, MERGE_MODES, ['concat', 'sum']);
}

export function readRecurrent(r: EntryRead, ctx: ReaderContext): Template | undefined {
  let ok = requireField(r, 'hidden', 'hidden state size', ctx);
  const hidden = optionalPositive(r, 'hidden', ctx);
  const depth = optionalPositive(r, 'depth', ctx);
  const flag = (field: string, fallback: boolean): boolean | undefined => {
    const node = r.fields.get(field);
    return node ? readBoolean(node, ctx) : fallback;
  };
  const bidirectional = flag('bidirectional', false);
  const sequence = flag('sequence', true);
  const mergeNode = r.fields.get('merge');
  const merge = mergeNode ? readMerge(mergeNode, ctx) : 'concat';
  const proj = r.fields.get('proj_size');
  if (proj) {
    const p = readNonNegativeInteger(proj, ctx);
    if (p === undefined) ok = false;
    else if (p !== 0) {
      ctx.sink.error('config/unsupported-value', `${displayPath(proj)} is ${p}, which is not read: a projection of the hidden state changes the width the recurrence carries; only 0 (none) is read`, proj.span);
      ok = false;
    }
  }
  const back = r.fields.get('go_backwards');
  if (back && !readOnly(back, ctx, false, 'a layer that reads the sequence backwards only is not read; write bidirectional: true for both directions')) ok = false;
  const bias = readBias(r, ctx);
  if (!ok || hidden === undefined || hidden === false || depth === false || bidirectional === undefined || sequence === undefined || !merge || !bias) return undefined;
  const body: Omit<RecurrentLayer, 'index' | 'inputs' | 'name' | 'path' | 'span' | 'fieldSpans' | 'repeatIteration'> = {
    kind: 'recurrent',
    hidden,
    depth: depth ?? 1,
    cell: r.entry.match.cell ?? 'arithmetic',
    bidirectional,
    merge,
    sequence,
    ...bias,
  };
  return chainOf(r, ctx, [{ body, site: r.site, labelled: true }], false);
}

export function readEmbedding(r: EntryRead, ctx: ReaderContext): Template | undefined {
  const ok = requireField(r, 'dim', 'the embedding width', ctx);
  const dim = optionalPositive(r, 'dim', ctx);
  const vocabNode = r.fields.get('vocabulary');
  const vocabulary = vocabNode ? readPositiveInteger(vocabNode, ctx) : undefined;
  if (!ok || dim === undefined || dim === false || (vocabNode && vocabulary === undefined)) return undefined;
  const made: MadeLayer = {
    body: { kind: 'embedding', dim },
    site: r.site,
    labelled: true,
    ...(vocabNode && vocabulary !== undefined ? { vocabulary: stated(vocabNode, vocabulary) } : {}),
  };
  return chainOf(r, ctx, [made], true);
}

const POSITION_MODES = new Map<string, PositionLayer['mode']>([
  ['learned', 'learned'],
  ['learnable', 'learned'],
  ['trainable', 'learned'],
  ['absolute', 'learned'],
  ['embedding', 'learned'],
  ['fixed', 'fixed'],
  ['sinusoidal', 'fixed'],
  ['sinusoid', 'fixed'],
  ['sine', 'fixed'],
  ['sincos', 'fixed'],
  ['sin_cos', 'fixed'],
  ['static', 'fixed'],
]);
/** Position schemes that act inside attention rather than adding a vector per position. */
const INSIDE_ATTENTION = new Set(['rotary', 'rope', 'alibi', 'relative', 'relative_key', 'relative_key_query', 'relative_position', 't5_relative']);

function readPositionMode(r: EntryRead, ctx: ReadContext): PositionLayer['mode'] | undefined {
  const { match } = r.entry;
  const node = r.fields.get('mode');
  if (!node) return match.positionMode ?? match.positionDefault ?? 'learned';
  if (node.kind === 'scalar' && typeof node.value === 'string' && INSIDE_ATTENTION.has(node.value.toLowerCase().replace(/-/g, '_'))) {
    ctx.sink.error(
      'config/unsupported-value',
      `${displayPath(node)} is '${node.value}', which is not read: rotary and relative position schemes act inside attention, which linearised attention does not model; additive position vectors are read ('learned' or 'fixed')`,
      node.span,
    );
    return undefined;
  }
  const mode = readChoice(node, ctx, POSITION_MODES, ['learned', 'fixed', 'sinusoidal']);
  if (mode !== undefined && match.positionMode !== undefined && mode !== match.positionMode) {
    ctx.sink.error('config/conflicting-fields', `${displayPath(node)} says ${mode}, but '${r.entry.kindWritten}' is a ${match.positionMode} encoding; drop one of them`, node.span);
    return undefined;
  }
  return mode;
}

export function readPosition(r: EntryRead, ctx: ReaderContext): Template | undefined {
  const mode = readPositionMode(r, ctx);
  const positions = declaredOf(r, 'positions', 'positions', ctx);
  const width = declaredOf(r, 'width', 'input-width', ctx);
  if (!mode || !positions || !width) return undefined;
  const declared = [...positions, ...width];
  return chainOf(r, ctx, [{ body: { kind: 'position', mode }, site: r.site, labelled: true, ...(declared.length > 0 ? { declared } : {}) }], true);
}

export function readClassToken(r: EntryRead, ctx: ReaderContext): Template | undefined {
  const width = declaredOf(r, 'width', 'input-width', ctx);
  if (!width) return undefined;
  return chainOf(r, ctx, [{ body: { kind: 'class-token' }, site: r.site, labelled: true, ...(width.length > 0 ? { declared: width } : {}) }], false);
}

/** What an attention layer (or a transformer block's attention) reads from its entry. */
export interface AttentionRead {
  readonly body: Omit<AttentionLayer, 'index' | 'inputs' | 'name' | 'path' | 'span' | 'fieldSpans' | 'repeatIteration'>;
  /** `width` (`embed_dim`), `kdim`, `vdim`, `value_dim`: checked against the input once known. */
  readonly declared: readonly DeclaredSize[];
}

const MASKS = new Map<string, boolean>([
  ['causal', true],
  ['lower_triangular', true],
  ['triangular', true],
  ['autoregressive', true],
  ['none', false],
  ['full', false],
  ['bidirectional', false],
]);

/** `causal`, `mask` and what the kind name says, which must agree. */
function readCausal(r: EntryRead, ctx: ReadContext): boolean | undefined {
  const byName = r.entry.match.causal === true;
  const causalNode = r.fields.get('causal');
  const maskNode = r.fields.get('mask');
  const fromFlag = causalNode ? readBoolean(causalNode, ctx) : null;
  const fromMask = maskNode ? (maskNode.kind === 'scalar' && maskNode.value === null ? false : readChoice(maskNode, ctx, MASKS, ['causal', 'none'])) : null;
  if (fromFlag === undefined || fromMask === undefined) return undefined;
  const said: { node: Located; value: boolean }[] = [];
  if (causalNode && fromFlag !== null) said.push({ node: causalNode, value: fromFlag });
  if (maskNode && fromMask !== null) said.push({ node: maskNode, value: fromMask });
  for (const s of said) {
    if (byName && !s.value) {
      ctx.sink.error('config/conflicting-fields', `${displayPath(s.node)} turns the causal mask off, but '${r.entry.kindWritten}' is causal attention; drop one of them`, s.node.span);
      return undefined;
    }
  }
  if (said.length === 2 && said[0]!.value !== said[1]!.value) {
    ctx.sink.error('config/conflicting-fields', `${displayPath(said[1]!.node)} disagrees with ${displayPath(said[0]!.node)} about the causal mask; keep one of them`, said[1]!.node.span);
    return undefined;
  }
  return byName || said.some((s) => s.value);
}

export function readAttentionFields(r: EntryRead, ctx: ReadContext): AttentionRead | undefined {
  let ok = requireField(r, 'heads', 'the number of attention heads', ctx);
  const heads = optionalPositive(r, 'heads', ctx);
  const headDim = optionalPositive(r, 'head_dim', ctx);
  const causal = readCausal(r, ctx);
  const windowNode = r.fields.get('window');
  const window = windowNode ? readNonNegativeInteger(windowNode, ctx) : undefined;
  if (windowNode && window === undefined) ok = false;
  if (!windowNode && r.entry.match.local === true) ok = requireField(r, 'window', 'how far each position attends on either side', ctx) && ok;
  const kv = r.fields.get('num_kv_heads');
  if (kv) {
    const k = readPositiveInteger(kv, ctx);
    if (k === undefined) ok = false;
    else if (typeof heads === 'number' && k !== heads) {
      ctx.sink.error(
        'config/unsupported-value',
        `${displayPath(kv)} is ${k}, which is not read: keys and values shared by groups of query heads are not modelled; only ${heads} (one per head) is read`,
        kv.span,
      );
      ok = false;
    }
  }
  for (const [field, why] of [
    ['rotary', 'rotary position schemes rotate queries and keys per position, which linearised attention does not model; add position vectors (position) instead'],
    ['add_bias_kv', 'a learned extra key and value is not modelled'],
    ['add_zero_attn', 'an extra zero key and value is not modelled'],
  ] as const) {
    const node = r.fields.get(field);
    if (node && !readOnly(node, ctx, false, why)) ok = false;
  }
  const declared: DeclaredSize[] = [];
  for (const [field, against] of [
    ['width', 'input-width'],
    ['kdim', 'input-width'],
    ['vdim', 'input-width'],
    ['value_dim', 'head-width'],
  ] as const) {
    const d = declaredOf(r, field, against, ctx);
    if (d) declared.push(...d);
    else ok = false;
  }
  const bias = readBias(r, ctx);
  if (!ok || heads === undefined || heads === false || headDim === false || causal === undefined || !bias) return undefined;
  return {
    body: { kind: 'attention', heads, ...(headDim !== undefined ? { headDim } : {}), causal, ...(window !== undefined ? { window } : {}), ...bias },
    declared,
  };
}

export function readAttention(r: EntryRead, ctx: ReaderContext): Template | undefined {
  const read = readAttentionFields(r, ctx);
  if (!read) return undefined;
  return chainOf(r, ctx, [{ body: read.body, site: r.site, labelled: true, ...(read.declared.length > 0 ? { declared: read.declared } : {}) }], false);
}
