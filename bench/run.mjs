// Benchmark: prints figures for this machine. Run with `npm run bench` (it builds first).
// Times are wall-clock medians of a few runs, measured around the analysis only (config text
// already in memory): parse + network + every partition's bounds.
import { performance } from 'node:perf_hooks';
import os from 'node:os';
import { loadConfigText, computeBounds, defaultPartitions, resolvePartition } from '../build/index.js';

function analyse(yamlText, surrogate, partitions) {
  const loaded = loadConfigText(yamlText, 'bench.yaml');
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
  input: {shape: [224, 224], features: 3}
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

const rac = `model:
  input: {shape: [4096], features: 8}
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
    small.push(`model:\n  input: {shape: [16], features: ${2 + rand(3)}}\n  weight_sharing: ${rand(2) === 0}\n  layers:\n    - conv: {channels: ${2 + rand(6)}, kernel: 3}\n    - pool: {window: 2}\n    - conv: {channels: ${2 + rand(6)}}\n    - pool: {window: 4}\n    - conv: {channels: ${2 + rand(6)}}\n`);
  } else if (kind === 1) {
    small.push(`model:\n  input: {shape: [8, 8], features: ${2 + rand(3)}}\n  layers:\n    - conv: {channels: ${2 + rand(8)}, kernel: 3}\n    - pool: {window: 2}\n    - conv: {channels: ${2 + rand(8)}}\n    - pool: {window: [2, 4]}\n`);
  } else {
    small.push(`model:\n  input: {shape: [${8 + 2 * rand(8)}], features: ${1 + rand(4)}}\n  layers:\n    - recurrent: {hidden: ${1 + rand(8)}, depth: ${1 + rand(3)}}\n`);
  }
}
time('1,000 small configs in one process (tree surrogate)', () => {
  for (const text of small) analyse(text, 'tree');
}, 3);
time('1,000 small configs in one process (overlap surrogate)', () => {
  for (const text of small) analyse(text, 'overlap');
}, 3);

// Start-up of the CLI against bare node, measured in this run: the medians of interleaved runs
// of `node -e 0`, `rankfloor --version` and `rankfloor bounds` on a tiny config (whose analysis
// takes well under a millisecond, so the time is start-up: loading modules and validators).
{
  const { spawnSync } = await import('node:child_process');
  const { fileURLToPath } = await import('node:url');
  const { mkdtempSync, writeFileSync, rmSync } = await import('node:fs');
  const { join } = await import('node:path');
  const cli = fileURLToPath(new URL('../build/bin/rankfloor.js', import.meta.url));
  const dir = mkdtempSync(join(os.tmpdir(), 'rankfloor-bench-'));
  const config = join(dir, 'tiny.yaml');
  writeFileSync(config, 'model:\n  input: {shape: [8], features: 2}\n  layers:\n    - conv: {channels: 4}\n    - pool: {window: 2}\n');
  const commands = {
    node: ['-e', '0'],
    version: [cli, '--version'],
    bounds: [cli, 'bounds', config],
  };
  const samples = { node: [], version: [], bounds: [] };
  for (let i = 0; i < 21; i++) {
    for (const [name, args] of Object.entries(commands)) {
      const t0 = performance.now();
      const r = spawnSync(process.execPath, args, { stdio: ['ignore', 'ignore', 'pipe'] });
      samples[name].push(performance.now() - t0);
      if (r.status !== 0) throw new Error(`${name}: exit ${r.status}: ${r.stderr}`);
    }
  }
  const median = (xs) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
  const base = median(samples.node);
  console.log(`${'start-up: bare node (node -e 0)'.padEnd(64)} ${base.toFixed(1).padStart(9)} ms (median of 21)`);
  for (const name of ['version', 'bounds']) {
    const m = median(samples[name]);
    const label = name === 'version' ? 'start-up: rankfloor --version' : 'start-up: rankfloor bounds on a tiny config';
    console.log(`${label.padEnd(64)} ${m.toFixed(1).padStart(9)} ms, ${(m / base).toFixed(2)}× bare node`);
  }
  rmSync(dir, { recursive: true, force: true });
}
