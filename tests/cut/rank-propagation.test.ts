/**
 * Rank propagation's exact values where they cross 2^53, the bound of exact doubles: the pass
 * runs on doubles and works out again in integers only the nodes whose values reach 2^53.
 */
import { describe, expect, it } from 'vitest';
import { NO_SPAN } from '../../src/diagnostic.js';
import { CircuitBuilder, OP_INPUT, OP_PRODUCT, OP_SUM, type Circuit } from '../../src/network/circuit.js';
import { rankPropagation } from '../../src/cut/rank-propagation.js';

/**
 * Π_{i<k} (f_i(x) + g_i(y) [+ u_i(x')·v_i(y')]) over inputs of dimension 2^20, each sum of width
 * 2^20, the product of width 1; x, x' on side A, y, y' on side B, every factor on inputs of its own.
 */
function productOfSums(k: number, withProductTerm: boolean): { circuit: Circuit; side: Uint8Array } {
  const per = withProductTerm ? 4 : 2;
  const b = new CircuitBuilder(per * k, 10_000);
  const tag = b.addTag({ label: 'x', line: 1, span: NO_SPAN, layerIndex: 0 });
  const side = new Uint8Array(per * k);
  const input = (p: number, onA: boolean): number => {
    side[p] = onA ? 1 : 0;
    return b.add(OP_INPUT, 2 ** 20, tag, [], p);
  };
  const sums: number[] = [];
  for (let i = 0; i < k; i++) {
    const terms = [input(per * i, true), input(per * i + 1, false)];
    if (withProductTerm) terms.push(b.add(OP_PRODUCT, 1, tag, [input(per * i + 2, true), input(per * i + 3, false)]));
    sums.push(b.add(OP_SUM, 2 ** 20, tag, terms));
  }
  return { circuit: b.finish(b.add(OP_PRODUCT, 1, tag, sums)), side };
}

describe('rank propagation, exact values', () => {
  // Derived here: a factor f(x) + g(y) reads one input of each side (λ = κ = 2, ρ_A = ρ_B =
  // 1 + 2^20); with a width-1 product term u(x')·v(y') (λ = 1) added, λ = κ = 3. The product of k
  // factors multiplies ρ_A to (1 + 2^20)^k or more, far beyond 2^53, but its width-1 index caps it
  // at 1·κ (the rule ρ_A ≤ D·κ): λ = 2^k, resp. 3^k, which is also the separation rank of a
  // product of k rank-2 (rank-3) factors in disjoint variables.
  it.each([10, 40, 52, 53, 54, 60, 100])('a product of %i rank-2 factors: 2^k', (k) => {
    const { circuit, side } = productOfSums(k, false);
    const r = rankPropagation(circuit, side);
    expect(r.rank()).toBe(2n ** BigInt(k));
    expect(r.log2).toBe(k);
  });

  // 3^33 < 2^53 < 3^34, and 3^34 is odd, so no double holds it: the values from 34 factors on
  // must come from the integer pass.
  it.each([20, 33, 34, 35, 60])('a product of %i rank-3 factors: 3^k', (k) => {
    const { circuit, side } = productOfSums(k, true);
    expect(rankPropagation(circuit, side).rank()).toBe(3n ** BigInt(k));
  });
});
