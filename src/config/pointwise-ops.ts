/**
 * The pointwise functions a config may name — activations, normalisations, dropout, scaling —
 * each with its family and the spellings teams use for it. They are read as layers (`- relu`,
 * `- {type: BatchNorm2d}`) and as shortcut fields of a weighted layer (`activation: gelu`,
 * `norm: batch`), so the table is shared by both readers. The surrogate reads every one of them
 * as the identity (DEVELOPERS.md, "pointwise"); they are kept so that reports can say so.
 */
import type { PointwiseFamily } from './model.js';

export interface PointwiseOp {
  /** Canonical lower-case name (`relu`, `batch_norm`), the `op` of the layer. */
  readonly op: string;
  readonly family: PointwiseFamily;
  /** Other spellings, compared after `normaliseWord`. */
  readonly aliases: readonly string[];
}

const ops = (family: PointwiseFamily, rows: readonly (readonly [string, ...string[]])[]): PointwiseOp[] =>
  rows.map(([op, ...aliases]) => ({ op, family, aliases }));

export const POINTWISE_OPS: readonly PointwiseOp[] = [
  ...ops('activation', [
    ['relu'],
    ['relu6'],
    ['gelu'],
    ['silu', 'swish'],
    ['tanh'],
    ['sigmoid'],
    ['hard_sigmoid'],
    ['elu'],
    ['selu'],
    ['celu'],
    ['leaky_relu', 'lrelu'],
    ['softplus'],
    ['softsign'],
    ['mish'],
    ['hardswish', 'hswish', 'hard_swish'],
    ['hardtanh'],
    ['prelu'],
    ['softmax'],
    ['log_softmax'],
    ['identity'],
  ]),
  ...ops('normalisation', [
    ['batch_norm', 'bn', 'batchnormalization', 'syncbatchnorm'],
    ['layer_norm', 'ln', 'layernormalization'],
    ['group_norm', 'gn', 'groupnormalization'],
    ['instance_norm', 'instancenormalization'],
    ['local_response_norm', 'lrn', 'localresponsenormalization'],
    ['rms_norm', 'rmsnormalization'],
  ]),
  ...ops('dropout', [
    ['dropout'],
    ['spatial_dropout'],
    ['alpha_dropout'],
    ['gaussian_dropout'],
    ['feature_alpha_dropout'],
  ]),
  ...ops('scaling', [
    ['scale', 'scaling', 'rescaling'],
    ['weight_norm', 'weightnormalization'],
  ]),
];

/**
 * How names are compared: lower case, without `_`, `-`, spaces and dots, so that `LeakyReLU`,
 * `leaky_relu` and `leaky-relu` are one word.
 */
export function normaliseWord(word: string): string {
  return word.toLowerCase().replace(/[_\-\s.]/g, '');
}

const BY_WORD = new Map<string, PointwiseOp>();
for (const o of POINTWISE_OPS) for (const w of [o.op, ...o.aliases]) BY_WORD.set(normaliseWord(w), o);

/** The op a (normalised) word names, if any. */
export function pointwiseOpOf(normalisedWord: string): PointwiseOp | undefined {
  return BY_WORD.get(normalisedWord);
}

/** Canonical op names of one family (for messages and "did you mean"). */
export function opsOf(family: PointwiseFamily): string[] {
  return POINTWISE_OPS.filter((o) => o.family === family).map((o) => o.op);
}
