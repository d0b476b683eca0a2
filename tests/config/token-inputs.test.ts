/**
 * Token inputs and what reads them: `input.vocabulary` under its common spellings, or the
 * `num_embeddings` of the embedding that reads the input; M = V exactly (DEVELOPERS.md, "the
 * surrogate functions": a token position carries its indicator vector); embeddings, position
 * vectors and class tokens with their spellings, defaults, stated sizes and errors at the field.
 */
import { describe, expect, test } from 'vitest';
import type { LayeredModel } from '../../src/config/model.js';
import { inferShapes, type ModelShapes } from '../../src/config/model-shapes.js';
import { bodyOf, codesAt, diagnostics, loadLayered } from './helpers.js';

const tokens = (input: string, layers: readonly string[]): string => `model:\n  input: ${input}\n  layers:\n${layers.map((l) => `    - ${l}\n`).join('')}`;

function shapesOf(m: LayeredModel): ModelShapes {
  const s = inferShapes(m);
  if (!s.ok) throw new Error(s.diagnostics.map((d) => d.message).join('\n'));
  return s.shapes;
}

describe('token inputs', () => {
  test.each(['vocabulary', 'vocab_size', 'vocabulary_size', 'vocab', 'num_tokens', 'n_vocab', 'ntoken', 'vocabSize'])('input.%s is the vocabulary, and M = V', (key) => {
    const m = loadLayered(tokens(`{shape: [12], ${key}: 40}`, ['embedding: {dim: 8}', 'dense: {units: 2}']));
    expect(m.input.vocabulary).toBe(40);
    expect(m.input.fieldSpans['vocabulary']).toMatchObject({ line: 2, column: 26 + key.length });
    // M is V, not the embedding's width of 8
    expect(shapesOf(m).representation).toBe(40);
  });

  test.each(['num_embeddings', 'vocab_size', 'vocabulary_size', 'input_dim', 'n_vocab', 'num_tokens'])('an embedding that reads the input gives it its vocabulary (%s)', (key) => {
    const m = loadLayered(tokens('{shape: [12]}', [`Embedding: {${key}: 1000, embedding_dim: 16}`, 'dense: {units: 2}']));
    expect(m.input.vocabulary).toBe(1000);
    // the input's vocabulary points at the embedding's field
    expect(m.input.fieldSpans['vocabulary']).toMatchObject({ line: 4, column: 21 + key.length });
    expect(bodyOf(m.layers[0]!)).toEqual({ kind: 'embedding', dim: 16 });
    expect(shapesOf(m).representation).toBe(1000);
  });

  test('the input and the embedding may both say it when they agree', () => {
    const m = loadLayered(tokens('{shape: [12], vocab_size: 500}', ['embedding: {num_embeddings: 500, dim: 8}']));
    expect(m.input.vocabulary).toBe(500);
    expect(m.input.fieldSpans['vocabulary']!.line).toBe(2);
  });

  test('they must agree: at the embedding field, naming both', () => {
    const text = tokens('{shape: [12], vocab_size: 500}', ['embedding: {num_embeddings: 501, dim: 8}']);
    expect(codesAt(text)).toEqual(['config/vocabulary-mismatch@4:35']);
    expect(diagnostics(text)[0]!.message).toBe(
      'model.layers[0].embedding.num_embeddings is 501, but model.input (line 2) gives a vocabulary of 500 tokens; a token embedding has one row per token, so they must agree',
    );
  });

  test('two embeddings that read the input (a summed segment embedding, say) must agree with each other', () => {
    const both = `model:\n  input: {shape: [12]}\n  layers:\n    - branches:\n        merge: sum\n        paths:\n          - [{embedding: {vocab_size: 300, dim: 8}}]\n          - [{embedding: {vocab_size: 301, dim: 8}}]\n`;
    expect(codesAt(both)).toEqual(['config/vocabulary-mismatch@8:39']);
    expect(diagnostics(both)[0]!.message).toContain('but model.layers[0].branches.paths[0][0].embedding.vocab_size (line 7) gives a vocabulary of 300 tokens');
  });

  test('only the embedding that reads the input has one row per token', () => {
    const text = tokens('{shape: [12], vocab_size: 50}', ['embedding: {dim: 8}', 'embedding: {dim: 4, num_embeddings: 50}']);
    expect(codesAt(text)).toEqual(['config/embedding-vocabulary@5:43']);
    expect(diagnostics(text)[0]!.message).toBe(
      'model.layers[1].embedding.num_embeddings is given on layer 1, which reads layer 0 (line 4), not the input: only an embedding that reads the token input has one row per token',
    );
  });

  test('a token input has neither channels nor a representation: at their keys', () => {
    const text = tokens('{shape: [12], vocab_size: 50, channels: 1, representation: 4}', ['embedding: {dim: 8}']);
    expect(codesAt(text)).toEqual(['config/conflicting-fields@2:40', 'config/conflicting-fields@2:53']);
    expect(diagnostics(text)[0]!.message).toBe("model.input gives both 'vocab_size' and 'channels': a token position holds one token, not channels; drop 'channels'");
    const fromEmbedding = tokens('{shape: [12], representation: 4}', ['embedding: {dim: 8, num_embeddings: 50}']);
    expect(codesAt(fromEmbedding)).toEqual(['config/conflicting-fields@4:43']);
  });

  test('two spellings of the vocabulary, a misspelt one, and a bad value', () => {
    expect(codesAt(tokens('{shape: [12], vocab_size: 50, ntoken: 50}', ['embedding: {dim: 8}']))).toEqual(['config/alias-conflict@2:40']);
    const misspelt = diagnostics(tokens('{shape: [12], vocab_sise: 50}', ['embedding: {dim: 8}']));
    expect(misspelt.map((d) => `${d.code}@${d.span?.line}:${d.span?.column}`)).toEqual(['config/unknown-field@2:24']);
    expect(misspelt[0]!.message).toContain("did you mean 'vocab_size'?");
    expect(codesAt(tokens('{shape: [12], vocab_size: 0}', ['embedding: {dim: 8}']))[0]).toBe('config/invalid-number@2:36');
  });

  test('any layer may read a token input: a conv over indicator vectors has M = V too', () => {
    const m = loadLayered(tokens('{shape: [16], vocabulary: 4}', ['conv: {channels: 32, kernel: 3}', 'GlobalMaxPooling1D', 'dense: {units: 1}']));
    expect(shapesOf(m).representation).toBe(4);
  });
});

