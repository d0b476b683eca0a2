/**
 * The eigenvalues of a real symmetric matrix, without its eigenvectors: Householder reduction to
 * tridiagonal form, then implicit QL iterations with shifts (Wilkinson & Reinsch,
 * "Handbook for automatic computation, vol. II: Linear algebra", 1971, procedures tred2 and tql2).
 * The measurement needs only the spectrum, and leaving out the accumulation of the orthogonal
 * transformations saves most of the work: about (4/3)n³ floating-point operations instead of about
 * 9n³ (Golub & Van Loan, "Matrix computations", ch. 8).
 * The arithmetic on the diagonal and off-diagonal is step for step that of the procedures with
 * eigenvectors, so the eigenvalues are the same numbers.
 */

/**
 * Eigenvalues (ascending order not guaranteed) of the symmetric n × n matrix `a` (row-major; both
 * triangles filled). `a` is overwritten.
 */
export function symmetricEigenvalues(a: Float64Array, n: number): Float64Array {
  if (a.length < n * n) throw new RangeError('symmetricEigenvalues: matrix smaller than n × n');
  const d = new Float64Array(n);
  const e = new Float64Array(n);
  if (n === 0) return d;
  tridiagonalize(a, n, d, e);
  diagonalizeTridiagonal(d, e, n);
  return d;
}

/**
 * Householder reduction, last row first: on return d holds the diagonal and e[1 … n−1] the
 * subdiagonal of the tridiagonal matrix (e[0] = 0). Step i reflects column i of the leading
 * (i+1) × (i+1) block onto its last entry: with u the scaled column (d), p = A·u/h − hh·u, and
 * A −= u·pᵀ + p·uᵀ on the upper triangle of the leading i × i block. The product A·u of step
 * i − 1 is accumulated row by row while step i updates the same rows, so that each row is read
 * once per step instead of twice; every sum is still taken in the same order.
 */
function tridiagonalize(a: Float64Array, n: number, d: Float64Array, e: Float64Array): void {
  const u = new Float64Array(n); // the Householder vector of the step being applied
  let p = new Float64Array(n); // A·u of the current step, then p
  let q = new Float64Array(n); // A·u of the next step, accumulated during the update
  for (let j = 0; j < n; j++) d[j] = a[j * n + n - 1]!;
  let h = n > 1 ? reflect(d, e, n - 1) : 0;
  let productReady = false;
  for (let i = n - 1; i > 0; i--) {
    if (h === 0) {
      // A zero column: nothing to reflect, A is unchanged.
      for (let j = 0; j < i; j++) d[j] = a[j * n + i - 1]!;
      d[i] = 0;
      h = i > 1 ? reflect(d, e, i - 1) : 0;
      productReady = false;
      continue;
    }
    if (!productReady) {
      p.fill(0, 0, i);
      let j = 0;
      for (; j + 2 <= i; j += 2) productOfRowPair(a, n, i, d, p, j);
      if (j < i) productOfRow(a, n, i, d, p, j);
    }
    let f = 0;
    for (let j = 0; j < i; j++) {
      p[j]! /= h;
      f += p[j]! * d[j]!;
    }
    const hh = f / (h + h);
    for (let j = 0; j < i; j++) p[j]! -= hh * d[j]!;
    u.set(d.subarray(0, i));
    // Column i − 1 first: it is the next step's column.
    const last = i - 1;
    for (let j = 0; j < i; j++) {
      a[j * n + last]! -= u[j]! * p[last]! + p[j]! * u[last]!;
      d[j] = a[j * n + last]!;
    }
    d[i] = h;
    h = i > 1 ? reflect(d, e, i - 1) : 0;
    if (h !== 0) {
      // The rest of the update, and the next step's A·u (over rows and columns < i − 1) from the
      // updated rows.
      q.fill(0, 0, last);
      let j = 0;
      for (; j + 2 <= last; j += 2) {
        updateRow(a, n, last, u, p, j);
        updateRow(a, n, last, u, p, j + 1);
        productOfRowPair(a, n, last, d, q, j);
      }
      if (j < last) {
        updateRow(a, n, last, u, p, j);
        productOfRow(a, n, last, d, q, j);
      }
      [p, q] = [q, p];
      productReady = true;
    } else {
      for (let j = 0; j < last; j++) updateRow(a, n, last, u, p, j);
      productReady = false;
    }
  }
  for (let j = 0; j < n; j++) d[j] = a[j * n + j]!;
  e[0] = 0;
}

/** Row j of the update A −= u·pᵀ + p·uᵀ, columns j … size − 1. */
function updateRow(a: Float64Array, n: number, size: number, u: Float64Array, p: Float64Array, j: number): void {
  const row = j * n;
  const uj = u[j]!;
  const pj = p[j]!;
  for (let k = j; k < size; k++) a[row + k]! -= uj * p[k]! + pj * u[k]!;
}

