// Benchmark: prints figures for this machine. Run with `npm run bench` (it builds first).
// Times are wall-clock medians of a few runs, measured around the analysis only (config text
// already in memory): parse + network + every partition's bounds.
import { performance } from 'node:perf_hooks';
import { readFileSync } from 'node:fs';
import os from 'node:os';
import { loadConfigText, computeBounds, defaultPartitions, resolvePartition } from '../build/index.js';

function analyse(yamlText, surrogate, partitions, modelPath, extra = {}) {
  const loaded = loadConfigText(yamlText, 'bench.yaml', modelPath ? { modelPath } : {});
  if (!loaded.ok) throw new Error(JSON.stringify(loaded.diagnostics));
  const shape = loaded.model.input.shape;
  const specs = partitions ?? defaultPartitions(shape);
  const parts = specs.map((s) => {
    const r = resolvePartition(s, shape);
    if (!r.ok) throw new Error(r.message);
    return r.partition;
  });
  const out = computeBounds(loaded.model, parts, { surrogate, ...extra });
  if (!out.ok) throw new Error(JSON.stringify(out.diagnostics));
  return out.result;
}

function time(label, fn, runs = 5) {
  if (runs > 1) fn(); // warm-up (a single run is cold: for the slow lines)
  const samples = [];
  let result;
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    result = fn();
    samples.push(performance.now() - t0);
  }
  samples.sort((a, b) => a - b);
  const median = samples[Math.floor(samples.length / 2)];
  console.log(`${label.padEnd(64)} ${median.toFixed(1).padStart(9)} ms (${runs > 1 ? `median of ${runs}` : 'one cold run'})`);
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

// Sequence models (issue 9's targets): a 12-block transformer over 1,024 tokens and a 2-layer
// bidirectional LSTM over 4,096 steps, every default partition.
const transformer = `model:
  input: {shape: [1024], vocabulary: 32000}
  layers:
    - token_embedding: {dim: 768}
    - position: {mode: learned}
    - repeat:
        times: 12
        layers:
          - transformer_block: {width: 768, n_head: 12, d_ff: 3072, norm: pre}
    - layer_norm
    - dense: {units: 32000}
`;
const t12 = time('12-block transformer, 1,024 tokens, all partitions (tree)', () => analyse(transformer, 'tree'), 3);
for (const p of t12.partitions) console.log(`    ${p.partition.padEnd(14)} upper ${p.upper.log2.toFixed(1)} bits (${p.upper.method}), ${p.status}`);
const bilstm = `model:
  input: {shape: [4096], channels: 40, representation: 40}
  layers:
    - lstm: {hidden_size: 256, num_layers: 2, bidirectional: true, sequence: false}
    - dense: {units: 10}
`;
const bl = time('2-layer bidirectional LSTM, 4,096 steps, all partitions (tree)', () => analyse(bilstm, 'tree'), 3);
for (const p of bl.partitions) console.log(`    ${p.partition.padEnd(14)} upper ${p.upper.log2.toFixed(1)} bits (${p.upper.method}), ${p.status}`);

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
// The rules alone (the certified probe off), then once with the probe towards every upper bound
// (what `bounds` does; `check` gives the probe the requirement's minimum as its target).
const rulesOnly = { probeBudget: 0 };
time('1,000 small configs in one process (tree surrogate, rules only)', () => {
  for (const text of small) analyse(text, 'tree', undefined, undefined, rulesOnly);
}, 3);
time('1,000 small configs in one process (overlap surrogate, rules only)', () => {
  for (const text of small) analyse(text, 'overlap', undefined, undefined, rulesOnly);
}, 3);
time('1,000 small configs in one process (tree surrogate, with the probe)', () => {
  for (const text of small) analyse(text, 'tree');
}, 1);

