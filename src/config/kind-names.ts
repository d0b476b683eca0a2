/**
 * Layer kind names as teams write them → the kind the loader reads. One alias table: names are
 * compared in lower case without `_`, `-` and spaces, and a trailing `1d`/`2d` (also before
 * `transpose`, as in `Conv2DTranspose`) is dropped, so `Conv2d`, `conv1d`, `convolution` and
 * `CONV` are all `conv`. A `3d` kind is refused with its own message (only 1D and 2D grids are
 * supported), and kinds whose function the surrogate does not model (single-step cells, decoder
 * layers with cross-attention, rotary position schemes) get a message saying why and what to write
 * instead, rather than "unknown kind".
 */
import type { PoolMode, RecurrentLayer } from './model.js';
import { normaliseWord, pointwiseOpOf, POINTWISE_OPS, type PointwiseOp } from './pointwise-ops.js';
import { closest } from '../text/suggest.js';

/** The kinds the layer reader knows; each has one reader and one row in the field table. */
export type ReaderKind =
  | 'conv'
  | 'conv_transpose'
  | 'separable_conv'
  | 'pool'
  | 'dense'
  | 'flatten'
  | 'upsample'
  | 'recurrent'
  | 'embedding'
  | 'position'
  | 'class_token'
  | 'attention'
  | 'transformer_block'
  | 'repeat'
  | 'residual'
  | 'branches'
  | 'add'
  | 'concat'
  | 'sequence'
  | 'activation'
  | 'pointwise';

/** What a kind name means: the reader, and what the spelling itself fixes (`MaxPool2d`: mode max). */
export interface KindMatch {
  readonly reader: ReaderKind;
  /** The name messages use: the canonical kind, or the pointwise op. */
  readonly canonical: string;
  readonly depthwise?: boolean;
  readonly poolMode?: PoolMode;
  readonly global?: boolean;
  /** Adaptive pooling: only an output size of 1 (a global pool) is read. */
  readonly adaptive?: boolean;
  readonly upsampleMode?: 'nearest' | 'linear';
  readonly op?: PointwiseOp;
  /** Recurrent kinds: the real network's cell (`LSTM`: lstm). */
  readonly cell?: RecurrentLayer['cell'];
  /** Attention kinds that are causal by name (`causal_self_attention`). */
  readonly causal?: boolean;
  /** Attention kinds that are local by name (`local_attention`): a window is required. */
  readonly local?: boolean;
  /** Position kinds: the mode the name fixes (`sinusoidal_position_embedding`: fixed). */
  readonly positionMode?: 'fixed';
  /** Position kinds: the mode when the entry gives none (`positional_encoding`: fixed). */
  readonly positionDefault?: 'learned' | 'fixed';
}

export type KindLookup =
  | { readonly ok: true; readonly match: KindMatch }
  | { readonly ok: false; readonly code: string; readonly message: string };

interface Row {
  /** Spellings (snake_case as documented; compared normalised). The first is the kind's main name. */
  readonly words: readonly string[];
  readonly match: KindMatch;
}

const row = (words: string[], match: KindMatch): Row => ({ words, match });

