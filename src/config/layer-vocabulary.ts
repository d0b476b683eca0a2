/**
 * The fields each layer kind reads, with the spellings teams use for them, in one table: the
 * field resolver, "did you mean" hints, and the README's layer table (checked by a test) all read
 * it. Field names are compared like kind names (case, `_` and `-` ignored), so `kernelSize` is
 * `kernel_size`. Fields marked `ignored` are accepted because real configs carry them, and have
 * no effect on the bounds (the surrogate has no biases, initialisers or regularisers).
 */
import type { ReaderKind } from './kind-names.js';

export interface FieldSpec {
  /** Canonical name: the key of the layer's `fieldSpans`, and how reports name the field. */
  readonly name: string;
  readonly aliases?: readonly string[];
  readonly doc: string;
  /** Accepted and not used. */
  readonly ignored?: boolean;
  /** Refused with this explanation (a spelling that means different things in different frameworks). */
  readonly refused?: string;
}

const f = (name: string, doc: string, aliases: string[] = []): FieldSpec => ({ name, doc, aliases });
const ignored = (name: string, doc: string, aliases: string[] = []): FieldSpec => ({ name, doc, aliases, ignored: true });

const NAME = f('name', 'a label for reports, and the name that `add`/`concat` `from:` refers to');

/** Pointwise layers written as fields of a weighted layer or a block; they follow it in this order. */
export const SHORTCUT_FIELDS: readonly FieldSpec[] = [
  f('norm', 'a normalisation after the layer: batch, layer, group, instance, …', ['normalization', 'normalisation']),
  f('batch_norm', 'true: a batch normalisation after the layer', ['bn', 'use_bn', 'use_batch_norm', 'batch_normalization']),
  f('layer_norm', 'true: a layer normalisation after the layer', ['use_layer_norm']),
  f('activation', 'an activation after the normalisation: relu, gelu, …; `linear`/`none`: no activation', ['act']),
  f('dropout', 'a dropout (of this rate) after the activation', ['dropout_rate']),
];

/** Fields of weighted layers that only training reads. */
const TRAINING_ONLY: readonly FieldSpec[] = [
  ignored('kernel_initializer', 'accepted, ignored', ['weight_init', 'init']),
  ignored('bias_initializer', 'accepted, ignored'),
  ignored('kernel_regularizer', 'accepted, ignored'),
  ignored('bias_regularizer', 'accepted, ignored'),
  ignored('activity_regularizer', 'accepted, ignored'),
  ignored('kernel_constraint', 'accepted, ignored'),
  ignored('bias_constraint', 'accepted, ignored'),
  ignored('trainable', 'accepted, ignored'),
  ignored('dtype', 'accepted, ignored'),
  ignored('data_format', 'accepted, ignored (grids are [length] or [height, width]; channels are the width)'),
];

/** Read by the parameter count only: the surrogate has no biases. */
const BIAS = f('bias', 'false: the real layer has no bias (only the parameter count reads it; default true)', ['use_bias']);

const IN_CHANNELS = ignored('in_channels', 'accepted, ignored: the input width follows from the previous layer', ['in_features', 'input_dim']);

const WINDOW_CONV: readonly FieldSpec[] = [
  f('kernel', 'window size per axis (default 1)', ['kernel_size']),
  f('stride', 'per axis (default 1)', ['strides']),
  f('dilation', 'spacing of the kernel taps per axis (default 1)', ['dilation_rate']),
];

const POINTWISE_PARAMS: Record<string, readonly string[]> = {
  activation: ['inplace', 'negative_slope', 'alpha', 'approximate', 'beta', 'threshold', 'dim', 'axis', 'num_parameters', 'max_value', 'min_val', 'max_val', 'lower', 'upper'],
  normalisation: ['num_features', 'eps', 'epsilon', 'momentum', 'affine', 'track_running_stats', 'num_groups', 'groups', 'num_channels', 'normalized_shape', 'elementwise_affine', 'axis', 'center', 'scale', 'size', 'alpha', 'beta', 'k'],
  dropout: ['inplace', 'noise_shape', 'seed'],
  scaling: ['scale', 'offset', 'dim', 'value'],
};

/** Parameters of a pointwise function that the surrogate does not read (`momentum`, `negative_slope`). */
export function pointwiseFields(family: string): FieldSpec[] {
  const params = (POINTWISE_PARAMS[family] ?? []).map((p) => ignored(p, 'accepted, ignored'));
  const rate = family === 'dropout' ? [f('rate', 'the dropout rate (accepted; dropout is the identity at inference)', ['p'])] : [];
  return [...rate, ...params, NAME];
}

