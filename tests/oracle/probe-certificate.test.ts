/**
 * The certified probe's certificates, re-checked without the product's evaluator: the numbers are
 * drawn again here from the function DEVELOPERS.md states ("Certified probe": the draw and the
 * names of weights and inputs), the model is evaluated by the oracle's own surrogate evaluator
 * (surrogate.ts, with every weight it asks for taken from that draw), and the minor's rank and
 * determinant are computed with the oracle's field arithmetic. A certificate passes when the
 * minor on its rows and columns has full rank and the determinant it states.
 */
import { describe, expect, it } from 'vitest';
import { computeBounds } from '../../src/cut/bounds.js';
import type { ExplicitModel, LayeredModel } from '../../src/config/model.js';
import type { ProbeCertificate } from '../../src/cut/types.js';
import { P, Rng, add, inv, mul, rank } from './field.js';
import { LAYERED_GENERATORS, explicitCase } from './families.js';
import { contract, explicitNetwork } from './contract.js';
import { compile, WeightStore, type SurrogateKind } from './surrogate.js';
import { conv, layered, partition, pool } from './models.js';

/** The draw as DEVELOPERS.md writes it (FNV-1a of the name, a 32-bit finaliser, a counter). */
function fnv(name: string): number {
  let h = 0x811c9dc5;
  for (const ch of name) h = Math.imul(h ^ ch.charCodeAt(0), 0x01000193) >>> 0;
  return h;
}
function fmix(x: number): number {
  x = Math.imul(x ^ (x >>> 16), 0x85ebca6b) >>> 0;
  x = Math.imul(x ^ (x >>> 13), 0xc2b2ae35) >>> 0;
  return (x ^ (x >>> 16)) >>> 0;
}
function draw(seed: number, name: string, length: number): Float64Array {
  const base = fmix((seed ^ fnv(name)) >>> 0);
  return Float64Array.from({ length }, (_, i) => fmix((base + Math.imul(i + 1, 0x9e3779b9)) >>> 0) % P);
}

/** Every weight the oracle asks for, by its name, from the certificate's draw. */
class DrawnWeights extends WeightStore {
  constructor(private readonly seed: number) {
    super(new Rng(0));
  }
  override get(key: string, length: number): Float64Array {
    return draw(this.seed, key, length);
  }
}

/** Determinant mod P by elimination (the oracle's field operations). */
function determinant(m: Float64Array, k: number): number {
  const a = Float64Array.from(m);
  let det = 1;
  for (let c = 0; c < k; c++) {
    let p = c;
    while (p < k && a[p * k + c] === 0) p++;
    if (p === k) return 0;
    if (p !== c) {
      for (let j = 0; j < k; j++) [a[p * k + j], a[c * k + j]] = [a[c * k + j]!, a[p * k + j]!];
      det = P - det;
    }
    det = mul(det, a[c * k + c]!);
    const s = inv(a[c * k + c]!);
    for (let r = c + 1; r < k; r++) {
      const f = mul(a[r * k + c]!, s);
      if (f === 0) continue;
      for (let j = c; j < k; j++) a[r * k + j] = add(a[r * k + j]!, mul(P - f, a[c * k + j]!));
    }
  }
  return det % P;
}

/** The certificate's minor, re-evaluated: [its rank, its determinant]. */
function recheck(model: LayeredModel, surrogate: SurrogateKind, side: Uint8Array, c: ProbeCertificate): [number, number] {
  const ev = compile(model, surrogate, new DrawnWeights(c.seed));
  if (!('probes' in c)) throw new Error('not a layered certificate');
  const tokens = model.input.vocabulary !== undefined;
  const V = ev.features;
  // A token input: probe inputs 0, 1, 2, … of a side in turn take, at attempt t = 0, 1, 2, …, the
  // token value(seed, name, t) mod V at every position, until the assignment is a new one.
  const assignments = (which: 'a' | 'b', upTo: number): number[][] => {
    const at = [...side.keys()].filter((p) => (side[p] === 1) === (which === 'a'));
    const seen = new Set<string>();
    const out: number[][] = [];
    for (let index = 0; index <= upTo; index++) {
      for (let t = 0; ; t++) {
        const x = at.map((p) => draw(c.seed, `${which}${index}@${p}`, t + 1)[t]! % V);
        if (seen.has(x.join(','))) continue;
        seen.add(x.join(','));
        out.push(x);
        break;
      }
    }
    return out;
  };
  const chosen = tokens ? { a: assignments('a', Math.max(...c.rows)), b: assignments('b', Math.max(...c.cols)) } : undefined;
  const inputs = (which: 'a' | 'b', index: number): Float64Array => {
    const parts: number[] = [];
    let k = 0;
    for (let p = 0; p < ev.positions; p++) {
      if ((side[p] === 1) !== (which === 'a')) continue;
      if (!chosen) parts.push(...draw(c.seed, `${which}${index}@${p}`, V));
      else {
        const x = new Array<number>(V).fill(0);
        x[chosen[which][index]![k++]!] = 1;
        parts.push(...x);
      }
    }
    return Float64Array.from(parts);
  };
  const minor = ev.probeMatrix(
    side,
    c.rows.map((i) => inputs('a', i)),
    c.cols.map((j) => inputs('b', j)),
  );
  const k = c.rows.length;
  return [rank(minor, k, k), determinant(minor, k)];
}

