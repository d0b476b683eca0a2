/**
 * Self-tests of the oracle, so that the property tests compare the engine against something
 * trustworthy: the field arithmetic against BigInt, the rank routine on matrices of known rank,
 * the probe evaluator against the coefficient-tensor contraction on random small trees (two
 * independent constructions, one shared weight draw: they must agree), and the measured check
 * values measured here and of the literature. Each value names its source beside it.
 */
import { describe, expect, it } from 'vitest';
import type { LayeredModel } from '../../src/config/model.js';
import { P, Rng, inv, mul, mulAdd, randomVector, rank } from './field.js';
import { compile, probeInputs, probeMatrixNaive, probeRank, probeRankAdaptive, probeRankWith, tokenProbeExact, WeightStore, type SurrogateKind } from './surrogate.js';
import { explicitRank, NotATreeNetwork, treeTensorRank } from './contract.js';
import { attentionCase, LAYERED_GENERATORS, randomMask, sequenceRecurrentCase } from './families.js';
import { conv, explicit, globalPool, layered, partition, pool, recurrent, type LayerDraft } from './models.js';
import { planModel } from './plan.js';

/** Probe rank with K = expected + 8 (K must exceed the rank for the reading to be the rank). */
function probe(model: LayeredModel, spec: string, expected: number, surrogate: SurrogateKind = 'tree', seed = 1): number {
  return probeRank(model, surrogate, partition(spec, model.input.shape).side, expected + 8, new Rng(seed));
}

describe('field arithmetic and rank', () => {
  it('multiplies and inverts exactly (checked against BigInt)', () => {
    const rng = new Rng(7);
    const big = BigInt(P);
    for (let i = 0; i < 5000; i++) {
      const a = rng.residue();
      const b = rng.residue();
      const c = rng.residue();
      expect(BigInt(mulAdd(a, b, c))).toBe((BigInt(a) * BigInt(b) + BigInt(c)) % big);
      if (a !== 0) expect(mul(a, inv(a))).toBe(1);
    }
    expect(mulAdd(P - 1, P - 1, P - 1)).toBe(Number(((big - 1n) * (big - 1n) + big - 1n) % big));
  });

  it('is a prime modulus', () => {
    for (let d = 2; d * d <= P; d++) expect(P % d === 0, `divisor ${d}`).toBe(false);
  });

  it('ranks products of random n×r and r×n matrices as r', () => {
    const rng = new Rng(11);
    for (const [n, r] of [
      [5, 0],
      [6, 1],
      [20, 7],
      [40, 40],
      [33, 12],
    ] as const) {
      const a = randomVector(rng, n * r);
      const b = randomVector(rng, r * n);
      const m = new Float64Array(n * n);
      for (let i = 0; i < n; i++)
        for (let j = 0; j < n; j++) {
          let acc = 0;
          for (let k = 0; k < r; k++) acc = mulAdd(a[i * r + k]!, b[k * n + j]!, acc);
          m[i * n + j] = acc;
        }
      expect(rank(m, n, n)).toBe(r);
    }
    // Rectangular and with dependent rows.
    const m = Float64Array.from([1, 2, 3, 2, 4, 6, 0, 1, 1]);
    expect(rank(m, 3, 3)).toBe(2);
    expect(rank(Float64Array.from([1, 2, 3, 4, 5, 6]), 2, 3)).toBe(2);
  });

  it('draws the same stream from the same seed', () => {
    const a = new Rng(123456);
    const b = new Rng(123456);
    const c = new Rng(123457);
    const xs = Array.from({ length: 10 }, () => a.u32());
    expect(Array.from({ length: 10 }, () => b.u32())).toEqual(xs);
    expect(Array.from({ length: 10 }, () => c.u32())).not.toEqual(xs);
  });
});