/** A width stated beside the one the layer reads: checked against the width of its input. */
const WIDTH = f('width', 'the width the layer reads and keeps; checked against its input', ['dim', 'embed_dim', 'embedding_dim', 'd_model', 'hidden_size', 'hidden_dim', 'n_embd']);

const RECURRENT_FIELDS: readonly FieldSpec[] = [
  f('hidden', 'hidden state size (required)', ['hidden_size', 'units', 'hidden_dim', 'num_units']),
  f('depth', 'stacked layers (default 1)', ['num_layers', 'n_layers']),
  f('bidirectional', 'true: a forward and a backward chain per level (default false)'),
  f('merge', 'how a bidirectional layer joins its two directions at each step: `concat` (default; width 2·hidden) or `sum`', ['merge_mode']),
  f('sequence', 'true (default): one output per step; false: the final state only', ['return_sequences']),
  f('proj_size', 'only 0 is read: a projection changes the width the recurrence carries'),
  f('go_backwards', 'only false is read: write bidirectional for both directions'),
  ignored('input_size', 'accepted, ignored (the input width follows from the previous layer)'),
  ignored('nonlinearity', 'accepted, ignored (the surrogate integrates multiplicatively)', ['activation']),
  ignored('recurrent_activation', 'accepted, ignored (gates are not modelled)'),
  ignored('dropout', 'accepted, ignored (between stacked layers; the identity at inference)'),
  ignored('recurrent_dropout', 'accepted, ignored'),
  ignored('batch_first', 'accepted, ignored', ['time_major']),
  ignored('return_state', 'accepted, ignored (the layer\'s output is analysed)'),
  ignored('stateful', 'accepted, ignored'),
  ignored('unroll', 'accepted, ignored'),
  ignored('reset_after', 'accepted, ignored'),
  ignored('unit_forget_bias', 'accepted, ignored'),
  ignored('recurrent_initializer', 'accepted, ignored'),
  ignored('recurrent_regularizer', 'accepted, ignored'),
  ignored('recurrent_constraint', 'accepted, ignored'),
  BIAS,
  ...TRAINING_ONLY,
  NAME,
];

const EMBEDDING_FIELDS: readonly FieldSpec[] = [
  f('dim', 'embedding width (required)', ['embedding_dim', 'embed_dim', 'embedding_size', 'd_model', 'output_dim', 'features']),
  f('vocabulary', 'rows of the table, one per token: gives the input its vocabulary, or must equal it', ['num_embeddings', 'vocab_size', 'vocabulary_size', 'input_dim', 'n_vocab', 'num_tokens']),
  ignored('padding_idx', 'accepted, ignored: the padding token is read as an ordinary token (its row learned)', ['mask_zero']),
  ignored('max_norm', 'accepted, ignored (a lookup stays a lookup)'),
  ignored('norm_type', 'accepted, ignored'),
  ignored('scale_grad_by_freq', 'accepted, ignored'),
  ignored('sparse', 'accepted, ignored'),
  ignored('input_length', 'accepted, ignored (the length is input.shape)'),
  ignored('embeddings_initializer', 'accepted, ignored'),
  ignored('embeddings_regularizer', 'accepted, ignored'),
  ignored('embeddings_constraint', 'accepted, ignored'),
  ...TRAINING_ONLY,
  ...SHORTCUT_FIELDS,
  NAME,
];

const POSITION_FIELDS: readonly FieldSpec[] = [
  f('mode', '`learned` (default; also `learnable`, `absolute`) or `fixed` (`sinusoidal`, `sincos`): both read as a learned vector per position', ['encoding', 'position_embedding_type']),
  f('positions', 'rows of the table: at least the positions of the grid', [
    'max_len',
    'max_length',
    'max_position_embeddings',
    'num_positions',
    'n_positions',
    'max_seq_len',
    'max_seq_length',
    'context_length',
    'block_size',
  ]),
  WIDTH,
  ignored('initializer', 'accepted, ignored'),
  ...SHORTCUT_FIELDS,
  NAME,
];

const HEADS = f('heads', 'attention heads (required)', ['num_heads', 'n_head', 'n_heads', 'nhead', 'num_attention_heads']);
const HEAD_DIM = f('head_dim', 'width of each head\'s queries, keys and values (default: the width / heads)', ['key_dim', 'head_size', 'd_head', 'kv_channels']);
const CAUSAL = f('causal', 'true: position i attends only to positions j ≤ i (default false)', ['is_causal', 'masked', 'autoregressive']);
const MASK = f('mask', '`causal` (also `lower_triangular`), or `none` (`full`, `bidirectional`)', ['attn_mask', 'attention_mask', 'mask_type']);
const WINDOW = f('window', 'local attention (1D): position i attends only to j with |i − j| ≤ window', ['local_window', 'attention_window', 'window_size', 'sliding_window']);
const KV_HEADS = f('num_kv_heads', 'only equal to heads is read (grouped keys and values are not modelled)', ['n_kv_heads', 'num_key_value_heads', 'n_kv_head']);
const ROTARY = f('rotary', 'only false is read: rotary position schemes act inside attention', ['use_rotary', 'rope', 'use_rope']);
const ATTENTION_DROPOUT = ignored('dropout', 'accepted, ignored (the identity at inference)', ['attn_dropout', 'attention_dropout', 'attn_pdrop', 'attention_probs_dropout_prob']);

