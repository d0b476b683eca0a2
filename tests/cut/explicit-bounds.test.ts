/**
 * Bounds for explicit tensor networks against answers computed another way: exhaustive
 * enumeration of cuts for the upper bound, and the exact rank of the network itself, contracted
 * with random tensors modulo a prime, for the lower one. A rank found mod p is at most the generic
 * rank, so `lower ≤ rank mod p` certifies the lower bound on that instance, and `rank mod p ≤ upper`
 * must hold always.
 */
import { describe, expect, it } from 'vitest';
import type { ExplicitBond, ExplicitModel, ExplicitTensor } from '../../src/config/model.js';
import type { Partition } from '../../src/partition/partition.js';
import { NO_SPAN, type Span } from '../../src/diagnostic.js';
import { explicitBounds } from '../../src/cut/explicit-bounds.js';
import { explicitProbe } from '../../src/cut/probe/explicit-probe.js';
import { computeBounds } from '../../src/cut/bounds.js';
import { mulberry32 } from '../helpers/models.js';

const rng = mulberry32;
const int = (r: () => number, lo: number, hi: number): number => lo + Math.floor(r() * (hi - lo + 1));
const pick = <T,>(r: () => number, xs: readonly T[]): T => xs[int(r, 0, xs.length - 1)]!;

const at = (line: number): Span => ({ ...NO_SPAN, line, endLine: line });

/** Tensors as [name, [[position, dim], ...]] and bonds as [[names], dim]. */
function model(
  tensors: readonly (readonly [string, readonly (readonly [number, number])[], number?])[],
  bonds: readonly (readonly [readonly string[], number, number?])[],
): ExplicitModel {
  const ts: ExplicitTensor[] = tensors.map(([name, legs, line]) => ({
    name,
    legs: legs.map(([position, dim]) => ({ position, dim, span: NO_SPAN })),
    span: line === undefined ? NO_SPAN : at(line),
  }));
  const bs: ExplicitBond[] = bonds.map(([names, dim, line]) => ({
    tensors: names,
    dim,
    span: line === undefined ? NO_SPAN : at(line),
  }));
  const n = 1 + Math.max(0, ...ts.flatMap((t) => t.legs.map((l) => l.position)));
  return { kind: 'explicit', file: 'test.yaml', shape: [n], tensors: ts, bonds: bs, span: NO_SPAN };
}

function partition(n: number, a: readonly number[]): Partition {
  const side = new Uint8Array(n);
  for (const p of a) side[p] = 1;
  return { label: `positions:${a.join(',')}`, kind: 'positions', side, description: 'test' };
}

/** The smallest product of cut dimensions over every assignment of tensors to sides. */
function bruteMinCut(m: ExplicitModel, part: Partition): bigint {
  const names = m.tensors.map((t) => t.name);
  const T = names.length;
  let best: bigint | undefined;
  for (let mask = 0; mask < 1 << T; mask++) {
    const onA = (i: number): boolean => (mask & (1 << i)) !== 0;
    let prod = 1n;
    m.tensors.forEach((t, i) => {
      for (const leg of t.legs) if ((part.side[leg.position] === 1) !== onA(i)) prod *= BigInt(leg.dim);
    });
    for (const b of m.bonds) {
      const sides = new Set(b.tensors.map((name) => onA(names.indexOf(name))));
      if (sides.size === 2) prod *= BigInt(b.dim);
    }
    if (best === undefined || prod < best) best = prod;
  }
  return best!;
}

const P = 67108859; // prime 2^26 − 5: products of two residues stay below 2^53
const mul = (a: number, b: number): number => (a * b) % P;
function inverse(a: number): number {
  let r = 1;
  let base = a;
  for (let e = P - 2; e > 0; e = Math.floor(e / 2)) {
    if (e % 2 === 1) r = mul(r, base);
    base = mul(base, base);
  }
  return r;
}

function rankModP(rows: number[][]): number {
  const m = rows.map((row) => row.slice());
  const width = m[0]?.length ?? 0;
  let rank = 0;
  for (let c = 0; c < width && rank < m.length; c++) {
    const pivot = m.findIndex((row, i) => i >= rank && row[c]! !== 0);
    if (pivot < 0) continue;
    [m[rank], m[pivot]] = [m[pivot]!, m[rank]!];
    const top = m[rank]!;
    const inv = inverse(top[c]!);
    for (let i = rank + 1; i < m.length; i++) {
      const row = m[i]!;
      const f = mul(row[c]!, inv);
      if (f === 0) continue;
      for (let j = c; j < width; j++) row[j] = (row[j]! - mul(f, top[j]!) + P) % P;
    }
    rank++;
  }
  return rank;
}

