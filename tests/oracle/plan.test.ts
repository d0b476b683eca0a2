/**
 * The oracle's grid arithmetic and its reading of a model, checked two ways: against worked
 * examples of the contributor guide's formulas (and the common conventions they encode), and
 * against the product's own shape inference on every family's draws. The two readings were
 * written apart from the same text; where they disagree one of them misreads it.
 */
import { describe, expect, it } from 'vitest';
import { inferShapes } from '../../src/config/model-shapes.js';
import { Rng } from './field.js';
import { LAYERED_GENERATORS } from './families.js';
import { count, linearAxis, transposeLength, transposePairs, treeConvAxis, treeTransposeAxis, windowAxis, axisTaps } from './geometry.js';
import { planModel } from './plan.js';
import { describeModel } from './models.js';

const same = { mode: 'same' } as const;
const valid = { mode: 'valid' } as const;
const causal = { mode: 'causal' } as const;

describe('grid arithmetic, worked examples', () => {
  it('output lengths and left padding of the table', () => {
    // `same`, n = 5, k = 3, s = 2: ⌈5/2⌉ = 3 outputs, total padding (3−1)·2 + 3 − 5 = 2, left 1
    // (common practice: the smaller half of the padding goes first).
    expect(windowAxis(5, 3, 2, 1, same, 0)).toEqual({ out: 3, left: 1 });
    expect(windowAxis(4, 3, 2, 1, same, 0)).toEqual({ out: 2, left: 0 });
    // `valid`: ⌊(n−e)/s⌋+1 with e = d(k−1)+1: n = 8, k = 3, d = 2 → e = 5, 4 outputs.
    expect(windowAxis(8, 3, 1, 2, valid, 0)).toEqual({ out: 4, left: 0 });
    expect(() => windowAxis(4, 3, 1, 2, valid, 0)).toThrow();
    // `causal`: every zero on the left: n = 8, k = 2, d = 4 → e − 1 = 4 zeros, 8 outputs.
    expect(windowAxis(8, 2, 1, 4, causal, 0)).toEqual({ out: 8, left: 4 });
    expect(windowAxis(7, 2, 2, 1, causal, 0)).toEqual({ out: 4, left: 1 });
    // explicit p: ⌊(n+2p−e)/s⌋+1.
    expect(windowAxis(4, 3, 2, 1, { mode: 'explicit', amount: [1] }, 0)).toEqual({ out: 2, left: 1 });
    // Taps j·s − left + t·d.
    expect(axisTaps(1, { out: 3, left: 1 }, 3, 2, 1)).toEqual([1, 2, 3]);
  });

  it('tree conv positions P(j): centre tap, stride windows, subsampling, causal', () => {
    const p = (n: number, k: number, s: number, d: number, pad: typeof same | typeof valid | typeof causal): number[][] => {
      const w = windowAxis(n, k, s, d, pad, 0);
      return Array.from({ length: w.out }, (_, j) => treeConvAxis(j, n, w, k, s, d, pad.mode === 'causal'));
    };
    expect(p(4, 3, 1, 1, same)).toEqual([[0], [1], [2], [3]]); // stride 1, same: the centre tap is j
    expect(p(5, 3, 1, 1, valid)).toEqual([[1], [2], [3]]); // valid shrinks the grid; centre tap
    expect(p(5, 3, 1, 2, valid)).toEqual([[2]]); // dilation 2: e = 5, the centre of 0..4
    expect(p(6, 1, 2, 1, same)).toEqual([[0], [2], [4]]); // kernel narrower than its stride subsamples
    expect(p(5, 3, 2, 1, same)).toEqual([[0], [1, 2], [3, 4]]); // k ≥ s: the stride window, clipped
    expect(p(8, 2, 2, 1, causal)).toEqual([[0], [1, 2], [3, 4], [5, 6]]); // causal: position 7 is read by no output
    expect(p(5, 2, 1, 3, causal)).toEqual([[0], [1], [2], [3], [4]]);
  });

  it('transposed conv: length, overlap pairs and tree sources', () => {
    // (n−1)·s − 2p + d(k−1) + 1 + q (common practice for transposed convolutions).
    expect(transposeLength(3, 3, 2, 1, 1, 1)).toBe(6);
    expect(transposeLength(2, 2, 2, 1, 0, 0)).toBe(4);
    // n = 2, k = 3, s = 2, p = 0: i·2 + t = j.
    expect([0, 1, 2, 3, 4].map((j) => transposePairs(j, 2, 3, 2, 1, 0))).toEqual([[[0, 0]], [[0, 1]], [[1, 0], [0, 2]], [[1, 1]], [[1, 2]]]);
    expect([0, 1, 2, 3, 4].map((j) => treeTransposeAxis(j, 2, 2))).toEqual([
      { source: 0, offset: 0 },
      { source: 0, offset: 1 },
      { source: 1, offset: 0 },
      { source: 1, offset: 1 },
      { source: 1, offset: 0 },
    ]);
  });

  it('linear upsampling weights are the half-pixel ones', () => {
    // Factor 2 on 2 positions: 1 | ¾,¼ | ¼,¾ | 1 (common practice: bilinear resize with
    // half-pixel centres, corners not aligned).
    expect([0, 1, 2, 3].map((j) => linearAxis(j, 2, 2))).toEqual([
      { i0: 0, i1: 0, num: 0, den: 4 },
      { i0: 0, i1: 1, num: 1, den: 4 },
      { i0: 0, i1: 1, num: 3, den: 4 },
      { i0: 1, i1: 1, num: 0, den: 4 },
    ]);
    // Factor 3: centres at (j + ½)/3 − ½ = −⅓, 0, ⅓, ⅔, 1, 4/3 for n = 2.
    expect([0, 1, 2, 3, 4, 5].map((j) => linearAxis(j, 2, 3)).map((l) => [l.i0, l.num / l.den])).toEqual([
      [0, 0],
      [0, 0],
      [0, 1 / 3],
      [0, 2 / 3],
      [1, 0],
      [1, 0],
    ]);
  });
});

