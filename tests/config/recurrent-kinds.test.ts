/**
 * Recurrent kinds: `lstm`, `gru`, `rnn` and the arithmetic `recurrent` cell, read into one layer
 * kind with the cell recorded (every cell is read as the recurrent arithmetic circuit of the same
 * width and depth: DEVELOPERS.md, "recurrent"); both directions and their merge, per-step outputs
 * or the final state, and the framework fields that are ignored or read only at a neutral value.
 */
import { describe, expect, test } from 'vitest';
import type { LayeredModel } from '../../src/config/model.js';
import { inferShapes, type ModelShapes } from '../../src/config/model-shapes.js';
import { bodyOf, codesAt, diagnostics, loadLayered } from './helpers.js';

const seq = (layers: readonly string[], input = '{shape: [10], channels: 3}'): string =>
  `model:\n  input: ${input}\n  layers:\n${layers.map((l) => `    - ${l}\n`).join('')}`;

function shapesOf(m: LayeredModel): ModelShapes {
  const s = inferShapes(m);
  if (!s.ok) throw new Error(s.diagnostics.map((d) => d.message).join('\n'));
  return s.shapes;
}

const ONE_WAY = { bidirectional: false, merge: 'concat', sequence: true };

describe('kinds and cells', () => {
  test.each([
    ['LSTM', 'lstm'],
    ['lstm', 'lstm'],
    ['CuDNNLSTM', 'lstm'],
    ['GRU', 'gru'],
    ['cudnn_gru', 'gru'],
    ['RNN', 'rnn'],
    ['SimpleRNN', 'rnn'],
    ['vanilla_rnn', 'rnn'],
    ['ElmanRNN', 'rnn'],
    ['recurrent', 'arithmetic'],
  ])('%s: cell %s', (kind, cell) => {
    const m = loadLayered(seq([`${kind}: {hidden: 4}`]));
    expect(bodyOf(m.layers[0]!)).toEqual({ kind: 'recurrent', hidden: 4, depth: 1, cell, ...ONE_WAY });
  });

  test.each(['hidden', 'hidden_size', 'units', 'hidden_dim', 'num_units', 'hiddenSize'])('%s is the hidden size', (key) => {
    expect(loadLayered(seq([`lstm: {${key}: 6}`])).layers[0]).toMatchObject({ hidden: 6 });
  });

  test.each(['depth', 'num_layers', 'n_layers'])('%s stacks levels', (key) => {
    expect(loadLayered(seq([`gru: {hidden: 6, ${key}: 3}`])).layers[0]).toMatchObject({ depth: 3 });
  });

  test('the hidden size is required', () => {
    const text = seq(['LSTM: {num_layers: 2}']);
    expect(codesAt(text)).toEqual(['config/missing-field@4:13']);
    expect(diagnostics(text)[0]!.message).toBe("model.layers[0].LSTM is missing 'hidden' (hidden state size)");
  });
});