/** Product of every leg and bond dimension: the number of terms the contraction enumerates. */
function contractionSize(m: ExplicitModel): number {
  let s = 1;
  for (const t of m.tensors) for (const l of t.legs) s *= l.dim;
  for (const b of m.bonds) s *= b.dim;
  return s;
}

/**
 * The rank of the network's matricisation (A-legs as rows, B-legs as columns) for random tensors
 * mod P, by summing over every assignment of every index.
 */
function networkRankModP(m: ExplicitModel, part: Partition, r: () => number): number {
  const dims: number[] = [];
  const aIdx: number[] = [];
  const bIdx: number[] = [];
  const slots: number[][] = m.tensors.map(() => []);
  m.tensors.forEach((t, i) => {
    for (const leg of t.legs) {
      (part.side[leg.position] === 1 ? aIdx : bIdx).push(dims.length);
      slots[i]!.push(dims.length);
      dims.push(leg.dim);
    }
  });
  for (const b of m.bonds) {
    for (const name of b.tensors) slots[m.tensors.findIndex((t) => t.name === name)]!.push(dims.length);
    dims.push(b.dim);
  }
  const entries = slots.map((s) => Array.from({ length: s.reduce((p, x) => p * dims[x]!, 1) }, () => int(r, 0, P - 1)));
  const radix = (idx: readonly number[], v: readonly number[]): number => idx.reduce((acc, x) => acc * dims[x]! + v[x]!, 0);
  const nRows = aIdx.reduce((p, x) => p * dims[x]!, 1);
  const nCols = bIdx.reduce((p, x) => p * dims[x]!, 1);
  const M = Array.from({ length: nRows }, () => new Array<number>(nCols).fill(0));
  const v = new Array<number>(dims.length).fill(0);
  for (;;) {
    let term = 1;
    slots.forEach((s, i) => {
      term = mul(term, entries[i]![radix(s, v)]!);
    });
    const row = M[radix(aIdx, v)]!;
    const col = radix(bIdx, v);
    row[col] = (row[col]! + term) % P;
    let k = 0;
    while (k < dims.length && ++v[k]! === dims[k]!) v[k++] = 0;
    if (k === dims.length) break;
  }
  return rankModP(M);
}

/** Star (worked out here): centre c with an open leg of dim 2, bonds of dim 2 to u and w, each of which has open legs of dims 2 and `big`. */
function star(big: number): ExplicitModel {
  return model(
    [
      ['c', [[0, 2]], 3],
      ['u', [[1, 2], [2, big]], 7],
      ['w', [[3, 2], [4, big]], 11],
    ],
    [
      [['c', 'u'], 2, 14],
      [['c', 'w'], 2, 15],
    ],
  );
}