const ATTENTION_FIELDS: readonly FieldSpec[] = [
  HEADS,
  HEAD_DIM,
  WIDTH,
  CAUSAL,
  MASK,
  WINDOW,
  KV_HEADS,
  ROTARY,
  f('kdim', 'only the input width is read (keys from another sequence are cross-attention)'),
  f('vdim', 'only the input width is read'),
  f('value_dim', 'only the head width is read'),
  f('add_bias_kv', 'only false is read (a learned extra key and value)'),
  f('add_zero_attn', 'only false is read'),
  {
    name: 'output_shape',
    doc: 'refused',
    aliases: [],
    refused: "the attention layer's output keeps its input width; a different output width is a dense layer after it",
  },
  { name: 'attention_axes', doc: 'refused', aliases: [], refused: 'attention runs over every position of the grid (row-major); other axes are not read' },
  ATTENTION_DROPOUT,
  ignored('batch_first', 'accepted, ignored'),
  BIAS,
  ...TRAINING_ONLY,
  NAME,
];

const TRANSFORMER_FIELDS: readonly FieldSpec[] = [
  HEADS,
  HEAD_DIM,
  WIDTH,
  f('mlp', 'hidden width of the position-wise MLP', ['dim_feedforward', 'mlp_dim', 'ffn_dim', 'd_ff', 'ff_dim', 'feedforward_dim', 'intermediate_size', 'mlp_hidden_dim']),
  f('mlp_ratio', 'the MLP width as a multiple of the block width (default 4)', ['ffn_ratio', 'mlp_expansion']),
  f('activation', 'the MLP\'s activation (default gelu)', ['act', 'hidden_act', 'ffn_activation', 'mlp_activation']),
  f('norm', '`pre` (default: a norm before attention and before the MLP) or `post` (after each sum)', ['norm_position', 'norm_placement']),
  f('norm_first', 'true: `norm: pre`; false: `norm: post`', ['pre_norm', 'prenorm']),
  f('norm_type', '`layer` (default) or `rms`', ['norm_layer']),
  CAUSAL,
  MASK,
  WINDOW,
  KV_HEADS,
  ROTARY,
  f('depth', 'blocks in a stack (default 1); copies are labelled name[1], name[2], …', ['num_layers', 'n_layers', 'n_layer']),
  // Dropout is the identity at inference; blocks often give several rates, one per place.
  ignored('dropout', 'accepted, ignored', ['dropout_rate']),
  ignored('attention_dropout', 'accepted, ignored', ['attn_dropout', 'attn_pdrop', 'attention_probs_dropout_prob']),
  ignored('activation_dropout', 'accepted, ignored'),
  ignored('resid_dropout', 'accepted, ignored', ['resid_pdrop', 'hidden_dropout', 'hidden_dropout_prob']),
  ignored('layer_norm_eps', 'accepted, ignored', ['norm_eps', 'eps', 'epsilon']),
  ignored('batch_first', 'accepted, ignored'),
  BIAS,
  NAME,
];

