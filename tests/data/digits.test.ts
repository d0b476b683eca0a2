/**
 * Open data: handwritten digits (UCI "Optical Recognition of Handwritten Digits", test set; see
 * fixtures/README.md). Alexander, De La Vega, Razin & Cohen ("What makes data suitable for a
 * locally connected neural network? A necessary and sufficient condition based on quantum
 * entanglement", NeurIPS 2023) report that natural images carry less entanglement across
 * partitions into contiguous halves than across partitions that interleave the positions. The
 * measurement must show that ordering on real images, beyond its own spread, and unsaturated.
 */
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { gunzipSync } from 'node:zlib';
import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { measureSource, type PartitionMeasurement } from '../../src/data/measure.js';
import { openData } from '../../src/data/open-data.js';
import { resolvePartition, type Partition } from '../../src/partition/partition.js';
import { tempDir } from './helpers.js';

const dir = tempDir();
const csv = join(dir.path, 'optdigits-test.csv');

beforeAll(() => {
  writeFileSync(csv, gunzipSync(readFileSync(new URL('./fixtures/optdigits-test.csv.gz', import.meta.url))));
});
afterAll(() => dir.remove());

const part = (spec: string): Partition => {
  const r = resolvePartition(spec, [8, 8]);
  if (!r.ok) throw new Error(r.message);
  return r.partition;
};

describe('handwritten digits, 8×8', () => {
  test('the file reads as 1,797 samples of 8×8 counts 0-16 with ten classes', () => {
    const opened = openData(csv, { shape: [8, 8], labelColumn: '65' });
    if (!opened.ok) throw new Error(JSON.stringify(opened.diagnostics));
    expect(opened.source.count).toBe(1797);
    expect(opened.source.range).toEqual({ lo: 0, hi: 16 });
    expect(opened.labels?.classes).toEqual(['0', '1', '2', '3', '4', '5', '6', '7', '8', '9']);
    opened.source.close();
  });

  test('interleaved (checkerboard) positions carry more than contiguous halves (left-right)', () => {
    const opened = openData(csv, { shape: [8, 8], labelColumn: '65' });
    if (!opened.ok) throw new Error(JSON.stringify(opened.diagnostics));
    // Three batches of 256: enough to be unsaturated here (the measurement says so), small enough
    // to stay fast. Unlabelled: the distribution of the images themselves.
    const m = measureSource(opened.source, ['left-right', 'checkerboard'].map(part), undefined, { batch: 256, samples: 768 });
    opened.source.close();
    if (!m.ok) throw new Error(JSON.stringify(m.diagnostics));
    const [lr, cb] = m.measurement.partitions as [PartitionMeasurement, PartitionMeasurement];
    for (const p of [lr, cb]) {
      expect(p.saturated).toBeUndefined();
      expect(p.spread).toBeDefined();
    }
    const high = (p: PartitionMeasurement) => p.bits + 2 * p.spread!;
    const low = (p: PartitionMeasurement) => p.bits - 2 * p.spread!;
    expect(low(cb)).toBeGreaterThan(high(lr));
    // Values measured here (derived here, not from the paper): about 6.3 bits across the halves
    // and 6.7 across the checkerboard, far from the 8-bit ceiling of a batch of 256.
    expect(lr.bits).toBeGreaterThan(5.5);
    expect(cb.bits).toBeLessThan(7);
  });
});
