/**
 * The measurement: the samples in a fixed pseudo-random order, cut into batches; per batch and
 * partition, the two sides' Gram matrices, their Cholesky factors, the spectrum of the data
 * tensor's matricisation, its entropy and ε-rank (and the same for the first half of the batch,
 * to see whether the value still grows with the batch size); then the mean over batches, its
 * bootstrap spread, and whether the sample size limits it. See DEVELOPERS.md, "Sampling".
 */
import type { Diagnostic } from '../diagnostic.js';
import type { Partition } from '../partition/partition.js';
import { bootstrapStandardError } from './bootstrap.js';
import type { DataSource, LabelColumn } from './data-source.js';
import { gramMatrix, NEGLIGIBLE } from './gram-matrix.js';
import { matricizationSpectrum } from './matricization-spectrum.js';
import { pivotedCholesky, type CholeskyFactor } from './pivoted-cholesky.js';
import { shuffledIndices } from './seeded-random.js';
import { entropyBits, epsilonRank } from './spectrum-measures.js';

export const DEFAULT_BATCH = 256;
export const DEFAULT_EPSILON = 0.05;
/** Within this many bits of log2 of the batch size, a measurement is saturated. */
export const CEILING_MARGIN_BITS = 1;
/** Growing by more than this from half batches to whole batches, a measurement is saturated. */
export const GROWTH_LIMIT_BITS = 0.5;
const ORDER_SEED = 1;
/** Memory for the class Gram matrices of one batch; past it, each side is computed directly. */
const CLASS_GRAM_BYTES = 64 * 1024 * 1024;
const BOOTSTRAP_SEED = 2;

export interface MeasureOptions {
  /** Target batch size; batches are of equal size (±1) near it. */
  readonly batch?: number;
  readonly epsilon?: number;
  /** Use only this many samples (the first of the fixed order). */
  readonly samples?: number;
}

export interface PartitionMeasurement {
  readonly partition: string;
  readonly description: string;
  /** Mean over batches of the entanglement entropy, in bits. */
  readonly bits: number;
  /** Bootstrap standard error of that mean; undefined with one batch. */
  readonly spread: number | undefined;
  /** Mean over batches of the ε-rank. */
  readonly epsilonRank: number;
  /** Mean over the first halves of the batches. */
  readonly halfBits: number;
  /** log2 of the smallest batch: no batch can show more. */
  readonly ceilingBits: number;
  readonly saturated: 'ceiling' | 'growing' | undefined;
  /** With more than two classes: the class whose one-versus-rest tensor measured most, per batch most often. */
  readonly class?: string;
}

export interface Measurement {
  readonly samples: number;
  readonly batches: number;
  readonly batchSizes: readonly [number, number];
  readonly epsilon: number;
  readonly weighting: 'none' | 'two-class' | 'one-versus-rest';
  readonly classes: number;
  readonly partitions: readonly PartitionMeasurement[];
}

export type MeasureResult = { ok: true; measurement: Measurement } | { ok: false; diagnostics: Diagnostic[] };

/** Per batch and partition: entropy, ε-rank, half-batch entropy and the class that gave them. */
interface BatchValue {
  bits: number;
  rank: number;
  halfBits: number;
  cls: number;
}

export function measureSource(source: DataSource, partitions: readonly Partition[], labels: LabelColumn | undefined, options: MeasureOptions = {}): MeasureResult {
  const epsilon = options.epsilon ?? DEFAULT_EPSILON;
  const total = Math.min(source.count, options.samples ?? source.count);
  const target = Math.max(2, options.batch ?? DEFAULT_BATCH);
  const batches = Math.max(1, Math.round(total / target));
  const order = shuffledIndices(source.count, ORDER_SEED).subarray(0, total);
  const weightSets = weightsOf(labels, order, total);
  const plan = gramPlan(partitions, source.shape.reduce((a, b) => a * b, 1));
  const values: BatchValue[][] = partitions.map(() => []);
  let minSize = Infinity;
  let maxSize = 0;
  let start = 0;
  for (let k = 0; k < batches; k++) {
    const size = Math.floor((total * (k + 1)) / batches) - Math.floor((total * k) / batches);
    minSize = Math.min(minSize, size);
    maxSize = Math.max(maxSize, size);
    const indices = order.subarray(start, start + size);
    const read = source.read(indices);
    if (!read.ok) return { ok: false, diagnostics: [read.diagnostic] };
    const batch = read.batch;
    const byClass = plan.classes.length * size * size * 8 <= CLASS_GRAM_BYTES;
    const classGrams = byClass
      ? plan.classes.map((positions) => {
          const g = new Float64Array(size * size);
          gramMatrix(batch, positions, g);
          return g;
        })
      : [];
    const gA = new Float64Array(size * size);
    const gB = new Float64Array(size * size);
    const half = Math.floor(size / 2);
    for (let j = 0; j < partitions.length; j++) {
      if (byClass) {
        hadamardProduct(classGrams, plan.sides[j]!.a, gA);
        hadamardProduct(classGrams, plan.sides[j]!.b, gB);
      } else {
        gramMatrix(batch, positionsOf(plan, plan.sides[j]!.a), gA);
        gramMatrix(batch, positionsOf(plan, plan.sides[j]!.b), gB);
      }
      const whole = [pivotedCholesky(gA, size), pivotedCholesky(gB, size)] as const;
      const halves = [pivotedCholesky(gA, half, size), pivotedCholesky(gB, half, size)] as const;
      values[j]!.push(batchValue(whole, halves, weightSets, start, epsilon));
    }
    start += size;
  }
  const ceilingBits = Math.log2(minSize);
  const measured = partitions.map((p, j): PartitionMeasurement => {
    const v = values[j]!;
    const bits = mean(v.map((x) => x.bits));
    const halfBits = mean(v.map((x) => x.halfBits));
    const spread = bootstrapStandardError(v.map((x) => x.bits), BOOTSTRAP_SEED);
    const saturated: PartitionMeasurement['saturated'] = bits >= ceilingBits - CEILING_MARGIN_BITS ? 'ceiling' : bits - halfBits > GROWTH_LIMIT_BITS ? 'growing' : undefined;
    const base = { partition: p.label, description: p.description, bits, spread, epsilonRank: mean(v.map((x) => x.rank)), halfBits, ceilingBits, saturated };
    if (!labels || labels.classes.length <= 2) return base;
    return { ...base, class: labels.classes[mostFrequent(v.map((x) => x.cls))]! };
  });
  return {
    ok: true,
    measurement: {
      samples: total,
      batches,
      batchSizes: [minSize, maxSize],
      epsilon,
      weighting: !labels ? 'none' : labels.classes.length <= 2 ? 'two-class' : 'one-versus-rest',
      classes: labels?.classes.length ?? 0,
      partitions: measured,
    },
  };
}

