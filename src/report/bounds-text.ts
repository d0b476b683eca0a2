/**
 * The terminal form of `rankfloor bounds`: a table with bits and ranks per partition, the
 * bottleneck layers of the minimal cut, and the notes on how the config was read.
 */
import type { BoundsResult, CutEntry, PartitionBounds } from '../cut/types.js';

const SURROGATE_WORDS = {
  tree: 'tree (arithmetic surrogate: per-position linear maps, product pooling)',
  overlap: 'overlap (arithmetic surrogate: linear maps over kernel windows, product pooling)',
} as const;

export function boundsText(result: BoundsResult): string {
  const rows = result.partitions.map(row);
  const head = ['partition', 'upper bits', 'upper rank', 'lower bits', 'status', 'bottleneck (min-cut)'];
  const widths = head.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i]!.length)));
  const fmt = (cells: string[]): string => cells.map((c, i) => (i === cells.length - 1 ? c : c.padEnd(widths[i]!))).join('  ').trimEnd();
  const out = [`${result.file}`, `surrogate: ${SURROGATE_WORDS[result.surrogate]}`, '', fmt(head), fmt(widths.map((w) => '-'.repeat(w)))];
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
    shortRank(p.upper.rank, p.upper.log2),
    p.lower ? bits(p.lower.log2) : '-',
    p.status,
    describeCut(p.upper.cut, p.upper.method),
  ];
}

export function bits(x: number): string {
  return x.toFixed(2);
}

/** Ranks up to 15 digits in full, larger ones by their size. */
export function shortRank(r: bigint, log2: number): string {
  const s = r.toString();
  return s.length <= 15 ? s : `≈2^${log2.toFixed(1)} (${s.length} digits)`;
}

export function describeCut(cut: readonly CutEntry[], method: string): string {
  if (cut.length === 0) return method;
  const parts = cut.map((c) => `${cutLabel(c.layer)} (line ${c.line}): ${c.count} × ${c.dim}`);
  return method === 'min-cut' ? parts.join('; ') : `${method}: ${parts.join('; ')}`;
}

/** How a cut group is named: input legs, an explicit network's legs or bond, or a layer. */
export function cutLabel(layer: number | string): string {
  if (layer === 'input') return 'input legs';
  if (layer === 'legs') return 'open legs';
  if (typeof layer === 'string' && layer.startsWith('bond ')) return layer;
  return `layer ${layer}`;
}
