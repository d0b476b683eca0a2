/**
 * Random generators of small models, one per family the bound engine must handle: the tree and
 * overlap stacks of every layer kind (1D and 2D, shared and unshared), residual blocks, branches,
 * long skips, upsampling, flatten + dense stacks, overlapping pools, dilation, causal padding,
 * grouped and depthwise convs, transposed convs, output positions, deep recurrences and explicit
 * networks, together with the partitions to test. Every draw comes from a seeded Rng, so a case is
 * reproduced from (family, seed) alone.
 *
 * Models are valid by construction: a family proposes a layer or a block and keeps it only when
 * the oracle's reading of the model (plan.ts) accepts it and the grid stays small; otherwise it
 * proposes again. Sizes stay small (≤ 16 positions, widths ≤ 5) so that exact ranks stay within
 * reach of the probe.
 */
import type { ExplicitModel, LayeredModel, Shape } from '../../src/config/model.js';
import type { Partition } from '../../src/partition/partition.js';
import { defaultPartitions } from '../../src/partition/partition.js';
import type { Rng } from './field.js';
import { count } from './geometry.js';
import {
  act,
  branches,
  conv,
  convTranspose,
  attention,
  classToken,
  dense,
  depthwise,
  dropout,
  embedding,
  explicit,
  flatten,
  globalPool,
  layered,
  maskPartition,
  named,
  norm,
  partition,
  pool,
  positions,
  recurrent,
  residual,
  scaling,
  skip,
  upsample,
  type BondDraft,
  type Item,
  type LayeredOptions,
  type PaddingSpec,
  type TensorDraft,
} from './models.js';
import { planModel, type GridShape, type SurrogateKind } from './plan.js';
import { compile, WeightStore } from './surrogate.js';

export interface LayeredCase {
  readonly model: LayeredModel;
  readonly surrogate: SurrogateKind;
  readonly partitions: Partition[];
}

export interface ExplicitCase {
  readonly model: ExplicitModel;
  readonly partitions: Partition[];
}

export type Dims = 1 | 2;

/** Weighted towards 2–3: a dimension of 1 anywhere tends to make the whole rank 1. */
const FEATURES = [1, 2, 2, 2, 3, 3];
const CHANNELS = [1, 2, 2, 2, 3, 3, 4, 4, 5];
const SMALL = [1, 2, 2, 2, 3, 3];
const LEG = [1, 2, 2, 3, 3, 4];
const BOND = [1, 2, 2, 3, 3, 4];

const SHAPES_1D = [2, 3, 4, 4, 6, 6, 8, 8, 9, 12, 16];
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
  const n = count(shape);
  const ps = defaultPartitions(shape).map((spec) => partition(spec, shape));
  if (n < 2) return ps;
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

/**
 * A model under construction: items are kept only while the oracle's plan accepts the model and
 * the last grid stays within the size limits.
 */
class Draw {
  readonly items: Item[] = [];
  names = 0;
  /** A token input's vocabulary (then M = V). */
  vocabulary: number | undefined;
  constructor(
    readonly rng: Rng,
    readonly shape: Shape,
    readonly m: number | undefined,
    readonly shared: boolean,
    readonly surrogate: SurrogateKind,
    readonly limits: { positions: number; width: number } = { positions: 16, width: 6 },
  ) {}

  model(opts: LayeredOptions = {}): LayeredModel {
    return layered(this.shape, this.m, this.shared, this.items, this.vocabulary !== undefined ? { ...opts, vocabulary: this.vocabulary } : opts);
  }

  /** The current grid (the input's when nothing is placed yet; its width is M or 0 if unknown). */
  grid(): GridShape {
    if (this.items.length === 0) return { dims: this.shape, width: this.vocabulary ?? this.m ?? 0 };
    const p = planModel(this.model(), this.surrogate);
    return p.grids[p.grids.length - 1] as GridShape;
  }

  positions(): number {
    return count(this.grid().dims);
  }

  /** Appends the items if the model stays valid and small; reports whether it did. */
  push(...items: Item[]): boolean {
    const before = this.items.length;
    this.items.push(...items);
    try {
      const p = planModel(this.model(), this.surrogate);
      const ok = p.grids.every((g) => count(g.dims) <= this.limits.positions && g.width <= this.limits.width);
      if (ok) return true;
    } catch {
      // rejected: the proposal does not fit (a window too wide, paths that disagree, ...)
    }
    this.items.length = before;
    return false;
  }

  /** Tries proposals until one fits (at most `tries`); reports whether one did. */
  attempt(propose: () => Item[], tries = 12): boolean {
    for (let i = 0; i < tries; i++) if (this.push(...propose())) return true;
    return false;
  }

  /** A layer width: up to 4 under `tree`, up to 2 under `overlap` (whose ranks grow fast). */
  width(): number {
    return this.rng.pick(this.surrogate === 'tree' ? [1, 2, 2, 3, 3, 4] : [1, 2, 2]);
  }

  name(prefix: string): string {
    return `${prefix}${this.names++}`;
  }

  done(extraPartitions: number, opts: LayeredOptions = {}): LayeredCase {
    return { model: this.model(opts), surrogate: this.surrogate, partitions: distinct(partitionsFor(this.rng, this.shape, extraPartitions)) };
  }
}

/**
 * A Draw for a block family: the shape from the lists (under `overlap` only those of at most 6
 * positions), M drawn or left to its default, shared or not.
 */