describe('directions and outputs', () => {
  test('per-step outputs by default: the grid keeps its length; one direction is causal, so the last step is analysed', () => {
    const m = loadLayered(seq(['lstm: {hidden: 4}', 'dense: {units: 2}']));
    const s = shapesOf(m);
    expect(s.layers.map((l) => [l.shape, l.width])).toEqual([
      [[10], 4],
      [[10], 2],
    ]);
    expect(s.output).toEqual({ position: [9], defaulted: true });
  });

  test.each([
    ['return_sequences: false', false],
    ['sequence: false', false],
    ['returnSequences: true', true],
  ])('%s', (field, sequence) => {
    const m = loadLayered(seq([`LSTM: {units: 4, ${field}}`, 'Dense: {units: 1}']));
    expect(m.layers[0]).toMatchObject({ sequence });
    expect(shapesOf(m).layers[0]!.shape).toEqual(sequence ? [10] : [1]);
  });

  test('both directions: concatenated by default (2·hidden), summed on request (hidden); not causal, so the centre is analysed', () => {
    const m = loadLayered(
      seq(['lstm: {hidden_size: 4, bidirectional: true}', 'gru: {hidden_size: 3, bidirectional: true, merge_mode: sum}', 'gru: {hidden_size: 3, bidirectional: true, merge: concatenate, return_sequences: false}']),
    );
    expect(m.layers.map((l) => l.kind === 'recurrent' && [l.bidirectional, l.merge, l.sequence])).toEqual([
      [true, 'concat', true],
      [true, 'sum', true],
      [true, 'concat', false],
    ]);
    const s = shapesOf(m);
    expect(s.layers.map((l) => [l.shape, l.width])).toEqual([
      [[10], 8],
      [[10], 3],
      [[1], 6],
    ]);
    const tagger = loadLayered(seq(['lstm: {hidden_size: 4, bidirectional: true}', 'dense: {units: 5}']));
    expect(shapesOf(tagger).output).toEqual({ position: [5], defaulted: true });
  });

  test('a product or an average of the directions, or none, is refused at the value with the two that are read', () => {
    const text = seq(['lstm: {hidden: 4, bidirectional: true, merge_mode: mul}', 'lstm: {hidden: 4, bidirectional: true, merge_mode: ave}', 'lstm: {hidden: 4, bidirectional: true, merge_mode: null}', 'lstm: {hidden: 4, bidirectional: true, merge_mode: concatt}']);
    expect(codesAt(text)).toEqual(['config/unsupported-value@4:58', 'config/unsupported-value@5:58', 'config/unsupported-value@6:58', 'config/invalid-value@7:58']);
    const d = diagnostics(text);
    expect(d[0]!.message).toBe("model.layers[0].lstm.merge_mode is 'mul', which is not read: a product or an average of the two directions is not modelled; write 'concat' (the width doubles) or 'sum'");
    expect(d[2]!.message).toBe(
      "model.layers[2].lstm.merge_mode is empty, which is not read: the two directions returned separately cannot be read by the next layer of a list; write 'concat' (the width doubles) or 'sum'",
    );
    expect(d[3]!.message).toContain("(did you mean 'concat'?)");
  });

  test('a 2D grid is refused at the layer', () => {
    expect(codesAt(seq(['gru: {hidden: 4}'], '{shape: [4, 4], channels: 1}'))).toEqual(['config/recurrent-needs-1d@4:7']);
  });
});

describe('framework fields', () => {
  test('fields that training reads, or that are the identity at inference, leave no trace', () => {
    const m = loadLayered(
      seq([
        '{type: LSTM, input_size: 3, hidden_size: 8, num_layers: 2, batch_first: true, dropout: 0.2, bidirectional: false, proj_size: 0, bias: true}',
        '{type: GRU, units: 8, activation: tanh, recurrent_activation: sigmoid, recurrent_dropout: 0.1, return_state: false, stateful: false, unroll: false, reset_after: true, time_major: false, go_backwards: false}',
        '{type: LSTM, units: 8, unit_forget_bias: true, kernel_initializer: glorot_uniform, recurrent_initializer: orthogonal, recurrent_regularizer: null, recurrent_constraint: null, use_bias: false}',
        '{type: RNN, hidden_size: 8, nonlinearity: relu}',
      ]),
    );
    expect(m.layers.map(bodyOf)).toEqual([
      { kind: 'recurrent', hidden: 8, depth: 2, cell: 'lstm', ...ONE_WAY },
      { kind: 'recurrent', hidden: 8, depth: 1, cell: 'gru', ...ONE_WAY },
      { kind: 'recurrent', hidden: 8, depth: 1, cell: 'lstm', ...ONE_WAY, bias: false },
      { kind: 'recurrent', hidden: 8, depth: 1, cell: 'rnn', ...ONE_WAY },
    ]);
    expect(Object.keys(m.layers[0]!.fieldSpans).sort()).toEqual(['bias', 'bidirectional', 'depth', 'hidden', 'proj_size']);
  });

  test('a projection, a backwards-only layer and a non-boolean direction are refused at the value', () => {
    const text = seq(['lstm: {hidden: 4, proj_size: 2}', 'lstm: {hidden: 4, go_backwards: true}', 'lstm: {hidden: 4, bidirectional: yes}']);
    // `yes` is a string in YAML 1.2 and a boolean in 1.1: refused both as a type and as a version hazard
    expect(codesAt(text)).toEqual(['config/unsupported-value@4:36', 'config/unsupported-value@5:39', 'config/type@6:40', 'config/yaml-version@6:40']);
    expect(diagnostics(text)[0]!.message).toBe(
      'model.layers[0].lstm.proj_size is 2, which is not read: a projection of the hidden state changes the width the recurrence carries; only 0 (none) is read',
    );
    expect(diagnostics(text)[1]!.message).toContain('write bidirectional: true for both directions');
  });
});
