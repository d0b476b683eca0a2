/**
 * Random generators of small models, one per family the bound engine must handle (tree 1D/2D,
 * shared and unshared; overlapping convolutions; deep recurrences; explicit networks with loops
 * and hyperedges), together with the partitions to test. Every draw comes from a seeded Rng, so a
 * case is reproduced from (family, seed) alone. Generated models are valid by construction
 * (windows tile, valid kernels fit); sizes stay small so that the exact ranks stay within reach of
 * the oracle.
 */
import type { ExplicitModel, LayeredModel, Shape } from '../../src/config/model.js';
import type { Partition } from '../../src/partition/partition.js';
import { defaultPartitions } from '../../src/partition/partition.js';
import type { Rng } from './field.js';
import {
  conv,
  dense,
  explicit,
  globalPool,
  layered,
  maskPartition,
  partition,
  pool,
  recurrent,
  type BondDraft,
  type LayerDraft,
  type TensorDraft,
} from './models.js';
import { axisGeometry, type SurrogateKind } from './surrogate.js';

export interface LayeredCase {
  readonly model: LayeredModel;
  readonly surrogate: SurrogateKind;
  readonly partitions: Partition[];
}

export interface ExplicitCase {
  readonly model: ExplicitModel;
  readonly partitions: Partition[];
}

/** Weighted towards 2–3: a dimension of 1 anywhere tends to make the whole rank 1. */
const FEATURES = [1, 2, 2, 2, 3, 3];
const CHANNELS = [1, 2, 2, 2, 3, 3, 4, 4, 5];
const SMALL = [1, 2, 2, 2, 3, 3];
const LEG = [1, 2, 2, 3, 3, 4];
const BOND = [1, 2, 2, 3, 3, 4];

function divisorsAbove1(n: number): number[] {
  const d: number[] = [];
  for (let k = 2; k <= n; k++) if (n % k === 0) d.push(k);
  return d;
}

/** A random side-A mask with both sides non-empty (n ≥ 2). */
export function randomMask(rng: Rng, n: number): Uint8Array {
  for (;;) {
    const side = new Uint8Array(n);
    let a = 0;
    for (let p = 0; p < n; p++) {
      if (rng.chance(0.5)) {
        side[p] = 1;
        a++;
      }
    }
    if (a > 0 && a < n) return side;
  }
}

/** Built-in partitions that fit the shape, plus `extra` random masks. */
function partitionsFor(rng: Rng, shape: Shape, extra: number): Partition[] {
  const n = shape.reduce((a, b) => a * b, 1);
  const ps = defaultPartitions(shape).map((spec) => partition(spec, shape));
  for (let i = 0; i < extra; i++) {
    const mask = randomMask(rng, n);
    // Half of them through the `positions:` parser, half as direct masks.
    if (rng.chance(0.5)) {
      const list: number[] = [];
      mask.forEach((s, p) => {
        if (s === 1) list.push(p);
      });
      ps.push(partition(`positions:${list.join(',')}`, shape));
    } else {
      ps.push(maskPartition(mask));
    }
  }
  return ps;
}

/** Tree surrogate, 1D input, stacks of (conv; pool or strided conv). */
export function tree1d(rng: Rng, shared: boolean): LayeredCase {
  const n = rng.pick([2, 3, 4, 4, 6, 6, 8, 8, 9, 12, 16]);
  const m = rng.pick(FEATURES);
  const layers: LayerDraft[] = [];
  let len = n;
  if (rng.chance(0.1)) {
    const w = rng.pick(divisorsAbove1(len));
    layers.push(pool([w]));
    len /= w;
  }
  while (len > 1) {
    const r = rng.pick(CHANNELS);
    const ds = divisorsAbove1(len);
    const kernel = [rng.int(1, Math.min(3, len))];
    // The tree surrogate ignores kernel and padding; both vary so that the engine must too.
    const padding = rng.chance(0.3) ? 'valid' : 'same';
    if (rng.chance(0.25)) {
      const s = rng.pick(ds);
      layers.push(conv(r, { kernel, stride: [s], padding }));
      len /= s;
      continue;
    }
    layers.push(conv(r, { kernel, padding }));
    if (rng.chance(0.15)) {
      layers.push(globalPool());
      len = 1;
    } else if (rng.chance(0.85)) {
      const w = rng.pick(ds);
      layers.push(pool([w]));
      len /= w;
    }
  }
  if (rng.chance(0.3)) layers.push(conv(rng.pick(CHANNELS)));
  if (rng.chance(0.2)) layers.push(dense(rng.pick(CHANNELS)));
  return { model: layered([n], m, shared, layers), surrogate: 'tree', partitions: partitionsFor(rng, [n], 2) };
}

