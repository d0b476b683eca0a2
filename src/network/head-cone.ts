/**
 * The part of a circuit that the head reads: the top and every node below it, renumbered in their
 * order. The builder makes every position of every layer, but the analysed output of a dense
 * prediction reads only its receptive field (for a segmentation net, a few per cent of the nodes),
 * and the bound rules work from the top down the children, so the rest cannot change a bound.
 *
 * The flags (`reuse`, `sums`, `homogeneous`) are those of the whole circuit: they say how the
 * network was built, and the rules and reports that read them keep doing so.
 */
import type { Circuit } from './circuit.js';

export function headCone(c: Circuit): Circuit {
  const n = c.size;
  const { childStart, childList } = c;
  const reached = new Uint8Array(n);
  reached[c.top] = 1;
  let size = 0;
  let links = 0;
  for (let v = c.top; v >= 0; v--) {
    if (reached[v] === 0) continue;
    size++;
    links += childStart[v + 1]! - childStart[v]!;
    for (let i = childStart[v]!; i < childStart[v + 1]!; i++) reached[childList[i]!] = 1;
  }
  if (size === n) return c;
  // Children come before their parents, so renumbering in order keeps the order topological.
  const index = new Int32Array(c.top + 1);
  const op = new Uint8Array(size);
  const dim = new Int32Array(size);
  const position = new Int32Array(size);
  const tag = new Int32Array(size);
  const bondTag = new Int32Array(size);
  const start = new Int32Array(size + 1);
  const list = new Int32Array(links);
  let k = 0;
  let m = 0;
  for (let v = 0; v <= c.top; v++) {
    if (reached[v] === 0) continue;
    index[v] = k;
    op[k] = c.op[v]!;
    dim[k] = c.dim[v]!;
    position[k] = c.position[v]!;
    tag[k] = c.tag[v]!;
    bondTag[k] = c.bondTag[v]!;
    start[k] = m;
    for (let i = childStart[v]!; i < childStart[v + 1]!; i++) list[m++] = index[childList[i]!]!;
    k++;
  }
  start[size] = m;
  return { ...c, size, op, dim, position, tag, bondTag, childStart: start, childList: list, top: size - 1 };
}
