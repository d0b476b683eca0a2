/**
 * A lower bound for shared-weight networks on partitions that split the product windows
 * (checkerboard, interleaved), where power rounding (unshared weights only) and the top-window
 * span (whole children on each side) do not reach. Derived here; DEVELOPERS.md, "Split windows
 * under shared weights".
 *
 * Below the first linear map above a product, a node's coordinate c is Π_{p∈S} ⟨w_c, x_p⟩ over
 * its positions S (a *window*), with w_c the rows of the per-position maps below, generic points
 * of a k-dimensional space. The first linear map above a window takes, in its coordinate 0, the
 * sum Σ_c of the window's coordinates (its other rows zero); every later linear map passes
 * coordinate 0 on, and products multiply. The output is then Π_X Σ_c Π_{p∈S_X} ⟨w_c, x_p⟩ over
 * the windows X that the first maps read: functions of disjoint sets of positions, so ranks
 * multiply, and Sylvester's inequality bounds each factor by ρ_A + ρ_B − r with
 * ρ_Y = min(r, C(k + |S∩Y| − 1, |S∩Y|)) (the Veronese variety spans the symmetric power).
 */
import { OP_INPUT, OP_LINEAR, OP_PRODUCT, type Circuit } from '../network/circuit.js';
import { sylvesterPowerSpan } from './degree-bound.js';

const LEAF = 1; // per-position maps of one input: ⟨w_c, x_p⟩
const WINDOW = 2; // products of leaves: Π_{p∈S} ⟨w_c, x_p⟩
const CARRIER = 3; // coordinate 0 carries a product of window sums

/**
 * The bound, or undefined when the network is not of that shape (a node of another kind, a
 * product of mixed kinds). `c` must be sum-free, without reuse, with weights shared by every
 * node of a layer; its top is the last node that is not a linear map (the head is generic).
 */
export function splitWindowLower(c: Circuit, side: Uint8Array): bigint | undefined {
  const n = c.size;
  const kind = new Uint8Array(n);
  const span = new Int32Array(n); // leaves: k, the dimension the maps below pass
  const inA = new Int32Array(n); // windows: positions on side A and on side B
  const inB = new Int32Array(n);
  const rank: bigint[] = new Array<bigint>(n);
  const windowRank = (v: number): bigint => {
    const r = BigInt(c.dim[v]!);
    const a = inA[v]!;
    const b = inB[v]!;
    if (a === 0 || b === 0) return 1n;
    const bound = sylvesterPowerSpan(span[v]!, a, b, r);
    return bound > 1n ? bound : 1n;
  };
  for (let v = 0; v < n; v++) {
    const from = c.childStart[v]!;
    const to = c.childStart[v + 1]!;
    switch (c.op[v]) {
      case OP_INPUT:
        kind[v] = LEAF;
        span[v] = c.dim[v]!;
        if (side[c.position[v]!] === 1) inA[v] = 1;
        else inB[v] = 1;
        break;
      case OP_LINEAR: {
        const ch = c.childList[from]!;
        if (kind[ch] === LEAF) {
          kind[v] = LEAF;
          span[v] = Math.min(span[ch]!, c.dim[v]!);
          inA[v] = inA[ch]!;
          inB[v] = inB[ch]!;
        } else if (kind[ch] === WINDOW) {
          kind[v] = CARRIER;
          rank[v] = windowRank(ch);
        } else if (kind[ch] === CARRIER) {
          kind[v] = CARRIER;
          rank[v] = rank[ch]!;
        } else return undefined;
        break;
      }
      case OP_PRODUCT: {
        const first = c.childList[from]!;
        const k = kind[first];
        if (k === CARRIER) {
          let r = 1n;
          for (let i = from; i < to; i++) {
            const ch = c.childList[i]!;
            if (kind[ch] !== CARRIER) return undefined;
            r *= rank[ch]!;
          }
          kind[v] = CARRIER;
          rank[v] = r;
        } else if (k === LEAF || k === WINDOW) {
          // Every factor must be a power-free product of the same rows: nodes of one layer.
          kind[v] = WINDOW;
          span[v] = span[first]!;
          for (let i = from; i < to; i++) {
            const ch = c.childList[i]!;
            if ((kind[ch] !== LEAF && kind[ch] !== WINDOW) || c.tag[ch] !== c.tag[first] || c.dim[ch] !== c.dim[first] || span[ch] !== span[first]) return undefined;
            inA[v] = inA[v]! + inA[ch]!;
            inB[v] = inB[v]! + inB[ch]!;
          }
        } else return undefined;
        break;
      }
      default:
        return undefined; // constants (learned vectors) and sums are outside the argument
    }
  }
  const top = c.top;
  // A window at the top is mixed by the head itself.
  if (kind[top] === WINDOW) return windowRank(top);
  return kind[top] === CARRIER ? rank[top] : undefined;
}