describe('the two oracle methods agree', () => {

  it('the cached probe matrix equals entry-by-entry evaluation, for every family', () => {
    // The fast path computes side-only units once per row or column; it must not change a value.
    const master = new Rng(31337);
    for (const { name, gen } of LAYERED_GENERATORS) {
      for (let i = 0; i < 6; i++) {
        const seed = master.fork();
        const c = gen(new Rng(seed));
        const ev = compile(c.model, c.surrogate, new WeightStore(new Rng(seed)));
        for (const p of c.partitions) {
          const { xa, xb } = probeInputs(ev, p.side, 5, new Rng(seed + 1));
          expect(Array.from(ev.probeMatrix(p.side, xa, xb)), `${name} seed ${seed} ${p.label}`).toEqual(Array.from(probeMatrixNaive(ev, p.side, xa, xb)));
        }
      }
    }
  });

  it('probe rank equals coefficient-tensor rank on random tree chains (shared weights draw)', () => {
    // Where the tree surrogate's function is a tensor network (a chain using every input once,
    // multilinear), the two constructions must give the same rank from one weight draw.
    const master = new Rng(2024);
    const compared = new Map<string, number>();
    const tries = LAYERED_GENERATORS.filter((g) => !g.name.endsWith('-overlap') && !g.name.startsWith('overlap'));
    for (let i = 0; i < 1500 && [...compared.values()].reduce((a, b) => a + b, 0) < 200; i++) {
      const seed = master.fork();
      const { name, gen } = tries[i % tries.length]!;
      const c = gen(new Rng(seed));
      if (c.surrogate !== 'tree') continue;
      const n = c.model.input.shape.reduce((a, b) => a * b, 1);
      const m = planModel(c.model, 'tree').m;
      if (m ** n > 4096) continue;
      for (const p of c.partitions) {
        const weights = new WeightStore(new Rng(seed ^ 0x1234));
        const ev = compile(c.model, 'tree', weights);
        const drawn = weights.size;
        let tensor: number;
        try {
          tensor = treeTensorRank(c.model, p.side, weights);
        } catch (e) {
          if (e instanceof NotATreeNetwork) break;
          throw e;
        }
        // The contraction must have found every weight already drawn by the evaluator.
        expect(weights.size, `${name} seed ${seed}: the two constructions asked for different weights`).toBe(drawn);
        const probed = probeRankWith(ev, p.side, tensor + 8, new Rng(seed ^ 0x5678));
        expect(probed, `${name} seed ${seed} partition ${p.label}`).toBe(tensor);
        compared.set(name, (compared.get(name) ?? 0) + 1);
      }
    }
    expect([...compared.values()].reduce((a, b) => a + b, 0)).toBeGreaterThanOrEqual(200);
    // The chains of the stacks and several block families reach the comparison.
    for (const name of ['tree1d', 'tree2d', 'recurrent', 'pools-tree', 'dilation-tree', 'grouped-tree']) {
      expect(compared.get(name) ?? 0, name).toBeGreaterThan(0);
    }
  });

  it('kernel-1 convs and tiling pools: overlap and tree give the generic rank of the tensor network', () => {
    // A conv of kernel 1 and stride 1 is the same per-position map under both surrogates.
    const master = new Rng(77);
    for (let i = 0; i < 60; i++) {
      const seed = master.fork();
      const rng = new Rng(seed);
      const twoD = i % 2 === 1;
      const shape = twoD ? [...rng.pick([[2, 2], [2, 4], [4, 2], [3, 3], [4, 4]] as const)] : [rng.pick([2, 3, 4, 6, 8, 9])];
      const layers: LayerDraft[] = [];
      let dims = shape.slice();
      while (dims.some((x) => x > 1)) {
        layers.push(conv(rng.pick([1, 2, 2, 3, 3, 4]), { dims: dims.length }));
        const window = dims.map((x) => (x === 1 ? 1 : rng.pick([2, 3, x].filter((w) => x % w === 0))));
        layers.push(pool(window));
        dims = dims.map((x, a) => x / window[a]!);
      }
      const m = layered(shape, rng.pick([1, 2, 2, 3]), rng.chance(0.5), layers);
      const n = shape.reduce((a, b) => a * b, 1);
      if ((m.input.representation ?? 1) ** n > 4096) continue;
      const side = randomMask(rng, n);
      const reference = treeTensorRank(m, side, new WeightStore(new Rng(seed)));
      const k = reference + 8;
      expect(probeRank(m, 'overlap', side, k, new Rng(seed + 1)), `seed ${seed}`).toBe(reference);
      expect(probeRank(m, 'tree', side, k, new Rng(seed + 2)), `seed ${seed}`).toBe(reference);
    }
  });
});