describe('embedding', () => {
  test.each(['dim', 'embedding_dim', 'embed_dim', 'embedding_size', 'd_model', 'output_dim', 'features'])('%s is its width', (key) => {
    const m = loadLayered(tokens('{shape: [6], vocab_size: 9}', [`embedding: {${key}: 5}`]));
    expect(bodyOf(m.layers[0]!)).toEqual({ kind: 'embedding', dim: 5 });
    expect(shapesOf(m).layers[0]).toEqual({ shape: [6], width: 5 });
  });

  test.each(['Embedding', 'embed', 'embeddings', 'token_embedding', 'word_embedding', 'TokenEmbedding'])('%s is an embedding', (kind) => {
    expect(loadLayered(tokens('{shape: [6], vocab_size: 9}', [`${kind}: {dim: 5}`])).layers[0]!.kind).toBe('embedding');
  });

  test('fields that only training or the lookup reads leave no trace; dropout after it is a layer', () => {
    const m = loadLayered(
      tokens('{shape: [6]}', [
        '{type: Embedding, input_dim: 9, output_dim: 5, mask_zero: true, input_length: 6, embeddings_initializer: uniform, embeddings_regularizer: null, embeddings_constraint: null, dropout: 0.1}',
        '{type: Embedding, vocab_size: 9, dim: 5, padding_idx: 0, max_norm: 1.0, norm_type: 2.0, scale_grad_by_freq: false, sparse: false}',
      ]).replace('{type: Embedding, vocab_size: 9, dim: 5', '{type: Embedding, dim: 5'),
    );
    expect(m.layers.map(bodyOf)).toEqual([{ kind: 'embedding', dim: 5 }, { kind: 'pointwise', family: 'dropout', op: 'dropout' }, { kind: 'embedding', dim: 5 }]);
    expect(Object.keys(m.layers[0]!.fieldSpans).sort()).toEqual(['dim', 'dropout', 'vocabulary']);
  });

  test('its width is required', () => {
    const text = tokens('{shape: [6], vocab_size: 9}', ['embedding: {num_embeddings: 9}']);
    expect(codesAt(text)).toEqual(['config/missing-field@4:18']);
    expect(diagnostics(text)[0]!.message).toBe("model.layers[0].embedding is missing 'dim' (the embedding width)");
  });

  test('an embedding on a continuous input is a per-position linear map, and a first map for M', () => {
    const m = loadLayered(tokens('{shape: [4, 4], channels: 3}', ['embedding: {dim: 6}', 'flatten', 'dense: {units: 1}']));
    expect(shapesOf(m).representation).toBe(6);
    expect(shapesOf(m).layers[0]).toEqual({ shape: [4, 4], width: 6 });
  });
});