// 300 small sequence models the rules leave far apart (attention stacks, bidirectional and
// per-step recurrences), with the probe towards every upper bound; how many bounds it closes.
const smallSequences = [];
for (let i = 0; i < 300; i++) {
  const n = 6 + rand(7);
  if (i % 3 === 0) {
    const width = [4, 8][rand(2)];
    smallSequences.push(`model:\n  input: {shape: [${n}], representation: ${2 + rand(3)}}\n  layers:\n    - embedding: {dim: ${width}}\n    - position: {mode: learned}\n    - repeat:\n        times: ${2 + rand(2)}\n        layers:\n          - attention: {heads: ${1 + rand(2)}, head_dim: ${1 + rand(2)}, causal: ${rand(2) === 0}}\n`);
  } else if (i % 3 === 1) {
    smallSequences.push(`model:\n  input: {shape: [${n}], representation: ${1 + rand(3)}}\n  layers:\n    - recurrent: {hidden: ${1 + rand(4)}, depth: ${1 + rand(2)}, bidirectional: true, sequence: false}\n`);
  } else {
    smallSequences.push(`model:\n  input: {shape: [${n}], vocabulary: ${3 + rand(4)}}\n  layers:\n    - embedding: {dim: ${2 + rand(3)}}\n    - recurrent: {hidden: ${2 + rand(3)}, depth: 2}\n    - recurrent: {hidden: ${2 + rand(3)}, depth: 1}\n`);
  }
}
let closed = [0, 0];
time('300 small attention / bidirectional / per-step sequence models (probe)', () => {
  closed = [0, 0];
  for (const text of smallSequences) {
    for (const p of analyse(text, 'tree').partitions) {
      closed[1]++;
      if (p.status === 'exact') closed[0]++;
    }
  }
}, 1);
console.log(`    exact (lower = upper): ${closed[0]} of ${closed[1]} partitions`);
const closedRules = [0, 0];
for (const text of smallSequences) {
  for (const p of analyse(text, 'tree', undefined, undefined, rulesOnly).partitions) {
    closedRules[1]++;
    if (p.status === 'exact') closedRules[0]++;
  }
}
console.log(`    exact with the rules alone: ${closedRules[0]} of ${closedRules[1]} partitions`);

// `check --base` against the same check without it, through the built CLI in a scratch git
// repository: 1,000 configs, every one changed by the head (the last width halved). A comparison
// starts a fixed number of git processes, so what it adds is reading and evaluating the base
// versions (on a worker thread when a core is idle, see src/check/base-evaluation.ts); the ratio
// says what that costs, in wall time, on this machine as loaded as it is.
{
  const { execFileSync, spawnSync } = await import('node:child_process');
  const { mkdtempSync, mkdirSync, writeFileSync, rmSync } = await import('node:fs');
  const { join } = await import('node:path');
  const dir = mkdtempSync(join(os.tmpdir(), 'rankfloor-bench-'));
  const env = { ...process.env, GIT_CONFIG_NOSYSTEM: '1', GIT_CONFIG_GLOBAL: '/dev/null', NO_COLOR: '1' };
  const git = (...args) => execFileSync('git', ['-c', 'user.name=bench', '-c', 'user.email=bench@example.invalid', '-c', 'commit.gpgsign=false', ...args], { cwd: dir, env });
  git('init', '-q', '-b', 'main');
  mkdirSync(join(dir, 'policies'));
  mkdirSync(join(dir, 'configs'));
  writeFileSync(join(dir, 'policies', 'pairs.yaml'), 'id: pairs\ndescription: bench\napplies_to: ["configs/*.yaml"]\nmax_drop_bits: 1\nrequire:\n  - {partition: left-right, min_rank: 4}\n');
  seed = 777;
  const shapes = Array.from({ length: 1000 }, () => ({ features: 2 + rand(3), first: 2 + rand(8), last: 16 + 2 * rand(24) }));
  const config = (s, last) =>
    `model:\n  input: {shape: [8, 8], features: ${s.features}}\n  layers:\n    - conv: {channels: ${s.first}, kernel: 3}\n    - pool: {window: 2}\n    - conv: {channels: 8}\n    - pool: {window: 2}\n    - conv: {channels: ${last}, name: last}\n    - pool: {global: true}\n`;
  shapes.forEach((s, i) => writeFileSync(join(dir, 'configs', `c${String(i).padStart(4, '0')}.yaml`), config(s, s.last)));
  git('add', '-A');
  git('commit', '-q', '-m', 'base');
  git('tag', 'bench-base');
  shapes.forEach((s, i) => writeFileSync(join(dir, 'configs', `c${String(i).padStart(4, '0')}.yaml`), config(s, s.last / 2)));
  git('add', '-A');
  git('commit', '-q', '-m', 'head: every last width halved');
  const { fileURLToPath } = await import('node:url');
  const cli = fileURLToPath(new URL('../build/cli/main.js', import.meta.url));
  const check = (...extra) => () => {
    const r = spawnSync(process.execPath, [cli, 'check', '--policy', 'policies', '--format', 'json', ...extra], { cwd: dir, env, maxBuffer: 1 << 30 });
    if (r.status !== 0 && r.status !== 1) throw new Error(`check ${extra.join(' ')} exited ${r.status}: ${r.stderr}`);
  };
  const load = os.loadavg()[0].toFixed(1);
  // Alternated, so that a machine getting busier mid-run weighs on both sides alike.
  const samples = { without: [], base: [] };
  for (let i = 0; i < 3; i++) {
    for (const [side, extra] of [['without', []], ['base', ['--base', 'bench-base']]]) {
      const start = performance.now();
      check(...extra)();
      samples[side].push(performance.now() - start);
    }
  }
  const median = (xs) => xs.sort((a, b) => a - b)[1];
  const without = median(samples.without);
  const withBase = median(samples.base);
  console.log(`${'1,000 changed configs: check --base (CLI)'.padEnd(64)} ${withBase.toFixed(1).padStart(9)} ms (median of 3)`);
  console.log(`${'1,000 changed configs: the same check without --base (CLI)'.padEnd(64)} ${without.toFixed(1).padStart(9)} ms (median of 3)`);
  console.log(`${'    ratio --base / without'.padEnd(64)} ${(withBase / without).toFixed(2).padStart(9)}   (load average ${load} on ${os.availableParallelism()} cores)`);
  rmSync(dir, { recursive: true, force: true });
}

