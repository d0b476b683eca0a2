/**
 * Reads the minimum of a requirement as an exact integer: `min_rank` (a positive integer, or a
 * power written `2^40` / `2**40`) and `min_bits` (b bits means rank ≥ 2^b, rounded up). Ranks of
 * real networks exceed 2^53, so neither form may pass through a floating-point number: integers
 * are read from the digits as written, and `min_bits` from its decimal text as a fraction.
 */
import { ceilPowerOfTwo } from './power-of-two-ceiling.js';
import { MAX_FRACTIONAL_MIN_BITS, MAX_MIN_BITS_DECIMALS, MAX_MINIMUM_BITS, MAX_MINIMUM_DIGITS } from './policy-limits.js';

export type MinimumRead =
  | { readonly ok: true; readonly minRank: bigint; readonly written: string }
  | { readonly ok: false; readonly code: string; readonly message: string };

const POWER = /^\s*([0-9]+)\s*(?:(\^|\*\*)\s*([0-9]+)\s*)?$/;
/** A YAML 1.2 decimal number, unsigned (the schema already refuses negative values). */
const DECIMAL = /^\+?(?:([0-9]+)(?:\.([0-9]*))?|\.([0-9]+))(?:[eE]([+-]?[0-9]+))?$/;
/** Exponents beyond this in a min_bits literal cannot be a value between 0 and 10^6 exactly. */
const MAX_LITERAL_EXPONENT = 400;

const LIMIT = 1n << BigInt(MAX_MINIMUM_BITS);

/**
 * `min_rank`. `value` is the YAML value; `source` the text of the scalar in the file, which keeps
 * the digits of integers too large for a JavaScript number.
 */
export function readMinRank(value: string | number, source: string | undefined): MinimumRead {
  let text: string;
  if (typeof value === 'string') text = value.trim();
  else if (source !== undefined && /^\+?[0-9]+$/.test(source.trim())) text = source.trim().replace(/^\+/, '');
  else if (Number.isSafeInteger(value)) text = String(value);
  else {
    return invalidRank(`${shown(source?.trim() ?? String(value))} is not an exact integer; write its digits, or a power such as '2^100'`);
  }
  const written = `min_rank: ${text}`;
  const m = POWER.exec(text);
  if (!m) {
    return invalidRank(`'${shown(text)}' is neither a positive integer nor a power such as '2^40' or '2**40' (integer base and exponent)`);
  }
  const baseDigits = stripZeros(m[1]!);
  const exponentDigits = m[3] === undefined ? undefined : stripZeros(m[3]);
  if (exponentDigits === undefined) {
    if (baseDigits === '0') return invalidRank(`the minimum rank must be a positive integer, got ${shown(text)}`);
    if (baseDigits.length > MAX_MINIMUM_DIGITS) return tooLarge(text);
    const n = BigInt(baseDigits);
    return n <= LIMIT ? { ok: true, minRank: n, written } : tooLarge(text);
  }
  if (baseDigits === '0') return invalidRank(`'${shown(text)}': the base of a power must be at least 1`);
  if (exponentDigits === '0' || baseDigits === '1') return { ok: true, minRank: 1n, written };
  if (baseDigits.length > MAX_MINIMUM_DIGITS) return tooLarge(text);
  const base = BigInt(baseDigits);
  const exponent = BigInt(exponentDigits);
  // base ≥ 2^(L−1) with L its bit length, so base^exponent ≥ 2^((L−1)·exponent): when that is
  // already past the limit the power is refused without being computed. Otherwise it has at most
  // L·exponent ≤ 2·MAX_MINIMUM_BITS bits and is computed and compared exactly.
  const lowBits = BigInt(bitLength(base) - 1) * exponent;
  if (lowBits > BigInt(MAX_MINIMUM_BITS)) return tooLarge(text);
  const n = base ** exponent;
  return n <= LIMIT ? { ok: true, minRank: n, written } : tooLarge(text);
}

/**
 * `min_bits`: the smallest integer ≥ 2^b. `value` is the YAML number (already checked to lie in
 * [0, MAX_MINIMUM_BITS]); `source` its text, read as an exact decimal fraction. When the text is
 * not a plain decimal (an alias, a hexadecimal literal), the shortest decimal that denotes the
 * same number is used instead, which is what such a value most plausibly means.
 */
export function readMinBits(value: number, source: string | undefined): MinimumRead {
  const literal = source?.trim();
  const text = literal !== undefined && DECIMAL.test(literal) ? literal : String(value);
  const written = `min_bits: ${text}`;
  const fraction = decimalFraction(text);
  if (!fraction) {
    return { ok: false, code: 'policy/invalid-min-bits', message: `${shown(text)} is not a decimal number of bits such as 12 or 12.5` };
  }
  const [num, den] = fraction;
  if (num % den === 0n) return { ok: true, minRank: 1n << (num / den), written };
  if ((num * 10n ** BigInt(MAX_MIN_BITS_DECIMALS)) % den !== 0n) {
    return {
      ok: false,
      code: 'policy/invalid-min-bits',
      message: `${shown(text)} has more than ${MAX_MIN_BITS_DECIMALS} decimals; round it, or use min_rank for an exact minimum`,
    };
  }
  if (num > BigInt(MAX_FRACTIONAL_MIN_BITS) * den) {
    return {
      ok: false,
      code: 'policy/invalid-min-bits',
      message: `${shown(text)} is not a whole number of bits and above ${MAX_FRACTIONAL_MIN_BITS}; use a whole number there`,
    };
  }
  return { ok: true, minRank: ceilPowerOfTwo(num, den), written };
}

/** `12.5` → [125, 10], `1.5e1` → [15, 1]; undefined for anything else. */
function decimalFraction(text: string): [bigint, bigint] | undefined {
  const m = DECIMAL.exec(text);
  if (!m) return undefined;
  const whole = m[1] ?? '';
  const frac = m[2] ?? m[3] ?? '';
  const exponent = m[4] === undefined ? 0 : Number(m[4]);
  if (!Number.isSafeInteger(exponent) || Math.abs(exponent) > MAX_LITERAL_EXPONENT) return undefined;
  let num = BigInt((whole + frac).replace(/^0+(?=.)/, '') || '0');
  let den = 10n ** BigInt(frac.length);
  if (exponent >= 0) num *= 10n ** BigInt(exponent);
  else den *= 10n ** BigInt(-exponent);
  return [num, den];
}

function invalidRank(message: string): MinimumRead {
  return { ok: false, code: 'policy/invalid-min-rank', message };
}

function tooLarge(text: string): MinimumRead {
  return {
    ok: false,
    code: 'policy/minimum-too-large',
    message: `${shown(text)} is above 2^${MAX_MINIMUM_BITS}; no network of a feasible size reaches such a rank`,
  };
}

/** Long digit strings are cut in messages; the diagnostic's span shows the whole value. */
function shown(text: string): string {
  return text.length > 60 ? `${text.slice(0, 60)}…` : text;
}

function stripZeros(digits: string): string {
  return digits.replace(/^0+(?=.)/, '');
}

function bitLength(n: bigint): number {
  return n.toString(2).length;
}