const SHAPES_2D: readonly (readonly [number, number])[] = [
  [2, 2],
  [2, 2],
  [2, 4],
  [4, 2],
  [2, 3],
  [3, 3],
  [4, 4],
  [4, 4],
  [1, 4],
];

function window2d(rng: Rng, h: number, w: number): [number, number] {
  for (;;) {
    const a = rng.pick([1, ...divisorsAbove1(h)]);
    const b = rng.pick([1, ...divisorsAbove1(w)]);
    if (a * b > 1) return [a, b];
  }
}

/** Tree surrogate, 2D input: pool windows 2×2, 1×2, 3×3 …, strided convs. */
export function tree2d(rng: Rng, shared: boolean): LayeredCase {
  const [h0, w0] = rng.pick(SHAPES_2D);
  const m = rng.pick(FEATURES);
  const layers: LayerDraft[] = [];
  let h = h0;
  let w = w0;
  while (h * w > 1) {
    const r = rng.pick(CHANNELS);
    const kernel = [rng.int(1, Math.min(3, h)), rng.int(1, Math.min(3, w))];
    const padding = rng.chance(0.3) ? 'valid' : 'same';
    const win = window2d(rng, h, w);
    if (rng.chance(0.25)) {
      layers.push(conv(r, { kernel, stride: win, padding }));
    } else {
      layers.push(conv(r, { kernel, padding }));
      if (rng.chance(0.1)) {
        layers.push(globalPool());
        h = 1;
        w = 1;
        continue;
      }
      layers.push(pool(win));
    }
    h /= win[0];
    w /= win[1];
  }
  if (rng.chance(0.2)) layers.push(dense(rng.pick(CHANNELS)));
  return { model: layered([h0, w0], m, shared, layers), surrogate: 'tree', partitions: partitionsFor(rng, [h0, w0], 1) };
}

/** Overlap surrogate, 1D: kernels 1–3, mostly stride 1, same and valid padding, product pools. */
export function overlap1d(rng: Rng): LayeredCase {
  const n = rng.int(2, 8);
  const m = rng.pick([1, 2, 2]);
  const layers: LayerDraft[] = [];
  let len = n;
  const blocks = rng.int(1, 3);
  for (let b = 0; b < blocks && len > 1; b++) {
    const r = rng.pick([1, 2, 2]);
    const k = rng.int(1, Math.min(3, len));
    const s = rng.chance(0.2) ? rng.pick([2, 2, 3]) : 1;
    const padding = rng.chance(0.3) ? 'valid' : 'same';
    layers.push(conv(r, { kernel: [k], stride: [s], padding }));
    len = axisGeometry(len, k, s, padding).out;
    if (len > 1 && rng.chance(0.1)) {
      layers.push(globalPool());
      len = 1;
    } else if (len > 1 && rng.chance(0.7)) {
      const w = rng.pick(divisorsAbove1(len));
      layers.push(pool([w]));
      len /= w;
    }
  }
  const shared = rng.chance(0.5);
  return { model: layered([n], m, shared, layers), surrogate: 'overlap', partitions: partitionsFor(rng, [n], 1) };
}

/** Overlap surrogate, 2D. */
export function overlap2d(rng: Rng): LayeredCase {
  const [h0, w0] = rng.pick([
    [2, 2],
    [2, 3],
    [3, 2],
    [2, 4],
    [3, 3],
    [4, 4],
  ] as const);
  const m = rng.int(1, 2);
  const layers: LayerDraft[] = [];
  let h: number = h0;
  let w: number = w0;
  const blocks = rng.int(1, 2);
  for (let b = 0; b < blocks && h * w > 1; b++) {
    const r = rng.int(1, 2);
    const kernel = [rng.int(1, Math.min(3, h)), rng.int(1, Math.min(3, w))];
    const stride = rng.chance(0.15) ? [rng.int(1, 2), 2] : [1, 1];
    const padding = rng.chance(0.3) ? 'valid' : 'same';
    layers.push(conv(r, { kernel, stride, padding }));
    h = axisGeometry(h, kernel[0] as number, stride[0] as number, padding).out;
    w = axisGeometry(w, kernel[1] as number, stride[1] as number, padding).out;
    if (h * w > 1 && rng.chance(0.6)) {
      const win = window2d(rng, h, w);
      layers.push(pool(win));
      h /= win[0];
      w /= win[1];
    }
  }
  const shared = rng.chance(0.5);
  return { model: layered([h0, w0], m, shared, layers), surrogate: 'overlap', partitions: partitionsFor(rng, [h0, w0], 1) };
}

