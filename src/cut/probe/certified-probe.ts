/**
 * The certified probe, a lower-bound rule for layered models (DESIGN §4; DEVELOPERS.md, "Certified
 * probe"). With the weights fixed at integers w and K integer assignments a_1..a_K of the side-A
 * inputs and b_1..b_K of the side-B inputs, F[i][j] = h_w(a_i, b_j) is a K×K submatrix of the
 * matricisation of h_w, so rank F ≤ sep(h_w; A, B) ≤ the capacity. A k×k minor of F that is not
 * zero modulo a prime is not zero over the integers (the surrogate's fixed coefficients are
 * fractions whose denominators the prime does not divide), so F has rank ≥ k over the reals: the
 * weights w themselves reach separation rank k. Nothing is claimed from floating point.
 *
 * The probe grows K by doubling, from just above the best lower bound the other rules found, and
 * stops when a reading falls short of K (more probes would rarely find more: the reading is then
 * the generic rank with high probability), when K reaches the upper bound (the bound is exact), or
 * when the next step would exceed the time budget. The budget is counted in multiply-adds mod p,
 * worked out before each step from the program's costs; a model too large for even the first
 * step is refused by arithmetic on its shapes, before anything is built.
 */
import { positionCount, type LayeredModel } from '../../config/model.js';
import type { ModelShapes } from '../../config/model-shapes.js';
import type { PointwiseReading } from '../../network/square-rule.js';
import type { Bound, ProbeCertificate, Surrogate } from '../types.js';
import { log2Big } from '../types.js';
import { drawValue, drawValues } from './draw.js';
import { PROBE_PRIME, certifyingMinor, type CertifyingMinor } from './modular.js';
import { surrogateProgram, type SurrogateProgram } from './surrogate-program.js';

export const PROBE_METHOD = 'certified probe';

/** Multiply-adds mod p one partition may spend (0.1–0.4 s on a CI runner, see DEVELOPERS.md). */
export const PROBE_BUDGET = 10_000_000;

/** The seed of every probe; a certificate states it. */
export const PROBE_SEED = 1;

/** Version of the naming and drawing scheme (draw.ts, surrogate-program.ts) a certificate follows. */
export const PROBE_SCHEME = 2;

/** Largest probe matrix side: the probe never proves more than this. */
export const MAX_PROBES = 1024;

/** Smallest probe matrix side worth running. */
const FIRST_PROBES = 8;

/** Largest buffer (numbers) a program may hold. */
const MAX_BUFFER = 4_000_000;

export type ProbeRule = (side: Uint8Array, lower: bigint, upper: bigint) => Bound | undefined;

/**
 * The probe for one model, or undefined when the model is too large for the budget (decided on
 * its shapes alone) or has a layer kind the program does not know. The program is built on the
 * first partition that asks, and shared by the rest.
 */
export function certifiedProbe(model: LayeredModel, shapes: ModelShapes, reading: PointwiseReading, surrogate: Surrogate, budget = PROBE_BUDGET): ProbeRule | undefined {
  if (budget <= 0) return undefined;
  const estimate = estimateCost(model, shapes, surrogate);
  // The first step evaluates every step at least 2·FIRST_PROBES times (rows and columns).
  if (estimate.cost * 2 * FIRST_PROBES > budget || estimate.buffer > MAX_BUFFER) return undefined;
  let program: SurrogateProgram | undefined | null = null;
  return (side, lower, upper) => {
    if (program === null) program = surrogateProgram(model, shapes, reading, surrogate, PROBE_SEED);
    if (!program) return undefined;
    const limit = upper < BigInt(MAX_PROBES) ? Number(upper) : MAX_PROBES;
    if (BigInt(limit) <= lower) return undefined;
    const found = probeRank(program, side, lower, limit, budget);
    if (!found || BigInt(found.minor.rows.length) <= lower) return undefined;
    const rank = BigInt(found.minor.rows.length);
    const certificate: ProbeCertificate = {
      scheme: PROBE_SCHEME,
      prime: PROBE_PRIME,
      seed: PROBE_SEED,
      probes: found.probes,
      rows: found.minor.rows,
      cols: found.minor.cols,
      determinant: found.minor.determinant,
    };
    return { rank, log2: log2Big(rank), method: PROBE_METHOD, cut: [], certificate };
  };
}

/** Input vector of probe row i (side A) or column j (side B) at a position. */
export function probeInputName(side: 'a' | 'b', index: number, position: number): string {
  return `${side}${index}@${position}`;
}

interface Reading {
  readonly probes: number;
  readonly minor: CertifyingMinor;
}

/** Step classes: which sides a step's value depends on. */
const CONSTANT = 0;
const SIDE_A = 1;
const SIDE_B = 2;
const MIXED = 3;