describe('position vectors', () => {
  test.each([
    ['position', 'learned'],
    ['PositionEmbedding', 'learned'],
    ['positional_embedding', 'learned'],
    ['pos_embed', 'learned'],
    ['pos_embedding', 'learned'],
    ['learned_position_embedding', 'learned'],
    ['LearnedPositionalEmbedding', 'learned'],
    ['PositionalEncoding', 'fixed'],
    ['position_encoding', 'fixed'],
    ['pos_encoding', 'fixed'],
    ['SinusoidalPositionEmbedding', 'fixed'],
    ['sinusoidal_positional_embedding', 'fixed'],
    ['sinusoidal_positional_encoding', 'fixed'],
    ['sinusoidal_encoding', 'fixed'],
  ])('%s: %s by default', (kind, mode) => {
    const m = loadLayered(tokens('{shape: [6], vocab_size: 9}', ['embedding: {dim: 4}', kind]));
    expect(bodyOf(m.layers[1]!)).toEqual({ kind: 'position', mode });
    expect(shapesOf(m).layers[1]).toEqual({ shape: [6], width: 4 });
  });

  test.each([
    ['mode: learned', 'learned'],
    ['mode: learnable', 'learned'],
    ['mode: trainable', 'learned'],
    ['position_embedding_type: absolute', 'learned'],
    ['encoding: embedding', 'learned'],
    ['mode: fixed', 'fixed'],
    ['mode: sinusoidal', 'fixed'],
    ['encoding: sinusoid', 'fixed'],
    ['mode: sine', 'fixed'],
    ['mode: sincos', 'fixed'],
    ['mode: sin_cos', 'fixed'],
    ['mode: static', 'fixed'],
  ])('%s', (field, mode) => {
    const m = loadLayered(tokens('{shape: [6], vocab_size: 9}', ['embedding: {dim: 4}', `positional_encoding: {${field}}`]));
    expect(m.layers[1]).toMatchObject({ kind: 'position', mode });
  });

  test('rotary and relative schemes are refused at the value; a sinusoidal kind cannot be learned', () => {
    const text = tokens('{shape: [6], vocab_size: 9}', ['embedding: {dim: 4}', 'position: {mode: rotary}', 'position: {position_embedding_type: relative_key}', 'sinusoidal_encoding: {mode: learned}', 'position: {mode: lerned}']);
    expect(codesAt(text)).toEqual(['config/unsupported-value@5:24', 'config/unsupported-value@6:43', 'config/conflicting-fields@7:35', 'config/invalid-value@8:24']);
    const d = diagnostics(text);
    expect(d[0]!.message).toBe(
      "model.layers[1].position.mode is 'rotary', which is not read: rotary and relative position schemes act inside attention, which linearised attention does not model; additive position vectors are read ('learned' or 'fixed')",
    );
    expect(d[3]!.message).toContain("(did you mean 'learned'?)");
  });

  test.each(['max_len', 'max_length', 'max_position_embeddings', 'num_positions', 'n_positions', 'max_seq_len', 'max_seq_length', 'context_length', 'block_size', 'positions'])(
    'a table of %s rows needs a row for every position',
    (key) => {
      expect(loadLayered(tokens('{shape: [6], vocab_size: 9}', ['embedding: {dim: 4}', `position: {${key}: 6}`])).layers).toHaveLength(2);
      const text = tokens('{shape: [6], vocab_size: 9}', ['embedding: {dim: 4}', `position: {${key}: 5}`]);
      expect(codesAt(text)).toEqual([`config/too-few-positions@5:${20 + key.length}`]);
      expect(diagnostics(text)[0]!.message).toBe(`model.layers[1].position.${key} is 5, but layer 1 reads 6 positions; the table needs a vector for every position`);
    },
  );

  test.each(['width', 'dim', 'embed_dim', 'embedding_dim', 'd_model', 'hidden_size', 'hidden_dim', 'n_embd'])('a stated %s is checked against the width it reads', (key) => {
    expect(loadLayered(tokens('{shape: [6], vocab_size: 9}', ['embedding: {dim: 4}', `position: {${key}: 4}`])).layers).toHaveLength(2);
    const text = tokens('{shape: [6], vocab_size: 9}', ['embedding: {dim: 4}', `position: {${key}: 8}`]);
    expect(codesAt(text)).toEqual([`config/width-mismatch@5:${20 + key.length}`]);
    expect(diagnostics(text)[0]!.message).toBe(`model.layers[1].position.${key} is 8, but layer 1 reads vectors of width 4; it must equal the width of the layer's input`);
  });

  test('dropout after the position vectors is a layer of its own', () => {
    const m = loadLayered(tokens('{shape: [6], vocab_size: 9}', ['embedding: {dim: 4}', 'position: {dropout: 0.1}']));
    expect(m.layers.map((l) => l.kind)).toEqual(['embedding', 'position', 'pointwise']);
  });
});

describe('class token', () => {
  test.each(['class_token', 'cls_token', 'CLS', 'class_embedding', 'ClsEmbedding'])('%s prepends a position; the default output is position 0', (kind) => {
    const m = loadLayered(tokens('{shape: [4, 4], channels: 3}', ['conv: {channels: 8, kernel: 2, stride: 2, padding: valid}', kind, 'dense: {units: 3}']));
    expect(bodyOf(m.layers[1]!)).toEqual({ kind: 'class-token' });
    const s = shapesOf(m);
    // derived here: a 2×2 grid of patches becomes 1 + 4 positions in a row
    expect(s.layers[1]).toEqual({ shape: [5], width: 8 });
    expect(s.output).toEqual({ position: [0], defaulted: true });
  });

  test('a stated width is checked', () => {
    const text = tokens('{shape: [4]}', ['embedding: {dim: 8, vocab_size: 5}', 'cls_token: {embed_dim: 16}']);
    expect(codesAt(text)).toEqual(['config/width-mismatch@5:30']);
  });
});