const ROWS: readonly Row[] = [
  row(['conv', 'convolution'], { reader: 'conv', canonical: 'conv' }),
  row(['depthwise_conv', 'depthwise_convolution', 'dw_conv'], { reader: 'conv', canonical: 'conv', depthwise: true }),
  row(['separable_conv', 'separable_convolution', 'sep_conv', 'depthwise_separable_conv'], { reader: 'separable_conv', canonical: 'separable_conv' }),
  row(['conv_transpose', 'convolution_transpose', 'transposed_conv', 'transpose_conv', 'deconv', 'deconvolution', 'upconv'], {
    reader: 'conv_transpose',
    canonical: 'conv_transpose',
  }),
  row(['pool', 'pooling'], { reader: 'pool', canonical: 'pool' }),
  row(['max_pool', 'max_pooling'], { reader: 'pool', canonical: 'pool', poolMode: 'max' }),
  row(['avg_pool', 'average_pool', 'avg_pooling', 'average_pooling', 'mean_pool'], { reader: 'pool', canonical: 'pool', poolMode: 'average' }),
  row(['sum_pool', 'sum_pooling'], { reader: 'pool', canonical: 'pool', poolMode: 'sum' }),
  row(['product_pool', 'product_pooling'], { reader: 'pool', canonical: 'pool', poolMode: 'product' }),
  row(['lp_pool', 'lp_pooling'], { reader: 'pool', canonical: 'pool', poolMode: 'other' }),
  row(['global_pool', 'global_pooling'], { reader: 'pool', canonical: 'pool', global: true }),
  row(['global_max_pool', 'global_max_pooling'], { reader: 'pool', canonical: 'pool', global: true, poolMode: 'max' }),
  row(['global_avg_pool', 'global_average_pool', 'global_avg_pooling', 'global_average_pooling'], {
    reader: 'pool',
    canonical: 'pool',
    global: true,
    poolMode: 'average',
  }),
  row(['adaptive_avg_pool', 'adaptive_average_pool'], { reader: 'pool', canonical: 'pool', adaptive: true, poolMode: 'average' }),
  row(['adaptive_max_pool'], { reader: 'pool', canonical: 'pool', adaptive: true, poolMode: 'max' }),
  row(['dense', 'linear', 'fc', 'fully_connected'], { reader: 'dense', canonical: 'dense' }),
  row(['flatten'], { reader: 'flatten', canonical: 'flatten' }),
  row(['upsample', 'upsampling', 'interpolate'], { reader: 'upsample', canonical: 'upsample' }),
  row(['upsampling_nearest', 'upsample_nearest'], { reader: 'upsample', canonical: 'upsample', upsampleMode: 'nearest' }),
  row(['upsampling_bilinear', 'upsample_bilinear'], { reader: 'upsample', canonical: 'upsample', upsampleMode: 'linear' }),
  row(['recurrent'], { reader: 'recurrent', canonical: 'recurrent', cell: 'arithmetic' }),
  row(['rnn', 'simple_rnn', 'vanilla_rnn', 'elman_rnn'], { reader: 'recurrent', canonical: 'rnn', cell: 'rnn' }),
  row(['lstm', 'cudnn_lstm'], { reader: 'recurrent', canonical: 'lstm', cell: 'lstm' }),
  row(['gru', 'cudnn_gru'], { reader: 'recurrent', canonical: 'gru', cell: 'gru' }),
  row(['embedding', 'embed', 'embeddings', 'token_embedding', 'word_embedding'], { reader: 'embedding', canonical: 'embedding' }),
  row(['position', 'position_embedding', 'positional_embedding', 'pos_embed', 'pos_embedding', 'learned_position_embedding', 'learned_positional_embedding'], {
    reader: 'position',
    canonical: 'position',
    positionDefault: 'learned',
  }),
  row(['positional_encoding', 'position_encoding', 'pos_encoding'], { reader: 'position', canonical: 'position', positionDefault: 'fixed' }),
  row(['sinusoidal_position_embedding', 'sinusoidal_positional_embedding', 'sinusoidal_positional_encoding', 'sinusoidal_encoding'], {
    reader: 'position',
    canonical: 'position',
    positionMode: 'fixed',
  }),
  row(['class_token', 'cls_token', 'cls', 'class_embedding', 'cls_embedding'], { reader: 'class_token', canonical: 'class_token' }),
  row(['attention', 'self_attention', 'multi_head_attention', 'multihead_attention', 'multi_head_self_attention', 'mha'], { reader: 'attention', canonical: 'attention' }),
  row(['causal_self_attention', 'causal_attention', 'masked_self_attention', 'masked_attention', 'masked_multi_head_attention'], {
    reader: 'attention',
    canonical: 'attention',
    causal: true,
  }),
  row(['local_attention', 'local_self_attention', 'sliding_window_attention'], { reader: 'attention', canonical: 'attention', local: true }),
  row(['transformer_block', 'transformer_layer', 'transformer_encoder_layer', 'transformer_encoder'], {
    reader: 'transformer_block',
    canonical: 'transformer_block',
  }),
  row(['repeat'], { reader: 'repeat', canonical: 'repeat' }),
  row(['residual', 'residual_block', 'res_block'], { reader: 'residual', canonical: 'residual' }),
  row(['branches', 'parallel'], { reader: 'branches', canonical: 'branches' }),
  row(['add', 'sum'], { reader: 'add', canonical: 'add' }),
  row(['concat', 'concatenate', 'cat'], { reader: 'concat', canonical: 'concat' }),
  row(['sequence', 'sequential', 'block'], { reader: 'sequence', canonical: 'sequence' }),
  row(['activation'], { reader: 'activation', canonical: 'activation' }),
  ...POINTWISE_OPS.map((op) => row([op.op, ...op.aliases], { reader: 'pointwise', canonical: op.op, op })),
];