/**
 * Row j's part of out = A·v over the leading size × size block, from the upper triangle: out[j]
 * (already holding the earlier rows' terms) gets the row's sum, out[k] for k > j its term.
 */
function productOfRow(a: Float64Array, n: number, size: number, v: Float64Array, out: Float64Array, j: number): void {
  const row = j * n;
  const f = v[j]!;
  let g = out[j]! + a[row + j]! * f;
  for (let k = j + 1; k < size; k++) {
    g += a[row + k]! * v[k]!;
    out[k]! += a[row + k]! * f;
  }
  out[j] = g;
}

/**
 * Rows j and j + 1 (j + 1 < size) together, as productOfRow for j then for j + 1 would do, term
 * by term in the same order: the two running sums overlap instead of waiting on each other.
 */
function productOfRowPair(a: Float64Array, n: number, size: number, v: Float64Array, out: Float64Array, j: number): void {
  const row0 = j * n;
  const row1 = row0 + n;
  const f0 = v[j]!;
  const f1 = v[j + 1]!;
  let g0 = out[j]! + a[row0 + j]! * f0;
  g0 += a[row0 + j + 1]! * v[j + 1]!;
  out[j + 1]! += a[row0 + j + 1]! * f0;
  let g1 = out[j + 1]! + a[row1 + j + 1]! * f1;
  for (let k = j + 2; k < size; k++) {
    const x0 = a[row0 + k]!;
    const x1 = a[row1 + k]!;
    g0 += x0 * v[k]!;
    g1 += x1 * v[k]!;
    out[k] = out[k]! + x0 * f0 + x1 * f1;
  }
  out[j] = g0;
  out[j + 1] = g1;
}

/**
 * The scaling and the reflector of step i, on the column in d[0 … i−1]: sets e[i] and returns h
 * (0 when the column is zero, which leaves d as it is).
 */
function reflect(d: Float64Array, e: Float64Array, i: number): number {
  let scale = 0;
  for (let k = 0; k < i; k++) scale = scale + Math.abs(d[k]!);
  if (scale === 0) {
    e[i] = d[i - 1]!;
    return 0;
  }
  let h = 0;
  for (let k = 0; k < i; k++) {
    d[k]! /= scale;
    h += d[k]! * d[k]!;
  }
  const f = d[i - 1]!;
  let g = Math.sqrt(h);
  if (f > 0) g = -g;
  e[i] = scale * g;
  h = h - f * g;
  d[i - 1] = f - g;
  return h;
}

/** Implicit QL on the tridiagonal (d, e[1 …]): d becomes the eigenvalues. */
function diagonalizeTridiagonal(d: Float64Array, e: Float64Array, n: number): void {
  for (let i = 1; i < n; i++) e[i - 1] = e[i]!;
  e[n - 1] = 0;
  let f = 0;
  let tst1 = 0;
  const eps = Number.EPSILON;
  for (let l = 0; l < n; l++) {
    tst1 = Math.max(tst1, Math.abs(d[l]!) + Math.abs(e[l]!));
    let m = l;
    while (m < n) {
      if (Math.abs(e[m]!) <= eps * tst1) break;
      m++;
    }
    if (m > l) {
      do {
        let g = d[l]!;
        let p = (d[l + 1]! - g) / (2 * e[l]!);
        let r = hypotenuse(p, 1);
        if (p < 0) r = -r;
        d[l] = e[l]! / (p + r);
        d[l + 1] = e[l]! * (p + r);
        const dl1 = d[l + 1]!;
        let h = g - d[l]!;
        for (let i = l + 2; i < n; i++) d[i]! -= h;
        f = f + h;
        p = d[m]!;
        let c = 1;
        let c2 = c;
        let c3 = c;
        const el1 = e[l + 1]!;
        let s = 0;
        let s2 = 0;
        for (let i = m - 1; i >= l; i--) {
          c3 = c2;
          c2 = c;
          s2 = s;
          g = c * e[i]!;
          h = c * p;
          r = hypotenuse(p, e[i]!);
          e[i + 1] = s * r;
          s = e[i]! / r;
          c = p / r;
          p = c * d[i]! - s * g;
          d[i + 1] = h + s * (c * g + s * d[i]!);
        }
        p = (-s * s2 * c3 * el1 * e[l]!) / dl1;
        e[l] = s * p;
        d[l] = c * p;
      } while (Math.abs(e[l]!) > eps * tst1);
    }
    d[l] = d[l]! + f;
    e[l] = 0;
  }
}

/** √(a² + b²) without overflow or destructive underflow. */
function hypotenuse(a: number, b: number): number {
  if (Math.abs(a) > Math.abs(b)) {
    const r = b / a;
    return Math.abs(a) * Math.sqrt(1 + r * r);
  }
  if (b !== 0) {
    const r = a / b;
    return Math.abs(b) * Math.sqrt(1 + r * r);
  }
  return 0;
}
