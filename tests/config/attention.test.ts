/**
 * Attention layers and the `transformer_block` sugar: spellings of the kind and its fields, the
 * causal mask and local windows, the sizes a config states beside the ones it is read by, what is
 * refused because linearised attention does not model it, and the block's expansion into residual
 * blocks (pre- and post-norm, MLP width or ratio, a stack with `depth`, inside `repeat`).
 */
import { describe, expect, test } from 'vitest';
import type { Layer, LayeredModel } from '../../src/config/model.js';
import { inferShapes, type ModelShapes } from '../../src/config/model-shapes.js';
import { bodyOf, codesAt, diagnostics, loadLayered } from './helpers.js';

/** A token model of 8 positions embedded to width 8, then the given layers. */
const onTokens = (layers: readonly string[], shape = '[8]'): string =>
  `model:\n  input: {shape: ${shape}, vocab_size: 20}\n  layers:\n    - embedding: {dim: 8}\n${layers.map((l) => `    - ${l}\n`).join('')}`;

function shapesOf(m: LayeredModel): ModelShapes {
  const s = inferShapes(m);
  if (!s.ok) throw new Error(s.diagnostics.map((d) => d.message).join('\n'));
  return s.shapes;
}

/** `kind inputs` per layer: dense layers with their units, merges as `sum`, pointwise as the op. */
function wiring(layers: readonly Layer[]): string[] {
  return layers.map((l) => {
    const what = l.kind === 'merge' ? l.mode : l.kind === 'pointwise' ? l.op : l.kind === 'dense' ? `dense(${l.units})` : l.kind;
    return `${what} ${l.inputs.join(',')}`;
  });
}

