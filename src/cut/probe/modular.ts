/**
 * Arithmetic modulo the probe's prime and the elimination that certifies a rank. A certificate is
 * a square submatrix (chosen rows and columns of the probe matrix) whose determinant is not zero
 * modulo the prime; the elimination below finds the largest such submatrix it can by ordinary
 * Gaussian elimination with row pivoting, and reports which original rows and columns it used.
 *
 * The prime is 2^26 − 5 = 67,108,859. Residues stay below 2^26, so a product of two residues plus
 * a residue is below 2^53 and is exact in a double: every operation is a multiply-add followed by
 * one reduction (x − ⌊x/p⌋·p, with ⌊x/p⌋ computed from a multiplication by 1/p, which can be off
 * by one and is corrected once).
 */

export const PROBE_PRIME = 67_108_859;
const INVERSE = 1 / PROBE_PRIME;

/** (a·b + c) mod p for residues a, b, c. */
export function mulAddMod(a: number, b: number, c: number): number {
  const x = a * b + c;
  const r = x - Math.floor(x * INVERSE) * PROBE_PRIME;
  return r < 0 ? r + PROBE_PRIME : r >= PROBE_PRIME ? r - PROBE_PRIME : r;
}

/** a^(p−2) mod p: the inverse of a non-zero residue. */
export function inverseMod(a: number): number {
  if (a === 0) throw new RangeError('0 has no inverse modulo the probe prime');
  let result = 1;
  let base = a;
  for (let e = PROBE_PRIME - 2; e > 0; e = Math.floor(e / 2)) {
    if (e % 2 === 1) result = mulAddMod(result, base, 0);
    base = mulAddMod(base, base, 0);
  }
  return result;
}

/** A non-singular square submatrix: its rows and columns (ascending) and its determinant mod p. */
export interface CertifyingMinor {
  readonly rows: number[];
  readonly cols: number[];
  readonly determinant: number;
}

/**
 * The rank mod p of a rows×cols matrix (row-major; overwritten) with a non-singular minor of that
 * size. Row operations only ever subtract multiples of earlier pivot rows, so the pivot rows
 * restricted to the pivot columns reduce to a triangular matrix with the pivots on its diagonal:
 * that minor is non-singular, and its determinant is the product of the pivots up to the sign of
 * the permutation that sorts its rows (computed here, so that a re-check can compare values).
 */
export function certifyingMinor(m: Float64Array, rows: number, cols: number): CertifyingMinor {
  const origin = Array.from({ length: rows }, (_, i) => i);
  const pivotRows: number[] = [];
  const pivotCols: number[] = [];
  let det = 1;
  let rank = 0;
  for (let c = 0; c < cols && rank < rows; c++) {
    let pivot = rank;
    while (pivot < rows && m[pivot * cols + c] === 0) pivot++;
    if (pivot === rows) continue;
    if (pivot !== rank) {
      for (let k = c; k < cols; k++) {
        const t = m[pivot * cols + k]!;
        m[pivot * cols + k] = m[rank * cols + k]!;
        m[rank * cols + k] = t;
      }
      const o = origin[pivot]!;
      origin[pivot] = origin[rank]!;
      origin[rank] = o;
    }
    const head = m[rank * cols + c]!;
    det = mulAddMod(det, head, 0);
    const scale = inverseMod(head);
    for (let r = rank + 1; r < rows; r++) {
      const f = m[r * cols + c]!;
      if (f === 0) continue;
      const factor = PROBE_PRIME - mulAddMod(f, scale, 0);
      const ro = r * cols;
      const po = rank * cols;
      for (let k = c; k < cols; k++) {
        const x = factor * m[po + k]! + m[ro + k]!;
        const y = x - Math.floor(x * INVERSE) * PROBE_PRIME;
        m[ro + k] = y < 0 ? y + PROBE_PRIME : y >= PROBE_PRIME ? y - PROBE_PRIME : y;
      }
    }
    pivotRows.push(origin[rank]!);
    pivotCols.push(c);
    rank++;
  }
  // The minor lists its rows in ascending order; the elimination met them in pivot order. Each
  // inversion between the two orders flips the determinant's sign.
  let inversions = 0;
  for (let i = 0; i < pivotRows.length; i++) for (let j = i + 1; j < pivotRows.length; j++) if (pivotRows[i]! > pivotRows[j]!) inversions++;
  if (inversions % 2 === 1 && det !== 0) det = PROBE_PRIME - det;
  return { rows: [...pivotRows].sort((a, b) => a - b), cols: pivotCols, determinant: det };
}
