/**
 * `rankfloor measure` for people (a table per partition, the sampling facts, the cautions) and
 * for programs (one JSON document, keys in a fixed order, numbers rounded to 4 decimals).
 */
import type { MeasureOutcome } from './measure-job.js';
import { featureMapText } from './measure-job.js';
import type { PartitionMeasurement } from './measure.js';
import type { Recommendation } from './recommend.js';
import type { PolicyWrite } from './policy-target.js';

const round = (x: number): number => Math.round(x * 1e4) / 1e4;

export function measureJson(o: MeasureOutcome): string {
  const { data, measurement: m } = o;
  const doc = {
    version: 1,
    data: {
      file: data.file,
      format: data.format,
      samples: data.count,
      shape: data.shape,
      kind: data.kind,
      channels: data.channels,
      range: data.range ? [data.range.lo, data.range.hi] : null,
      vocabulary: data.vocabulary ?? null,
      modified: data.modified,
      classes: data.classes ?? null,
    },
    method: {
      feature_map: data.kind === 'tokens' ? 'indicator' : 'cos-sin',
      weighting: m.weighting,
      samples: m.samples,
      batches: m.batches,
      batch_size: m.batchSizes,
      epsilon: m.epsilon,
    },
    partitions: m.partitions.map((p, i) => {
      const r = o.recommendations[i]!;
      return {
        partition: p.partition,
        description: p.description,
        bits: round(p.bits),
        spread: p.spread === undefined ? null : round(p.spread),
        saturated: p.saturated !== undefined,
        saturation: p.saturated ?? null,
        ceiling_bits: round(p.ceilingBits),
        half_batch_bits: round(p.halfBits),
        epsilon_rank: round(p.epsilonRank),
        samples: m.samples,
        class: p.class ?? null,
        recommended: r.minRank === null ? null : r.minRank.toString(),
        reason: r.minRank === null ? r.reason : null,
      };
    }),
    policy: o.policy ? policyJson(o.policy) : null,
  };
  return JSON.stringify(doc, null, 2) + '\n';
}

export function policyJson(w: PolicyWrite): { file: string; written: boolean; created: boolean; changes: { partition: string; action: string; min_rank: string; previous: string | null }[] } {
  return {
    file: w.file,
    written: w.written,
    created: w.created,
    changes: w.changes.map((c) => ({ partition: c.partition, action: c.action, min_rank: c.minRank.toString(), previous: c.action === 'added' ? null : c.previous.toString() })),
  };
}

export function measureText(o: MeasureOutcome): string {
  const { data, measurement: m } = o;
  const lines: string[] = [];
  const scale = data.range ? `, values scaled from [${data.range.lo}, ${data.range.hi}]` : '';
  const channels = data.channels > 1 ? ` × ${data.channels} channels` : '';
  lines.push(`${data.file}: ${data.count} samples (${data.format}, dated ${data.modified}), positions [${data.shape.join(', ')}]${channels}${scale}`);
  const [lo, hi] = m.batchSizes;
  const used = m.samples < data.count ? `${m.samples} of them ` : '';
  lines.push(`measured ${used}in ${m.batches} batch${m.batches === 1 ? '' : 'es'} of ${lo === hi ? lo : `${lo}-${hi}`} (no batch can show more than ${Math.log2(lo).toFixed(1)} bits)`);
  const weighting =
    m.weighting === 'none' ? 'unlabelled' : m.weighting === 'two-class' ? 'label-weighted, two classes (±1)' : `label-weighted, ${m.classes} classes (each against the rest; the largest is shown)`;
  lines.push(`entanglement entropy of the empirical data tensor: ${featureMapText(data)}, ${weighting}, ε = ${m.epsilon}`);
  lines.push('');
  const rows = m.partitions.map((p, i) => [p.partition, bitsText(p), String(Math.ceil(p.epsilonRank)), recommendationText(o.recommendations[i]!)]);
  const head = ['partition', 'measured bits', 'ε-rank', 'recommended minimum'];
  const widths = head.map((h, c) => Math.max(h.length, ...rows.map((r) => r[c]!.length)));
  const row = (cells: string[]): string => cells.map((cell, c) => (c === cells.length - 1 ? cell : cell.padEnd(widths[c]!))).join('  ').trimEnd();
  lines.push(row(head));
  for (const r of rows) lines.push(row(r));
  const notes = m.partitions.flatMap((p, i) => noteFor(p, o.recommendations[i]!));
  if (notes.length > 0) lines.push('', ...notes);
  if (o.policy) lines.push('', ...policyWriteLines(o.policy));
  lines.push('');
  lines.push('A measured dependency is a property of this sample; a recommended minimum is a necessary');
  lines.push('condition only (a model below it cannot represent the data across the partition). Review');
  lines.push('each minimum before committing it.');
  return lines.join('\n') + '\n';
}

function bitsText(p: PartitionMeasurement): string {
  const spread = p.spread === undefined ? '' : ` ± ${p.spread.toFixed(2)}`;
  return `${p.bits.toFixed(2)}${spread}${p.saturated ? ' (saturated)' : ''}`;
}

function recommendationText(r: Recommendation): string {
  if (r.minRank !== null) return `min_rank ${r.minRank} (${r.bits.toFixed(2)} bits)`;
  return r.reason === 'saturated' ? 'none: saturated' : r.reason === 'one-batch' ? 'none: one batch, no spread' : 'none: no dependency';
}

function noteFor(p: PartitionMeasurement, r: Recommendation): string[] {
  if (p.saturated === 'ceiling') {
    return [`${p.partition}: saturated: ${p.bits.toFixed(2)} bits is within 1 bit of the ${p.ceilingBits.toFixed(1)}-bit ceiling of a batch; more samples per batch (--batch) are needed.`];
  }
  if (p.saturated === 'growing') {
    return [`${p.partition}: saturated: it grows from ${p.halfBits.toFixed(2)} bits on half batches to ${p.bits.toFixed(2)} on whole batches; more samples per batch (--batch) are needed.`];
  }
  if (r.minRank === null && r.reason === 'one-batch') return [`${p.partition}: one batch gives no spread; measure more samples than one batch.`];
  return [];
}

/** What a write did to the policy, for the text reports of both commands. */
export function policyWriteLines(w: PolicyWrite): string[] {
  const count = (a: string) => w.changes.filter((c) => c.action === a).length;
  const tally = `${count('added')} added, ${count('raised')} raised, ${count('kept')} kept (an existing minimum is never lowered)`;
  const lines = [w.written ? `${w.created ? 'created' : 'updated'} ${w.file}: ${tally}` : `${w.file} left as it was: ${w.changes.length === 0 ? 'no minimum to write' : tally}`];
  for (const c of w.changes) {
    if (c.action === 'added') lines.push(`  ${c.partition}: min_rank ${c.minRank}`);
    else if (c.action === 'raised') lines.push(`  ${c.partition}: min_rank ${c.previous} → ${c.minRank}`);
    else lines.push(`  ${c.partition}: kept ${c.previous} (this evidence gives ${c.minRank})`);
  }
  return lines;
}