function blockDraw(rng: Rng, dims: Dims, surrogate: SurrogateKind, oneD: readonly number[], twoD: readonly (readonly [number, number])[], limits?: { positions: number; width: number }): Draw {
  const small = (n: number): boolean => surrogate === 'tree' || n <= 6;
  const shape = shapeOf(rng, dims, oneD.filter(small), twoD.filter(([h, w]) => small(h * w)));
  const m = rng.chance(0.2) ? undefined : rng.pick(surrogate === 'tree' ? FEATURES : [1, 2, 2]);
  return new Draw(rng, shape, m, rng.chance(0.5), surrogate, limits);
}

function shapeOf(rng: Rng, dims: Dims, oneD: readonly number[] = SHAPES_1D, twoD: readonly (readonly [number, number])[] = SHAPES_2D): number[] {
  return dims === 1 ? [rng.pick(oneD)] : [...rng.pick(twoD)];
}

const perAxis = (dims: number, f: () => number): number[] => Array.from({ length: dims }, f);

function paddingOf(rng: Rng, dims: number, causalAllowed: boolean): PaddingSpec {
  const x = rng.u32() % 10;
  if (x < 5) return 'same';
  if (x < 7) return 'valid';
  if (x < 9 && causalAllowed && dims === 1) return 'causal';
  return perAxis(dims, () => rng.int(0, 1));
}

/** A random conv: kernel 1–3, stride mostly 1, dilation mostly 1, any padding the grid allows. */
function randomConv(rng: Rng, dims: number, r: number, o: { strided?: number; dilated?: number; causal?: boolean } = {}): Item {
  const kernel = perAxis(dims, () => rng.int(1, 3));
  const stride = perAxis(dims, () => (rng.chance(o.strided ?? 0.15) ? rng.int(2, 3) : 1));
  const dilation = perAxis(dims, () => (rng.chance(o.dilated ?? 0.1) ? rng.int(2, 3) : 1));
  return conv(r, { kernel, stride, dilation, padding: paddingOf(rng, dims, o.causal ?? true) });
}

/** A pool that reduces the grid: window 2–3 per axis (1 where an axis is 1), stride = window mostly. */
function randomPool(rng: Rng, grid: GridShape, overlap = 0.15): Item {
  const window = grid.dims.map((n) => (n === 1 ? 1 : rng.int(2, Math.min(3, n))));
  const stride = window.map((w) => (rng.chance(overlap) ? rng.int(1, w) : w));
  // Explicit padding at most half the window, as frameworks require: no window reads only padding.
  const pad: PaddingSpec = rng.chance(0.7) ? 'valid' : rng.chance(0.5) ? 'same' : window.map((w) => rng.int(0, Math.floor(w / 2)));
  return pool(window, { stride, padding: pad });
}

/** Ends a model: a global pool, one more reducing pool, or nothing (an output position). */
function finish(d: Draw, globalChance = 0.4): void {
  if (d.positions() === 1) return;
  if (d.rng.chance(globalChance)) d.push(globalPool());
}

// ---------------------------------------------------------------------------------------------
// The stacks of the first wave, now with the real grid arithmetic of the tree conv.

/** Tree surrogate, 1D input, stacks of (conv; pool or strided conv). */
export function tree1d(rng: Rng, shared: boolean): LayeredCase {
  const d = new Draw(rng, shapeOf(rng, 1), rng.pick(FEATURES), shared, 'tree');
  if (rng.chance(0.1)) d.attempt(() => [randomPool(rng, d.grid(), 0)]);
  for (let step = 0; step < 6 && d.positions() > 1; step++) {
    const r = rng.pick(CHANNELS);
    if (rng.chance(0.25)) {
      d.attempt(() => [randomConv(rng, 1, r, { strided: 1 })]);
      continue;
    }
    d.attempt(() => [randomConv(rng, 1, r, { strided: 0 })]);
    if (rng.chance(0.15)) d.push(globalPool());
    else if (rng.chance(0.85) && d.positions() > 1) d.attempt(() => [randomPool(rng, d.grid(), 0.1)]);
  }
  if (d.positions() > 1 && rng.chance(0.7)) d.push(globalPool());
  if (rng.chance(0.3)) d.push(conv(rng.pick(CHANNELS)));
  if (rng.chance(0.2)) d.push(dense(rng.pick(CHANNELS)));
  return d.done(2);
}

/** Tree surrogate, 2D input: pool windows 2×2, 1×2, 3×3 …, strided convs. */
export function tree2d(rng: Rng, shared: boolean): LayeredCase {
  const d = new Draw(rng, shapeOf(rng, 2), rng.pick(FEATURES), shared, 'tree');
  for (let step = 0; step < 5 && d.positions() > 1; step++) {
    const r = rng.pick(CHANNELS);
    if (rng.chance(0.25)) {
      d.attempt(() => [randomConv(rng, 2, r, { strided: 0.6 })]);
      continue;
    }
    d.attempt(() => [randomConv(rng, 2, r, { strided: 0 })]);
    if (rng.chance(0.1)) d.push(globalPool());
    else if (d.positions() > 1) d.attempt(() => [randomPool(rng, d.grid(), 0.1)]);
  }
  if (d.positions() > 1 && rng.chance(0.7)) d.push(globalPool());
  if (rng.chance(0.2)) d.push(dense(rng.pick(CHANNELS)));
  return d.done(1);
}

