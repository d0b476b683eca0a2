/**
 * The size expressions of architecture definitions, evaluated exactly. Reference facts:
 * - IEEE 754 binary64 arithmetic (what JavaScript numbers are): 0.1 * 3 * 10 is
 *   3.0000000000000004, 0.07 * 100 is 7.000000000000001 and 1.1 * 1.1 * 100 is
 *   121.00000000000003, so a float `ceil` gives 4, 8 and 122 — asserted below on this machine's
 *   own arithmetic, as the contrast the exact evaluator avoids.
 * - floor and ceiling (Graham, Knuth & Patashnik, "Concrete Mathematics", ch. 3): ⌊x⌋ is the
 *   greatest integer ≤ x, ⌈x⌉ the least integer ≥ x, also for negative x (⌊−2.5⌋ = −3, ⌈−2.5⌉ = −2).
 * - Operator precedence and associativity as in common mathematical notation: × and ÷ before + and
 *   −, powers before signs (−2² = −4), powers grouped from the right (2^3^2 = 2^9 = 512).
 * The limits (2^63, 500 characters, 32 levels, exponents up to 64) are derived here.
 */
import { describe, expect, test } from 'vitest';
import { ceil, exact, floor, formatExact, fromNumber, parseDecimal, type Exact } from '../../src/config/exact-number.js';
import { evaluateExpression, MAX_EXPRESSION_DEPTH, MAX_EXPRESSION_LENGTH, parseExpression, type ParameterValue } from '../../src/config/expression.js';

const PARAMS = new Map<string, ParameterValue>([
  ['width', fromNumber(0.1)!],
  ['half', fromNumber(0.5)!],
  ['one', exact(1n)],
  ['stages', [exact(2n), exact(3n), exact(5n)]],
  ['hidden', exact(96n)],
]);

function value(text: string, params = PARAMS): string {
  const parsed = parseExpression(text);
  if (!parsed.ok) throw new Error(`parse: ${parsed.error.message}`);
  const r = evaluateExpression(parsed.expr, params);
  if (!r.ok) throw new Error(`evaluate: ${r.error.message}`);
  return formatExact(r.value);
}

/** `code [start, end)` of the problem, and the characters it points at. */
function problem(text: string, params = PARAMS): string {
  const parsed = parseExpression(text);
  const error = parsed.ok ? (() => {
    const r = evaluateExpression(parsed.expr, params);
    if (r.ok) throw new Error(`expected a problem, got ${formatExact(r.value)}`);
    return r.error;
  })() : parsed.error;
  return `${error.code} '${text.slice(error.start, error.end)}'`;
}

describe('exact numbers', () => {
  test('decimals are read as the decimal written, not as the nearest double', () => {
    expect(parseDecimal('0.1')).toEqual({ n: 1n, d: 10n });
    expect(fromNumber(0.1)).toEqual({ n: 1n, d: 10n });
    expect(fromNumber(1e-7)).toEqual({ n: 1n, d: 10000000n });
    expect(parseDecimal('-0.125')).toEqual({ n: -1n, d: 8n });
    expect(parseDecimal('1.5e3')).toEqual({ n: 1500n, d: 1n });
    expect(parseDecimal('abc')).toBeUndefined();
  });

  test('floor and ceiling of negative and positive fractions', () => {
    const x: Exact = exact(-5n, 2n);
    expect(floor(x)).toEqual(exact(-3n));
    expect(ceil(x)).toEqual(exact(-2n));
    expect(floor(exact(7n, 2n))).toEqual(exact(3n));
    expect(ceil(exact(7n, 2n))).toEqual(exact(4n));
    expect(ceil(exact(4n))).toEqual(exact(4n));
  });

  test('decimal text for finite expansions, a fraction otherwise', () => {
    expect(formatExact(exact(1n, 8n))).toBe('0.125');
    expect(formatExact(exact(-3n, 4n))).toBe('-0.75');
    expect(formatExact(exact(2n, 3n))).toBe('2/3');
    expect(formatExact(exact(640n))).toBe('640');
  });
});

