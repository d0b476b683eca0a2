/**
 * Bounds of models with blocks (residual sums, concatenations, flatten + dense, output positions)
 * on small networks whose ranks follow from a short argument (derived here, stated beside each
 * check). The random cross-check against the exact oracle lives in tests/oracle.
 */
import { describe, expect, it } from 'vitest';
import { NO_SPAN } from '../../src/diagnostic.js';
import { INPUT, type Layer, type LayeredModel } from '../../src/config/model.js';
import { computeBounds } from '../../src/cut/bounds.js';
import { resolvePartition } from '../../src/partition/partition.js';

type Draft = Omit<Layer, 'index' | 'path' | 'span' | 'fieldSpans' | 'inputs'> & { inputs?: number[] };

function model(shape: number[], m: number | undefined, drafts: Draft[], extra: Partial<LayeredModel> = {}): LayeredModel {
  const layers = drafts.map((d, index) => ({
    ...d,
    index,
    inputs: d.inputs ?? [index - 1],
    path: `/model/layers/${index}`,
    span: { ...NO_SPAN, line: index + 10 },
    fieldSpans: {},
  })) as Layer[];
  return {
    kind: 'layered',
    file: 'blocks.yaml',
    input: { shape, ...(m !== undefined ? { representation: m } : {}), span: NO_SPAN, fieldSpans: {} },
    weightSharing: true,
    layers,
    output: {},
    span: NO_SPAN,
    ...extra,
  };
}

const conv = (channels: number, extra: Partial<Record<string, unknown>> = {}): Draft =>
  ({ kind: 'conv', channels, kernel: [1], stride: [1], dilation: [1], padding: { mode: 'same' }, groups: 1, depthMultiplier: 1, ...extra }) as Draft;
const pool = (w: number, extra: Partial<Record<string, unknown>> = {}): Draft =>
  ({ kind: 'pool', mode: 'max', window: [w], stride: [w], padding: { mode: 'valid' }, global: false, ...extra }) as Draft;
const merge = (mode: 'sum' | 'concat', inputs: number[], origin: 'residual' | 'branches' | 'skip' = 'branches'): Draft =>
  ({ kind: 'merge', mode, origin, inputs }) as Draft;

function bounds(m: LayeredModel, spec: string, surrogate: 'tree' | 'overlap' = 'tree') {
  const p = resolvePartition(spec, m.input.shape);
  if (!p.ok) throw new Error(p.message);
  const out = computeBounds(m, [p.partition], { surrogate });
  if (!out.ok) throw new Error(out.diagnostics.map((d) => d.message).join('\n'));
  return out.result.partitions[0]!;
}

describe('blocks', () => {
  it('a residual block with a width-1 bottleneck still passes its full width (derived here: I + W2·W1 is invertible)', () => {
    // x ∈ R^4 per position; two positions after a pool of 2; residual {conv 1, conv 4}; product.
    const layers: Draft[] = [conv(4), pool(2), conv(1), conv(4), merge('sum', [3, 1], 'residual'), pool(2)];
    const b = bounds(model([4], 4, layers), 'start-end');
    expect(b.upper.rank).toBe(4n);
    expect(b.lower?.rank).toBe(4n);
    expect(b.status).toBe('exact');
    // Without the shortcut the bottleneck of width 1 makes the two halves' product rank 1.
    const plain = bounds(model([4], 4, [conv(4), pool(2), conv(1), conv(4), pool(2)]), 'start-end');
    expect(plain.upper.rank).toBe(1n);
  });

  it("a channel concatenation's bond is the sum of the two widths (derived here)", () => {
    // Branches conv 2 and conv 3 on each position, concatenated (width 5), then one product of two.
    const layers: Draft[] = [conv(2, { inputs: [INPUT] }), conv(3, { inputs: [INPUT] }), merge('concat', [0, 1]), pool(2)];
    const b = bounds(model([2], 5, layers), 'start-end');
    expect(b.upper.rank).toBe(5n);
  });

  it('an output position is rank 1 across a partition that moves only positions outside its receptive field (derived here)', () => {
    // Per-position maps keep output j a function of input j alone; the default output of 8 is 4.
    const layers: Draft[] = [conv(3, { kernel: [3] }), conv(3, { kernel: [3] })];
    const m = model([8], 3, layers);
    expect(bounds(m, 'start-end').upper.rank).toBe(1n);
    expect(bounds(m, 'block:4-8').upper.rank).toBe(1n);
    // Under overlap, two 3-taps reach positions 2..6: moving 0..1 alone is still rank 1.
    expect(bounds(m, 'block:0-2', 'overlap').upper.rank).toBe(1n);
    expect(bounds(m, 'start-end', 'overlap').upper.rank).toBeGreaterThan(1n);
  });

  it('flatten + dense without activations is linear: rank at most 2 across any partition (derived here)', () => {
    const layers: Draft[] = [conv(3), { kind: 'flatten' } as Draft, { kind: 'dense', units: 8 } as Draft, { kind: 'dense', units: 1 } as Draft];
    for (const spec of ['start-end', 'interleaved']) expect(bounds(model([6], 3, layers), spec).upper.rank).toBeLessThanOrEqual(2n);
  });
});
