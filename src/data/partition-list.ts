/**
 * Which partitions a command measures or ratchets: the partitions given on the command line (or
 * the built-in ones that fit the shape), then the partitions a policy names. A policy's name
 * replaces a built-in spec it is made of (`organ-pair: {kind: left-right}` is measured once, as
 * `organ-pair`), so that a minimum is written under the team's name.
 */
import type { Shape } from '../config/model.js';
import type { Diagnostic } from '../diagnostic.js';
import { defaultPartitions, resolvePartition, type Partition } from '../partition/partition.js';
import type { Policy } from '../policy/policy.js';
import { partitionKey } from './policy-update.js';
import { policyPartitions } from './policy-target.js';

export interface LabelledPartition {
  /** What a requirement writes: the policy's name, or the spec. */
  readonly label: string;
  readonly partition: Partition;
}

export type PartitionListResult =
  | { ok: true; partitions: LabelledPartition[] }
  | { ok: false; usage: string }
  | { ok: false; diagnostics: Diagnostic[] };

export function partitionList(shape: Shape, given: readonly string[] | undefined, policy: Policy | undefined, shapeWhat: string): PartitionListResult {
  const out: { label: string; spec: string; partition: Partition }[] = [];
  for (const spec of given ?? defaultPartitions(shape)) {
    const r = resolvePartition(spec, shape);
    if (!r.ok) return { ok: false, usage: `--partition ${spec}: ${r.message}` };
    out.push({ label: spec.trim(), spec: partitionKey(spec), partition: r.partition });
  }
  const diagnostics: Diagnostic[] = [];
  for (const p of policyPartitions(policy)) {
    const r = resolvePartition(p.spec, shape);
    if (!r.ok) {
      diagnostics.push({
        code: 'data/partition-shape',
        message: `the policy's partition '${p.label}' does not fit ${shapeWhat} of shape [${shape.join(', ')}]: ${r.message}`,
        file: p.file,
        span: p.span,
        severity: 'error',
      });
      continue;
    }
    const key = partitionKey(p.spec);
    const same = out.find((o) => o.spec === key);
    if (same && same.label === same.spec) same.label = p.label;
    else if (!same) out.push({ label: p.label, spec: key, partition: r.partition });
  }
  if (diagnostics.length > 0) return { ok: false, diagnostics };
  return { ok: true, partitions: out.map((o) => ({ label: o.label, partition: { ...o.partition, label: o.label } })) };
}