/** Overlap surrogate, 1D: kernels 1–3, dilation, strides, every padding, product pools. */
export function overlap1d(rng: Rng): LayeredCase {
  const d = new Draw(rng, [rng.int(2, 8)], rng.pick([1, 2, 2]), rng.chance(0.5), 'overlap');
  const blocks = rng.int(1, 3);
  for (let b = 0; b < blocks && d.positions() > 1; b++) {
    d.attempt(() => [randomConv(rng, 1, rng.pick([1, 2, 2]), { strided: 0.2, dilated: 0.15 })]);
    if (d.positions() > 1 && rng.chance(0.1)) d.push(globalPool());
    else if (d.positions() > 1 && rng.chance(0.7)) d.attempt(() => [randomPool(rng, d.grid(), 0.2)]);
  }
  finish(d, 0.5);
  return d.done(1);
}

/** Overlap surrogate, 2D. */
export function overlap2d(rng: Rng): LayeredCase {
  const shape = [...rng.pick([[2, 2], [2, 3], [3, 2], [2, 4], [3, 3], [4, 4]] as const)];
  const d = new Draw(rng, shape, rng.int(1, 2), rng.chance(0.5), 'overlap');
  const blocks = rng.int(1, 2);
  for (let b = 0; b < blocks && d.positions() > 1; b++) {
    d.attempt(() => [randomConv(rng, 2, rng.int(1, 2), { strided: 0.15, dilated: 0.1 })]);
    if (d.positions() > 1 && rng.chance(0.6)) d.attempt(() => [randomPool(rng, d.grid(), 0.2)]);
  }
  finish(d, 0.5);
  return d.done(1);
}

/** Recurrent arithmetic circuits of depth 1–3, optionally after a conv (and a pool). */
export function recurrentCase(rng: Rng, depth: number): LayeredCase {
  const t = rng.int(2, 8);
  const before = rng.int(0, 9);
  const surrogate: SurrogateKind = before >= 7 && rng.chance(0.5) ? 'overlap' : 'tree';
  const d = new Draw(rng, [t], rng.pick(FEATURES), rng.chance(0.5), surrogate);
  if (before >= 7) {
    d.push(conv(rng.pick(SMALL), { kernel: [rng.int(1, Math.min(3, t))] }));
    if (before === 9 && t % 2 === 0 && t > 2) d.push(pool([2]));
  }
  d.push(recurrent(rng.pick(SMALL), depth));
  // Rarely: layers on the single remaining position (a per-position conv, a second recurrence
  // over a length-1 sequence).
  if (rng.chance(0.08)) d.push(conv(rng.pick(SMALL)));
  if (rng.chance(0.05)) d.push(recurrent(rng.pick(SMALL), rng.int(1, 2)));
  if (rng.chance(0.2)) d.push(dense(rng.pick(SMALL)));
  return d.done(2);
}

// ---------------------------------------------------------------------------------------------
// Blocks.

/** A stem conv, so that the blocks after it read a mapped grid (M defaults to its width). */
function stem(d: Draw, dims: number, r: number): void {
  d.attempt(() => [conv(r, { kernel: perAxis(dims, () => d.rng.int(1, 3)), padding: 'same' })]);
}

const fillAxes = (dims: number, v: number): number[] => perAxis(dims, () => v);

/** Residual blocks: identity or projection shortcuts, bottlenecks, strided and pooled main paths. */
export function residualCase(rng: Rng, dims: Dims, surrogate: SurrogateKind): LayeredCase {
  const d = blockDraw(rng, dims, surrogate, [2, 4, 4, 6, 8, 8], [[2, 2], [2, 3], [2, 4], [4, 2], [4, 4], [3, 3]]);
  stem(d, dims, Math.max(2, d.width()));
  const blocks = rng.int(1, 2);
  for (let b = 0; b < blocks; b++) {
    const r = d.grid().width;
    const k = (): number[] => perAxis(dims, () => rng.int(1, 3));
    const s2 = fillAxes(dims, 2);
    d.attempt(() => {
      const kind = rng.int(0, 4);
      const narrow = rng.int(1, Math.max(1, r - 1));
      const act1 = rng.chance(0.6) ? [act()] : [];
      const nrm = rng.chance(0.4) ? [norm()] : [];
      const r2 = d.width();
      // kind 2–4: a 1×1 projection shortcut, strided (2, 3) or not (4).
      const shortcut = [conv(r2, { kernel: fillAxes(dims, 1), stride: kind === 4 ? fillAxes(dims, 1) : s2, padding: 'same' })];
      switch (kind) {
        case 0: // bottleneck, identity shortcut
          return [residual([conv(narrow, { kernel: k() }), ...nrm, ...act1, conv(r, { kernel: k() })])];
        case 1:
          return [residual([conv(r, { kernel: k() })])];
        case 2: // strided main path next to a strided projection
          return [residual([conv(r2, { kernel: k(), stride: s2 }), ...act1, conv(r2, { kernel: k() })], shortcut)];
        case 3: // pooled main path next to a strided projection
          return [residual([conv(r2, { kernel: k() }), ...nrm, pool(s2)], shortcut)];
        default:
          return [residual([conv(narrow, { kernel: k() }), ...act1, conv(r2, { kernel: k() })], shortcut)];
      }
    });
    if (rng.chance(0.4)) d.push(act());
  }
  finish(d, 0.6);
  return d.done(1);
}

