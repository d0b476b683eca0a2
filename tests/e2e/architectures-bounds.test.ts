/**
 * The architecture corpus (examples/architectures/, configs written as teams keep them) through
 * the engine: every config is bounded on every built-in partition under both surrogates without
 * an input error, and the facts below hold. Each fact is derived here from the config and the
 * surrogate's definition (DEVELOPERS.md), stated beside its check; the random cross-check of the
 * bounds against exact ranks is in tests/oracle.
 */
import { describe, expect, test } from 'vitest';
import { loadConfigFile } from '../../src/config/load-config.js';
import type { LayeredModel } from '../../src/config/model.js';
import { computeBounds } from '../../src/cut/bounds.js';
import type { PartitionBounds, Surrogate } from '../../src/cut/types.js';
import { defaultPartitions, resolvePartition } from '../../src/partition/partition.js';

const DIR = new URL('../../examples/architectures/', import.meta.url);

const CORPUS: Record<string, string> = {
  'bigru-shipment-tagger.yaml': '/network',
  'causal-lm-release-notes.yaml': '/model',
  'inception-wildlife.yaml': '/pipeline/stages/1/network',
  'lenet-digits.yaml': '/model',
  'lstm-ticket-router.yaml': '/model',
  'mlp-fashion.yaml': '/model',
  'mobilenet-leaf-disease.yaml': '/trainer/model',
  'resnet18-shelf-products.yaml': '/experiment/model',
  'tcn-fall-detection.yaml': '/model',
  'unet-nuclei-segmentation.yaml': '/model',
  'vgg11-aerial-tiles.yaml': '/training/network',
  'vit-solar-panel-defects.yaml': '/experiment/model',
};

function load(file: string): LayeredModel {
  const r = loadConfigFile(new URL(file, DIR).pathname, { modelPath: CORPUS[file]! });
  if (!r.ok || r.model.kind !== 'layered') throw new Error(`${file} does not load`);
  return r.model;
}

function bounds(file: string, specs: readonly string[], surrogate: Surrogate): { byName: Map<string, PartitionBounds>; notes: readonly string[] } {
  const model = load(file);
  const parts = specs.map((s) => {
    const p = resolvePartition(s, model.input.shape);
    if (!p.ok) throw new Error(p.message);
    return p.partition;
  });
  const out = computeBounds(model, parts, { surrogate });
  if (!out.ok) throw new Error(out.diagnostics.map((d) => d.message).join('\n'));
  return { byName: new Map(out.result.partitions.map((p) => [p.partition, p])), notes: out.result.notes };
}

describe('every corpus config is bounded on every built-in partition under both surrogates', () => {
  for (const file of Object.keys(CORPUS)) {
    test.each(['tree', 'overlap'] as const)(`${file}, %s`, (surrogate) => {
      const specs = defaultPartitions(load(file).input.shape);
      const { byName } = bounds(file, specs, surrogate);
      expect([...byName.keys()]).toEqual(specs);
      for (const b of byName.values()) {
        if (b.lower) expect(b.lower.rank <= b.upper.rank).toBe(true);
        expect(b.status).toBe(b.lower === null ? 'upper-only' : b.lower.rank === b.upper.rank ? 'exact' : 'bounded');
      }
    });
  }
});

describe('facts derived here from the configs', () => {
  test('causal temporal net: the last step sees steps 771–1023 only, so moving any earlier steps couples nothing', () => {
    // Six residual blocks of two causal 3-taps with dilations 1 … 32: the receptive field of the
    // last step is 1 + 2·2·(1 + 2 + … + 32) = 253 steps, i.e. 771 … 1023.
    for (const surrogate of ['tree', 'overlap'] as const) {
      const { byName } = bounds('tcn-fall-detection.yaml', ['start-end', 'block:0-771'], surrogate);
      for (const b of byName.values()) {
        expect(b.upper.rank).toBe(1n);
        expect(b.status).toBe('exact');
      }
    }
    // One step further in, under overlap (which uses every tap), the step is read: the bound is
    // no longer 1. The tree surrogate reads only the current step (the centre tap of causal convs).
    expect(bounds('tcn-fall-detection.yaml', ['block:0-772'], 'overlap').byName.get('block:0-772')!.upper.rank > 1n).toBe(true);
    expect(bounds('tcn-fall-detection.yaml', ['block:0-772'], 'tree').byName.get('block:0-772')!.upper.rank).toBe(1n);
  });

  test('encoder/decoder under tree: output [40, 90] lies in one quadrant of its receptive field, so halves do not couple', () => {
    // Four 2×2 pools take 128×128 to 8×8; position (40, 90) reads the bottleneck cell (2, 5),
    // which covers rows 32–47 and columns 80–95: inside the top and the right half alike.
    const { byName } = bounds('unet-nuclei-segmentation.yaml', ['left-right', 'top-bottom'], 'tree');
    for (const b of byName.values()) {
      expect(b.upper.rank).toBe(1n);
      expect(b.status).toBe('exact');
    }
  });

  test('MLP on the raw 28×28 input: one fully connected layer reads every position alike, so every partition has the same bound', () => {
    const { byName, notes } = bounds('mlp-fashion.yaml', ['left-right', 'top-bottom', 'checkerboard'], 'tree');
    const uppers = new Set([...byName.values()].map((b) => b.upper.rank));
    expect(uppers.size).toBe(1);
    // The square rule keeps the stack non-linear: a linear stack would be capped at 2.
    expect([...uppers][0]! > 2n).toBe(true);
    expect(notes.some((n) => n.startsWith('activations after dense layers that mix positions are read as the elementwise square'))).toBe(true);
    expect(notes.some((n) => n.startsWith('pointwise layers after the last weighted layer are not part of the analysed score: softmax'))).toBe(true);
  });

  test('18-layer residual net: the square input and square layers make left-right and top-bottom alike; the stem width is proven', () => {
    const { byName } = bounds('resnet18-shelf-products.yaml', ['left-right', 'top-bottom'], 'tree');
    const [lr, tb] = [byName.get('left-right')!, byName.get('top-bottom')!];
    expect(lr.upper.rank).toBe(tb.upper.rank);
    // With every residual block reduced to its shortcut (a special case), the partial-identity
    // construction proves the narrowest width on the way, the 64 channels of the stem.
    expect(lr.lower?.rank).toBe(64n);
  });

  test('inception net: a bound beyond the 4,000,000-bit limit is a result, not an input error', () => {
    const { byName } = bounds('inception-wildlife.yaml', ['checkerboard'], 'tree');
    const b = byName.get('checkerboard')!;
    expect(b.upper.huge).toBe(true);
    expect(b.upper.log2 > 4_000_000).toBe(true);
  });

  test('every config says which pointwise layers it read as the identity', () => {
    for (const file of Object.keys(CORPUS)) {
      const { notes } = bounds(file, [defaultPartitions(load(file).input.shape)[0]!], 'tree');
      expect(notes.some((n) => n.startsWith('pointwise layers read as the identity')), file).toBe(true);
    }
  });
});