function probeRank(program: SurrogateProgram, side: Uint8Array, lower: bigint, most: number, budget: number): Reading | undefined {
  let limit = most;
  const { steps, positions, m } = program;
  const cls = new Uint8Array(steps.length);
  for (let s = 0; s < steps.length; s++) {
    if (s < positions) cls[s] = side[s] === 1 ? SIDE_A : SIDE_B;
    else {
      let c = CONSTANT;
      for (const r of steps[s]!.reads) c |= cls[r]!;
      cls[s] = c;
    }
  }
  // A function of one side only has rank ≤ 1: the other rules say so.
  if (cls[program.output] !== MIXED) return undefined;
  const lists: number[][] = [[], [], [], []];
  const cost = [0, 0, 0, 0];
  for (let s = positions; s < steps.length; s++) {
    lists[cls[s]!]!.push(s);
    cost[cls[s]!]! += steps[s]!.cost + 1;
  }
  // The one-side values that mixed steps read: saved per row and per column.
  const frontier: number[][] = [[], [], [], []];
  const seen = new Uint8Array(steps.length);
  for (const s of lists[MIXED]!) {
    for (const r of steps[s]!.reads) {
      if (cls[r] !== MIXED && cls[r] !== CONSTANT && !seen[r]) {
        seen[r] = 1;
        frontier[cls[r]!]!.push(r);
      }
    }
  }
  // Each frontier as (offset, length) pairs, copied with plain loops: an entry of the matrix
  // restores a column's frontier, and allocating views there would cost more than the copy.
  const spans = frontier.map((list) => Int32Array.from(list.flatMap((s) => [steps[s]!.offset, steps[s]!.length])));
  const width = (which: number): number => frontier[which]!.reduce((a, s) => a + steps[s]!.length, 0);
  const frontierA = width(SIDE_A);
  const frontierB = width(SIDE_B);
  const rowCost = cost[SIDE_A]! + frontierA + m * positions;
  const colCost = cost[SIDE_B]! + frontierB + m * positions;
  const entryCost = cost[MIXED]! + frontierB;

  const buf = new Float64Array(program.bufferSize);
  const runAll = (list: readonly number[]): void => {
    for (const s of list) steps[s]!.run!(buf);
  };
  runAll(lists[CONSTANT]!);
  const sideOf = (which: number): number[] => {
    const at: number[] = [];
    for (let p = 0; p < positions; p++) if (cls[p] === which) at.push(p);
    return at;
  };
  const positionsA = sideOf(SIDE_A);
  const positionsB = sideOf(SIDE_B);
  // Start just above the best lower bound so far: a smaller probe could not improve on it.
  const known = Number(lower < BigInt(MAX_PROBES) ? lower : BigInt(MAX_PROBES));
  // Token inputs: a side has V^|side| distinct assignments, and no probe matrix larger than that.
  if (program.tokens) limit = Math.min(limit, m ** positionsA.length, m ** positionsB.length);
  if (limit <= known) return undefined;
  // Token assignments already used per side: a repeated row or column would prove nothing.
  const usedTokens: Record<number, Set<string>> = { [SIDE_A]: new Set(), [SIDE_B]: new Set() };
  /** Sets the inputs of one side, runs that side's steps and returns the values mixed steps read. */
  const sideValues = (which: number, index: number): Float64Array => {
    const name = which === SIDE_A ? 'a' : 'b';
    const inputs = which === SIDE_A ? positionsA : positionsB;
    if (!program.tokens) {
      for (const p of inputs) buf.set(drawValues(PROBE_SEED, probeInputName(name, index, p), m), steps[p]!.offset);
    } else {
      // A token input takes only indicator vectors: the tokens of the first attempt whose
      // assignment the side has not used yet (the probe never asks for more rows than the side
      // has assignments: the token count bounds the rank from above).
      const tokens = distinctTokens(inputs.map((p) => probeInputName(name, index, p)), m, usedTokens[which]!);
      inputs.forEach((p, k) => {
        const o = steps[p]!.offset;
        buf.fill(0, o, o + m);
        buf[o + tokens[k]!] = 1;
      });
    }
    runAll(lists[which]!);
    const saved = new Float64Array(which === SIDE_A ? frontierA : frontierB);
    const at = spans[which]!;
    for (let x = 0, o = 0; x < at.length; x += 2) for (let k = 0; k < at[x + 1]!; k++) saved[o++] = buf[at[x]! + k]!;
    return saved;
  };
  const restore = (which: number, saved: Float64Array): void => {
    const at = spans[which]!;
    for (let x = 0, o = 0; x < at.length; x += 2) for (let k = 0; k < at[x + 1]!; k++) buf[at[x]! + k] = saved[o++]!;
  };
  const mixed = lists[MIXED]!;
  const out = steps[program.output]!.offset;

  const rows: Float64Array[] = [];
  const cols: Float64Array[] = [];
  const entries: Float64Array[] = [];
  let spent = 0;
  let best: Reading | undefined;
  let k = Math.min(limit, Math.max(FIRST_PROBES, nextPowerOfTwo(known + 1)));
  const stepCost = (from: number, to: number): number => (to - from) * (rowCost + colCost) + (to * to - from * from) * entryCost + (to * to * to) / 3;
  for (;;) {
    const before = rows.length;
    if (spent + stepCost(before, k) > budget) {
      // The last step takes the largest size the rest of the budget pays for.
      let lo = before;
      let hi = k;
      while (hi - lo > 1) {
        const mid = Math.floor((lo + hi) / 2);
        if (spent + stepCost(before, mid) <= budget) lo = mid;
        else hi = mid;
      }
      if (lo <= Math.max(before, known, best?.minor.rows.length ?? 0)) break;
      k = lo;
      limit = k;
    }
    spent += stepCost(before, k);
    while (cols.length < k) cols.push(sideValues(SIDE_B, cols.length));
    while (rows.length < k) {
      rows.push(sideValues(SIDE_A, rows.length));
      entries.push(new Float64Array(limit));
    }
    for (let i = 0; i < k; i++) {
      restore(SIDE_A, rows[i]!);
      for (let j = i < before ? before : 0; j < k; j++) {
        restore(SIDE_B, cols[j]!);
        runAll(mixed);
        entries[i]![j] = buf[out]!;
      }
    }
    const matrix = new Float64Array(k * k);
    for (let i = 0; i < k; i++) matrix.set(entries[i]!.subarray(0, k), i * k);
    const minor = certifyingMinor(matrix, k, k);
    if (!best || minor.rows.length > best.minor.rows.length) best = { probes: k, minor };
    if (minor.rows.length < k || k >= limit) break;
    k = Math.min(limit, 2 * k);
  }
  return best;
}