/** Parallel branches merged by sum or concatenation (inception-style). */
export function branchesCase(rng: Rng, dims: Dims, surrogate: SurrogateKind): LayeredCase {
  const d = blockDraw(rng, dims, surrogate, [2, 3, 4, 4, 6, 8], [[2, 2], [2, 3], [2, 4], [3, 3], [4, 4]]);
  const r = d.width();
  stem(d, dims, r);
  const mode = rng.chance(0.5) ? 'sum' : 'concat';
  d.attempt(() => {
    // A sum needs equal widths: every path ends at width r.
    const w = (): number => (mode === 'sum' ? r : rng.int(1, 2));
    const one = fillAxes(dims, 1);
    const three = fillAxes(dims, 3);
    const path = (): Item[] => {
      switch (rng.int(0, 5)) {
        case 0:
          return mode === 'sum' ? [] : [conv(w(), { kernel: one })];
        case 1:
          return [conv(w(), { kernel: one })];
        case 2:
          return [conv(w(), { kernel: three })];
        case 3:
          return [conv(rng.int(1, 2), { kernel: one }), act(), conv(w(), { kernel: three })];
        case 4:
          return [pool(three, { stride: one, padding: 'same' }), conv(w(), { kernel: one })];
        default:
          return [conv(w(), { kernel: fillAxes(dims, 2), dilation: fillAxes(dims, 2) })];
      }
    };
    return [branches(mode, Array.from({ length: rng.int(2, 3) }, path))];
  });
  if (rng.chance(0.5)) d.attempt(() => [randomConv(rng, dims, d.width(), { strided: 0.3 })]);
  finish(d, 0.6);
  return d.done(1);
}

/**
 * A transposed conv of stride 2 that doubles every axis: k + q − 2p = 2, i.e. (k, p, q) one of
 * (2, 0, 0), (3, 1, 1), (4, 1, 0) per axis.
 */
function doubling(rng: Rng, dims: number): { kernel: number[]; stride: number[]; padding: number[]; outputPadding: number[] } {
  const axes = perAxis(dims, () => rng.int(0, 2)).map((i) => [[2, 0, 0], [3, 1, 1], [4, 1, 0]][i] as [number, number, number]);
  return { kernel: axes.map((a) => a[0]), stride: fillAxes(dims, 2), padding: axes.map((a) => a[1]), outputPadding: axes.map((a) => a[2]) };
}

/** Encoder/decoder with long skips: downsample, upsample (nearest, linear or transposed conv), merge. */
export function skipsCase(rng: Rng, dims: Dims, surrogate: SurrogateKind): LayeredCase {
  const d = blockDraw(rng, dims, surrogate, [4, 4, 6, 8], [[2, 2], [2, 4], [4, 4], [4, 2]]);
  const levels = d.shape.every((n) => n % 4 === 0) && rng.chance(0.3) ? 2 : 1;
  const widths: number[] = [];
  const names: string[] = [];
  const two = fillAxes(dims, 2);
  for (let l = 0; l < levels; l++) {
    const r = d.width();
    const name = d.name('enc');
    d.attempt(() => [named(name, conv(r, { kernel: perAxis(dims, () => rng.int(1, 3)) }))]);
    widths.push(r);
    names.push(name);
    d.attempt(() => [rng.chance(0.6) ? pool(two) : conv(d.width(), { kernel: two, stride: two })]);
  }
  d.attempt(() => [conv(d.width(), { kernel: perAxis(dims, () => rng.int(1, 3)) })]);
  for (let l = levels - 1; l >= 0; l--) {
    const mode = rng.chance(0.5) ? 'concat' : 'sum';
    d.attempt(() => {
      const w = mode === 'sum' ? (widths[l] as number) : rng.pick([1, 2]);
      const up = rng.int(0, 2);
      const grow: Item[] =
        up === 0
          ? [upsample(two, 'nearest'), conv(w, { dims })]
          : up === 1
            ? [upsample(two, 'linear'), conv(w, { dims })]
            : [convTranspose(w, doubling(rng, dims))];
      return [...grow, skip(mode, names[l] as string)];
    }, 20);
    if (rng.chance(0.5)) d.attempt(() => [conv(d.width(), { kernel: perAxis(dims, () => rng.int(1, 3)) })]);
  }
  finish(d, 0.3);
  return d.done(1);
}

/** Upsampling (nearest and linear) between convs and pools. */
export function upsampleCase(rng: Rng, dims: Dims, surrogate: SurrogateKind): LayeredCase {
  const d = blockDraw(rng, dims, surrogate, [2, 2, 3, 4, 4], [[1, 2], [2, 2], [2, 1], [2, 3]]);
  stem(d, dims, d.width());
  const mode = (): 'nearest' | 'linear' => (rng.chance(0.5) ? 'nearest' : 'linear');
  // Factors 2–3 in 1D; in 2D 1–2 per axis, not both 1.
  const factor = (): number[] => (dims === 1 ? [rng.int(2, 3)] : rng.pick([[2, 2], [1, 2], [2, 1], [2, 2]]));
  d.attempt(() => [upsample(factor(), mode())]);
  d.attempt(() => [randomConv(rng, dims, d.width(), { strided: 0.2 })]);
  if (rng.chance(0.7)) d.attempt(() => [randomPool(rng, d.grid(), 0.3)]);
  if (rng.chance(0.3)) d.attempt(() => [upsample(fillAxes(dims, 2), mode()), conv(d.width(), { dims })]);
  finish(d, 0.5);
  return d.done(1);
}