describe('attention', () => {
  test.each(['attention', 'SelfAttention', 'MultiheadAttention', 'MultiHeadAttention', 'multi_head_self_attention', 'MHA'])('%s', (kind) => {
    const m = loadLayered(onTokens([`${kind}: {heads: 2}`]));
    expect(bodyOf(m.layers[1]!)).toEqual({ kind: 'attention', heads: 2, causal: false });
    expect(shapesOf(m).headDims[1]).toBe(4);
  });

  test.each(['heads', 'num_heads', 'n_head', 'n_heads', 'nhead', 'num_attention_heads'])('%s', (key) => {
    expect(loadLayered(onTokens([`attention: {${key}: 4}`])).layers[1]).toMatchObject({ heads: 4 });
  });

  test.each(['head_dim', 'key_dim', 'head_size', 'd_head', 'kv_channels'])('%s is the head width', (key) => {
    const m = loadLayered(onTokens([`attention: {heads: 3, ${key}: 5}`]));
    expect(m.layers[1]).toMatchObject({ heads: 3, headDim: 5 });
    // the output keeps the width it reads
    expect(shapesOf(m).layers[1]).toEqual({ shape: [8], width: 8 });
    expect(shapesOf(m).headDims[1]).toBe(5);
  });

  test.each([
    ['causal: true', true],
    ['is_causal: true', true],
    ['masked: true', true],
    ['autoregressive: true', true],
    ['causal: false', false],
    ['mask: causal', true],
    ['attn_mask: lower_triangular', true],
    ['attention_mask: triangular', true],
    ['mask_type: autoregressive', true],
    ['mask: none', false],
    ['mask: full', false],
    ['mask: bidirectional', false],
    ['mask: null', false],
    ['causal: true, mask: causal', true],
  ])('%s', (fields, causal) => {
    expect(loadLayered(onTokens([`attention: {heads: 2, ${fields}}`])).layers[1]).toMatchObject({ causal });
  });

  test.each(['CausalSelfAttention', 'causal_attention', 'MaskedSelfAttention', 'masked_attention', 'MaskedMultiHeadAttention'])('%s is causal by name; the last position is analysed', (kind) => {
    const m = loadLayered(onTokens([`${kind}: {heads: 2}`, 'dense: {units: 20}']));
    expect(m.layers[1]).toMatchObject({ kind: 'attention', causal: true });
    expect(shapesOf(m).output).toEqual({ position: [7], defaulted: true });
  });

  test('masks that disagree, with each other or with the kind, at the later value', () => {
    const text = onTokens(['attention: {heads: 2, causal: true, mask: none}', 'causal_self_attention: {heads: 2, is_causal: false}', 'attention: {heads: 2, mask: padding}']);
    expect(codesAt(text)).toEqual(['config/conflicting-fields@5:49', 'config/conflicting-fields@6:52', 'config/invalid-value@7:35']);
    const d = diagnostics(text);
    expect(d[0]!.message).toBe('model.layers[1].attention.mask disagrees with model.layers[1].attention.causal about the causal mask; keep one of them');
    expect(d[1]!.message).toBe("model.layers[2].causal_self_attention.is_causal turns the causal mask off, but 'causal_self_attention' is causal attention; drop one of them");
  });

  test.each(['window', 'local_window', 'attention_window', 'window_size', 'sliding_window'])('%s: a local window', (key) => {
    expect(loadLayered(onTokens([`attention: {heads: 2, ${key}: 3}`])).layers[1]).toMatchObject({ window: 3 });
  });

  test('local kinds need a window; a window needs a 1D grid', () => {
    expect(loadLayered(onTokens(['LocalAttention: {heads: 2, window: 2}'])).layers[1]).toMatchObject({ kind: 'attention', window: 2, causal: false });
    expect(loadLayered(onTokens(['sliding_window_attention: {heads: 2, window: 0, causal: true}'])).layers[1]).toMatchObject({ window: 0, causal: true });
    expect(codesAt(onTokens(['local_self_attention: {heads: 2}']))).toEqual(['config/missing-field@5:29']);
    expect(codesAt(onTokens(['attention: {heads: 2, window: 1}'], '[2, 4]'))).toEqual(['config/attention-window@5:37']);
  });

  test('heads are required and must divide the width unless head_dim is given', () => {
    expect(codesAt(onTokens(['attention: {head_dim: 4}']))).toEqual(['config/missing-field@5:18']);
    const text = onTokens(['attention: {heads: 3}']);
    expect(codesAt(text)).toEqual(['config/attention-heads@5:26']);
    expect(diagnostics(text)[0]!.message).toBe('layer 1 (line 5): 3 heads do not divide the width 8; give head_dim');
  });

  test.each(['width', 'embed_dim', 'd_model', 'hidden_size', 'hidden_dim', 'dim', 'n_embd', 'kdim', 'vdim'])('a stated %s must be the width it reads', (key) => {
    expect(loadLayered(onTokens([`attention: {heads: 2, ${key}: 8}`])).layers).toHaveLength(2);
    const text = onTokens([`attention: {heads: 2, ${key}: 16}`]);
    expect(codesAt(text)).toEqual([`config/width-mismatch@5:${31 + key.length}`]);
    expect(diagnostics(text)[0]!.message).toBe(`model.layers[1].attention.${key} is 16, but layer 1 reads vectors of width 8; it must equal the width of the layer's input`);
  });

  test('value_dim must be the head width (one width for queries, keys and values)', () => {
    expect(loadLayered(onTokens(['MultiHeadAttention: {num_heads: 2, key_dim: 3, value_dim: 3}'])).layers[1]).toMatchObject({ headDim: 3 });
    expect(loadLayered(onTokens(['attention: {heads: 2, value_dim: 4}'])).layers).toHaveLength(2);
    const text = onTokens(['MultiHeadAttention: {num_heads: 2, key_dim: 3, value_dim: 5}']);
    expect(codesAt(text)).toEqual(['config/width-mismatch@5:65']);
    expect(diagnostics(text)[0]!.message).toContain('but the heads of layer 1 are 3 wide');
  });

  test('what linearised attention does not model is refused at the value or the key', () => {
    const text = onTokens([
      'attention: {heads: 2, num_kv_heads: 1}',
      'attention: {heads: 2, rope: true}',
      'attention: {heads: 2, add_zero_attn: true}',
      'attention: {heads: 2, output_shape: 16}',
      'attention: {heads: 2, attention_axes: [1]}',
    ]);
    expect(codesAt(text)).toEqual([
      'config/unsupported-value@5:43',
      'config/unsupported-value@6:35',
      'config/unsupported-value@7:44',
      'config/unsupported-field@8:29',
      'config/unsupported-field@9:29',
    ]);
    const d = diagnostics(text);
    expect(d[0]!.message).toBe(
      'model.layers[1].attention.num_kv_heads is 1, which is not read: keys and values shared by groups of query heads are not modelled; only 2 (one per head) is read',
    );
    expect(d[3]!.message).toContain('a different output width is a dense layer after it');
    // the neutral values are accepted
    expect(loadLayered(onTokens(['attention: {heads: 2, n_kv_heads: 2, use_rope: false, add_bias_kv: false, add_zero_attn: false}'])).layers).toHaveLength(2);
  });

  test('dropout and framework flags leave no trace; bias: false is kept for the parameter count', () => {
    const m = loadLayered(onTokens(['{type: MultiheadAttention, embed_dim: 8, num_heads: 2, dropout: 0.1, batch_first: true, bias: false, kernel_initializer: glorot_uniform}']));
    expect(m.layers.map(bodyOf)).toEqual([
      { kind: 'embedding', dim: 8 },
      { kind: 'attention', heads: 2, causal: false, bias: false },
    ]);
    for (const key of ['attn_dropout', 'attention_dropout', 'attn_pdrop', 'attention_probs_dropout_prob']) {
      expect(loadLayered(onTokens([`attention: {heads: 2, ${key}: 0.1}`])).layers).toHaveLength(2);
    }
  });

  test('over an image grid: every position attends to every other (row-major)', () => {
    const m = loadLayered('model:\n  input: {shape: [4, 4], channels: 3}\n  layers:\n    - conv: {channels: 8}\n    - attention: {heads: 2}\n    - GlobalAvgPool2d\n    - dense: {units: 2}\n');
    expect(shapesOf(m).layers[1]).toEqual({ shape: [4, 4], width: 8 });
  });
});

