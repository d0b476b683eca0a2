/**
 * Reading min_rank and min_bits: the accepted spellings, exactness beyond 2^53, and the caps
 * that keep a policy from asking for numbers too large to hold.
 */
import { describe, expect, test } from 'vitest';
import { readMinBits, readMinRank, type MinimumRead } from '../../src/policy/minimum-rank.js';
import { MAX_MINIMUM_DIGITS } from '../../src/policy/policy-limits.js';
import { HEAD, policyOf } from './helpers.js';

function value(r: MinimumRead): bigint | string {
  return r.ok ? r.minRank : r.code;
}

describe('min_rank', () => {
  test('integers, from the digits as written', () => {
    expect(value(readMinRank(64, '64'))).toBe(64n);
    expect(value(readMinRank(64, '064'))).toBe(64n);
    expect(value(readMinRank('18446744073709551617', undefined))).toBe(2n ** 64n + 1n);
    // The number YAML parsed has lost the last digit; the source text has not.
    expect(value(readMinRank(Number('18446744073709551617'), '18446744073709551617'))).toBe(2n ** 64n + 1n);
    // Through an alias only the parsed number is known: exact when it is a safe integer.
    expect(value(readMinRank(4096, '*size'))).toBe(4096n);
    expect(value(readMinRank(2 ** 60, '*size'))).toBe('policy/invalid-min-rank');
    expect(value(readMinRank(0x40, '0x40'))).toBe(64n);
  });

  test('powers with ^ and **, spaces allowed', () => {
    expect(value(readMinRank('2^40', undefined))).toBe(2n ** 40n);
    expect(value(readMinRank('2**40', undefined))).toBe(2n ** 40n);
    expect(value(readMinRank(' 10 ^ 30 ', undefined))).toBe(10n ** 30n);
    expect(value(readMinRank('7^0', undefined))).toBe(1n);
    expect(value(readMinRank('1^99999999999999999999', undefined))).toBe(1n);
    expect(readMinRank(' 2 ** 40 ', undefined)).toEqual({ ok: true, minRank: 2n ** 40n, written: 'min_rank: 2 ** 40' });
  });

  test('malformed values', () => {
    for (const bad of ['2^x', '2^', '^3', '2^-1', '-4', '2^3^2', '2*3', '1e3', '0', '0^0', '0^5', '']) {
      expect([bad, value(readMinRank(bad, undefined))]).toEqual([bad, 'policy/invalid-min-rank']);
    }
  });

  test('the cap at 2^1000000, exactly at the edge', () => {
    expect(value(readMinRank('2^1000000', undefined))).toBe(1n << 1_000_000n);
    expect(value(readMinRank('2^1000001', undefined))).toBe('policy/minimum-too-large');
    expect(value(readMinRank('4^500000', undefined))).toBe(1n << 1_000_000n);
    expect(value(readMinRank('4^500001', undefined))).toBe('policy/minimum-too-large');
    // log2(3) · 630929 = 999998.6 and log2(3) · 630930 = 1000000.2: decided by the exact power.
    expect(typeof value(readMinRank('3^630929', undefined))).toBe('bigint');
    expect(value(readMinRank('3^630930', undefined))).toBe('policy/minimum-too-large');
    // 10^301029 < 2^1000000 < 10^301030 - 1.
    expect(value(readMinRank('1' + '0'.repeat(301_029), undefined))).toBe(10n ** 301_029n);
    expect(value(readMinRank('9'.repeat(MAX_MINIMUM_DIGITS), undefined))).toBe('policy/minimum-too-large');
    expect(value(readMinRank('9'.repeat(MAX_MINIMUM_DIGITS + 1), undefined))).toBe('policy/minimum-too-large');
    expect(value(readMinRank('9'.repeat(MAX_MINIMUM_DIGITS + 1) + '^1', undefined))).toBe('policy/minimum-too-large');
  });
});

describe('min_bits', () => {
  test('whole numbers of bits', () => {
    expect(readMinBits(12, '12')).toEqual({ ok: true, minRank: 4096n, written: 'min_bits: 12' });
    expect(value(readMinBits(0, '0'))).toBe(1n);
    expect(value(readMinBits(12, '12.000'))).toBe(4096n);
    expect(value(readMinBits(10, '1e1'))).toBe(1024n);
    expect(value(readMinBits(1_000_000, '1000000'))).toBe(1n << 1_000_000n);
  });

  test('fractions of bits round up to the next integer rank', () => {
    expect(value(readMinBits(1.5, '1.5'))).toBe(3n);
    expect(value(readMinBits(0.5, '.5'))).toBe(2n);
    expect(value(readMinBits(12.5, '12.50'))).toBe(5793n);
    expect(value(readMinBits(0.15, '1.5e-1'))).toBe(2n);
    expect(value(readMinBits(3.999999, '3.999999'))).toBe(16n);
    // Through an alias the shortest decimal of the parsed number stands in for the text.
    expect(readMinBits(1.5, '*half')).toEqual({ ok: true, minRank: 3n, written: 'min_bits: 1.5' });
  });

  test('more than six decimals, or a fraction above 65536 bits', () => {
    expect(value(readMinBits(1.1234567, '1.1234567'))).toBe('policy/invalid-min-bits');
    expect(value(readMinBits(1, '1.0000000001'))).toBe('policy/invalid-min-bits');
    expect(value(readMinBits(0, '1e-400'))).toBe('policy/invalid-min-bits');
    expect(value(readMinBits(65_536.5, '65536.5'))).toBe('policy/invalid-min-bits');
    expect(value(readMinBits(65_535.5, '65535.5'))).not.toBe('policy/invalid-min-bits');
  });

  test('in a policy, the minimum comes from the text of the file', () => {
    const p = policyOf(`${HEAD}require:\n  - {partition: left-right, min_bits: 2.000001}\n  - {partition: top-bottom, min_rank: 36893488147419103233}\n`);
    // 2^2.000001 = 4.0000028
    expect(p.requirements.map((r) => [r.minRank, r.written])).toEqual([
      [5n, 'min_bits: 2.000001'],
      [2n ** 65n + 1n, 'min_rank: 36893488147419103233'],
    ]);
  });
});