/** Fully connected stacks: dense on the raw input or after flatten, activations (the square rule). */
export function mlpCase(rng: Rng, dims: Dims, surrogate: SurrogateKind): LayeredCase {
  const d = blockDraw(rng, dims, surrogate, [2, 3, 4, 4, 5, 6], [[2, 2], [1, 3], [2, 3]], { positions: 16, width: 12 });
  if (rng.chance(0.5)) {
    // A conv front end, then flatten.
    stem(d, dims, rng.pick([1, 2]));
    if (rng.chance(0.4)) d.attempt(() => [randomPool(rng, d.grid(), 0.3)]);
    if (rng.chance(0.3)) d.push(act());
    d.push(flatten());
  } else if (rng.chance(0.3)) {
    d.push(rng.chance(0.5) ? norm('layer_norm') : dropout());
  }
  const layers = rng.int(1, 3);
  for (let l = 0; l < layers; l++) {
    d.push(dense(rng.pick([1, 2, 2, 3, 3, 4])));
    if (rng.chance(0.3)) d.push(rng.pick([norm(), dropout(), scaling()]));
    if (rng.chance(0.7)) d.push(act(rng.pick(['relu', 'gelu', 'tanh'])));
    if (rng.chance(0.15)) d.push(act('relu'));
  }
  if (rng.chance(0.3)) d.push(dense(rng.pick([1, 2, 3])));
  return d.done(2);
}

/** Overlapping pools (stride < window), with every padding. */
export function poolsCase(rng: Rng, dims: Dims, surrogate: SurrogateKind): LayeredCase {
  const d = blockDraw(rng, dims, surrogate, [3, 4, 5, 6, 8], [[2, 3], [3, 3], [3, 2], [2, 4], [4, 4]]);
  for (let b = 0; b < 2 && d.positions() > 1; b++) {
    d.attempt(() => [randomConv(rng, dims, d.width(), { strided: 0 })]);
    d.attempt(() => [randomPool(rng, d.grid(), 0.8)]);
  }
  finish(d, 0.5);
  return d.done(1);
}

/** Dilated convs (kernel 2–3, dilation 2–3), with pools between. */
export function dilationCase(rng: Rng, dims: Dims, surrogate: SurrogateKind): LayeredCase {
  const d = blockDraw(rng, dims, surrogate, [4, 5, 6, 8, 8], [[2, 3], [3, 3], [2, 4], [4, 4], [4, 3]]);
  for (let b = 0; b < 2 && d.positions() > 1; b++) {
    d.attempt(() => [randomConv(rng, dims, d.width(), { dilated: 0.9, strided: 0.2, causal: false })]);
    if (rng.chance(surrogate === 'tree' ? 0.8 : 0.5) && d.positions() > 1) d.attempt(() => [randomPool(rng, d.grid(), 0.2)]);
  }
  finish(d, 0.5);
  return d.done(1);
}

/** 1D stacks of causal convs (dilated, sometimes strided); the default output is the last position. */
export function causalCase(rng: Rng, surrogate: SurrogateKind): LayeredCase {
  const d = blockDraw(rng, 1, surrogate, [3, 4, 5, 6, 8], []);
  const layers = rng.int(1, 3);
  for (let l = 0; l < layers || d.items.length === 0; l++) {
    d.attempt(() => [
      conv(d.width(), {
        kernel: [rng.int(1, 3)],
        dilation: [rng.pick([1, 1, 2, 4])],
        stride: [rng.chance(surrogate === 'tree' ? 0.7 : 0.2) ? rng.int(2, 3) : 1],
        padding: 'causal',
      }),
    ]);
    if (rng.chance(0.2)) d.push(act());
    // Under `tree` only strides and pools couple positions; a pool is not a conv, so the output
    // stays the last position by default.
    if (surrogate === 'tree' && d.positions() > 2 && rng.chance(0.4)) d.attempt(() => [pool([2], { stride: [rng.int(1, 2)] })]);
  }
  if (d.positions() > 1 && rng.chance(0.2)) d.push(globalPool());
  const opts: LayeredOptions = d.positions() > 1 && rng.chance(0.3) ? { output: [rng.int(0, d.positions() - 1)] } : {};
  return d.done(2, opts);
}

/** Grouped and depthwise convs (depthwise-separable blocks). */
export function groupedCase(rng: Rng, dims: Dims, surrogate: SurrogateKind): LayeredCase {
  const d = blockDraw(rng, dims, surrogate, [2, 4, 4, 6, 8], [[2, 2], [2, 3], [2, 4], [3, 3], [4, 4]]);
  stem(d, dims, rng.pick(surrogate === 'tree' ? [2, 2, 3, 4] : [2, 2, 3]));
  for (let b = 0; b < 2 && d.positions() > 1; b++) {
    const width = d.grid().width;
    d.attempt(() => {
      const kernel = perAxis(dims, () => rng.int(1, 3));
      const stride = perAxis(dims, () => (rng.chance(0.25) ? 2 : 1));
      if (rng.chance(0.6)) {
        const multiplier = width > 2 ? 1 : rng.pick([1, 1, 2]);
        return [depthwise({ kernel, stride, depthMultiplier: multiplier, padding: rng.chance(0.8) ? 'same' : 'valid' }), conv(d.width(), { dims })];
      }
      const g = rng.pick(divisorsAbove1(width).length > 0 ? divisorsAbove1(width) : [1]);
      return [conv(g * rng.int(1, 2), { kernel, stride, groups: g })];
    });
    if (rng.chance(0.5) && d.positions() > 1) d.attempt(() => [randomPool(rng, d.grid(), 0.1)]);
  }
  finish(d, 0.5);
  return d.done(1);
}