/** Kinds whose function the surrogate does not model: why, and what to write instead. */
const NOT_READ: readonly (readonly [words: readonly string[], why: string])[] = [
  [
    ['lstm_cell', 'gru_cell', 'rnn_cell', 'simple_rnn_cell'],
    'a single-step cell runs inside a loop that the config does not describe; write the sequence layer (lstm, gru or rnn) with its hidden size and number of layers',
  ],
  [['conv_lstm', 'conv_gru'], 'convolutional recurrent layers are not read; a recurrent layer reads a 1D sequence of vectors'],
  [
    ['transformer_decoder', 'transformer_decoder_layer', 'decoder_layer', 'cross_attention'],
    "cross-attention reads a second sequence (an encoder's output), which a model with one input does not have; a decoder-only model is a stack of causal blocks: transformer_block with causal: true",
  ],
  [
    ['rotary_embedding', 'rotary_position_embedding', 'rotary_positional_embedding', 'rope', 'alibi', 'relative_position_bias', 'relative_positional_encoding'],
    'rotary and relative position schemes act inside attention (they rotate queries and keys, or bias the scores, per pair of positions), which linearised attention does not model; additive position vectors are read (position, positional_encoding)',
  ],
  [['transformer'], "the name means an encoder-decoder in some frameworks and a stack of encoder blocks in others; write transformer_block (with depth: N for a stack of N)"],
  [['bidirectional'], 'write the recurrent layer itself with bidirectional: true (and merge: concat or sum), e.g. lstm: {hidden_size: 64, bidirectional: true}'],
];

const BY_WORD = new Map<string, Row>();
for (const r of ROWS) for (const w of r.words) BY_WORD.set(normaliseWord(w), r);
const NOT_READ_WORDS = new Map<string, string>();
for (const [words, why] of NOT_READ) for (const w of words) NOT_READ_WORDS.set(normaliseWord(w), why);
const SUGGESTIONS = new Map<string, string>();
for (const r of ROWS) for (const w of r.words) SUGGESTIONS.set(normaliseWord(w), w);

/** The documented spellings of every kind, main name first (README table, tests). */
export const KIND_SPELLINGS: readonly (readonly string[])[] = ROWS.map((r) => r.words);

/** `conv2d` → `conv`; `conv3d` → `conv` with `dims3` set. */
function splitDimension(word: string): { base: string; dims3: boolean } {
  const n = normaliseWord(word);
  const m = /([123])d(?=transpose$|$)/.exec(n);
  if (!m) return { base: n, dims3: false };
  return { base: n.slice(0, m.index) + n.slice(m.index + 2), dims3: m[1] === '3' };
}

export function lookupKind(written: string): KindLookup {
  const { base, dims3 } = splitDimension(written);
  const hit = BY_WORD.get(base);
  if (hit && dims3) {
    return { ok: false, code: 'config/unsupported-3d', message: `'${written}' is a 3D layer; only 1D ([length]) and 2D ([height, width]) grids are supported` };
  }
  if (hit) return { ok: true, match: hit.match };
  const why = NOT_READ_WORDS.get(base);
  if (why !== undefined) return { ok: false, code: 'config/unsupported-kind', message: `'${written}' layers are not read: ${why}` };
  const guess = closest(base, [...SUGGESTIONS.keys()]) ?? closest(base.replace(/[123]d/g, ''), [...SUGGESTIONS.keys()]);
  const shown = guess ? SUGGESTIONS.get(guess) : undefined;
  return {
    ok: false,
    code: 'config/unknown-layer-kind',
    message: `unknown layer kind '${written}'${shown ? ` (did you mean '${shown}'?)` : ''}`,
  };
}

/** The op a pointwise name stands for, when the word names one of `family`'s ops. */
export function pointwiseOpNamed(written: string): PointwiseOp | undefined {
  return pointwiseOpOf(splitDimension(written).base);
}
