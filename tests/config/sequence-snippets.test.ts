/**
 * Sequence-model snippets written the way teams write them (common practice): a layer-by-layer
 * text classifier with a stacked LSTM, a character-level language model whose block names its
 * sizes as such training scripts do (n_embd, n_head, n_layer, block_size, *_pdrop), and an encoder
 * stack written as one entry with its framework's argument names. Each reads as written, into the
 * layers, widths and analysed output the snippet means.
 */
import { describe, expect, test } from 'vitest';
import type { Layer, LayeredModel } from '../../src/config/model.js';
import { inferShapes, type ModelShapes } from '../../src/config/model-shapes.js';
import { parameterCount } from '../../src/policy/parameters.js';
import { loadLayered } from './helpers.js';

const kinds = (layers: readonly Layer[]) => layers.map((l) => (l.kind === 'pointwise' ? l.op : l.kind === 'merge' ? l.mode : l.kind === 'recurrent' ? l.cell : l.kind));

function shapesOf(m: LayeredModel): ModelShapes {
  const s = inferShapes(m);
  if (!s.ok) throw new Error(s.diagnostics.map((d) => d.message).join('\n'));
  return s.shapes;
}

describe('sequence snippets', () => {
  test('a layer-by-layer text classifier: an embedding, two LSTMs, a sigmoid head', () => {
    const m = loadLayered(`model:
  input:
    shape: [200]
  layers:
    - Embedding: {input_dim: 10000, output_dim: 64, input_length: 200, mask_zero: true}
    - LSTM: {units: 64, return_sequences: true, dropout: 0.2, recurrent_dropout: 0.2}
    - LSTM: {units: 32}
    - Dense: {units: 1, activation: sigmoid}
`);
    expect(m.input.vocabulary).toBe(10000);
    expect(kinds(m.layers)).toEqual(['embedding', 'lstm', 'lstm', 'dense', 'sigmoid']);
    const s = shapesOf(m);
    // one direction only: the model is causal and its score is read at the last of the 200 steps
    expect(s.output).toEqual({ position: [199], defaulted: true });
    expect(s.representation).toBe(10000);
    // derived here: 10000·64 + 4·(64·(64+64)+64) + 4·(32·(64+32)+32) + 32 + 1
    expect(parameterCount(m)).toBe(640000n + 33024n + 12416n + 33n);
  });

  test('a character-level language model with its sizes named as such training scripts name them', () => {
    const m = loadLayered(`model:
  input: {shape: [256], vocab_size: 65}
  layers:
    - {type: Embedding, num_embeddings: 65, embedding_dim: 384}
    - {type: PositionEmbedding, block_size: 256, n_embd: 384}
    - {type: Dropout, p: 0.2}
    - {type: TransformerBlock, n_embd: 384, n_head: 6, n_layer: 6, attn_pdrop: 0.2, resid_pdrop: 0.2, is_causal: true, name: h}
    - {type: LayerNorm, normalized_shape: 384}
    - {type: Linear, in_features: 384, out_features: 65, bias: false}
`);
    expect(m.layers.filter((l) => l.kind === 'attention').map((l) => l.kind === 'attention' && [l.heads, l.causal])).toEqual(new Array(6).fill([6, true]));
    expect(m.layers.filter((l) => l.name !== undefined).map((l) => l.name)).toEqual(['h[1]', 'h[2]', 'h[3]', 'h[4]', 'h[5]', 'h[6]']);
    const s = shapesOf(m);
    expect(s.headDims.filter((a) => a > 0)).toEqual(new Array(6).fill(64));
    expect(s.output).toEqual({ position: [255], defaulted: true });
    // the MLP is four times the width (the default ratio)
    expect(Math.max(...s.layers.map((l) => l.width))).toBe(1536);
  });

  test('an encoder stack written as one entry with its framework argument names', () => {
    const m = loadLayered(`model:
  input: {shape: [128], channels: 40}     # 40 filterbank features per frame
  layers:
    - conv: {channels: 256, kernel: 1}
    - positional_encoding: {dropout: 0.1, max_len: 5000}
    - transformer_encoder: {d_model: 256, nhead: 4, num_layers: 3, dim_feedforward: 1024, dropout: 0.1, activation: relu, batch_first: true, norm_first: false}
    - GlobalAveragePooling1D
    - dense: {units: 12}
`);
    expect(kinds(m.layers).slice(0, 12)).toEqual(['conv', 'position', 'dropout', 'attention', 'sum', 'layer_norm', 'dense', 'relu', 'dense', 'sum', 'layer_norm', 'attention']);
    expect(m.layers[1]).toMatchObject({ kind: 'position', mode: 'fixed' });
    const s = shapesOf(m);
    expect(s.layers[s.layers.length - 1]).toEqual({ shape: [1], width: 12 });
  });
});