describe('sequence models: the oracle against itself', () => {
  it('attention: the aggregated form equals the literal double sum, in value and receptive field', () => {
    // Two evaluations of the same text (`AttentionForm`), one weight draw: every attention draw of
    // both families must give the same number and the same positions read.
    const master = new Rng(4711);
    for (let i = 0; i < 120; i++) {
      const seed = master.fork();
      const c = attentionCase(new Rng(seed), i % 2 === 1);
      const weights = new WeightStore(new Rng(seed));
      const agg = compile(c.model, 'tree', weights, 'aggregate');
      const lit = compile(c.model, 'tree', weights, 'literal');
      const x = agg.plan.vocabulary === undefined ? randomVector(new Rng(seed + 1), agg.positions * agg.features) : tokens(new Rng(seed + 1), agg.positions, agg.plan.vocabulary);
      expect(agg.evaluate(x), `seed ${seed}`).toBe(lit.evaluate(x));
      expect(Array.from(agg.dependsOn()), `seed ${seed}`).toEqual(Array.from(lit.dependsOn()));
    }
  });

  it('token inputs: the adaptive probe reads the rank of the whole token table', () => {
    // Reference: K large enough that both sides are enumerated (every token sequence of each
    // side: the matrix is the function on its discrete domain, its rank exact). The adaptive
    // probe samples larger sides; it must not read lower on these draws.
    const master = new Rng(99);
    let compared = 0;
    for (let i = 0; i < 200 && compared < 40; i++) {
      const seed = master.fork();
      const c = i % 2 === 0 ? attentionCase(new Rng(seed), i % 4 === 0) : sequenceRecurrentCase(new Rng(seed), i % 4 === 1);
      if (c.model.input.vocabulary === undefined) continue;
      const ev = compile(c.model, 'tree', new WeightStore(new Rng(seed)));
      for (const p of c.partitions) {
        let k = 16;
        while (!tokenProbeExact(ev, p.side, k) && k < 64) k *= 2;
        if (!tokenProbeExact(ev, p.side, k) || tokenProbeExact(ev, p.side, 16)) continue;
        const full = probeRankWith(ev, p.side, k, new Rng(seed + 2));
        expect(probeRankAdaptive(ev, p.side, 158, new Rng(seed + 3)), `seed ${seed} ${p.label}`).toBe(full);
        compared++;
      }
    }
    expect(compared).toBeGreaterThanOrEqual(40);
  });
});

/** n random tokens of a vocabulary v, as indicator vectors. */
function tokens(rng: Rng, n: number, v: number): Float64Array {
  const x = new Float64Array(n * v);
  for (let p = 0; p < n; p++) x[p * v + rng.int(0, v - 1)] = 1;
  return x;
}