// `rankfloor measure` on invented data: grey 28×28 "ink blot" images (two to four Gaussian blots
// each, 8-bit), written as a .npy file; every built-in 2D partition. Each run is a child process,
// so the peak memory printed is that run's own.
{
  const { mkdtempSync, writeFileSync, rmSync } = await import('node:fs');
  const { join } = await import('node:path');
  const { spawnSync } = await import('node:child_process');
  const inkBlots = (n) => {
    let s = 7;
    const random = () => {
      s = (s * 1103515245 + 12345) % 2147483648;
      return s / 2147483648;
    };
    const data = new Uint8Array(n * 784);
    for (let k = 0; k < n; k++) {
      const blots = Array.from({ length: 2 + Math.floor(random() * 3) }, () => [6 + random() * 16, 6 + random() * 16, 1.5 + random() * 2.5]);
      for (let y = 0; y < 28; y++) {
        for (let x = 0; x < 28; x++) {
          const v = blots.reduce((a, [cx, cy, r]) => a + Math.exp(-((x - cx) ** 2 + (y - cy) ** 2) / (2 * r * r)), 0);
          data[k * 784 + y * 28 + x] = Math.min(255, Math.round(255 * v));
        }
      }
    }
    return data;
  };
  const npy = (data, shape) => {
    let header = `{'descr': '|u1', 'fortran_order': False, 'shape': (${shape.join(', ')}), }`;
    header += ' '.repeat((64 - ((10 + header.length + 1) % 64)) % 64) + '\n';
    const head = Buffer.from([0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59, 1, 0, 0, 0]);
    head.writeUInt16LE(header.length, 8);
    return Buffer.concat([head, Buffer.from(header, 'latin1'), Buffer.from(data)]);
  };
  const dir = mkdtempSync(join(os.tmpdir(), 'rankfloor-bench-'));
  const run = (label, file, batch, samples) => {
    const r = spawnSync(process.execPath, [new URL('./measure-data.mjs', import.meta.url).pathname, file, String(batch), ...(samples ? [String(samples)] : [])], { encoding: 'utf8' });
    if (r.status !== 0) throw new Error(r.stderr);
    const out = JSON.parse(r.stdout);
    console.log(`${label.padEnd(64)} ${out.ms.toFixed(0).padStart(9)} ms, peak ${out.maxRssMiB.toFixed(0)} MiB`);
    for (const p of out.partitions) console.log(`    ${p.partition.padEnd(14)} ${p.bits.toFixed(2)} bits${p.saturated ? ` (saturated: ${p.saturated})` : ''}`);
  };
  console.log(`(measure runs below: load average ${os.loadavg()[0].toFixed(1)} on ${os.cpus().length} cores at their start)`);
  try {
    const ten = join(dir, 'blots-10k.npy');
    writeFileSync(ten, npy(inkBlots(10000), [10000, 28, 28]));
    run('measure: 10,000 × 28×28, 3 partitions, batch 256 (default)', ten, 256);
    run('measure: 10,000 × 28×28, 3 partitions, batch 128', ten, 128);
    const hundred = join(dir, 'blots-100k.npy');
    const block = inkBlots(10000);
    const big = new Uint8Array(100000 * 784);
    for (let i = 0; i < 10; i++) big.set(block, i * block.length);
    writeFileSync(hundred, npy(big, [100000, 28, 28]));
    run('measure: a 100,000 × 28×28 file (78 MB), 2,048 of its samples', hundred, 256, 2048);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

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
