// Benchmark: prints figures for this machine. Run with `npm run bench` (it builds first).
// Times are wall-clock medians of a few runs, measured around the analysis only (config text
// already in memory): parse + network + every partition's bounds.
import { performance } from 'node:perf_hooks';
import { readFileSync } from 'node:fs';
import os from 'node:os';
import { loadConfigText, computeBounds, defaultPartitions, resolvePartition } from '../build/index.js';

function analyse(yamlText, surrogate, partitions, modelPath) {
  const loaded = loadConfigText(yamlText, 'bench.yaml', modelPath ? { modelPath } : {});
  if (!loaded.ok) throw new Error(JSON.stringify(loaded.diagnostics));
  const shape = loaded.model.input.shape;
  const specs = partitions ?? defaultPartitions(shape);
  const parts = specs.map((s) => {
    const r = resolvePartition(s, shape);
    if (!r.ok) throw new Error(r.message);
    return r.partition;
  });
  const out = computeBounds(loaded.model, parts, { surrogate });
  if (!out.ok) throw new Error(JSON.stringify(out.diagnostics));
  return out.result;
}

function time(label, fn, runs = 5) {
  fn(); // warm-up
  const samples = [];
  let result;
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    result = fn();
    samples.push(performance.now() - t0);
  }
  samples.sort((a, b) => a - b);
  const median = samples[Math.floor(samples.length / 2)];
  console.log(`${label.padEnd(64)} ${median.toFixed(1).padStart(9)} ms (median of ${runs})`);
  return result;
}

console.log(`rankfloor benchmark — node ${process.version}, ${os.cpus().length} cores, ${os.cpus()[0]?.model ?? ''}`);

const vgg = `model:
  input: {shape: [224, 224], representation: 3}
  layers:
    - conv: {channels: 64, kernel: 3}
    - pool: {window: 2}
    - conv: {channels: 128, kernel: 3}
    - pool: {window: 2}
    - conv: {channels: 256, kernel: 3}
    - pool: {window: 2}
    - conv: {channels: 512, kernel: 3}
    - pool: {window: 2}
    - conv: {channels: 512, kernel: 3}
    - pool: {window: 2}
    - dense: {units: 1000}
`.replace('    - dense', '    - pool: {global: true}\n    - dense');
for (const surrogate of ['tree', 'overlap']) {
  const r = time(`224x224, 5 stages 3x3 conv + 2x2 pool, all partitions, ${surrogate}`, () => analyse(vgg, surrogate), 3);
  for (const p of r.partitions) console.log(`    ${p.partition.padEnd(14)} upper ${p.upper.log2.toFixed(1)} bits (${p.upper.method}), ${p.status}`);
}

// Real architectures from examples/architectures, read as teams write them (blocks, pointwise layers).
for (const [file, modelPath, label, resize] of [
  ['resnet18-shelf-products.yaml', '/experiment/model', '18-layer residual net, 224x224', (t) => t],
  ['unet-nuclei-segmentation.yaml', '/model', 'encoder/decoder with skips, 256x256', (t) => t.replace('shape: [128, 128]', 'shape: [256, 256]')],
]) {
  const text = resize(readFileSync(new URL(`../examples/architectures/${file}`, import.meta.url), 'utf8'));
  for (const surrogate of ['tree', 'overlap']) {
    const r = time(`${label}, all partitions, ${surrogate}`, () => analyse(text, surrogate, undefined, modelPath), 3);
    for (const p of r.partitions) console.log(`    ${p.partition.padEnd(14)} upper ${p.upper.log2.toFixed(1)} bits (${p.upper.method}), ${p.status}`);
  }
}

const rac = `model:
  input: {shape: [4096], representation: 8}
  layers:
    - recurrent: {hidden: 64, depth: 3}
    - dense: {units: 1}
`;
const r = time('depth-3 recurrent net, 4096 steps, start-end + interleaved', () => analyse(rac, 'tree'), 3);
for (const p of r.partitions) console.log(`    ${p.partition.padEnd(14)} upper ${p.upper.log2.toFixed(1)} bits (${p.upper.method}), ${p.status}`);

// 1,000 small configs of mixed families, generated deterministically.
let seed = 12345;
const rand = (n) => {
  seed = (seed * 1103515245 + 12345) % 2147483648;
  return seed % n;
};
const small = [];
for (let i = 0; i < 1000; i++) {
  const kind = i % 3;
  if (kind === 0) {
    small.push(`model:\n  input: {shape: [16], representation: ${2 + rand(3)}}\n  weight_sharing: ${rand(2) === 0}\n  layers:\n    - conv: {channels: ${2 + rand(6)}, kernel: 3}\n    - pool: {window: 2}\n    - conv: {channels: ${2 + rand(6)}}\n    - pool: {window: 4}\n    - conv: {channels: ${2 + rand(6)}}\n`);
  } else if (kind === 1) {
    small.push(`model:\n  input: {shape: [8, 8], representation: ${2 + rand(3)}}\n  layers:\n    - conv: {channels: ${2 + rand(8)}, kernel: 3}\n    - pool: {window: 2}\n    - conv: {channels: ${2 + rand(8)}}\n    - pool: {window: [2, 4]}\n`);
  } else {
    small.push(`model:\n  input: {shape: [${8 + 2 * rand(8)}], representation: ${1 + rand(4)}}\n  layers:\n    - recurrent: {hidden: ${1 + rand(8)}, depth: ${1 + rand(3)}}\n`);
  }
}
time('1,000 small configs in one process (tree surrogate)', () => {
  for (const text of small) analyse(text, 'tree');
}, 3);
time('1,000 small configs in one process (overlap surrogate)', () => {
  for (const text of small) analyse(text, 'overlap');
}, 3);