describe('explicitBounds: the star network', () => {
  // A = {centre leg, both 2-legs}, B = {both big legs}. Cuts: the three A legs (2·2·2 = 8), or,
  // with the centre on A, min(big, 2·2) per branch (9 for big = 3). Min-cut 8 for big = 3 and 4.
  const part = partition(5, [0, 1, 3]);

  it('big legs of dim 3: min-cut 8, but the generic rank is 7, so the lower bound stays below 8', () => {
    const m = star(3);
    const b = explicitBounds(m, part);
    expect(b.upper.rank).toBe(8n);
    expect(b.upper.log2).toBe(3);
    expect(b.upper.method).toBe('min-cut');
    expect(b.upper.cut).toEqual([
      { layer: 'legs', line: 3, dim: 2, count: 1 },
      { layer: 'legs', line: 7, dim: 2, count: 1 },
      { layer: 'legs', line: 11, dim: 2, count: 1 },
    ]);
    // q = 2 rounds the 3-legs to 2: min-cut 4 (the two rounded B legs, or two A legs with c on A).
    expect(b.lower).not.toBeNull();
    expect(b.lower!.rank).toBe(4n);
    expect(b.lower!.method).toBe('power-rounding q=2');
    expect(b.lower!.rank <= 7n).toBe(true);
    // The generic rank itself, measured: 7 < 8, so max-flow ≠ min-cut here.
    expect(networkRankModP(m, part, rng(1))).toBe(7);
  });

  it('big legs of dim 3: the certified probe proves the generic rank 7 (DESIGN §8, measured)', () => {
    const m = star(3);
    const probed = explicitProbe(m, part.side, 4n);
    expect(probed?.rank).toBe(7n);
    expect(probed?.certificate).toMatchObject({ matricisation: [8, 9] });
    // Through computeBounds: the probe's 7 replaces power rounding's 4.
    const out = computeBounds(m, [part], { surrogate: 'tree' });
    if (!out.ok) throw new Error('refused');
    expect(out.result.partitions[0]!.lower).toMatchObject({ rank: 7n, method: 'certified probe' });
    // Budget 0 turns it off; it never claims what the rules proved already.
    expect(explicitProbe(m, part.side, 4n, 0)).toBeUndefined();
    expect(explicitProbe(m, part.side, 7n)).toBeUndefined();
  });

  it('big legs of dim 4: every dimension a power of 2, lower = upper = 8', () => {
    const m = star(4);
    const b = explicitBounds(m, part);
    expect(b.upper.rank).toBe(8n);
    expect(b.lower?.rank).toBe(8n);
    expect(b.lower?.method).toBe('power-rounding q=2');
    expect(b.lower?.cut).toEqual(b.upper.cut);
    expect(networkRankModP(m, part, rng(2))).toBe(8);
  });
});

/** A random connected network with extra bonds (loops, parallel bonds) and 2–6 open legs. */
function randomNetwork(r: () => number, dimsOf: readonly number[]): { m: ExplicitModel; part: Partition } {
  const T = int(r, 2, 5);
  const names = Array.from({ length: T }, (_, i) => `t${i}`);
  const bonds: [string[], number][] = [];
  for (let i = 1; i < T; i++) bonds.push([[names[i]!, names[int(r, 0, i - 1)]!], pick(r, dimsOf)]);
  const extra = int(r, 1, 3);
  for (let k = 0; k < extra; k++) {
    const a = int(r, 0, T - 1);
    let b = int(r, 0, T - 2);
    if (b >= a) b++;
    bonds.push([[names[a]!, names[b]!], pick(r, dimsOf)]);
  }
  const L = int(r, 2, 6);
  const legs: [number, number][][] = names.map(() => []);
  for (let p = 0; p < L; p++) legs[int(r, 0, T - 1)]!.push([p, pick(r, dimsOf)]);
  const a: number[] = [];
  for (let p = 0; p < L; p++) if (r() < 0.5) a.push(p);
  if (a.length === 0) a.push(0);
  if (a.length === L) a.pop();
  const m = model(
    names.map((n, i) => [n, legs[i]!] as const),
    bonds,
  );
  return { m, part: partition(L, a) };
}

describe('explicitBounds on random networks with loops', () => {
  it('all dimensions powers of 2: lower = upper = brute-force min-cut = rank (Cui et al., "Quantum max-flow/min-cut")', () => {
    const r = rng(4242);
    let measured = 0;
    let above1 = 0;
    for (let trial = 0; trial < 300; trial++) {
      const { m, part } = randomNetwork(r, [1, 2, 2, 4, 8]);
      const b = explicitBounds(m, part);
      const brute = bruteMinCut(m, part);
      expect(b.upper.rank, `trial ${trial}`).toBe(brute);
      expect(b.lower, `trial ${trial}`).not.toBeNull();
      expect(b.lower!.rank, `trial ${trial}`).toBe(b.upper.rank);
      expect(b.lower!.method).toBe('power-rounding q=2');
      if (brute > 1n) above1++;
      if (contractionSize(m) <= 1 << 14) {
        expect(networkRankModP(m, part, r), `trial ${trial}`).toBe(Number(brute));
        measured++;
      }
    }
    expect(above1).toBeGreaterThan(200);
    expect(measured).toBeGreaterThan(60);
  });

  it('dimensions 2 and 3 mixed: upper = brute-force min-cut and lower ≤ rank ≤ upper', () => {
    const r = rng(777);
    let measured = 0;
    let gap = 0;
    for (let trial = 0; trial < 300; trial++) {
      const { m, part } = randomNetwork(r, [2, 3, 3, 4, 6]);
      const b = explicitBounds(m, part);
      expect(b.upper.rank, `trial ${trial}`).toBe(bruteMinCut(m, part));
      expect(b.lower).not.toBeNull();
      expect(b.lower!.rank <= b.upper.rank).toBe(true);
      if (b.lower!.rank < b.upper.rank) gap++;
      if (contractionSize(m) <= 1 << 14) {
        const rank = BigInt(networkRankModP(m, part, r));
        expect(b.lower!.rank <= rank, `trial ${trial}`).toBe(true);
        expect(rank <= b.upper.rank, `trial ${trial}`).toBe(true);
        measured++;
      }
    }
    expect(gap).toBeGreaterThan(20);
    expect(measured).toBeGreaterThan(30);
  });
});

