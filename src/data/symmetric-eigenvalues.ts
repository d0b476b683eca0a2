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
 * subdiagonal of the tridiagonal matrix (e[0] = 0). Row j of `a` is read left to right in the
 * O(n³) loops.
 */
function tridiagonalize(a: Float64Array, n: number, d: Float64Array, e: Float64Array): void {
  for (let j = 0; j < n; j++) d[j] = a[j * n + n - 1]!;
  for (let i = n - 1; i > 0; i--) {
    let scale = 0;
    let h = 0;
    for (let k = 0; k < i; k++) scale = scale + Math.abs(d[k]!);
    if (scale === 0) {
      e[i] = d[i - 1]!;
      for (let j = 0; j < i; j++) d[j] = a[j * n + i - 1]!;
    } else {
      for (let k = 0; k < i; k++) {
        d[k]! /= scale;
        h += d[k]! * d[k]!;
      }
      let f = d[i - 1]!;
      let g = Math.sqrt(h);
      if (f > 0) g = -g;
      e[i] = scale * g;
      h = h - f * g;
      d[i - 1] = f - g;
      for (let j = 0; j < i; j++) e[j] = 0;
      // e = A·u over the leading i × i block (u = d), from its upper triangle.
      for (let j = 0; j < i; j++) {
        const row = j * n;
        f = d[j]!;
        g = e[j]! + a[row + j]! * f;
        for (let k = j + 1; k <= i - 1; k++) {
          g += a[row + k]! * d[k]!;
          e[k]! += a[row + k]! * f;
        }
        e[j] = g;
      }
      f = 0;
      for (let j = 0; j < i; j++) {
        e[j]! /= h;
        f += e[j]! * d[j]!;
      }
      const hh = f / (h + h);
      for (let j = 0; j < i; j++) e[j]! -= hh * d[j]!;
      // The rank-two update A −= u·pᵀ + p·uᵀ, on the upper triangle.
      for (let j = 0; j < i; j++) {
        const row = j * n;
        f = d[j]!;
        g = e[j]!;
        for (let k = j; k <= i - 1; k++) a[row + k]! -= f * e[k]! + g * d[k]!;
        d[j] = a[row + i - 1]!;
      }
    }
    d[i] = h;
  }
  for (let j = 0; j < n; j++) d[j] = a[j * n + j]!;
  e[0] = 0;
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