describe('measured here (exact rank mod a prime)', () => {
  it('1D, 8 inputs, windows 2·2·2, unshared, even/odd, M = 3, r = (3,3,3): 81', () => {
    // source: measured here (exact rank mod a prime) (min(M, r0)^4)
    const m = layered([8], 3, false, [conv(3), pool([2]), conv(3), pool([2]), conv(3), pool([2])]);
    expect(probe(m, 'interleaved', 81)).toBe(81);
  });

  it('4×4, 2×2 pooling, M = 2, unshared', () => {
    const net = (r: number, shared = false): LayeredModel =>
      layered([4, 4], 2, shared, [conv(r, { dims: 2 }), pool([2, 2]), conv(r, { dims: 2 }), pool([2, 2])]);
    expect(probe(net(2), 'checkerboard', 16)).toBe(16); // source: measured here (exact rank mod a prime)
    expect(probe(net(2), 'left-right', 2)).toBe(2); // source: measured here (exact rank mod a prime)
    expect(probe(net(3), 'checkerboard', 81)).toBe(81); // source: measured here (exact rank mod a prime)
    expect(probe(net(4), 'checkerboard', 256)).toBe(256); // source: measured here (exact rank mod a prime)
    // Shared weights, channels (4, ·): the symmetric power lowers 256 to 81. The second
    // width does not matter; 4 is used here (2 gives the same reading, checked below).
    expect(probe(net(4, true), 'checkerboard', 81)).toBe(81); // source: measured here (exact rank mod a prime)
    const second2 = layered([4, 4], 2, true, [conv(4, { dims: 2 }), pool([2, 2]), conv(2, { dims: 2 }), pool([2, 2])]);
    expect(probe(second2, 'checkerboard', 81)).toBe(81);
  });

  it('shallow net, N = 6, M = 2, |A| = 3: min(Z, 8) for Z = 1..10', () => {
    // source: measured here (exact rank mod a prime); Cohen & Shashua, "Inductive bias of deep
    // convolutional networks through pooling geometry" (ICLR 2017): the rank is at most the width
    // Z, and at most M^|A| = 8. One hidden layer of width Z, unshared (a CP decomposition).
    for (let z = 1; z <= 10; z++) {
      const m = layered([6], 2, false, [conv(z), globalPool()]);
      expect(probe(m, 'start-end', Math.min(z, 8)), `Z = ${z}`).toBe(Math.min(z, 8));
    }
  });

  it('recurrent arithmetic circuits, start/end', () => {
    // source: measured here (exact rank mod a prime) — depth 1: R
    for (const [mr, t] of [
      [1, 4],
      [2, 4],
      [2, 6],
      [3, 4],
      [3, 8],
    ] as const) {
      expect(probe(layered([t], mr, true, [recurrent(mr, 1)]), 'start-end', mr), `depth 1 M=R=${mr} T=${t}`).toBe(mr);
    }
    // source: measured here (exact rank mod a prime) — depth 2, R·C(R+T/2−1, T/2) for M = R
    const d2 = (mr: number, t: number): LayeredModel => layered([t], mr, true, [recurrent(mr, 2)]);
    expect(probe(d2(2, 4), 'start-end', 6)).toBe(6);
    expect(probe(d2(2, 6), 'start-end', 8)).toBe(8);
    expect(probe(d2(2, 8), 'start-end', 10)).toBe(10);
    expect(probe(d2(3, 4), 'start-end', 18)).toBe(18);
    expect(probe(d2(3, 6), 'start-end', 30)).toBe(30);
  });

  it('depth-2 RAC, T = 4, M = R = 2, A = {first step}: 5 > M', () => {
    // source: measured here (exact rank mod a prime) (the input-side cap M^|A| fails under reuse)
    expect(probe(layered([4], 2, true, [recurrent(2, 2)]), 'positions:0', 5)).toBe(5);
  });

  it('overlap, 1D, 8 inputs, three blocks (3-tap conv, 2 channels, same; product pool 2), M = 2, start-end: 195; tree 2', () => {
    // source: measured here (exact rank mod a prime). Shared and unshared weights
    // both give 195 (measured here), and the tree surrogate gives 2 for both.
    for (const shared of [true, false]) {
      const block = (): LayerDraft[] => [conv(2, { kernel: [3], padding: 'same' }), pool([2])];
      const m = layered([8], 2, shared, [...block(), ...block(), ...block()]);
      expect(probe(m, 'start-end', 195, 'overlap'), `shared=${shared}`).toBe(195);
      expect(probe(m, 'start-end', 2, 'tree'), `shared=${shared}`).toBe(2);
    }
  });

  it('1D, 6 inputs, windows [3, 2], M = 3, channels (5, 2), unshared, interleaved: 14 (min-cut 15)', () => {
    // source: measured here (exact rank mod a prime) (min-cut is not attained even on a tree)
    const m = layered([6], 3, false, [conv(5), pool([3]), conv(2), pool([2])]);
    expect(probe(m, 'interleaved', 15)).toBe(14);
  });
});