describe('evaluation', () => {
  test('widths are exact where binary floating point is not', () => {
    expect(Math.ceil(0.1 * 3 * 10)).toBe(4); // binary64, this machine
    expect(Math.ceil(0.07 * 100)).toBe(8);
    expect(Math.ceil(1.1 * 1.1 * 100)).toBe(122);
    expect(value('=ceil(width * 3 * 10)')).toBe('3');
    expect(value('=ceil(0.07 * 100)')).toBe('7');
    expect(value('=ceil(1.1 * 1.1 * 100)')).toBe('121');
    expect(value('=ceil(48 * width * 10 * half)')).toBe('24');
  });

  test('rounding up and down, min and max', () => {
    expect(value('=floor(hidden / 10)')).toBe('9');
    expect(value('=ceil(hidden / 10)')).toBe('10');
    expect(value('=floor(-5 / 2)')).toBe('-3');
    expect(value('=ceil(-5 / 2)')).toBe('-2');
    expect(value('=max(8, floor(hidden * width))')).toBe('9');
    expect(value('=min(stages[0], stages[1], stages[2])')).toBe('2');
  });

  test('precedence, signs, powers and the other operator spellings', () => {
    expect(value('=2 + 3 * 4')).toBe('14');
    expect(value('=(2 + 3) * 4')).toBe('20');
    expect(value('=-2^2')).toBe('-4');
    expect(value('=2^3^2')).toBe('512');
    expect(value('=2^-1')).toBe('0.5');
    expect(value('=64 × half ÷ 2 − 1')).toBe('15');
    expect(value('=10 - 2 - 3')).toBe('5');
    expect(value('=64 / 4 / 2')).toBe('8');
  });

  test('list parameters are indexed from 0, and the index may be computed', () => {
    expect(value('=stages[0]')).toBe('2');
    expect(value('=stages[2]')).toBe('5');
    expect(value('=stages[stages[0]]')).toBe('5');
    expect(value('=16 * 2^stages[0]')).toBe('64');
  });

  test('the parameters read are reported, in the order first read', () => {
    const parsed = parseExpression('=max(stages[1], ceil(hidden * width), stages[0])');
    if (!parsed.ok) throw new Error(parsed.error.message);
    const r = evaluateExpression(parsed.expr, PARAMS);
    expect(r.ok && r.used).toEqual(['stages', 'hidden', 'width']);
  });
});

describe('problems point at the characters at fault', () => {
  test('division by zero at the divisor', () => {
    expect(problem('=64 / (one - 1)')).toBe("definition/division-by-zero '(one - 1)'");
    expect(problem('=hidden / 0')).toBe("definition/division-by-zero '0'");
    expect(problem('=0^-1')).toBe("definition/division-by-zero '0^-1'");
  });

  test('overflow past 2^63 at the operation', () => {
    expect(value('=2^62')).toBe('4611686018427387904');
    expect(problem('=2 * 2^62')).toBe("definition/overflow '2 * 2^62'");
    expect(problem('=1 + 9223372036854775807')).toBe("definition/overflow '1 + 9223372036854775807'");
    expect(problem('=9223372036854775808 - 1')).toBe("definition/overflow '9223372036854775808'");
    expect(problem('=2^64')).toBe("definition/overflow '2^64'");
    expect(problem('=hidden^65')).toBe("definition/expression-type '65'");
  });

  test('unknown names with a suggestion, lists used as numbers, indices outside the list', () => {
    const parsed = parseExpression('=ceil(64 * widht)');
    if (!parsed.ok) throw new Error(parsed.error.message);
    const r = evaluateExpression(parsed.expr, PARAMS);
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.error.message).toContain("(did you mean 'width'?)");
      expect([r.error.start, r.error.end]).toEqual([11, 16]);
    }
    expect(problem('=stages * 2')).toBe("definition/expression-type 'stages'");
    expect(problem('=hidden[0]')).toBe("definition/expression-type 'hidden'");
    expect(problem('=stages[3]')).toBe("definition/index '3'");
    expect(problem('=stages[half]')).toBe("definition/index 'half'");
  });

  test('syntax', () => {
    expect(problem('=')).toBe("definition/expression-syntax '='");
    expect(problem('=64 *')).toBe("definition/expression-syntax ''");
    expect(problem('=(64')).toMatch(/^definition\/expression-syntax/);
    expect(problem('=64 64')).toBe("definition/expression-syntax '64'");
    expect(problem('=sqrt(4)')).toBe("definition/expression-syntax 'sqrt'");
    expect(problem('=min(1)')).toBe("definition/expression-syntax 'min(1)'");
    expect(problem('=ceil')).toBe("definition/expression-syntax 'ceil'");
    expect(problem('=1.5.2')).toBe("definition/expression-syntax '1.5.'");
  });

  test('nothing but numbers, parameters and the four functions can be named', () => {
    expect(problem("=require('fs')")).toBe("definition/expression-syntax '''");
    expect(problem('=process.exit(1)')).toBe("definition/expression-syntax '.'");
    expect(problem('=constructor')).toBe("definition/unknown-parameter 'constructor'");
    expect(problem('=__proto__')).toBe("definition/unknown-parameter '__proto__'");
    expect(problem('=toString(1)')).toBe("definition/expression-syntax 'toString'");
  });

  test('length and depth limits are checked before evaluating', () => {
    const deep = `=${'('.repeat(MAX_EXPRESSION_DEPTH + 1)}1${')'.repeat(MAX_EXPRESSION_DEPTH + 1)}`;
    expect(problem(deep)).toBe("definition/expression-limit '('");
    const fine = `=${'('.repeat(MAX_EXPRESSION_DEPTH - 1)}1${')'.repeat(MAX_EXPRESSION_DEPTH - 1)}`;
    expect(value(fine)).toBe('1');
    expect(problem(`=${'-'.repeat(40)}1`)).toMatch(/^definition\/expression-limit/);
    const long = `=${'1 + '.repeat(130)}1`;
    expect(long.length).toBeGreaterThan(MAX_EXPRESSION_LENGTH);
    expect(problem(long)).toBe(`definition/expression-limit '${long}'`);
  });
});
