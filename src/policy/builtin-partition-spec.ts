/**
 * Checks a built-in partition spec (`left-right`, `block:0-4,0-8`, `positions:0,2,5`) before any
 * input shape is known: the kind exists, takes an argument exactly when it needs one, and the
 * argument has the syntax `resolvePartition` reads. Whether the spec fits a config's shape
 * (dimensions, bounds) can only be decided against that config, later. The syntax accepted here
 * is the resolver's: surrounding spaces are ignored, ranges are half-open `a-b`.
 */
import { BUILTIN_KINDS, type PartitionKind } from '../partition/partition.js';

export type SpecCheck =
  | { readonly ok: true; readonly kind: PartitionKind; readonly canonical: string }
  | { readonly ok: false; readonly unknownKind: boolean; readonly kind: string; readonly message: string };

const ARGUMENT_FREE: ReadonlySet<string> = new Set(['start-end', 'left-right', 'top-bottom', 'interleaved', 'checkerboard']);
const RANGE = /^\s*(\d+)\s*-\s*(\d+)\s*$/;

export function isBuiltinKind(name: string): name is PartitionKind {
  return (BUILTIN_KINDS as readonly string[]).includes(name);
}

export function checkBuiltinSpec(spec: string): SpecCheck {
  const text = spec.trim();
  const colon = text.indexOf(':');
  const kind = colon < 0 ? text : text.slice(0, colon);
  const arg = colon < 0 ? undefined : text.slice(colon + 1);
  const invalid = (message: string): SpecCheck => ({ ok: false, unknownKind: false, kind, message });
  if (!isBuiltinKind(kind)) {
    return { ok: false, unknownKind: true, kind, message: `unknown partition '${kind}'; known kinds: ${BUILTIN_KINDS.join(', ')}` };
  }
  if (ARGUMENT_FREE.has(kind)) {
    if (arg !== undefined) return invalid(`partition '${kind}' takes no argument (got '${arg}')`);
    return { ok: true, kind, canonical: kind };
  }
  if (kind === 'block') {
    if (arg === undefined) return invalid(`partition 'block' needs ranges: 'block:r0-r1,c0-c1' (2D) or 'block:a-b' (1D), half-open`);
    const parts = arg.split(',');
    const ranges = parts.map((p) => RANGE.exec(p));
    if (parts.length > 2 || ranges.some((r) => r === null)) {
      return invalid(`partition '${text}': expected 'block:r0-r1,c0-c1' (2D) or 'block:a-b' (1D) with half-open integer ranges`);
    }
    for (const r of ranges) {
      if (Number(r![1]) >= Number(r![2])) return invalid(`partition '${text}': the range ${r![1]}-${r![2]} is empty; half-open ranges need start < end`);
    }
    return { ok: true, kind, canonical: `block:${ranges.map((r) => `${Number(r![1])}-${Number(r![2])}`).join(',')}` };
  }
  // positions
  if (arg === undefined || arg.trim() === '') return invalid(`partition 'positions' needs a list: 'positions:0,2,5'`);
  const items = arg.split(',').map((p) => p.trim());
  const bad = items.find((p) => !/^\d+$/.test(p));
  if (bad !== undefined) return invalid(`partition '${text}': '${bad}' is not a position number`);
  return { ok: true, kind, canonical: `positions:${items.map((p) => String(Number(p))).join(',')}` };
}