describe('explicitBounds on a 4-cycle', () => {
  it('upper = exact brute-force min-cut product for every mix of bond dims 2 and 3, leg dims and partition', () => {
    let cases = 0;
    for (let mask = 0; mask < 16; mask++) {
      const d = [0, 1, 2, 3].map((i) => (mask & (1 << i) ? 3 : 2));
      for (const legDims of [[2, 2, 2, 2], [3, 3, 3, 3], [2, 3, 3, 2]]) {
        const m = model(
          [0, 1, 2, 3].map((i) => [`t${i}`, [[i, legDims[i]!]]] as const),
          [
            [['t0', 't1'], d[0]!],
            [['t1', 't2'], d[1]!],
            [['t2', 't3'], d[2]!],
            [['t3', 't0'], d[3]!],
          ],
        );
        for (let a = 1; a < 15; a++) {
          const part = partition(4, [0, 1, 2, 3].filter((p) => a & (1 << p)));
          const b = explicitBounds(m, part);
          expect(b.upper.rank).toBe(bruteMinCut(m, part));
          expect(b.lower!.rank <= b.upper.rank).toBe(true);
          cases++;
        }
      }
    }
    expect(cases).toBe(16 * 3 * 14);
  });

  it('bonds 2,3,2,3 and legs 3, split {0,1} | {2,3}: min-cut 9 (two bonds of 3, or either pair of legs)', () => {
    const m = model(
      [0, 1, 2, 3].map((i) => [`t${i}`, [[i, 3]]] as const),
      [
        [['t0', 't1'], 2],
        [['t1', 't2'], 3],
        [['t2', 't3'], 2],
        [['t3', 't0'], 3],
      ],
    );
    const part = partition(4, [0, 1]);
    const b = explicitBounds(m, part);
    expect(b.upper.rank).toBe(9n);
    expect(b.lower?.rank).toBe(9n);
    expect(b.lower?.method).toBe('power-rounding q=3');
    expect(networkRankModP(m, part, rng(3))).toBe(9);
  });
});

