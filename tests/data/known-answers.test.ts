/**
 * The measurement against answers known without it. Each check names its source; "derived here"
 * refers to DEVELOPERS.md, "Measuring a data domain".
 */
import { describe, expect, test } from 'vitest';
import { valueBatch, tokenBatch } from '../../src/data/feature-batch.js';
import { gramMatrix } from '../../src/data/gram-matrix.js';
import { matricizationSpectrum } from '../../src/data/matricization-spectrum.js';
import { measureSource } from '../../src/data/measure.js';
import { pivotedCholesky } from '../../src/data/pivoted-cholesky.js';
import { seededRandom } from '../../src/data/seeded-random.js';
import { entropyBits, epsilonRank } from '../../src/data/spectrum-measures.js';
import { defaultPartitions, resolvePartition, type Partition } from '../../src/partition/partition.js';
import { explicitSpectrum, productSet, tokenSource, valueSource } from './helpers.js';

const part = (spec: string, shape: readonly number[]): Partition => {
  const r = resolvePartition(spec, shape);
  if (!r.ok) throw new Error(r.message);
  return r.partition;
};

/** One batch holding every sample, so that the measurement is of exactly these samples. */
function bitsOf(source: ReturnType<typeof tokenSource>, specs: readonly string[], weights?: { classes: string[]; of: Int32Array }): number[] {
  const m = measureSource(source, specs.map((s) => part(s, source.shape)), weights, { batch: source.count });
  if (!m.ok) throw new Error(JSON.stringify(m.diagnostics));
  return m.measurement.partitions.map((p) => p.bits);
}

describe('entropy and ε-rank of a known spectrum (Shannon entropy: Cover & Thomas, "Elements of information theory", ch. 2)', () => {
  test.each([
    [[1, 1, 1, 1], 2],
    [[5, 5], 1],
    [[0.5, 0.25, 0.25], 1.5],
    [[3, 1], -(0.75 * Math.log2(0.75) + 0.25 * Math.log2(0.25))],
    [[7, 0, 0], 0],
    [[0, 0], 0],
  ])('%j → %d bits', (spectrum, bits) => {
    expect(entropyBits(spectrum)).toBeCloseTo(bits, 14);
  });

  test('ε-rank: the fewest largest values holding 1 − ε of the weight', () => {
    expect(epsilonRank([0.25, 0.5, 0.25], 0.05)).toBe(3);
    expect(epsilonRank([0.25, 0.5, 0.25], 0.25)).toBe(2);
    expect(epsilonRank([0.25, 0.5, 0.25], 0.5)).toBe(1);
    expect(epsilonRank([1, 1, 1, 1], 0.05)).toBe(4);
    expect(epsilonRank([96, 1, 1, 1, 1], 0.05)).toBe(1);
    expect(epsilonRank([0, 0], 0.05)).toBe(0);
  });
});

describe('independent positions measure 0 bits (a product tensor has rank 1; derived here)', () => {
  test('values: a product set with equal weights, every partition', () => {
    const rows = productSet([0, 0.3, 1], 4);
    const specs = ['start-end', 'interleaved', 'positions:0', 'positions:1,2', 'block:1-2'];
    for (const b of bitsOf(valueSource(rows, [4]), specs)) expect(b).toBeLessThan(1e-9);
  });

  test('2D values with two channels, the built-in partitions', () => {
    const rows = productSet([0, 1], 8);
    const source = valueSource(rows, [2, 2], 2);
    for (const b of bitsOf(source, defaultPartitions([2, 2]))) expect(b).toBeLessThan(1e-9);
  });

  test('tokens: a product set of three symbols', () => {
    const rows = productSet([0, 1, 2], 4);
    for (const b of bitsOf(tokenSource(rows), ['start-end', 'interleaved', 'positions:3'])) expect(b).toBeLessThan(1e-9);
  });

  test('random independent samples: within 18·log2(n)/n bits, shrinking with n (derived here: the sampling noise of a rank-1 tensor)', () => {
    // Four binary tokens, each 0 or 1 with probability ½, independently; start-end splits 2 | 2.
    // The noise fills (4 − 1)·(4 − 1) = 9 directions with weight ~1/n each, so the entropy is about
    // 9·log2(n)/n; the tolerance doubles that.
    const measured: number[] = [];
    for (const n of [128, 512, 2048]) {
      const random = seededRandom(n);
      const rows = Array.from({ length: n }, () => Array.from({ length: 4 }, () => (random() < 0.5 ? 0 : 1)));
      const [bits] = bitsOf(tokenSource(rows), ['start-end']);
      expect(bits!).toBeLessThan((18 * Math.log2(n)) / n);
      measured.push(bits!);
    }
    expect(measured[2]!).toBeLessThan(measured[1]!);
    expect(measured[1]!).toBeLessThan(measured[0]!);
  });
});

