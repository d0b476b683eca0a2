/**
 * The exact minimum rank that `min_bits: b` asks for: the smallest integer r with r ≥ 2^b, for a
 * rational b ≥ 0 given as a fraction. A floating-point `2 ** b` cannot serve: it has 53 bits, so
 * for b > 53 most digits of the rank would be invented, and near an integer it rounds either way.
 *
 * Method. Write b = E/q in lowest terms. If q = 1 the answer is 2^E. Otherwise no integer r has
 * r^q = 2^E (r would be a power of two 2^k with kq = E, so q would divide E), hence 2^b is not an
 * integer and the answer is the unique r with (r − 1)^q < 2^E < r^q. A candidate r is the ceiling
 * of a Newton approximation of 2^b carried with a little more precision than r has bits. The
 * candidate is then proven, not trusted: r^q is computed with every product truncated downwards
 * (a lower bound) and (r − 1)^q with every product rounded upwards (an upper bound), both in
 * binary floating point whose exponent can be compared with E exactly. When a bound is too coarse
 * to decide, because 2^b lies unusually close to an integer, the precision doubles and the
 * candidate is recomputed; at full precision the bounds are the exact powers, so the loop ends.
 * The cost is a few dozen multiplications of numbers with about b bits.
 */

/** A positive binary number m·2^e; m is kept to a bounded number of bits. */
interface Binary {
  readonly m: bigint;
  readonly e: number;
}

export function ceilPowerOfTwo(numerator: bigint, denominator: bigint): bigint {
  if (numerator < 0n || denominator <= 0n) throw new RangeError(`ceilPowerOfTwo needs b = ${numerator}/${denominator} >= 0`);
  const g = gcd(numerator, denominator);
  const E = numerator / g;
  const q = denominator / g;
  if (q === 1n) return 1n << E;
  const wholeBits = Number(E / q);
  // Extra bits beyond those of r cover the rounding of about 2·log2(q) products per power.
  const guard = 64 + 2 * bitLength(q);
  const exact = (wholeBits + 2) * Number(q) + guard;
  for (let precision = wholeBits + guard; ; precision *= 2) {
    const r = ceiling(approximate(E, q, precision));
    if (exceeds(power({ m: r, e: 0 }, q, precision, false), E) && below(r - 1n, q, precision, E)) return r;
    // Past this precision every product is exact, so a failure would be a bug, not bad luck.
    if (precision > exact) throw new Error(`ceilPowerOfTwo(${numerator}/${denominator}): no certified result (a bug)`);
  }
}

/** 2^(E/q) to about `precision` bits, by Newton's iteration for x^q = 2^E with growing precision. */
function approximate(E: bigint, q: bigint, precision: number): Binary {
  const whole = E / q;
  const start = 2 ** (Number(E - whole * q) / Number(q));
  let x: Binary = { m: BigInt(Math.round(start * 2 ** 52)), e: Number(whole) - 52 };
  let bits = 48;
  // Each step doubles the correct bits; the last step runs twice at full precision so that the
  // rounding of the step itself is the only error left.
  for (let final = 0; final < 2; ) {
    bits = Math.min(2 * bits, precision);
    if (bits === precision) final++;
    x = newtonStep(x, E, q, bits + 16);
  }
  return x;
}

/** x·((q − 1) + 2^E / x^q) / q, rounded to `bits` bits. */
function newtonStep(x: Binary, E: bigint, q: bigint, bits: number): Binary {
  const t = power(x, q, bits, false);
  // 2^E / t as a fixed-point number with `bits` fraction bits; t is close to 2^E, so the shift is
  // about 2·bits and never negative unless x is far off, when dropping the term still decreases x.
  const shift = Number(E) - t.e + bits;
  const ratio = shift >= 0 ? (1n << BigInt(shift)) / t.m : 0n;
  const factor = (q - 1n) * (1n << BigInt(bits)) + ratio;
  return rounded((x.m * factor) / q, x.e - bits, bits, false);
}

/** base^k with every product rounded to `bits` bits, downwards (a lower bound) or upwards. */
function power(base: Binary, k: bigint, bits: number, up: boolean): Binary {
  const b = rounded(base.m, base.e, bits, up);
  let acc: Binary = { m: 1n, e: 0 };
  for (const digit of k.toString(2)) {
    acc = rounded(acc.m * acc.m, 2 * acc.e, bits, up);
    if (digit === '1') acc = rounded(acc.m * b.m, acc.e + b.e, bits, up);
  }
  return acc;
}

function rounded(m: bigint, e: number, bits: number, up: boolean): Binary {
  const excess = bitLength(m) - bits;
  if (excess <= 0) return { m, e };
  const k = BigInt(excess);
  let t = m >> k;
  if (up && t << k !== m) t += 1n;
  return { m: t, e: e + excess };
}

/** Whether a lower bound of a value proves the value > 2^E. */
function exceeds(lower: Binary, E: bigint): boolean {
  const top = lower.e + bitLength(lower.m) - 1;
  const isPowerOfTwo = (lower.m & (lower.m - 1n)) === 0n;
  return top > Number(E) || (top === Number(E) && !isPowerOfTwo);
}

/** Whether (r − 1)^q < 2^E is proven by an upper bound (computed only when r − 1 > 0). */
function below(rMinus1: bigint, q: bigint, bits: number, E: bigint): boolean {
  if (rMinus1 <= 0n) return true;
  const upper = power({ m: rMinus1, e: 0 }, q, bits, true);
  return upper.e + bitLength(upper.m) - 1 < Number(E);
}

function ceiling(x: Binary): bigint {
  if (x.e >= 0) return x.m << BigInt(x.e);
  const k = BigInt(-x.e);
  return (x.m + (1n << k) - 1n) >> k;
}

function bitLength(m: bigint): number {
  return m === 0n ? 0 : m.toString(2).length;
}

function gcd(a: bigint, b: bigint): bigint {
  while (b !== 0n) [a, b] = [b, a % b];
  return a;
}
