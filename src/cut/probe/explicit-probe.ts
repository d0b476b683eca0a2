/**
 * The certified probe for explicit (`network:`) tensor networks (DEVELOPERS.md, "Certified probe",
 * explicit networks). Every tensor is drawn with integer entries mod p, the network is contracted
 * exactly mod p into its matricisation M (rows: the assignments of the side-A open legs, columns:
 * those of the side-B legs), and the elimination finds a non-singular minor of M. M is the
 * matricisation of the network at those tensors, so a k×k minor that is not zero mod p is not zero
 * over the integers, and those tensors reach rank ≥ k: a lower bound of the generic rank. No
 * probe inputs are needed: the whole matrix is small whenever the probe runs.
 *
 * Contraction is variable elimination: each bond is one index (a bond of three or more tensors, a
 * copy tensor, is one index shared by all of them), summed out in a greedy order that keeps the
 * largest intermediate factor small; the open legs stay. The cost of the whole plan (contraction
 * and elimination) is worked out before anything is drawn, and a network over the budget gets no
 * probe.
 */
import type { ExplicitModel } from '../../config/model.js';
import type { Bound, ProbeCertificate } from '../types.js';
import { log2Big } from '../types.js';
import { PROBE_BUDGET, PROBE_SCHEME, PROBE_SEED, PROBE_METHOD } from './certified-probe.js';
import { drawValues } from './draw.js';
import { PROBE_PRIME, certifyingMinor, mulAddMod } from './modular.js';

/** Largest factor (numbers) the contraction may hold, and largest matricisation. */
const MAX_FACTOR = 1 << 22;

/** The draw name of a tensor's entries. */
export function explicitTensorName(name: string): string {
  return `tensor:${name}`;
}

interface Factor {
  readonly vars: readonly number[];
  readonly data: Float64Array;
}

/** The number of entries of a factor over these variables. */
function sizeOf(vars: Iterable<number>, dims: readonly number[]): number {
  let s = 1;
  for (const v of vars) s *= dims[v]!;
  return s;
}

/**
 * Σ over `sum` (none when null) of the product of `fs`, as a factor over `keep` (row-major, first
 * variable most significant). Every variable of `fs` lies in keep ∪ {sum}.
 */
function productSum(fs: readonly Factor[], keep: readonly number[], sum: number | null, dims: readonly number[]): Factor {
  const all = sum === null ? keep : [...keep, sum];
  const size = sizeOf(keep, dims);
  const out = new Float64Array(size);
  const at = new Int32Array(dims.length);
  // Strides of each factor's variables, looked up per variable of `all`.
  const strides = fs.map((f) => {
    const s = new Float64Array(all.length);
    let stride = 1;
    for (let k = f.vars.length - 1; k >= 0; k--) {
      const v = f.vars[k]!;
      s[all.indexOf(v)] = stride;
      stride *= dims[v]!;
    }
    return s;
  });
  const total = sizeOf(all, dims);
  const inner = sum === null ? 1 : dims[sum]!;
  for (let flat = 0; flat < total; flat++) {
    let rest = flat;
    for (let k = all.length - 1; k >= 0; k--) {
      const d = dims[all[k]!]!;
      at[k] = rest % d;
      rest = Math.floor(rest / d);
    }
    let value = 1;
    for (let i = 0; i < fs.length; i++) {
      let o = 0;
      const s = strides[i]!;
      for (let k = 0; k < all.length; k++) o += s[k]! * at[k]!;
      value = mulAddMod(value, fs[i]!.data[o]!, 0);
    }
    const target = Math.floor(flat / inner);
    out[target] = (out[target]! + value) % PROBE_PRIME;
  }
  return { vars: keep, data: out };
}

interface Plan {
  /** Bond variables in elimination order. */
  readonly order: readonly number[];
  readonly cost: number;
}