describe('explicitBounds: exact arithmetic and cut entries', () => {
  it('keeps ranks beyond 2^53 exact', () => {
    // Four parallel bonds of the prime 10007 between a and b; five legs of 10007 on each side.
    const legs = (from: number): [number, number][] => [0, 1, 2, 3, 4].map((k) => [from + k, 10007]);
    const m = model(
      [
        ['a', legs(0), 2],
        ['b', legs(5), 9],
      ],
      Array.from({ length: 4 }, () => [['a', 'b'], 10007, 20] as const),
    );
    const b = explicitBounds(m, partition(10, [0, 1, 2, 3, 4]));
    expect(b.upper.rank).toBe(10007n ** 4n);
    expect(b.upper.rank > BigInt(Number.MAX_SAFE_INTEGER)).toBe(true);
    expect(b.upper.cut).toEqual([{ layer: 'bond a-b', line: 20, dim: 10007, count: 4 }]);
    expect(b.lower?.rank).toBe(10007n ** 4n);
    expect(b.lower?.method).toBe('power-rounding q=10007');
  });

  it('rounds with exact integer logarithms (log 1000 / log 10 is 2.999… in floats)', () => {
    // a —(10, 100)— b with legs of 1000: every cut is 1000 = 10^3, reached only by q = 10.
    const m = model(
      [
        ['a', [[0, 1000]]],
        ['b', [[1, 1000]]],
      ],
      [
        [['a', 'b'], 10],
        [['a', 'b'], 100],
      ],
    );
    const b = explicitBounds(m, partition(2, [0]));
    expect(b.upper.rank).toBe(1000n);
    expect(b.lower?.rank).toBe(1000n);
    expect(b.lower?.method).toBe('power-rounding q=10');
  });

  it('tries integer roots of the dimensions as bases', () => {
    // a —(9, 27)— b with legs of 243: every cut is 3^5, and 3 is no dimension, only a root of one.
    const m = model(
      [
        ['a', [[0, 243]]],
        ['b', [[1, 243]]],
      ],
      [
        [['a', 'b'], 9],
        [['a', 'b'], 27],
      ],
    );
    const b = explicitBounds(m, partition(2, [0]));
    expect(b.upper.rank).toBe(243n);
    expect(b.lower?.rank).toBe(243n);
    expect(b.lower?.method).toBe('power-rounding q=3');
  });

  it('groups legs of one tensor and picks the best base among 2 and the dimensions', () => {
    const legsCut = explicitBounds(
      model(
        [
          ['a', [[0, 2], [1, 2]], 4],
          ['b', [[2, 8]], 8],
        ],
        [[['a', 'b'], 8, 12]],
      ),
      partition(3, [0, 1]),
    );
    expect(legsCut.upper.rank).toBe(4n);
    expect(legsCut.upper.cut).toEqual([{ layer: 'legs', line: 4, dim: 2, count: 2 }]);

    // Bond 3 is the bottleneck against legs of 4: q = 2 proves only 2, q = 3 proves 3.
    const bondCut = explicitBounds(
      model(
        [
          ['a', [[0, 4], [1, 4]], 4],
          ['b', [[2, 4]], 8],
        ],
        [[['a', 'b'], 3, 12]],
      ),
      partition(3, [0, 1]),
    );
    expect(bondCut.upper.rank).toBe(3n);
    expect(bondCut.upper.cut).toEqual([{ layer: 'bond a-b', line: 12, dim: 3, count: 1 }]);
    expect(bondCut.lower?.rank).toBe(3n);
    expect(bondCut.lower?.method).toBe('power-rounding q=3');
  });
});

describe('explicitBounds with hyperedges', () => {
  it('pays a hyperedge once, and proves the lower bound on a tree', () => {
    const m = model(
      [0, 1, 2, 3].map((i) => [`t${i}`, [[i, 3]]] as const),
      [[['t0', 't1', 't2', 't3'], 3, 5]],
    );
    const part = partition(4, [0, 1]);
    const b = explicitBounds(m, part);
    expect(b.upper.rank).toBe(3n);
    expect(b.upper.cut).toEqual([{ layer: 'bond t0-t1-t2-t3', line: 5, dim: 3, count: 1 }]);
    expect(b.lower?.rank).toBe(3n);
    expect(networkRankModP(m, part, rng(5))).toBe(3);
  });

  it('gives no lower bound when a hyperedge sits on a loop', () => {
    const m = model(
      [0, 1, 2].map((i) => [`t${i}`, [[i, 2]]] as const),
      [
        [['t0', 't1', 't2'], 2],
        [['t0', 't1'], 2],
      ],
    );
    const b = explicitBounds(m, partition(3, [0]));
    expect(b.upper.rank).toBe(2n);
    expect(b.lower).toBeNull();
  });

  it('still gives one on a tree of several hyperedges and bonds, within the measured rank', () => {
    const m = model(
      [
        ['a', [[0, 2], [1, 3]]],
        ['b', [[2, 2]]],
        ['c', [[3, 3]]],
        ['d', [[4, 2]]],
      ],
      [
        [['a', 'b', 'c'], 3],
        [['c', 'd'], 2],
      ],
    );
    for (const a of [[0], [0, 1], [0, 2], [1, 3], [2, 4]]) {
      const part = partition(5, a);
      const b = explicitBounds(m, part);
      expect(b.upper.rank).toBe(bruteMinCut(m, part));
      expect(b.lower).not.toBeNull();
      const rank = BigInt(networkRankModP(m, part, rng(6)));
      expect(b.lower!.rank <= rank).toBe(true);
      expect(rank <= b.upper.rank).toBe(true);
    }
  });
});
