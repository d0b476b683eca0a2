/**
 * A lower bound for networks with shared weights (derived here), where the power-rounding rule
 * does not apply: sharing makes sibling subtrees compute the same function, which can lower the
 * rank below the min-cut. The rule looks at the last product window, h = Σ_k w_k Π_j c_{j,k}.
 * With the children that lie wholly on one side kept and the others fixed at generic inputs,
 * h = L·diag(w')·Rᵀ with L[x_A, k] = Π_{j∈A} c_{j,k}, so by Sylvester's inequality
 * rank ≥ rank L + rank R − D.
 *
 * rank L is the dimension of the span of Π_{j∈A} f_k(y_j), k ≤ D, where f is the function every
 * child computes on its own inputs. If f = W·g with W generic (the child is a linear map) and g
 * spans S dimensions, the rows of W·G are generic points and their a-th powers span
 * min(D, C(S + a − 1, a)) dimensions (the Veronese variety spans the symmetric power);
 * otherwise fixing all but one child at generic values still leaves S. The spans S themselves
 * follow the same two rules up the tree. Every statement is a Zariski-open condition on the
 * weights, so generic weights satisfy all of them at once.
 */
import { OP_CONST, OP_INPUT, OP_LINEAR, OP_PRODUCT, type Circuit } from '../network/circuit.js';
import { powerSpan as veronese } from './degree-bound.js';

/** Lower bound from the top window, or undefined when one side holds none of its children whole. */
export function topWindowLower(c: Circuit, side: Uint8Array): bigint | undefined {
  let top = c.top;
  while (c.op[top] === OP_LINEAR) top = c.childList[c.childStart[top]!]!;
  if (c.op[top] !== OP_PRODUCT) return undefined;
  const children = Array.from(c.childList.subarray(c.childStart[top]!, c.childStart[top + 1]!));
  if (children.length < 2 || !sameKind(c, children)) return undefined;

  const dep = dependence(c, side);
  let a = 0;
  let b = 0;
  // A child that reads both sides is fixed at generic inputs: it becomes a constant vector with
  // non-zero components, which only rescales w. Fixing inputs restricts the function, so the
  // restricted rank is a lower bound.
  for (const ch of children) {
    if (dep[ch] === 1) a++;
    else if (dep[ch] === 2) b++;
  }
  if (a === 0 || b === 0) return undefined;
  const span = spans(c);
  const child = children[0]!;
  const d = BigInt(c.dim[top]!);
  const rho = (count: number): bigint => powerSpan(c, child, span[child]!, count);
  const bound = rho(a) + rho(b) - d;
  return bound > 1n ? bound : 1n;
}

/** Dimension of the span of Π over `count` copies of the child's components. */
function powerSpan(c: Circuit, child: number, s: number, count: number): bigint {
  const d = BigInt(c.dim[child]!);
  if (c.op[child] !== OP_LINEAR) return BigInt(s) < d ? BigInt(s) : d;
  return veronese(s, count, d);
}

/** Children built by one layer at the same dimension compute the same function (shared weights). */
function sameKind(c: Circuit, nodes: readonly number[]): boolean {
  const first = nodes[0]!;
  return nodes.every((v) => c.op[v] === c.op[first] && c.tag[v] === c.tag[first] && c.dim[v] === c.dim[first]);
}

/** Bit 1: depends on side A; bit 2: on side B. */
function dependence(c: Circuit, side: Uint8Array): Uint8Array {
  const dep = new Uint8Array(c.size);
  for (let v = 0; v < c.size; v++) {
    if (c.op[v] === OP_INPUT) dep[v] = side[c.position[v]!] === 1 ? 1 : 2;
    else for (let i = c.childStart[v]!; i < c.childStart[v + 1]!; i++) dep[v] = dep[v]! | dep[c.childList[i]!]!;
  }
  return dep;
}

/** A lower bound on the dimension of the span of each node's component functions. */
function spans(c: Circuit): Float64Array {
  const s = new Float64Array(c.size);
  for (let v = 0; v < c.size; v++) {
    const first = c.childList[c.childStart[v]!]!;
    switch (c.op[v]) {
      case OP_INPUT:
        s[v] = c.dim[v]!;
        break;
      case OP_CONST:
        s[v] = 1;
        break;
      case OP_LINEAR:
        s[v] = Math.min(c.dim[v]!, s[first]!);
        break;
      case OP_PRODUCT: {
        const kids = Array.from(c.childList.subarray(c.childStart[v]!, c.childStart[v + 1]!));
        const w = kids.length;
        if (w > 1 && sameKind(c, kids) && c.op[first] === OP_LINEAR) {
          s[v] = Number(veronese(s[first]!, w, BigInt(c.dim[v]!)));
        } else {
          s[v] = Math.min(c.dim[v]!, Math.max(...kids.map((k) => s[k]!)));
        }
        break;
      }
      default:
        s[v] = 1;
    }
  }
  return s;
}