/** Transposed convs (stride, dilation, padding, output padding) after a downsampling. */
export function transposeCase(rng: Rng, dims: Dims, surrogate: SurrogateKind): LayeredCase {
  const d = blockDraw(rng, dims, surrogate, [2, 3, 4, 4, 6], [[2, 2], [1, 2], [2, 3], [2, 4]]);
  stem(d, dims, d.width());
  if (d.positions() > 2 && rng.chance(0.5)) d.attempt(() => [randomPool(rng, d.grid(), 0)]);
  d.attempt(() => [
    convTranspose(d.width(), {
      kernel: perAxis(dims, () => rng.int(1, 3)),
      stride: perAxis(dims, () => rng.int(1, 3)),
      dilation: perAxis(dims, () => (rng.chance(0.2) ? 2 : 1)),
      padding: perAxis(dims, () => (rng.chance(0.3) ? 1 : 0)),
      outputPadding: perAxis(dims, () => (rng.chance(0.2) ? 1 : 0)),
      groups: rng.chance(0.2) ? d.grid().width : 1,
    }),
  ]);
  if (rng.chance(0.5)) d.attempt(() => [randomConv(rng, dims, d.width(), { strided: 0.3 })]);
  if (rng.chance(0.6) && d.positions() > 1) d.attempt(() => [randomPool(rng, d.grid(), 0.2)]);
  finish(d, 0.3);
  return d.done(1);
}

/**
 * Dense prediction: the model keeps several positions and the analysed output is one of them (set
 * or defaulted). Besides the usual partitions it tests ones that move only positions outside the
 * output's receptive field (rank 1), and one that adds a single position inside.
 */
export function positionsCase(rng: Rng, dims: Dims, surrogate: SurrogateKind): LayeredCase {
  const d = blockDraw(rng, dims, surrogate, [4, 5, 6, 8, 8, 12], [[2, 3], [3, 3], [2, 4], [4, 4], [3, 4]]);
  // Under `tree` only strides and pools couple positions: draw more of them there.
  const tree = surrogate === 'tree';
  const layers = rng.int(1, 3);
  for (let l = 0; l < layers || d.items.length === 0; l++) {
    d.attempt(() => [randomConv(rng, dims, d.width(), { strided: tree ? 0.4 : 0.2, dilated: 0.2 })]);
    if (rng.chance(tree ? 0.7 : 0.4) && d.positions() > 2) d.attempt(() => [randomPool(rng, d.grid(), 0.5)]);
  }
  const last = d.grid().dims;
  const opts: LayeredOptions = count(last) > 1 && rng.chance(0.5) ? { output: last.map((n) => rng.int(0, n - 1)) } : {};
  const c = d.done(1, opts);
  return { ...c, partitions: distinct([...c.partitions, ...fieldPartitions(rng, c, surrogate)]) };
}

// ---------------------------------------------------------------------------------------------
// Sequences: token inputs, embeddings, position vectors, recurrent stacks, attention.

/**
 * Partitions that test receptive fields: side A made of positions the output cannot read (some
 * of them, all of them; rank 1 exactly), and all of them plus one position it reads.
 */
function fieldPartitions(rng: Rng, c: LayeredCase, surrogate: SurrogateKind): Partition[] {
  const field = compile(c.model, surrogate, new WeightStore(rng)).dependsOn();
  const n = field.length;
  const outside: number[] = [];
  const inside: number[] = [];
  field.forEach((f, p) => (f === 0 ? outside : inside).push(p));
  const out: Partition[] = [];
  if (outside.length > 0 && inside.length > 0) {
    const some = new Uint8Array(n);
    for (const p of outside) if (rng.chance(0.6)) some[p] = 1;
    some[rng.pick(outside)] = 1;
    out.push(maskPartition(some));
    const all = new Uint8Array(n);
    for (const p of outside) all[p] = 1;
    out.push(maskPartition(all));
    if (inside.length > 1) {
      const plusOne = all.slice();
      plusOne[rng.pick(inside)] = 1;
      out.push(maskPartition(plusOne));
    }
  }
  return out;
}

/** A random output position for a grid of several positions (else the default), with chance q. */
function outputOption(d: Draw, q: number): LayeredOptions {
  const last = d.grid().dims;
  return count(last) > 1 && d.rng.chance(q) ? { output: last.map((n) => d.rng.int(0, n - 1)) } : {};
}

/**
 * A token input most of the time, else a continuous one of M features. Vocabularies of 2–5 up to
 * 6 positions, 2–3 beyond: the probe enumerates a side's V^n token sequences when they are few,
 * and samples them (at a higher cost) otherwise.
 */
