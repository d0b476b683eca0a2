/**
 * The terminal form of `rankfloor bounds`: a table with bits and ranks per partition, the
 * bottleneck layers of the minimal cut, and the notes on how the config was read.
 */
import type { ArchitectureUse } from '../config/model.js';
import { MAX_RANK_BITS, boundsMeet, type Bound, type BoundsResult, type CutEntry, type PartitionBounds } from '../cut/types.js';

const SURROGATE_WORDS = {
  tree: 'tree (arithmetic surrogate: per-position linear maps, product pooling)',
  overlap: 'overlap (arithmetic surrogate: linear maps over kernel windows, product pooling)',
} as const;

/** `architecture`: the definition a config names; the layer lines are that file's. */
export function boundsText(result: BoundsResult, architecture?: ArchitectureUse): string {
  const rows = result.partitions.map(row);
  const head = ['partition', 'upper bits', 'upper rank', 'lower bits', 'status', 'bottleneck (min-cut)'];
  const widths = head.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i]!.length)));
  const fmt = (cells: string[]): string => cells.map((c, i) => (i === cells.length - 1 ? c : c.padEnd(widths[i]!))).join('  ').trimEnd();
  const out = [`${result.file}`, `surrogate: ${SURROGATE_WORDS[result.surrogate]}`];
  if (architecture) {
    const values = architecture.parameters.map((p) => `${p.name} = ${p.value}`).join(', ');
    out.push(`built from: ${architecture.file} (${architecture.name}) with ${values}; the lines below are that file's`);
  }
  out.push('', fmt(head), fmt(widths.map((w) => '-'.repeat(w))));
  for (const r of rows) out.push(fmt(r));
  if (result.notes.length > 0) {
    out.push('', 'notes:');
    for (const n of result.notes) out.push(`  - ${n}`);
  }
  return out.join('\n') + '\n';
}

function row(p: PartitionBounds): string[] {
  return [
    p.partition,
    bits(p.upper.log2),
    boundRank(p.upper),
    p.lower ? bits(p.lower.log2) : '-',
    p.status,
    describeCut(p.upper.cut, p.upper.method),
  ];
}

export function bits(x: number): string {
  return x.toFixed(2);
}

/** Ranks up to 15 digits in full, larger ones by their size. */
/** A bound's rank as text: the integer, ≈2^x for long ones, or "more than N bits" for huge ones. */
export function boundRank(b: Bound): string {
  return b.huge ? `more than 2^${MAX_RANK_BITS.toLocaleString('en-US')} (≈2^${b.log2.toFixed(1)})` : shortRank(b.rank, b.log2);
}

/**
 * A capacity in bits from its bounds: one number when they meet, a range when both are known,
 * else only the ceiling (`≤ 8.00`). Bounds beyond the bit limit never meet: their integers are
 * not known.
 */
export function capacityBits(upper: Bound, lower: Bound | null): string {
  if (lower === null) return `≤ ${bits(upper.log2)}`;
  if (boundsMeet(lower, upper)) return bits(upper.log2);
  return `${bits(lower.log2)}–${bits(upper.log2)}`;
}

export function shortRank(r: bigint, log2: number): string {
  // Digits from the size, not from the string: a bound of millions of bits prints in no time.
  if (log2 > 100_000) return `≈2^${log2.toFixed(1)} (${Math.floor(log2 * Math.log10(2)) + 1} digits)`;
  const s = r.toString();
  return s.length <= 15 ? s : `≈2^${log2.toFixed(1)} (${s.length} digits)`;
}

/** Cut groups shown per bound; the rest are counted. */
const SHOWN_CUT_GROUPS = 6;

export function describeCut(cut: readonly CutEntry[], method: string): string {
  if (cut.length === 0) return method;
  // The groups that contribute most bits, in file order.
  const kept = new Set(
    [...cut].sort((a, b) => b.count * Math.log2(b.dim) - a.count * Math.log2(a.dim) || a.line - b.line).slice(0, SHOWN_CUT_GROUPS),
  );
  const parts = cut.filter((c) => kept.has(c)).map((c) => `${cutLabel(c.layer)} (line ${c.line}): ${c.count} × ${c.dim}`);
  if (cut.length > kept.size) parts.push(`${cut.length - kept.size} more`);
  return method === 'min-cut' ? parts.join('; ') : `${method}: ${parts.join('; ')}`;
}

/** How a cut group is named: input legs, an explicit network's legs or bond, or a layer. */
export function cutLabel(layer: number | string): string {
  if (layer === 'input') return 'input legs';
  if (layer === 'legs') return 'open legs';
  if (typeof layer === 'string' && layer.startsWith('bond ')) return layer;
  return `layer ${layer}`;
}