describe('transformer_block', () => {
  test('pre-norm by default: two residual blocks, MLP four times the width with gelu, back to the width', () => {
    const m = loadLayered(onTokens(['transformer_block: {heads: 2}']));
    expect(wiring(m.layers)).toEqual([
      'embedding -1',
      'layer_norm 0',
      'attention 1',
      'sum 2,0',
      'layer_norm 3',
      'dense(32) 4',
      'gelu 5',
      'dense(8) 6',
      'sum 7,3',
    ]);
    // every layer of the block points at the entry; each has a path of its own (a fix edits one)
    expect(new Set(m.layers.slice(1).map((l) => l.span.line))).toEqual(new Set([5]));
    expect(m.layers.slice(1).map((l) => l.path.replace('/model/layers/1/', ''))).toEqual([
      'attention/norm',
      'attention',
      'attention/sum',
      'mlp/norm',
      'mlp/in',
      'mlp/activation',
      'mlp/out',
      'mlp/sum',
    ]);
    expect(shapesOf(m).layers.map((l) => l.width)).toEqual([8, 8, 8, 8, 8, 32, 32, 8, 8]);
  });

  test('post-norm: each norm after its sum (norm: post, or norm_first: false)', () => {
    for (const field of ['norm: post', 'norm_first: false', 'pre_norm: false', 'norm_position: post', 'norm_placement: postnorm']) {
      const m = loadLayered(onTokens([`transformer_block: {heads: 2, ${field}}`]));
      expect(wiring(m.layers)).toEqual(['embedding -1', 'attention 0', 'sum 1,0', 'layer_norm 2', 'dense(32) 3', 'gelu 4', 'dense(8) 5', 'sum 6,3', 'layer_norm 7']);
    }
    expect(wiring(loadLayered(onTokens(['transformer_block: {heads: 2, norm_first: true}'])).layers)[1]).toBe('layer_norm 0');
  });

  test.each([
    ['mlp: 12', 12],
    ['dim_feedforward: 12', 12],
    ['mlp_dim: 12', 12],
    ['ffn_dim: 12', 12],
    ['d_ff: 12', 12],
    ['ff_dim: 12', 12],
    ['feedforward_dim: 12', 12],
    ['intermediate_size: 12', 12],
    ['mlp_hidden_dim: 12', 12],
    ['mlp_ratio: 2', 16],
    ['ffn_ratio: 1.5', 12],
    ['mlp_expansion: 3', 24],
  ])('%s: MLP width %i', (field, units) => {
    const m = loadLayered(onTokens([`transformer_block: {heads: 2, ${field}}`]));
    expect(m.layers.filter((l) => l.kind === 'dense').map((l) => l.kind === 'dense' && l.units)).toEqual([units, 8]);
  });

  test('a stated width: the MLP maps back to it, and it must be the width the block reads', () => {
    const m = loadLayered(onTokens(['transformer_block: {d_model: 8, nhead: 2, mlp_ratio: 0.5}']));
    expect(m.layers.filter((l) => l.kind === 'dense').map((l) => l.kind === 'dense' && l.units)).toEqual([4, 8]);
    const text = onTokens(['transformer_block: {d_model: 16, nhead: 2}']);
    expect(codesAt(text)).toEqual(['config/width-mismatch@5:36']);
    expect(diagnostics(text)[0]!.message).toBe("model.layers[1].transformer_block.d_model is 16, but layer 2 reads vectors of width 8; it must equal the width of the layer's input");
  });

  test('a ratio that does not give whole units, at the ratio; both a width and a ratio, at the ratio', () => {
    const text = onTokens(['transformer_block: {heads: 2, mlp_ratio: 2.7}', 'transformer_block: {heads: 2, width: 8, mlp_ratio: 2.7}', 'transformer_block: {heads: 2, mlp: 16, mlp_ratio: 2}']);
    // the stated width is known while reading: its ratio is refused then, with the conflict
    expect(codesAt(text)).toEqual(['config/mlp-width@6:58', 'config/conflicting-fields@7:46']);
    expect(diagnostics(text)[0]!.message).toBe(
      "model.layers[2].transformer_block.mlp_ratio is 2.7, and 2.7 × the width 8 is not a whole number of units; give the MLP's width instead (e.g. mlp: 22)",
    );
    const late = onTokens(['transformer_block: {heads: 2, mlp_ratio: 2.7}']);
    expect(codesAt(late)).toEqual(['config/mlp-width@5:48']);
    expect(codesAt(onTokens(['transformer_block: {heads: 2, mlp_ratio: -1}']))).toEqual(['config/type@5:48']);
  });

  test('activation, norm type, and the attention fields pass through', () => {
    const m = loadLayered(
      onTokens(['transformer_block: {heads: 2, head_dim: 3, activation: relu, norm_type: rms, causal: true, window: 2, dropout: 0.1, attn_pdrop: 0.1, resid_pdrop: 0.1, activation_dropout: 0.0, layer_norm_eps: 1.0e-5, batch_first: true}']),
    );
    expect(wiring(m.layers).slice(1)).toEqual(['rms_norm 0', 'attention 1', 'sum 2,0', 'rms_norm 3', 'dense(32) 4', 'relu 5', 'dense(8) 6', 'sum 7,3']);
    expect(bodyOf(m.layers[2]!)).toEqual({ kind: 'attention', heads: 2, headDim: 3, causal: true, window: 2 });
    const linear = loadLayered(onTokens(['transformer_block: {heads: 2, act: none, bias: false}']));
    expect(wiring(linear.layers).slice(5, 7)).toEqual(['dense(32) 4', 'dense(8) 5']);
    expect(linear.layers.filter((l) => l.kind === 'dense' || l.kind === 'attention').every((l) => 'bias' in l && l.bias === false)).toBe(true);
  });

  test('norm and norm_first together, a bad placement and a bad norm type', () => {
    const text = onTokens(['transformer_block: {heads: 2, norm: pre, norm_first: true}', 'transformer_block: {heads: 2, norm: sandwich}', 'transformer_block: {heads: 2, norm_type: batch}']);
    expect(codesAt(text)).toEqual(['config/conflicting-fields@5:48', 'config/invalid-value@6:43', 'config/invalid-value@7:48']);
  });

  test.each(['transformer_block', 'TransformerLayer', 'TransformerEncoderLayer', 'transformer_encoder'])('%s', (kind) => {
    expect(loadLayered(onTokens([`${kind}: {heads: 2}`])).layers).toHaveLength(9);
  });

  test('depth: a stack whose blocks are labelled name[1], name[2], …; from: names one of them', () => {
    for (const key of ['depth', 'num_layers', 'n_layers', 'n_layer']) {
      const m = loadLayered(onTokens([`transformer_block: {heads: 2, ${key}: 3, name: enc}`, 'add: {from: "enc[1]"}']));
      expect(m.layers.filter((l) => l.name !== undefined).map((l) => `${l.name}:${l.index}`)).toEqual(['enc[1]:8', 'enc[2]:16', 'enc[3]:24']);
      expect(m.layers[25]!.inputs).toEqual([24, 8]);
    }
    expect(codesAt(onTokens(['transformer_block: {heads: 2, depth: 0}']))).toEqual(['config/invalid-number@5:44']);
    // the size is known before anything is expanded: a stack beyond the layer limit is refused at depth
    const deep = onTokens(['transformer_block: {heads: 2, depth: 1000000}']);
    expect(codesAt(deep)).toEqual(['config/too-many-layers@5:44']);
    expect(diagnostics(deep)[0]!.message).toBe(
      'model.layers[1].transformer_block.depth is 1000000, which makes the model expand to 8000001 layers; at most 10000 layers are allowed after expanding repeat blocks',
    );
  });

  test('inside a repeat, as teams write a stack; the width is filled in per copy', () => {
    const m = loadLayered(`model:
  input: {shape: [8], vocab_size: 20}
  layers:
    - embedding: {dim: 8}
    - repeat:
        times: 2
        layers:
          - transformer_block: {heads: 2, name: blk}
          - dense: {units: 12}
`);
    expect(m.layers.filter((l) => l.name?.startsWith('blk')).map((l) => l.name)).toEqual(['blk[1]', 'blk[2]']);
    // the second block reads width 12: its MLP is 48 wide and maps back to 12
    expect(m.layers.filter((l) => l.kind === 'dense').map((l) => l.kind === 'dense' && l.units)).toEqual([32, 8, 12, 48, 12, 12]);
  });
});