/**
 * An explicit network's certificate, re-evaluated: every tensor drawn as `tensor:{name}` (DEVELOPERS.md),
 * the network contracted by the oracle into its matricisation, and the minor on the certificate's
 * rows and columns (indices of that matrix): [its rank, its determinant].
 */
function recheckExplicit(model: ExplicitModel, side: Uint8Array, c: ProbeCertificate): [number, number] {
  if (!('matricisation' in c)) throw new Error('not an explicit certificate');
  const { net, rows, cols } = explicitNetwork(model, side, (name, size) => draw(c.seed, `tensor:${name}`, size));
  const width = cols.reduce((a, v) => a * net.dims[v]!, 1);
  expect([rows.reduce((a, v) => a * net.dims[v]!, 1), width]).toEqual([...c.matricisation]);
  const whole = contract(net, [...rows, ...cols]);
  const k = c.rows.length;
  const minor = new Float64Array(k * k);
  c.rows.forEach((i, a) => c.cols.forEach((j, b) => (minor[a * k + b] = whole[i * width + j]!)));
  return [rank(Float64Array.from(minor), k, k), determinant(minor, k)];
}

describe('certified probe certificates, re-checked by the oracle', () => {
  it('every certificate of an explicit network re-checks on its contracted matricisation', () => {
    const master = new Rng(4343);
    let checked = 0;
    for (let n = 0; n < 60; n++) {
      const seed = master.fork();
      const c = explicitCase(new Rng(seed));
      const out = computeBounds(c.model, c.partitions, { surrogate: 'tree' });
      if (!out.ok) continue;
      out.result.partitions.forEach((pb, i) => {
        const cert = pb.lower?.certificate;
        if (!cert) return;
        const [r, det] = recheckExplicit(c.model, c.partitions[i]!.side, cert);
        expect(r, `explicit seed=${seed} ${pb.partition}`).toBe(cert.rows.length);
        expect(det, `explicit seed=${seed} ${pb.partition}`).toBe(cert.determinant);
        checked++;
      });
    }
    console.log(`explicit certificates re-checked: ${checked}`);
    expect(checked).toBeGreaterThan(20);
  });

  it('a shared 4×4 net, checkerboard: the probe proves 81, the generic rank measured in the design notes', () => {
    // DESIGN §4 (measured): 4×4 grid, 2×2 pooling, M = 2, channels (4, ·), shared, checkerboard: 81.
    const m = layered([4, 4], 2, true, [conv(4, { dims: 2 }), pool([2, 2]), conv(4, { dims: 2 }), pool([2, 2])]);
    const p = partition('checkerboard', [4, 4]);
    const out = computeBounds(m, [p], { surrogate: 'tree' });
    if (!out.ok) throw new Error('bounds refused the model');
    const lower = out.result.partitions[0]!.lower!;
    expect(lower.method).toBe('certified probe');
    expect(lower.rank).toBe(81n);
    const c = lower.certificate!;
    expect([c.prime, c.rows.length, c.cols.length]).toEqual([P, 81, 81]);
    expect(recheck(m, 'tree', p.side, c)).toEqual([81, c.determinant]);
    // Another seed draws other numbers: the stated determinant no longer matches.
    expect(recheck(m, 'tree', p.side, { ...c, seed: c.seed + 1 })[1]).not.toBe(c.determinant);
  });

  it('every certificate over the oracle families re-checks', () => {
    let checked = 0;
    const perFamily: string[] = [];
    const master = new Rng(4242);
    for (const g of LAYERED_GENERATORS) {
      let here = 0;
      // Up to 12 models per family, until 3 certificates are found.
      for (let n = 0; n < 12 && here < 3; n++) {
        const seed = master.fork();
        const c = g.gen(new Rng(seed));
        const out = computeBounds(c.model, c.partitions, { surrogate: c.surrogate });
        if (!out.ok) continue;
        out.result.partitions.forEach((pb, i) => {
          const cert = pb.lower?.certificate;
          if (!cert) return;
          expect(cert.prime).toBe(P);
          const [r, det] = recheck(c.model, c.surrogate, c.partitions[i]!.side, cert);
          expect(r, `${g.name} seed=${seed} ${pb.partition}`).toBe(cert.rows.length);
          expect(det, `${g.name} seed=${seed} ${pb.partition}`).toBe(cert.determinant);
          here++;
        });
      }
      perFamily.push(`${g.name}: ${here}`);
      checked += here;
    }
    console.log(`certificates re-checked: ${checked} (${perFamily.join(', ')})`);
    expect(checked).toBeGreaterThan(60);
  });
});
