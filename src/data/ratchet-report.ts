/** `rankfloor ratchet` for people and for programs (one JSON document, ranks as decimal strings). */
import { roundLog } from '../report/bounds-json.js';
import { policyJson, policyWriteLines } from './measure-report.js';
import type { Bound } from '../cut/types.js';
import { boundText, rankText, type RatchetOutcome } from './ratchet-job.js';

export function ratchetJson(o: RatchetOutcome): string {
  // A bound beyond the bit limit is known by its log2 only (as in every other report).
  const bound = (b: Bound | null) => (b ? { rank: b.huge ? null : b.rank.toString(), log2: roundLog(b.log2) } : null);
  const doc = {
    version: 1,
    file: o.file,
    surrogate: o.surrogate,
    margin_bits: o.margin,
    partitions: o.partitions.map((p) => ({
      partition: p.partition,
      lower: bound(p.lower),
      upper: bound(p.upper),
      minimum: p.minRank === null ? null : p.minRank.toString(),
      reason: p.reason,
    })),
    policy: o.policy ? policyJson(o.policy) : null,
  };
  return JSON.stringify(doc, null, 2) + '\n';
}

export function ratchetText(o: RatchetOutcome): string {
  const lines = [`${o.file} (${o.surrogate} surrogate): proven capacities less a margin of ${o.margin} bit${o.margin === 1 ? '' : 's'}`, ''];
  const rows = o.partitions.map((p) => [
    p.partition,
    p.lower ? `${boundText(p.lower)} (${p.lower.log2.toFixed(1)} bits)` : 'none proven',
    p.minRank !== null ? `min_rank ${rankText(p.minRank)}` : p.reason === 'unproven' ? 'none: no proven lower bound' : 'none: rank 1 needs no floor',
  ]);
  const head = ['partition', 'proven lower bound', 'minimum'];
  const widths = head.map((h, c) => Math.max(h.length, ...rows.map((r) => r[c]!.length)));
  const row = (cells: string[]) => cells.map((cell, c) => (c === cells.length - 1 ? cell : cell.padEnd(widths[c]!))).join('  ').trimEnd();
  lines.push(row(head), ...rows.map(row));
  if (o.policy) lines.push('', ...policyWriteLines(o.policy));
  lines.push('', 'Only proven lower bounds are ratcheted: an upper bound is not a capacity the config is known to have.');
  return lines.join('\n') + '\n';
}