/**
 * The tokens of one probe input over a side's positions: attempt t draws token
 * value(seed, name_p, t) mod V at every position p, and the first attempt whose assignment is not
 * in `used` is taken (and added to it).
 */
export function distinctTokens(names: readonly string[], vocabulary: number, used: Set<string>): number[] {
  for (let t = 0; ; t++) {
    const tokens = names.map((n) => drawValue(PROBE_SEED, n, t) % vocabulary);
    const key = tokens.join(',');
    if (!used.has(key)) {
      used.add(key);
      return tokens;
    }
  }
}

function nextPowerOfTwo(x: number): number {
  let p = 1;
  while (p < x) p *= 2;
  return p;
}

/**
 * Multiply-adds of one evaluation and the numbers the program holds, from the shapes alone
 * (an over-estimate; nothing per position is allocated). An unknown layer kind costs infinitely
 * much, which turns the probe off for the model.
 */
export function estimateCost(model: LayeredModel, shapes: ModelShapes, surrogate: Surrogate): { cost: number; buffer: number } {
  const m = shapes.representation;
  let cost = 0;
  let buffer = positionCount(model.input.shape) * m;
  for (const layer of model.layers) {
    const src = layer.inputs[0]! < 0 ? { shape: model.input.shape, width: m } : shapes.layers[layer.inputs[0]!]!;
    const out = shapes.layers[layer.index]!;
    const pin = positionCount(src.shape);
    const pout = positionCount(out.shape);
    const d = src.width;
    const r = out.width;
    const g = shapes.groups[layer.index]!;
    const taps = (k: readonly number[]): number => k.reduce((a, x) => a * x, 1);
    let c: number;
    switch (layer.kind) {
      case 'pointwise':
        c = pout * r;
        break;
      case 'flatten':
        c = pin * d;
        break;
      case 'dense':
        c = shapes.denseReading[layer.index] === 'per-position' ? pout * r * d : r * d * pin + d * pin;
        break;
      case 'merge':
        c = pout * r * layer.inputs.length;
        break;
      case 'embedding':
        c = pout * r * d;
        break;
      case 'recurrent': {
        const dirs = layer.bidirectional ? 2 : 1;
        c = pin * layer.depth * dirs * (layer.hidden * (layer.hidden + Math.max(d, dirs * layer.hidden) + 2));
        break;
      }
      case 'position':
        c = pout * r;
        break;
      case 'class-token':
        c = r;
        break;
      case 'attention': {
        // Projections, the segment tree's sums (≤ 2n blocks, fields of ≤ ⌈log2 n⌉ + 2 blocks)
        // and the outputs; per block H·a² numbers.
        const a = shapes.headDims[layer.index]!;
        const blockWidth = layer.heads * a * a;
        const sums = pin * (Math.ceil(Math.log2(Math.max(pin, 2))) + 4) * blockWidth;
        c = pin * layer.heads * (3 * a * d + a * a) + sums + pout * layer.heads * (a * a + r * a);
        buffer += pin * layer.heads * a + sums;
        break;
      }
      case 'pool':
        c = layer.global ? pin * d : pout * taps(layer.window) * d;
        break;
      case 'upsample':
        c = pout * 4 * d;
        break;
      case 'conv':
        c = surrogate === 'overlap' ? pout * taps(layer.kernel) * r * (d / g) : pin * r * (d / g) + pout * taps(layer.stride) * r;
        break;
      case 'conv-transpose':
        c = pout * taps(layer.kernel) * r * (d / g);
        break;
      default:
        return { cost: Infinity, buffer: Infinity };
    }
    cost += c;
    // Every output position holds a vector, and the recurrence holds one per step and level.
    buffer += layer.kind === 'recurrent' ? pin * layer.depth * (layer.bidirectional ? 2 : 1) * layer.hidden * 4 : (pout + pin) * r;
  }
  return { cost, buffer };
}
