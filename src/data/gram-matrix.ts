/**
 * The Gram matrix of one side of a partition: G[s, t] = Π_{p ∈ side} ⟨φ(x_{s,p}), φ(x_{t,p})⟩, the
 * inner products of the samples' feature tensors restricted to that side, computed as a product
 * of per-position kernels so that nothing of size M^|side| is built. See DEVELOPERS.md. The side's
 * features are first gathered into one contiguous array per sample, so that the O(n²·|side|)
 * loop reads memory in order.
 */
import type { FeatureBatch } from './feature-batch.js';

/** Products below this are set to 0: against a diagonal of 1 they are far below rounding. */
export const NEGLIGIBLE = 2 ** -100;

/** Fills `out` (count × count, row-major) with the Gram matrix over `positions`. */
export function gramMatrix(batch: FeatureBatch, positions: Int32Array, out: Float64Array): void {
  const n = batch.count;
  if (out.length < n * n) throw new RangeError('gramMatrix: output buffer too small');
  if (batch.kind === 'tokens') tokenGram(gatherTokens(batch.ids, n, batch.positions, positions), n, positions.length, out);
  else valueGram(gatherValues(batch.cos, batch.sin, n, batch.positions, batch.channels, positions), n, positions.length * batch.channels, out);
}

/** Per sample, the side's (cos, sin) pairs, interleaved: f[2·(s·m + i)], f[2·(s·m + i) + 1]. */
function gatherValues(cos: Float64Array, sin: Float64Array, n: number, total: number, channels: number, positions: Int32Array): Float64Array {
  const m = positions.length * channels;
  const f = new Float64Array(2 * n * m);
  let k = 0;
  for (let s = 0; s < n; s++) {
    for (let i = 0; i < positions.length; i++) {
      const from = (s * total + positions[i]!) * channels;
      for (let c = 0; c < channels; c++) {
        f[k++] = cos[from + c]!;
        f[k++] = sin[from + c]!;
      }
    }
  }
  return f;
}

function gatherTokens(ids: Int32Array, n: number, total: number, positions: Int32Array): Int32Array {
  const m = positions.length;
  const f = new Int32Array(n * m);
  for (let s = 0; s < n; s++) for (let i = 0; i < m; i++) f[s * m + i] = ids[s * total + positions[i]!]!;
  return f;
}

/**
 * m kernel factors per pair (positions × channels). Four running products, so that successive
 * multiplications do not wait on each other; the test against NEGLIGIBLE every 16 factors keeps
 * the products out of the subnormal range (each factor lies in [0, 1]).
 */
function valueGram(f: Float64Array, n: number, m: number, out: Float64Array): void {
  const width = 2 * m;
  const blockEnd = width - (width % 32);
  for (let s = 0; s < n; s++) {
    out[s * n + s] = 1;
    const a = s * width;
    for (let t = 0; t < s; t++) {
      const b = t * width;
      let g0 = 1;
      let g1 = 1;
      let g2 = 1;
      let g3 = 1;
      let i = 0;
      let negligible = false;
      for (; i < blockEnd; i += 32) {
        for (let j = i; j < i + 32; j += 8) {
          g0 *= f[a + j]! * f[b + j]! + f[a + j + 1]! * f[b + j + 1]!;
          g1 *= f[a + j + 2]! * f[b + j + 2]! + f[a + j + 3]! * f[b + j + 3]!;
          g2 *= f[a + j + 4]! * f[b + j + 4]! + f[a + j + 5]! * f[b + j + 5]!;
          g3 *= f[a + j + 6]! * f[b + j + 6]! + f[a + j + 7]! * f[b + j + 7]!;
        }
        if (g0 * g1 * g2 * g3 < NEGLIGIBLE) {
          negligible = true;
          break;
        }
      }
      let g = 0;
      if (!negligible) {
        g = g0 * g1 * g2 * g3;
        for (; i < width; i += 2) g *= f[a + i]! * f[b + i]! + f[a + i + 1]! * f[b + i + 1]!;
        if (g < NEGLIGIBLE) g = 0;
      }
      out[s * n + t] = g;
      out[t * n + s] = g;
    }
  }
}

function tokenGram(f: Int32Array, n: number, m: number, out: Float64Array): void {
  for (let s = 0; s < n; s++) {
    out[s * n + s] = 1;
    const a = s * m;
    for (let t = 0; t < s; t++) {
      const b = t * m;
      let g = 1;
      for (let i = 0; i < m; i++) {
        if (f[a + i] !== f[b + i]) {
          g = 0;
          break;
        }
      }
      out[s * n + t] = g;
      out[t * n + s] = g;
    }
  }
}