export const LAYER_FIELDS: ReadonlyMap<ReaderKind, readonly FieldSpec[]> = new Map<ReaderKind, readonly FieldSpec[]>([
  [
    'conv',
    [
      f('channels', 'output channels (required unless depthwise)', ['out_channels', 'filters']),
      ...WINDOW_CONV,
      f('padding', '`same` (default), `valid`, `causal` (1D), or zeros per side: an integer or [h, w]'),
      f('groups', 'grouped conv: an integer dividing both widths, or `depthwise` (default 1)'),
      f('depthwise', 'true: one group per input channel', []),
      f('depth_multiplier', 'output channels per input channel of a depthwise conv (default 1)'),
      IN_CHANNELS,
      BIAS,
      ...TRAINING_ONLY,
      ...SHORTCUT_FIELDS,
      NAME,
    ],
  ],
  [
    'conv_transpose',
    [
      f('channels', 'output channels', ['out_channels', 'filters']),
      ...WINDOW_CONV,
      f('padding', 'zeros removed from both ends per axis (default 0), or `same` (output n·stride) or `valid`'),
      f('output_padding', 'positions added at the end per axis (default 0)'),
      f('groups', 'grouped transposed conv (default 1)'),
      IN_CHANNELS,
      BIAS,
      ...TRAINING_ONLY,
      ...SHORTCUT_FIELDS,
      NAME,
    ],
  ],
  [
    'separable_conv',
    [
      f('channels', 'output channels of the 1×1 conv that follows the depthwise conv', ['out_channels', 'filters']),
      ...WINDOW_CONV,
      f('padding', 'as for conv, of the depthwise conv'),
      f('depth_multiplier', 'as for conv (default 1)'),
      IN_CHANNELS,
      BIAS,
      ignored('depthwise_initializer', 'accepted, ignored'),
      ignored('pointwise_initializer', 'accepted, ignored'),
      ...TRAINING_ONLY,
      ...SHORTCUT_FIELDS,
      NAME,
    ],
  ],
  [
    'pool',
    [
      f('window', 'window per axis (required unless global)', ['pool_size', 'kernel_size']),
      f('stride', 'per axis (default: the window)', ['strides']),
      f('padding', '`valid` (default), `same`, or zeros per side'),
      f('mode', '`max` (default), `average`/`avg`/`mean`, `sum`, `product`, `lp`'),
      f('global', 'true: one position pooled from all that are left'),
      f('output_size', 'adaptive pooling: only 1 (a global pool) is read'),
      { name: 'ceil_mode', doc: 'only false is read', aliases: [] },
      ignored('count_include_pad', 'accepted, ignored'),
      ignored('keepdims', 'accepted, ignored'),
      ignored('data_format', 'accepted, ignored'),
      NAME,
    ],
  ],
  ['dense', [f('units', 'output units', ['out_features', 'features', 'output_dim']), IN_CHANNELS, BIAS, ...TRAINING_ONLY, ...SHORTCUT_FIELDS, NAME]],
  ['flatten', [ignored('start_dim', 'accepted, ignored'), ignored('end_dim', 'accepted, ignored'), ignored('data_format', 'accepted, ignored'), NAME]],
  [
    'upsample',
    [
      f('factor', 'integer factor per axis (default 2)', ['scale_factor']),
      f('mode', '`nearest` (default) or `linear` (`bilinear`)', ['interpolation']),
      { name: 'align_corners', doc: 'only false is read', aliases: [] },
      {
        name: 'size',
        doc: 'refused',
        aliases: [],
        refused: "'size' is a factor in some frameworks and an output size in others; write 'factor' (the integer factor per axis)",
      },
      ignored('data_format', 'accepted, ignored'),
      NAME,
    ],
  ],
  ['recurrent', RECURRENT_FIELDS],
  ['embedding', EMBEDDING_FIELDS],
  ['position', POSITION_FIELDS],
  ['class_token', [WIDTH, ignored('initializer', 'accepted, ignored'), NAME]],
  ['attention', ATTENTION_FIELDS],
  ['transformer_block', TRANSFORMER_FIELDS],
  ['repeat', [f('times', 'how many copies (required)', ['count', 'repeats']), f('layers', 'the layers repeated, in order'), NAME]],
  [
    'residual',
    [
      f('layers', 'the main path', ['body', 'main', 'path']),
      f('shortcut', 'the shortcut path (absent or empty: the identity)', ['projection', 'downsample', 'skip']),
      ...SHORTCUT_FIELDS,
      NAME,
    ],
  ],
  [
    'branches',
    [
      f('paths', 'a list of paths, each a list of layers (empty: the identity); at least two', ['branches']),
      f('merge', '`concat` (default) or `sum`', ['mode']),
      ...SHORTCUT_FIELDS,
      NAME,
    ],
  ],
  ['add', [f('from', 'the name (or list of names) of earlier layers added to the current grid'), ...SHORTCUT_FIELDS, NAME]],
  [
    'concat',
    [
      f('from', 'the name (or list of names) of earlier layers joined to the current grid'),
      ignored('axis', 'accepted, ignored (always the channels)', ['dim']),
      ...SHORTCUT_FIELDS,
      NAME,
    ],
  ],
  ['sequence', [f('layers', 'the layers, in order'), NAME]],
  ['activation', [f('fn', 'the function: relu, gelu, …', ['function', 'activation']), ...pointwiseFields('activation').filter((s) => s.name !== 'name'), NAME]],
]);

/** Fields of a kind (the pointwise ops depend on their family). */
export function fieldsOf(kind: ReaderKind, family?: string): readonly FieldSpec[] {
  if (kind === 'pointwise') return pointwiseFields(family ?? 'activation');
  return LAYER_FIELDS.get(kind) ?? [NAME];
}
