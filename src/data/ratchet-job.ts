/**
 * `rankfloor ratchet`: minimums from a blessed config instead of data. For each partition, the
 * config's proven lower bound (the engine's `lower`, never its upper bound) divided by 2^margin,
 * rounded up: a policy with these minimums fails any later change that provably loses more than
 * the margin of what this config has. A partition without a proven lower bound gets no minimum.
 */
import { statSync } from 'node:fs';
import { resolve } from 'node:path';
import { findRepoRoot, toRootRelative } from '../check/repo-files.js';
import { workTreeDefinitions } from '../config/definition-source.js';
import { loadConfigFile } from '../config/load-config.js';
import { computeBounds } from '../cut/bounds.js';
import { MAX_RANK_BITS, type Bound, type Surrogate } from '../cut/types.js';
import { MAX_MINIMUM_BITS } from '../policy/policy-limits.js';
import type { Diagnostic } from '../diagnostic.js';
import { partitionList } from './partition-list.js';
import { idFromFile, openPolicyTarget, writePolicy, type PolicyWrite } from './policy-target.js';
import type { Minimum } from './policy-update.js';

export interface RatchetRequest {
  readonly config: string;
  readonly modelPath?: string;
  readonly surrogate?: Surrogate;
  readonly partitions?: readonly string[];
  readonly policy?: string;
  readonly write: boolean;
  /** Whole bits, 0 or more. */
  readonly margin: number;
  readonly cwd: string;
  readonly root?: string;
}

export interface RatchetedPartition {
  readonly partition: string;
  readonly lower: Bound | null;
  readonly upper: Bound;
  readonly minRank: bigint | null;
  readonly reason: 'unproven' | 'trivial' | null;
}

export interface RatchetOutcome {
  readonly file: string;
  readonly modified: string;
  readonly surrogate: Surrogate;
  readonly margin: number;
  readonly partitions: readonly RatchetedPartition[];
  readonly policy?: PolicyWrite;
}

export type RatchetJobResult = { ok: true; outcome: RatchetOutcome } | { ok: false; diagnostics: Diagnostic[] } | { ok: false; usage: string };

export function runRatchet(req: RatchetRequest): RatchetJobResult {
  if (!Number.isSafeInteger(req.margin) || req.margin < 0) return { ok: false, usage: `--margin must be a whole number of bits, 0 or more (got ${req.margin})` };
  if (req.write && req.policy === undefined) return { ok: false, usage: '--write needs --policy FILE (the policy to create or update)' };
  const root = req.root ? resolve(req.cwd, req.root) : findRepoRoot(req.cwd);
  const opened = req.policy === undefined ? undefined : openPolicyTarget(req.policy, root, req.write);
  if (opened && !opened.ok) return opened;
  const policy = opened?.target.policy;
  if (policy && req.surrogate !== undefined && req.surrogate !== policy.surrogate) {
    return { ok: false, usage: `${policy.file} checks configs under the ${policy.surrogate} surrogate; its minimums must be ratcheted under the same one (--surrogate ${policy.surrogate})` };
  }
  const surrogate = req.surrogate ?? policy?.surrogate ?? 'tree';
  const modelPath = req.modelPath ?? policy?.modelPath;
  // A definition the config names is read from the same repository, links refused.
  const where = { definitions: workTreeDefinitions(root), configPath: toRootRelative(root, req.config) };
  const loaded = loadConfigFile(req.config, { ...(modelPath === undefined ? {} : { modelPath }), ...where });
  if (!loaded.ok) return loaded;
  const model = loaded.model;
  const shape = model.kind === 'explicit' ? model.shape : model.input.shape;
  const list = partitionList(shape, req.partitions, policy, "the config's input");
  if (!list.ok) return list;
  const bounds = computeBounds(model, list.partitions.map((p) => p.partition), { surrogate });
  if (!bounds.ok) return bounds;
  const shift = BigInt(req.margin);
  const partitions = bounds.result.partitions.map((b): RatchetedPartition => {
    if (!b.lower) return { partition: b.partition, lower: null, upper: b.upper, minRank: null, reason: 'unproven' };
    // A policy states minimums up to 2^MAX_MINIMUM_BITS; a larger floor is capped there (still
    // below the proven bound). A huge lower bound's rank is below the bound itself.
    const floor = (b.lower.rank + (1n << shift) - 1n) >> shift;
    const minRank = floor < LARGEST_MINIMUM ? floor : LARGEST_MINIMUM;
    return minRank <= 1n
      ? { partition: b.partition, lower: b.lower, upper: b.upper, minRank: null, reason: 'trivial' }
      : { partition: b.partition, lower: b.lower, upper: b.upper, minRank, reason: null };
  });
  const modified = statSync(req.config).mtime.toISOString().slice(0, 10);
  let written: PolicyWrite | undefined;
  if (req.write && opened?.ok) {
    const minimums: Minimum[] = partitions.flatMap((p) =>
      p.minRank === null
        ? []
        : [
            {
              partition: p.partition,
              minRank: p.minRank,
              evidence: [
                `Proven lower bound ${boundText(p.lower!)} (${p.lower!.method}) of ${req.config} (dated ${modified}) under the ${surrogate} surrogate,`,
                p.minRank === LARGEST_MINIMUM
                  ? `less a margin of ${req.margin} bit${req.margin === 1 ? '' : 's'}, capped at 2^${MAX_MINIMUM_BITS}, the largest minimum a policy states.`
                  : `less a margin of ${req.margin} bit${req.margin === 1 ? '' : 's'}: ⌈lower / 2^${req.margin}⌉.`,
                `Written by 'rankfloor ratchet' so that no later change loses what that config has; review before committing.`,
              ],
            },
          ],
    );
    written = writePolicy(
      opened.target,
      {
        id: idFromFile(opened.target.file),
        description: `Capacity floors ratcheted from ${req.config}.`,
        header: [
          `Minimums ratcheted from ${req.config} by 'rankfloor ratchet': its proven capacities less a margin.`,
          'Review every minimum before committing it; add applies_to (the configs this policy governs), or extend an organisation policy.',
        ],
        settings: { surrogate, ...(modelPath !== undefined ? { model_path: JSON.stringify(modelPath) } : {}) },
      },
      minimums,
      root,
    );
  }
  return { ok: true, outcome: { file: req.config, modified, surrogate, margin: req.margin, partitions, ...(written ? { policy: written } : {}) } };
}

/** `2^12` for powers of two, the digits otherwise (shortened past 40 digits). */
const LARGEST_MINIMUM = 1n << BigInt(MAX_MINIMUM_BITS);

/** A bound as text; a bound beyond the bit limit by its log2. */
export function boundText(b: Bound): string {
  return b.huge ? `more than 2^${MAX_RANK_BITS} (≈2^${b.log2.toFixed(1)})` : rankText(b.rank);
}

export function rankText(rank: bigint): string {
  const bits = rank.toString(2);
  if (/^10*$/.test(bits)) return `2^${bits.length - 1}`;
  const digits = rank.toString();
  return digits.length > 40 ? `${digits.slice(0, 12)}…(${digits.length} digits)` : digits;
}