/** Brute-force min-cut of a small explicit network: every placement of the tensors on A or B. */
function bruteMinCut(model: ReturnType<typeof explicit>, side: Uint8Array): number {
  const n = model.tensors.length;
  let best = Infinity;
  for (let mask = 0; mask < 1 << n; mask++) {
    const onA = (t: number): boolean => ((mask >> t) & 1) === 1;
    let cost = 1;
    model.tensors.forEach((t, i) => {
      for (const l of t.legs) if (((side[l.position] ?? 0) === 1) !== onA(i)) cost *= l.dim;
    });
    for (const b of model.bonds) {
      const sides = new Set(b.tensors.map((name) => onA(model.tensors.findIndex((t) => t.name === name))));
      if (sides.size > 1) cost *= b.dim;
    }
    best = Math.min(best, cost);
  }
  return best;
}

describe('explicit networks', () => {
  const side = (n: number, a: readonly number[]): Uint8Array => {
    const s = new Uint8Array(n);
    for (const p of a) s[p] = 1;
    return s;
  };

  it('contracts simple networks to their known ranks', () => {
    const rng = new Rng(5);
    // One tensor 3×4: a generic matrix, rank 3.
    expect(explicitRank(explicit([2], [{ name: 'a', legs: [[0, 3], [1, 4]] }], []), side(2, [0]), rng)).toBe(3);
    // A hyperedge of dim 2 over three tensors with legs 3: Σ_k A[a,k]B[b,k]C[c,k], rank 2.
    const cp = explicit(
      [3],
      [
        { name: 'a', legs: [[0, 3]] },
        { name: 'b', legs: [[1, 3]] },
        { name: 'c', legs: [[2, 3]] },
      ],
      [{ tensors: ['a', 'b', 'c'], dim: 2 }],
    );
    expect(explicitRank(cp, side(3, [0]), rng)).toBe(2);
    expect(explicitRank(cp, side(3, [0, 1]), rng)).toBe(2);
    // A triangle of bonds 2 with legs 4: {a} against {b, c} passes 2·2 = 4.
    const tri = explicit(
      [3],
      [
        { name: 'a', legs: [[0, 4]] },
        { name: 'b', legs: [[1, 4]] },
        { name: 'c', legs: [[2, 4]] },
      ],
      [
        { tensors: ['a', 'b'], dim: 2 },
        { tensors: ['b', 'c'], dim: 2 },
        { tensors: ['a', 'c'], dim: 2 },
      ],
    );
    expect(explicitRank(tri, side(3, [0]), rng)).toBe(4);
    // An MPS of four sites, leg 2, bond 3, cut in the middle: min(3, 2·2) = 3.
    const mps = explicit(
      [4],
      [0, 1, 2, 3].map((i) => ({ name: `s${i}`, legs: [[i, 2]] as const })),
      [
        { tensors: ['s0', 's1'], dim: 3 },
        { tensors: ['s1', 's2'], dim: 3 },
        { tensors: ['s2', 's3'], dim: 3 },
      ],
    );
    expect(explicitRank(mps, side(4, [0, 1]), rng)).toBe(3);
    expect(explicitRank(mps, side(4, [0]), rng)).toBe(2);
  });

  it('the star network: min-cut 8, generic rank 7; with legs 4: 8 = 8', () => {
    // source: measured here (exact rank mod a prime) (max-flow/min-cut fails off powers of one
    // integer: Cui, Freedman, Sattath, Stong, Minton, "Quantum max-flow/min-cut", 2016).
    // Positions: 0 the centre's leg; 1, 2 the legs 2 and 3 of u; 3, 4 those of w. The partition
    // with min-cut 8 is A = {2, 4} (the two legs of 3): cutting the centre's leg and the legs 2 of
    // u and w costs 2·2·2 = 8, cheaper than 3·3 = 9.
    for (const [leg, expected] of [
      [3, 7],
      [4, 8],
    ] as const) {
      const star = explicit(
        [5],
        [
          { name: 'c', legs: [[0, 2]] },
          { name: 'u', legs: [[1, 2], [2, leg]] },
          { name: 'w', legs: [[3, 2], [4, leg]] },
        ],
        [
          { tensors: ['c', 'u'], dim: 2 },
          { tensors: ['c', 'w'], dim: 2 },
        ],
      );
      const a = partition('positions:2,4', [5]).side;
      expect(bruteMinCut(star, a)).toBe(8);
      expect(explicitRank(star, a, new Rng(leg))).toBe(expected);
    }
  });
});