describe("the oracle's reading of models agrees with the product's shape inference", () => {
  it('grids, widths, groups, dense readings, M and the output position, on every family', () => {
    const master = new Rng(4242);
    const problems: string[] = [];
    for (const { name, gen } of LAYERED_GENERATORS) {
      for (let i = 0; i < 25; i++) {
        const seed = master.fork();
        const c = gen(new Rng(seed));
        const where = `${name} seed ${seed}: ${describeModel(c.model)}`;
        const mine = planModel(c.model, c.surrogate);
        const theirs = inferShapes(c.model);
        if (!theirs.ok) {
          problems.push(`${where}: inferShapes refused: ${theirs.diagnostics.map((d) => d.message).join('; ')}`);
          continue;
        }
        const s = theirs.shapes;
        if (s.representation !== mine.m) problems.push(`${where}: M ${s.representation} vs ${mine.m}`);
        c.model.layers.forEach((_, li) => {
          const a = mine.grids[li]!;
          const b = s.layers[li]!;
          const single = count(a.dims) === 1 && count(b.shape) === 1;
          if (!single && a.dims.join(',') !== b.shape.join(',')) problems.push(`${where}: layer ${li} grid [${b.shape}] vs [${a.dims}]`);
          if (a.width !== b.width) problems.push(`${where}: layer ${li} width ${b.width} vs ${a.width}`);
          if (s.groups[li] !== mine.groups[li]) problems.push(`${where}: layer ${li} groups ${s.groups[li]} vs ${mine.groups[li]}`);
          if (s.denseReading[li] !== mine.reading[li]) problems.push(`${where}: layer ${li} reading ${s.denseReading[li]} vs ${mine.reading[li]}`);
        });
        const last = mine.grids[mine.grids.length - 1]!;
        if (count(last.dims) > 1 && s.output.position.join(',') !== mine.output.position.join(',')) {
          problems.push(`${where}: output [${s.output.position}] vs [${mine.output.position}]`);
        }
      }
    }
    expect(problems, problems.join('\n')).toEqual([]);
  });
});