function sequenceDraw(rng: Rng, n: number, tokenChance: number, limits: { positions: number; width: number }): Draw {
  const token = rng.chance(tokenChance);
  const d = new Draw(rng, [n], token ? undefined : rng.pick([1, 2, 2, 3, 3, 4]), rng.chance(0.5), 'tree', limits);
  if (token) d.vocabulary = rng.pick(n <= 6 ? [2, 2, 3, 3, 4, 5] : [2, 2, 3, 3]);
  return d;
}

const CELLS = ['arithmetic', 'rnn', 'lstm', 'gru'] as const;

/**
 * Token + embedding + recurrent stacks (LSTM, GRU, plain cells, all read as the arithmetic
 * circuit): one or two recurrent layers, unidirectional or bidirectional (concat or sum), per-step
 * outputs or the final state, the analysed output at the default or any step, sometimes position
 * vectors or a per-position dense head.
 */
export function sequenceRecurrentCase(rng: Rng, bidirectional: boolean): LayeredCase {
  const d = sequenceDraw(rng, rng.int(2, bidirectional ? 6 : 8), 0.7, { positions: 16, width: 6 });
  if (d.vocabulary === undefined ? rng.chance(0.3) : rng.chance(0.8)) d.push(embedding(rng.pick([1, 2, 2, 3, 3, 4])));
  if (rng.chance(0.2)) d.push(positions(rng.chance(0.5) ? 'learned' : 'fixed'));
  const layers = rng.chance(0.25) ? 2 : 1;
  for (let l = 0; l < layers; l++) {
    const lastLayer = l === layers - 1;
    d.attempt(() => {
      const bi = bidirectional && (l === 0 || rng.chance(0.5));
      const depth = bi ? rng.pick([1, 1, 2]) : rng.pick([1, 1, 2, 2, 3]);
      return [
        recurrent(rng.pick(bi ? [1, 2, 2, 3] : SMALL), depth, {
          cell: rng.pick(CELLS),
          bidirectional: bi,
          merge: rng.chance(0.5) ? 'concat' : 'sum',
          sequence: !lastLayer || rng.chance(0.6),
        }),
      ];
    });
    if (!lastLayer && rng.chance(0.3)) d.push(rng.pick([dropout(), norm('layer_norm')]));
  }
  if (rng.chance(0.2)) d.push(dense(rng.pick(SMALL)));
  const c = d.done(2, outputOption(d, 0.5));
  return { ...c, partitions: distinct([...c.partitions, ...fieldPartitions(rng, c, 'tree')]) };
}

/**
 * Token inputs under the other kinds: a dense layer on the whole token sequence with the square
 * rule, an embedding then flatten + dense, convs and pools (with or without an embedding first),
 * under both surrogates. On the discrete domain a position supports V functions only, and a
 * squared or reused position passes no more than that.
 */
export function tokenStackCase(rng: Rng): LayeredCase {
  const n = rng.int(2, 6);
  // Wide enough for a flatten of 6 positions of width 3.
  const d = new Draw(rng, [n], undefined, rng.chance(0.5), rng.chance(0.5) ? 'overlap' : 'tree', { positions: 16, width: 18 });
  d.vocabulary = rng.pick([2, 2, 3, 4]);
  switch (rng.int(0, 3)) {
    case 0:
      d.push(dense(rng.int(1, 4)), act(), dense(rng.int(1, 3)));
      break;
    case 1:
      d.push(embedding(rng.int(1, 3)), flatten(), dense(rng.int(1, 4)), act(), dense(1));
      break;
    case 2:
      d.attempt(() => [randomConv(rng, 1, rng.int(1, 3), { strided: 0.2 })]);
      if (d.positions() > 1) d.attempt(() => [randomPool(rng, d.grid(), 0.3)]);
      d.attempt(() => [conv(rng.int(1, 3), { kernel: [rng.int(1, 3)] })]);
      finish(d, 0.7);
      break;
    default:
      d.push(embedding(rng.int(1, 3)));
      d.attempt(() => [conv(rng.int(1, 3), { kernel: [rng.int(1, 3)] })]);
      finish(d, 0.7);
  }
  if (d.items.length === 0) d.push(embedding(rng.int(1, 3)));
  return d.done(1, outputOption(d, 0.3));
}

/**
 * Linearised attention nets: 2–12 positions (a class token included), width 2–4, 1–3 attention
 * layers (heads 1–3, head width 1–3 or the default), with or without residual connections,
 * layer norms and position-wise MLP blocks, position vectors, class tokens; `masked`: causal masks
 * and windows (on most layers, some full ones mixed in). Token inputs with an embedding of the
 * width, or continuous inputs of M = width. Deeper nets draw fewer heads and narrower widths, so
 * that most bounds stay within reach of the probe.
 */
