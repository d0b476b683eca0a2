/**
 * The exact rank behind `min_bits`, checked against an independent bisection over exact powers
 * and against values worked out with high-precision decimal arithmetic.
 */
import { describe, expect, test } from 'vitest';
import { ceilPowerOfTwo } from '../../src/policy/power-of-two-ceiling.js';

/**
 * The smallest r with r^q ≥ 2^E by bisection over exact powers: slow, but shares nothing with
 * the Newton-and-bounds method under test.
 */
function bisect(E: bigint, q: bigint): bigint {
  const target = 1n << E;
  let lo = 1n;
  let hi = 1n << (E / q + 1n);
  while (lo < hi) {
    const mid = (lo + hi) / 2n;
    if (mid ** q >= target) hi = mid;
    else lo = mid + 1n;
  }
  return lo;
}

describe('ceilPowerOfTwo(E, q) = ⌈2^(E/q)⌉', () => {
  test('whole numbers of bits are exact powers of two', () => {
    expect(ceilPowerOfTwo(0n, 1n)).toBe(1n);
    expect(ceilPowerOfTwo(12n, 1n)).toBe(4096n);
    expect(ceilPowerOfTwo(24n, 2n)).toBe(4096n);
    expect(ceilPowerOfTwo(1_000_000n, 1n)).toBe(1n << 1_000_000n);
  });

  test('known values', () => {
    expect(ceilPowerOfTwo(3n, 2n)).toBe(3n); // 2^1.5 = 2.83
    expect(ceilPowerOfTwo(1n, 2n)).toBe(2n); // 2^0.5 = 1.41
    expect(ceilPowerOfTwo(25n, 2n)).toBe(5793n); // 2^12.5 = 5792.62
    expect(ceilPowerOfTwo(1n, 1_000_000n)).toBe(2n); // 2^0.000001 = 1.0000007
  });

  test('just above and just below a power of two, at six decimals', () => {
    // 2^(10 ± 10^-6) = 1024 · (1 ± 6.9·10^-7) = 1024.0007 and 1023.9993.
    expect(ceilPowerOfTwo(10_000_001n, 1_000_000n)).toBe(1025n);
    expect(ceilPowerOfTwo(9_999_999n, 1_000_000n)).toBe(1024n);
    // At 60 bits, where a double has run out of digits (value from 80-digit decimal arithmetic).
    expect(ceilPowerOfTwo(60_000_001n, 1_000_000n)).toBe((1n << 60n) + 799_144_567_288n);
  });

  test('agrees with bisection over exact powers for every E ≤ 200 and q ≤ 24', () => {
    const wrong: string[] = [];
    for (let q = 1n; q <= 24n; q++) {
      for (let E = 0n; E <= 200n; E++) {
        const got = ceilPowerOfTwo(E, q);
        const want = bisect(E, q);
        if (got !== want) wrong.push(`${E}/${q}: ${got} instead of ${want}`);
      }
    }
    expect(wrong).toEqual([]);
  });

  test('agrees with bisection for large b with small denominators', () => {
    for (const [E, q] of [[201n, 2n], [4001n, 4n], [20_001n, 8n], [30_007n, 10n]] as const) expect(ceilPowerOfTwo(E, q)).toBe(bisect(E, q));
  });

  test('the largest fractional min_bits the loader allows, checked exactly', () => {
    const E = 131_073n; // 65536.5 bits
    const r = ceilPowerOfTwo(E, 2n);
    expect(r * r > 1n << E).toBe(true);
    expect((r - 1n) * (r - 1n) < 1n << E).toBe(true);
  });

  test('negative exponents and zero denominators are programming errors', () => {
    expect(() => ceilPowerOfTwo(-1n, 2n)).toThrow(RangeError);
    expect(() => ceilPowerOfTwo(1n, 0n)).toThrow(RangeError);
  });
});
