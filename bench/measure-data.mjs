// One `rankfloor measure` run for the benchmark, in its own process so that its peak memory is
// its own: node bench/measure-data.mjs FILE BATCH [SAMPLES] → one JSON line {ms, maxRssMiB, partitions}.
import { readFileSync } from 'node:fs';
import { performance } from 'node:perf_hooks';
import { runMeasure } from '../build/data/measure-job.js';

const [file, batch, samples] = process.argv.slice(2);
const t0 = performance.now();
const r = runMeasure({ data: file, write: false, cwd: process.cwd(), batch: Number(batch), ...(samples ? { samples: Number(samples) } : {}) });
const ms = performance.now() - t0;
if (!r.ok) throw new Error(JSON.stringify(r));
const partitions = r.outcome.measurement.partitions.map((p) => ({ partition: p.partition, bits: p.bits, saturated: p.saturated ?? null }));
console.log(JSON.stringify({ ms, maxRssMiB: peakMiB(), batches: r.outcome.measurement.batches, partitions }));

/**
 * This process's own peak resident memory: VmHWM of /proc/self/status on Linux (getrusage's
 * maximum there also counts the parent's memory at the fork), getrusage elsewhere.
 */
function peakMiB() {
  try {
    const m = /VmHWM:\s+(\d+) kB/.exec(readFileSync('/proc/self/status', 'utf8'));
    if (m) return Number(m[1]) / 1024;
  } catch {
    // not Linux
  }
  return process.resourceUsage().maxRSS / 1024;
}