export function attentionCase(rng: Rng, masked: boolean): LayeredCase {
  const layers = rng.pick([1, 1, 1, 2, 2, 3]);
  const width = layers === 3 ? rng.pick([2, 2, 3]) : rng.pick([2, 2, 3, 3, 4]);
  const cls = rng.chance(masked ? 0.15 : 0.3);
  // Deeper nets on shorter sequences: their ranks do not grow with the length (measured here),
  // their cost does.
  const n = rng.int(2, (layers === 1 ? 12 : layers === 2 ? 10 : 8) - (cls ? 1 : 0));
  const d = sequenceDraw(rng, n, 0.6, { positions: 16, width: 12 });
  // A continuous input reads the width directly (M = width), or through an embedding map.
  const direct = d.vocabulary === undefined && rng.chance(0.6);
  const draw = direct ? new Draw(rng, [n], width, d.shared, 'tree', { positions: 16, width: 12 }) : d;
  if (!direct) draw.push(embedding(width));
  if (rng.chance(0.4)) draw.push(positions(rng.chance(0.7) ? 'learned' : 'fixed'));
  if (cls) draw.push(classToken());
  for (let l = 0; l < layers; l++) {
    // Three layers: scalar heads (start-end rank 50 at most, measured here); two: narrow ones.
    const heads = layers === 1 ? rng.int(1, 3) : layers === 2 ? rng.pick([1, 1, 2]) : 1;
    const byDefault = width % heads === 0 && (layers === 1 || width / heads <= 2);
    const headDim = layers === 3 ? 1 : byDefault && rng.chance(0.4) ? undefined : rng.pick(layers === 1 ? [1, 2, 2, 3] : [1, 1, 2]);
    const causal = masked && rng.chance(0.75);
    const window = masked && rng.chance(0.4) ? rng.int(0, 3) : undefined;
    const att = attention(heads, { ...(headDim !== undefined ? { headDim } : {}), causal, ...(window !== undefined ? { window } : {}) });
    const pre = rng.chance(0.3) ? [norm('layer_norm')] : [];
    draw.attempt(() => [rng.chance(0.5) ? residual([...pre, att]) : att], 4);
    if (rng.chance(0.25)) {
      const hidden = rng.int(1, 4);
      draw.push(residual([...pre, dense(hidden), act(rng.pick(['relu', 'gelu'])), dense(width)]));
    }
  }
  if (rng.chance(0.15)) draw.push(dense(rng.int(1, 3)));
  const c = draw.done(2, outputOption(draw, 0.4));
  const extra: Partition[] = fieldPartitions(rng, c, 'tree');
  // Positions after the output's input position: rank 1 exactly when every layer is causal.
  const out = planModel(c.model, 'tree').output.index - (cls ? 1 : 0);
  if (out >= 0 && out < n - 1) {
    const after = new Uint8Array(n);
    for (let p = out + 1; p < n; p++) after[p] = 1;
    extra.push(maskPartition(after));
  }
  return { ...c, partitions: distinct([...c.partitions, ...extra]) };
}

/** Partitions with distinct masks, first occurrence kept. */
function distinct(ps: readonly Partition[]): Partition[] {
  const seen = new Set<string>();
  return ps.filter((p) => {
    const key = p.side.join('');
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
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

/** A block family: a generator for a grid dimension and a surrogate. */
export type BlockFamily = (rng: Rng, dims: Dims, surrogate: SurrogateKind) => LayeredCase;

/**
 * The block families by name, each to be run in 1D and 2D under both surrogates (`causal` is 1D
 * only). The property tests and the oracle's self-tests both iterate this list.
 */
export const BLOCK_FAMILIES: readonly { readonly name: string; readonly gen: BlockFamily; readonly dims: readonly Dims[] }[] = [
  { name: 'residual', gen: residualCase, dims: [1, 2] },
  { name: 'branches', gen: branchesCase, dims: [1, 2] },
  { name: 'skips', gen: skipsCase, dims: [1, 2] },
  { name: 'upsample', gen: upsampleCase, dims: [1, 2] },
  { name: 'mlp', gen: mlpCase, dims: [1, 2] },
  { name: 'pools', gen: poolsCase, dims: [1, 2] },
  { name: 'dilation', gen: dilationCase, dims: [1, 2] },
  { name: 'causal', gen: (rng, _dims, s) => causalCase(rng, s), dims: [1] },
  { name: 'grouped', gen: groupedCase, dims: [1, 2] },
  { name: 'transpose', gen: transposeCase, dims: [1, 2] },
  { name: 'positions', gen: positionsCase, dims: [1, 2] },
];

/** One case of a block family under a surrogate, its grid dimension (1D or 2D) drawn first. */
export function blockCase(rng: Rng, family: (typeof BLOCK_FAMILIES)[number], surrogate: SurrogateKind): LayeredCase {
  return family.gen(rng, rng.pick(family.dims), surrogate);
}

/** Every layered family's generator, block families under both surrogates (for the self-tests). */
export const LAYERED_GENERATORS: readonly { readonly name: string; readonly gen: (rng: Rng) => LayeredCase }[] = [
  { name: 'tree1d', gen: (rng) => tree1d(rng, rng.chance(0.5)) },
  { name: 'tree2d', gen: (rng) => tree2d(rng, rng.chance(0.5)) },
  { name: 'overlap1d', gen: overlap1d },
  { name: 'overlap2d', gen: overlap2d },
  { name: 'recurrent', gen: (rng) => recurrentCase(rng, rng.int(1, 3)) },
  { name: 'sequence-recurrent', gen: (rng) => sequenceRecurrentCase(rng, false) },
  { name: 'sequence-bidirectional', gen: (rng) => sequenceRecurrentCase(rng, true) },
  { name: 'tokens', gen: tokenStackCase },
  { name: 'attention', gen: (rng) => attentionCase(rng, false) },
  { name: 'attention-masked', gen: (rng) => attentionCase(rng, true) },
  ...BLOCK_FAMILIES.flatMap((f) => (['tree', 'overlap'] as const).map((s) => ({ name: `${f.name}-${s}`, gen: (rng: Rng) => blockCase(rng, f, s) }))),
];