/** Recurrent arithmetic circuits of depth 1–3, optionally after a conv (and a pool). */
export function recurrentCase(rng: Rng, depth: number): LayeredCase {
  const t = rng.int(2, 8);
  const m = rng.pick(FEATURES);
  const layers: LayerDraft[] = [];
  let surrogate: SurrogateKind = 'tree';
  let len = t;
  const before = rng.int(0, 9);
  if (before >= 7) {
    const k = rng.int(1, Math.min(3, t));
    surrogate = rng.chance(0.5) ? 'overlap' : 'tree';
    layers.push(conv(rng.pick(SMALL), { kernel: [k] }));
    if (before === 9 && len % 2 === 0 && len > 2) {
      layers.push(pool([2]));
      len /= 2;
    }
  }
  layers.push(recurrent(rng.pick(SMALL), depth));
  // Rarely: layers on the single remaining position (a per-position conv, a second recurrence
  // over a length-1 sequence).
  if (rng.chance(0.08)) layers.push(conv(rng.pick(SMALL)));
  if (rng.chance(0.05)) layers.push(recurrent(rng.pick(SMALL), rng.int(1, 2)));
  if (rng.chance(0.2)) layers.push(dense(rng.pick(SMALL)));
  return { model: layered([t], m, rng.chance(0.5), layers), surrogate, partitions: partitionsFor(rng, [t], 2) };
}

/**
 * Explicit networks: 3–6 tensors on a random connected graph with extra edges (loops), bond
 * dimensions 1–4, some hyperedges of 3–4 tensors, open legs of dimension 1–4 (total ≤ 4096).
 */
export function explicitCase(rng: Rng): ExplicitCase {
  const nt = rng.int(3, 6);
  const names = Array.from({ length: nt }, (_, i) => `t${i}`);
  const bonds: BondDraft[] = [];
  for (let i = 1; i < nt; i++) bonds.push({ tensors: [names[rng.int(0, i - 1)] as string, names[i] as string], dim: rng.pick(BOND) });
  const extra = rng.int(0, 3);
  for (let e = 0; e < extra; e++) {
    const a = rng.int(0, nt - 1);
    let b = rng.int(0, nt - 2);
    if (b >= a) b++;
    bonds.push({ tensors: [names[a] as string, names[b] as string], dim: rng.pick(BOND) });
  }
  if (nt >= 3 && rng.chance(0.4)) {
    const size = Math.min(nt, rng.int(3, 4));
    const pool: string[] = names.slice();
    const members: string[] = [];
    for (let i = 0; i < size; i++) members.push(pool.splice(rng.int(0, pool.length - 1), 1)[0] as string);
    bonds.push({ tensors: members, dim: rng.int(2, 3) });
  }
  // Open legs: every tensor gets 0–2, at least two in total; each leg its own position, sometimes
  // two legs share one.
  const legs: { tensor: number; dim: number }[] = [];
  let open = 1;
  for (let i = 0; i < nt; i++) {
    const count = rng.int(0, 2);
    for (let c = 0; c < count; c++) {
      const d = rng.pick(LEG);
      if (open * d > 4096) continue;
      open *= d;
      legs.push({ tensor: i, dim: d });
    }
  }
  while (legs.length < 2) legs.push({ tensor: rng.int(0, nt - 1), dim: 2 });
  const positionOf: number[] = [];
  let positions = 0;
  for (let l = 0; l < legs.length; l++) {
    if (positions > 0 && rng.chance(0.15)) positionOf.push(rng.int(0, positions - 1));
    else positionOf.push(positions++);
  }
  if (positions < 2) {
    positionOf[positionOf.length - 1] = 1;
    positions = 2;
  }
  const tensors: TensorDraft[] = names.map((name, i) => ({
    name,
    legs: legs.flatMap((l, j) => (l.tensor === i ? [[positionOf[j] as number, l.dim] as const] : [])),
  }));
  const shape = [positions];
  const partitions: Partition[] = [];
  const tries = rng.int(2, 3);
  for (let i = 0; i < tries; i++) partitions.push(maskPartition(randomMask(rng, positions)));
  if (positions >= 2) partitions.push(partition('start-end', shape));
  return { model: explicit(shape, tensors, bonds), partitions };
}