describe('a copied pair measures exactly 1 bit across a partition that splits it (D = ½(e₀⊗e₀ + e₁⊗e₁); derived here)', () => {
  test('tokens', () => {
    const [startEnd, positions] = bitsOf(tokenSource([[0, 0], [1, 1]]), ['start-end', 'positions:1']);
    expect(startEnd).toBeCloseTo(1, 12);
    expect(positions).toBeCloseTo(1, 12);
  });

  test('values at the two ends of the scale, beside independent positions', () => {
    // x0 = x3 in {0, 1}; x1, x2 independent in {0, 1}; all 8 combinations once.
    const rows = productSet([0, 1], 3).map(([a, b, c]) => [a!, b!, c!, a!]);
    const [startEnd, interleaved, pairTogether] = bitsOf(valueSource(rows, [4]), ['start-end', 'interleaved', 'positions:0,3']);
    expect(startEnd).toBeCloseTo(1, 12);
    expect(interleaved).toBeCloseTo(1, 12);
    expect(pairTogether).toBeLessThan(1e-9);
  });

  test('two copied pairs across the cut: exactly 2 bits', () => {
    const rows = productSet([0, 1], 2).map(([a, b]) => [a!, b!, a!, b!]);
    expect(bitsOf(valueSource(rows, [4]), ['start-end'])[0]).toBeCloseTo(2, 12);
  });

  test('two-class labels: ±1 weights of a copied pair against its flip still give 1 bit', () => {
    // Class a: (0,0), (1,1); class b: (0,1), (1,0). D = ½(e₀e₀ᵀ + e₁e₁ᵀ − e₀e₁ᵀ − e₁e₀ᵀ)·½ has rank 1
    // (it is (e₀ − e₁)(e₀ − e₁)ᵀ/4): 0 bits. Unweighted, the four samples are a product set: 0 bits.
    // Weighting only the copied pair (class b absent) gives the copied pair: 1 bit.
    const rows = [[0, 0], [1, 1], [0, 1], [1, 0]];
    expect(bitsOf(tokenSource(rows), ['start-end'], { classes: ['a', 'b'], of: Int32Array.from([0, 0, 1, 1]) })[0]).toBeLessThan(1e-9);
    expect(bitsOf(tokenSource(rows), ['start-end'])[0]).toBeLessThan(1e-9);
    const copied = [[0, 0], [1, 1], [0, 0], [1, 1]];
    expect(bitsOf(tokenSource(copied), ['start-end'], { classes: ['a', 'b'], of: Int32Array.from([0, 0, 0, 0]) })[0]).toBeCloseTo(1, 12);
  });
});

describe('the Gram route equals an explicit matricisation built entry by entry (N ≤ 10; derived here)', () => {
  function gramSpectrum(batch: ReturnType<typeof valueBatch> | ReturnType<typeof tokenBatch>, sideA: number[], P: number, weights?: number[]): number[] {
    const n = batch.count;
    const a = Int32Array.from(sideA);
    const b = Int32Array.from(Array.from({ length: P }, (_, p) => p).filter((p) => !sideA.includes(p)));
    const gA = new Float64Array(n * n);
    const gB = new Float64Array(n * n);
    gramMatrix(batch, a, gA);
    gramMatrix(batch, b, gB);
    const spectrum = Array.from(matricizationSpectrum(pivotedCholesky(gA, n), pivotedCholesky(gB, n), weights ? Float64Array.from(weights) : undefined));
    const total = spectrum.reduce((x, y) => x + y, 0);
    return spectrum.map((x) => x / total);
  }

  function expectSameSpectrum(route: number[], explicit: number[]): void {
    const nonzero = explicit.filter((x) => x > 1e-13);
    expect(route.filter((x) => x > 1e-13).length).toBe(nonzero.length);
    nonzero.forEach((x, i) => expect(Math.abs(route[i]! - x)).toBeLessThan(1e-10));
    expect(Math.abs(entropyBits(route) - entropyBits(explicit))).toBeLessThan(1e-9);
  }

  test.each([
    [6, 1, 12, [0, 2, 3]],
    [8, 1, 30, [0, 1, 2, 3]],
    [10, 1, 25, [1, 4, 5, 8, 9]],
    [4, 2, 20, [0, 3]],
    [5, 1, 40, [2]],
  ])('values: %d positions × %d channels, %d samples, side A %j', (P, channels, n, sideA) => {
    const random = seededRandom(P * 100 + n);
    const rows = Array.from({ length: n }, () => Array.from({ length: P * channels }, () => Math.round(random() * 8) / 8));
    const weights = rows.map(() => (random() < 0.5 ? -1 : 1));
    const batch = valueBatch(Float64Array.from(rows.flat()), n, P, channels, { lo: 0, hi: 1 });
    expectSameSpectrum(gramSpectrum(batch, sideA, P), explicitSpectrum(rows, sideA, { channels }));
    expectSameSpectrum(gramSpectrum(batch, sideA, P, weights), explicitSpectrum(rows, sideA, { channels, weights }));
  });

  test('tokens: 7 positions over 3 symbols, 60 samples (repeats included)', () => {
    const random = seededRandom(7);
    const rows = Array.from({ length: 60 }, () => Array.from({ length: 7 }, () => Math.floor(random() * 3)));
    const batch = tokenBatch(Int32Array.from(rows.flat()), 60, 7);
    expectSameSpectrum(gramSpectrum(batch, [0, 2, 5], 7), explicitSpectrum(rows, [0, 2, 5], { vocabulary: 3 }));
  });
});