/**
 * The weights of the samples in the fixed order, one set per tensor to measure: none (all 1);
 * ±1 for two classes; one set per class (+1 for it, −1 for the rest) for more.
 */
function weightsOf(labels: LabelColumn | undefined, order: Int32Array, total: number): Float64Array[] | undefined {
  if (!labels || labels.classes.length < 2) return undefined;
  const classes = labels.classes.length === 2 ? [0] : labels.classes.map((_, c) => c);
  return classes.map((c) => Float64Array.from(order.subarray(0, total), (i) => (labels.of[i] === c ? 1 : -1)));
}

function batchValue(
  whole: readonly [CholeskyFactor, CholeskyFactor],
  halves: readonly [CholeskyFactor, CholeskyFactor],
  weightSets: Float64Array[] | undefined,
  start: number,
  epsilon: number,
): BatchValue {
  const n = whole[0].n;
  const sets = weightSets ?? [undefined];
  let best: BatchValue | undefined;
  for (let c = 0; c < sets.length; c++) {
    const w = sets[c]?.subarray(start, start + n);
    const spectrum = matricizationSpectrum(whole[0], whole[1], w);
    const bits = entropyBits(spectrum);
    if (best && bits <= best.bits) continue;
    const halfSpectrum = matricizationSpectrum(halves[0], halves[1], w?.subarray(0, halves[0].n));
    best = { bits, rank: epsilonRank(spectrum, epsilon), halfBits: entropyBits(halfSpectrum), cls: c };
  }
  return best!;
}

/**
 * Positions that lie on the same side in every partition form a class; a side's Gram matrix is
 * the entrywise product of its classes' Gram matrices. So each position's kernel is evaluated
 * once per pair of samples, however many partitions are measured (the three 2D defaults make
 * 8 classes of 784 positions).
 */
interface GramPlan {
  readonly classes: Int32Array[];
  /** Per partition, the classes of side A and of side B. */
  readonly sides: { a: number[]; b: number[] }[];
}

function gramPlan(partitions: readonly Partition[], positions: number): GramPlan {
  const byKey = new Map<string, number[]>();
  for (let p = 0; p < positions; p++) {
    const key = partitions.map((q) => (q.side[p] ? '1' : '0')).join('');
    const list = byKey.get(key);
    if (list) list.push(p);
    else byKey.set(key, [p]);
  }
  const keys = [...byKey.keys()].sort();
  const classes = keys.map((k) => Int32Array.from(byKey.get(k)!));
  const sides = partitions.map((_, j) => {
    const a: number[] = [];
    const b: number[] = [];
    keys.forEach((k, c) => (k[j] === '1' ? a : b).push(c));
    return { a, b };
  });
  return { classes, sides };
}

function positionsOf(plan: GramPlan, classes: readonly number[]): Int32Array {
  return Int32Array.from(classes.flatMap((c) => Array.from(plan.classes[c]!)));
}

/** out = the entrywise product of grams[c] for c in `which`, with products below 2^−100 set to 0. */
function hadamardProduct(grams: readonly Float64Array[], which: readonly number[], out: Float64Array): void {
  out.set(grams[which[0]!]!.subarray(0, out.length));
  for (let k = 1; k < which.length; k++) {
    const g = grams[which[k]!]!;
    for (let i = 0; i < out.length; i++) out[i]! *= g[i]!;
  }
  for (let i = 0; i < out.length; i++) if (out[i]! < NEGLIGIBLE) out[i] = 0;
}

function mean(xs: readonly number[]): number {
  return xs.reduce((a, b) => a + b, 0) / xs.length;
}

function mostFrequent(xs: readonly number[]): number {
  const counts = new Map<number, number>();
  for (const x of xs) counts.set(x, (counts.get(x) ?? 0) + 1);
  let best = xs[0]!;
  for (const [x, c] of counts) if (c > counts.get(best)! || (c === counts.get(best)! && x < best)) best = x;
  return best;
}
