/**
 * The spread of a mean over batches: the standard deviation of the means of resamples drawn with
 * replacement (the bootstrap standard error; Efron & Tibshirani, "An introduction to the
 * bootstrap", 1993), with a fixed seed so that it is the same on every run.
 */
import { seededRandom } from './seeded-random.js';

export const BOOTSTRAP_RESAMPLES = 1000;

/** Undefined for fewer than two values: one batch has no spread to show. */
export function bootstrapStandardError(values: readonly number[], seed: number): number | undefined {
  const k = values.length;
  if (k < 2) return undefined;
  const random = seededRandom(seed);
  let sum = 0;
  let sumSquares = 0;
  for (let r = 0; r < BOOTSTRAP_RESAMPLES; r++) {
    let total = 0;
    for (let i = 0; i < k; i++) total += values[Math.floor(random() * k)]!;
    const mean = total / k;
    sum += mean;
    sumSquares += mean * mean;
  }
  const mean = sum / BOOTSTRAP_RESAMPLES;
  return Math.sqrt(Math.max(0, sumSquares / BOOTSTRAP_RESAMPLES - mean * mean));
}
