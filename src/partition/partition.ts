/**
 * Partitions of the input positions into side A and side B. Positions are numbered row-major from
 * 0 (row·width + col). Built-in kinds cover the dependencies teams usually care about; `block`
 * and `positions` let a team name its own regions. A partition is resolved against a shape once,
 * into a 0/1 mask that the cut engine reads.
 */
import type { Shape } from '../config/model.js';
import { positionCount } from '../config/model.js';
import { MAX_INPUT_POSITIONS } from '../config/limits.js';
import { closest } from '../text/suggest.js';

export type PartitionKind =
  | 'start-end'
  | 'left-right'
  | 'top-bottom'
  | 'interleaved'
  | 'checkerboard'
  | 'block'
  | 'positions';

export interface Partition {
  /** As the user wrote it, e.g. `left-right` or `block:0-4,0-8`. */
  readonly label: string;
  readonly kind: PartitionKind;
  /** side[p] = 1 when position p is on side A. */
  readonly side: Uint8Array;
  /** A sentence for reports: which positions form side A. */
  readonly description: string;
}

export type PartitionResult = { ok: true; partition: Partition } | { ok: false; message: string };

export const BUILTIN_KINDS: readonly PartitionKind[] = [
  'start-end',
  'left-right',
  'top-bottom',
  'interleaved',
  'checkerboard',
  'block',
  'positions',
];

const ONE_D: readonly PartitionKind[] = ['start-end', 'interleaved'];
const TWO_D: readonly PartitionKind[] = ['left-right', 'top-bottom', 'checkerboard'];

/** The argument-free built-in partitions that fit a shape, in a fixed order. */
export function defaultPartitions(shape: Shape): string[] {
  const kinds = shape.length === 1 ? ONE_D : TWO_D;
  return kinds.filter((k) => resolvePartition(k, shape).ok);
}

/** Parses `name`, `positions:0,2,5` or `block:r0-r1,c0-c1` (half-open ranges) against a shape. */
export function resolvePartition(spec: string, shape: Shape): PartitionResult {
  const text = spec.trim();
  const colon = text.indexOf(':');
  const name = colon < 0 ? text : text.slice(0, colon);
  const arg = colon < 0 ? undefined : text.slice(colon + 1);
  const n = positionCount(shape);
  // The loader refuses such inputs; a library caller gets the same answer before any allocation.
  if (!(n <= MAX_INPUT_POSITIONS)) return { ok: false, message: `the shape [${shape.join(', ')}] has more than ${MAX_INPUT_POSITIONS} positions` };
  const side = new Uint8Array(n);
  const is2d = shape.length === 2;
  const width = is2d ? (shape[1] as number) : n;
  const height = is2d ? (shape[0] as number) : 1;
  const shapeText = `[${shape.join(', ')}]`;
  const needs = (dims: number): PartitionResult | undefined =>
    shape.length === dims
      ? undefined
      : { ok: false, message: `partition '${name}' needs a ${dims}D input, but the input shape is ${shapeText}` };
  const noArg = (): PartitionResult | undefined =>
    arg === undefined ? undefined : { ok: false, message: `partition '${name}' takes no argument (got '${arg}')` };
  let description: string;

  switch (name) {
    case 'start-end': {
      const bad = needs(1) ?? noArg();
      if (bad) return bad;
      const half = Math.floor(n / 2);
      for (let p = 0; p < half; p++) side[p] = 1;
      description = `positions 0-${half - 1} against ${half}-${n - 1}`;
      break;
    }
    case 'interleaved': {
      const bad = needs(1) ?? noArg();
      if (bad) return bad;
      for (let p = 0; p < n; p += 2) side[p] = 1;
      description = 'even positions against odd positions';
      break;
    }
    case 'left-right': {
      const bad = needs(2) ?? noArg();
      if (bad) return bad;
      const half = Math.floor(width / 2);
      for (let r = 0; r < height; r++) for (let c = 0; c < half; c++) side[r * width + c] = 1;
      description = `columns 0-${half - 1} against columns ${half}-${width - 1}`;
      break;
    }
    case 'top-bottom': {
      const bad = needs(2) ?? noArg();
      if (bad) return bad;
      const half = Math.floor(height / 2);
      for (let r = 0; r < half; r++) for (let c = 0; c < width; c++) side[r * width + c] = 1;
      description = `rows 0-${half - 1} against rows ${half}-${height - 1}`;
      break;
    }
    case 'checkerboard': {
      const bad = needs(2) ?? noArg();
      if (bad) return bad;
      for (let r = 0; r < height; r++) for (let c = 0; c < width; c++) if ((r + c) % 2 === 0) side[r * width + c] = 1;
      description = 'positions with (row + column) even against the others';
      break;
    }
    case 'block': {
      if (arg === undefined) {
        return { ok: false, message: `partition 'block' needs ranges: 'block:r0-r1,c0-c1' (2D) or 'block:a-b' (1D), half-open` };
      }
      const ranges = arg.split(',').map((part) => parseRange(part));
      if (ranges.some((r) => r === undefined) || ranges.length !== shape.length) {
        return {
          ok: false,
          message: `partition '${text}': expected ${shape.length === 2 ? "'block:r0-r1,c0-c1'" : "'block:a-b'"} with half-open integer ranges for the input shape ${shapeText}`,
        };
      }
      const [rr, cr] = is2d ? [ranges[0]!, ranges[1]!] : [[0, 1] as const, ranges[0]!];
      if (rr[1] > height || cr[1] > width || rr[0] >= rr[1] || cr[0] >= cr[1]) {
        return { ok: false, message: `partition '${text}': the ranges must be non-empty and lie inside the input shape ${shapeText}` };
      }
      for (let r = rr[0]; r < rr[1]; r++) for (let c = cr[0]; c < cr[1]; c++) side[r * width + c] = 1;
      description = is2d
        ? `rows ${rr[0]}-${rr[1] - 1}, columns ${cr[0]}-${cr[1] - 1} against the rest`
        : `positions ${cr[0]}-${cr[1] - 1} against the rest`;
      break;
    }
    case 'positions': {
      if (arg === undefined || arg.trim() === '') {
        return { ok: false, message: `partition 'positions' needs a list: 'positions:0,2,5'` };
      }
      for (const part of arg.split(',')) {
        const t = part.trim();
        if (!/^\d+$/.test(t)) return { ok: false, message: `partition '${text}': '${t}' is not a position number` };
        const p = Number(t);
        if (p >= n) return { ok: false, message: `partition '${text}': position ${p} is outside the ${n} positions of shape ${shapeText}` };
        side[p] = 1;
      }
      description = `positions ${arg.split(',').map((s) => s.trim()).join(', ')} against the rest`;
      break;
    }
    default: {
      const hint = closest(name, BUILTIN_KINDS);
      return {
        ok: false,
        message: `unknown partition '${name}'${hint ? ` (did you mean '${hint}'?)` : ''}; known: ${BUILTIN_KINDS.join(', ')}`,
      };
    }
  }
  const countA = side.reduce((a, b) => a + b, 0);
  if (countA === 0 || countA === n) {
    return { ok: false, message: `partition '${text}' puts every position of shape ${shapeText} on one side` };
  }
  return { ok: true, partition: { label: text, kind: name as PartitionKind, side, description } };
}

function parseRange(part: string): readonly [number, number] | undefined {
  const m = /^\s*(\d+)\s*-\s*(\d+)\s*$/.exec(part);
  if (!m) return undefined;
  return [Number(m[1]), Number(m[2])];
}
