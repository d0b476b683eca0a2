/**
 * Exact rational numbers for the expressions of architecture definitions. A width computed as
 * `ceil(64 * 0.1 * 10)` must be 64, not 65: binary floating point would make 0.1 * 10 a hair
 * above 1 and round it up. Every value is a fraction of two bigints in lowest terms, and a
 * decimal such as `0.1` is exactly 1/10. Numerators and denominators are capped (an expression
 * may not build numbers of unbounded size from a short text); going past the cap is an
 * `OverflowError` that the evaluator reports where it happened.
 */

/** An exact rational n/d in lowest terms, d > 0. */
export interface Exact {
  readonly n: bigint;
  readonly d: bigint;
}

/** Numerators and denominators stay below 2^63 in magnitude (a signed 64-bit integer). */
export const EXACT_LIMIT = 1n << 63n;

export class OverflowError extends Error {
  override readonly name = 'OverflowError';
}

function gcd(a: bigint, b: bigint): bigint {
  let x = a < 0n ? -a : a;
  let y = b < 0n ? -b : b;
  while (y !== 0n) [x, y] = [y, x % y];
  return x;
}

/** Builds n/d in lowest terms; throws OverflowError past the cap (d must not be 0). */
export function exact(n: bigint, d: bigint = 1n): Exact {
  if (d === 0n) throw new RangeError('exact: zero denominator');
  if (d < 0n) [n, d] = [-n, -d];
  const g = gcd(n, d) || 1n;
  const out = { n: n / g, d: d / g };
  if (out.n >= EXACT_LIMIT || out.n <= -EXACT_LIMIT || out.d >= EXACT_LIMIT) throw new OverflowError(`${show(out)} is beyond 2^63`);
  return out;
}

function show(x: Exact): string {
  const text = x.d === 1n ? x.n.toString() : `${x.n}/${x.d}`;
  return text.length > 40 ? `a number of ${text.length} digits` : text;
}

export const ZERO: Exact = { n: 0n, d: 1n };

export function add(a: Exact, b: Exact): Exact {
  return exact(a.n * b.d + b.n * a.d, a.d * b.d);
}

export function sub(a: Exact, b: Exact): Exact {
  return exact(a.n * b.d - b.n * a.d, a.d * b.d);
}

export function mul(a: Exact, b: Exact): Exact {
  return exact(a.n * b.n, a.d * b.d);
}

/** a / b; the caller checks b ≠ 0 (division by zero is the user's error, reported where it is). */
export function div(a: Exact, b: Exact): Exact {
  return exact(a.n * b.d, a.d * b.n);
}

export function neg(a: Exact): Exact {
  return { n: -a.n, d: a.d };
}

export function isZero(a: Exact): boolean {
  return a.n === 0n;
}

export function isInteger(a: Exact): boolean {
  return a.d === 1n;
}

export function compare(a: Exact, b: Exact): number {
  const l = a.n * b.d;
  const r = b.n * a.d;
  return l < r ? -1 : l > r ? 1 : 0;
}

/** The largest integer ≤ a (towards −∞). */
export function floor(a: Exact): Exact {
  const q = a.n / a.d;
  return { n: a.n < 0n && q * a.d !== a.n ? q - 1n : q, d: 1n };
}

/** The smallest integer ≥ a (towards +∞). */
export function ceil(a: Exact): Exact {
  const q = a.n / a.d;
  return { n: a.n > 0n && q * a.d !== a.n ? q + 1n : q, d: 1n };
}

/** a^k for an integer k; the caller bounds |k|. Throws OverflowError past the cap, RangeError for 0^negative. */
export function pow(a: Exact, k: number): Exact {
  if (k < 0 && a.n === 0n) throw new RangeError('zero to a negative power');
  let out: Exact = { n: 1n, d: 1n };
  const base = k < 0 ? div({ n: 1n, d: 1n }, a) : a;
  for (let i = 0; i < Math.abs(k); i++) out = mul(out, base);
  return out;
}

/**
 * The exact value of a decimal text: `64`, `-0.125`, `1.5e-3`, `2E+4`. Undefined for anything
 * else. Throws OverflowError when the value needs more than the cap.
 */
export function parseDecimal(text: string): Exact | undefined {
  const m = /^([+-]?)([0-9]+)(?:\.([0-9]*))?(?:[eE]([+-]?[0-9]+))?$/.exec(text) ?? /^([+-]?)()\.([0-9]+)(?:[eE]([+-]?[0-9]+))?$/.exec(text);
  if (!m) return undefined;
  const digits = `${m[2] ?? ''}${m[3] ?? ''}`.replace(/^0+(?=[0-9])/, '') || '0';
  const exponent = Number(m[4] ?? '0') - (m[3] ?? '').length;
  if (!Number.isSafeInteger(exponent) || Math.abs(exponent) > 400 || digits.length > 400) {
    if (/^0*$/.test(digits)) return ZERO;
    throw new OverflowError(`${text} is beyond 2^63`);
  }
  const n = BigInt(digits) * (m[1] === '-' ? -1n : 1n);
  return exponent >= 0 ? exact(n * 10n ** BigInt(exponent), 1n) : exact(n, 10n ** BigInt(-exponent));
}

/**
 * The exact value a YAML number was written as. The YAML reader hands over a double; its
 * shortest round-trip decimal (`String(0.1)` is `0.1`) is what was written for any number of up
 * to 15 significant digits, so that decimal, not the double's binary value, is taken.
 */
export function fromNumber(x: number): Exact | undefined {
  if (!Number.isFinite(x)) return undefined;
  return parseDecimal(String(x));
}

/** A JavaScript number for the value: exact for integers up to 2^53, the nearest double otherwise. */
export function toNumber(a: Exact): number {
  if (a.d === 1n) return Number(a.n);
  return Number(a.n) / Number(a.d);
}

/** Decimal text: exact when the value has a finite decimal expansion, else a fraction `2/3`. */
export function formatExact(a: Exact): string {
  if (a.d === 1n) return a.n.toString();
  let d = a.d;
  let twos = 0;
  let fives = 0;
  while (d % 2n === 0n) [d, twos] = [d / 2n, twos + 1];
  while (d % 5n === 0n) [d, fives] = [d / 5n, fives + 1];
  if (d !== 1n) return `${a.n}/${a.d}`;
  const places = Math.max(twos, fives);
  const scaled = (a.n * 10n ** BigInt(places)) / a.d;
  const negative = scaled < 0n;
  const digits = (negative ? -scaled : scaled).toString().padStart(places + 1, '0');
  return `${negative ? '-' : ''}${digits.slice(0, -places)}.${digits.slice(-places)}`;
}