/** A greedy order: next the bond whose summed product is smallest; its cost in multiply-adds. */
function planElimination(factorVars: readonly (readonly number[])[], bonds: readonly number[], dims: readonly number[]): Plan | undefined {
  let groups = factorVars.map((v) => new Set(v));
  const left = new Set(bonds);
  const order: number[] = [];
  let cost = 0;
  while (left.size > 0) {
    let best: { v: number; size: number; work: number } | undefined;
    for (const v of left) {
      const union = new Set<number>();
      let count = 0;
      for (const g of groups) {
        if (!g.has(v)) continue;
        count++;
        for (const x of g) union.add(x);
      }
      const work = sizeOf(union, dims) * Math.max(count, 1);
      union.delete(v);
      const size = sizeOf(union, dims);
      if (!best || size < best.size || (size === best.size && work < best.work)) best = { v, size, work };
    }
    if (best!.size > MAX_FACTOR) return undefined;
    cost += best!.work;
    order.push(best!.v);
    left.delete(best!.v);
    const merged = new Set<number>();
    const kept: Set<number>[] = [];
    for (const g of groups) {
      if (g.has(best!.v)) for (const x of g) merged.add(x);
      else kept.push(g);
    }
    merged.delete(best!.v);
    groups = [...kept, merged];
  }
  return { order, cost };
}

/**
 * A certified lower bound for one partition, or undefined when the network is over the budget,
 * lists a tensor twice in one bond, or the minor proves no more than `lower`.
 */
export function explicitProbe(model: ExplicitModel, side: Uint8Array, lower: bigint, budget = PROBE_BUDGET): Bound | undefined {
  if (budget <= 0) return undefined;
  const dims: number[] = [];
  const fresh = (d: number): number => {
    dims.push(d);
    return dims.length - 1;
  };
  const bondVars = model.bonds.map((b) => fresh(b.dim));
  const rows: number[] = [];
  const cols: number[] = [];
  const tensorVars: number[][] = [];
  for (const t of model.tensors) {
    const vars: number[] = [];
    for (const leg of t.legs) {
      const v = fresh(leg.dim);
      vars.push(v);
      (side[leg.position] === 1 ? rows : cols).push(v);
    }
    for (let i = 0; i < model.bonds.length; i++) {
      const times = model.bonds[i]!.tensors.filter((n) => n === t.name).length;
      if (times > 1) return undefined;
      if (times === 1) vars.push(bondVars[i]!);
    }
    tensorVars.push(vars);
  }
  const r = sizeOf(rows, dims);
  const c = sizeOf(cols, dims);
  if (rows.length === 0 || cols.length === 0 || r * c > MAX_FACTOR) return undefined;
  if (BigInt(Math.min(r, c)) <= lower) return undefined;
  const plan = planElimination(tensorVars, bondVars, dims);
  if (!plan) return undefined;
  const elimination = (r * c * Math.min(r, c)) / 3;
  if (plan.cost + r * c * model.tensors.length + elimination > budget) return undefined;

  let factors: Factor[] = model.tensors.map((t, i) => ({ vars: tensorVars[i]!, data: drawValues(PROBE_SEED, explicitTensorName(t.name), sizeOf(tensorVars[i]!, dims)) }));
  for (const v of plan.order) {
    const touching = factors.filter((f) => f.vars.includes(v));
    if (touching.length === 0) continue;
    const keep = [...new Set(touching.flatMap((f) => f.vars))].filter((x) => x !== v);
    factors = [...factors.filter((f) => !f.vars.includes(v)), productSum(touching, keep, v, dims)];
  }
  // What is left reads open legs only: their product, rows (A legs) before columns (B legs).
  const matrix = productSum(factors, [...rows, ...cols], null, dims).data;
  const minor = certifyingMinor(matrix, r, c);
  const rank = BigInt(minor.rows.length);
  if (rank <= lower) return undefined;
  const certificate: ProbeCertificate = {
    scheme: PROBE_SCHEME,
    prime: PROBE_PRIME,
    seed: PROBE_SEED,
    matricisation: [r, c],
    rows: minor.rows,
    cols: minor.cols,
    determinant: minor.determinant,
  };
  return { rank, log2: log2Big(rank), method: PROBE_METHOD, cut: [], certificate };
}
