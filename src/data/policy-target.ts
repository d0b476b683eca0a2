/**
 * The policy a command reads partitions from and writes minimums to. An existing file is loaded
 * with the policy loader (extends resolved), so its named partitions, its requirements and the
 * minimums it already enforces are known; a missing file is fine when it is about to be created.
 */
import { existsSync, lstatSync, readFileSync } from 'node:fs';
import { basename, extname } from 'node:path';
import type { Diagnostic, Span } from '../diagnostic.js';
import { loadPolicyFile, loadPolicyText } from '../policy/load-policy.js';
import type { Policy } from '../policy/policy.js';
import { partitionKey, writeMinimums, type Minimum, type MinimumChange, type NewPolicy } from './policy-update.js';
import { writeFileAtomic } from './write-atomic.js';

export type PolicyTarget = { readonly file: string; readonly policy: Policy; readonly text: string } | { readonly file: string; readonly policy: undefined };

export function openPolicyTarget(file: string, repoRoot: string, mayCreate: boolean): { ok: true; target: PolicyTarget } | { ok: false; diagnostics: Diagnostic[] } {
  if (mayCreate && isSymbolicLink(file)) {
    return { ok: false, diagnostics: [{ code: 'policy/symlink', message: 'the policy file is a symbolic link; give the path of the file it points to', file, severity: 'error' }] };
  }
  if (!existsSync(file)) {
    if (mayCreate) return { ok: true, target: { file, policy: undefined } };
    return { ok: false, diagnostics: [{ code: 'policy/unreadable', message: 'the policy file does not exist (add --write to create it)', file, severity: 'error' }] };
  }
  const loaded = loadPolicyFile(file, { repoRoot });
  if (!loaded.ok) return { ok: false, diagnostics: loaded.diagnostics };
  return { ok: true, target: { file, policy: loaded.policy, text: readFileSync(file, 'utf8') } };
}

/**
 * Partitions a policy names: its named partitions (name → spec, by name), then the built-in specs
 * its requirements use; each with the place that names it.
 */
export function policyPartitions(policy: Policy | undefined): PolicyPartition[] {
  if (!policy) return [];
  const out: PolicyPartition[] = [];
  for (const named of [...policy.partitions.values()].sort((a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : 0))) {
    out.push({ label: named.name, spec: named.spec, file: named.file, span: named.span });
  }
  for (const r of policy.requirements) if (!policy.partitions.has(r.partition)) out.push({ label: r.partition, spec: r.partition, file: r.file, span: r.span });
  return out;
}

export interface PolicyPartition {
  readonly label: string;
  readonly spec: string;
  readonly file: string;
  readonly span: Span;
}

export interface PolicyWrite {
  readonly file: string;
  /** False when nothing was added or raised: the file is then left as it was (or not created). */
  readonly written: boolean;
  readonly created: boolean;
  readonly changes: readonly MinimumChange[];
}

/**
 * Writes the minimums into the target (atomically) after checking that the result loads with the
 * policy loader; a result that does not load is a bug and throws before anything is written.
 */
export function writePolicy(target: PolicyTarget, fresh: NewPolicy, minimums: readonly Minimum[], repoRoot: string): PolicyWrite {
  const existing = target.policy
    ? { text: target.text, effective: new Map(target.policy.requirements.map((r) => [partitionKey(r.partition), r.minRank] as const)) }
    : undefined;
  const { text, changes } = writeMinimums(existing, fresh, minimums);
  if (!changes.some((c) => c.action !== 'kept')) return { file: target.file, written: false, created: false, changes };
  const check = loadPolicyText(text, target.file, { repoRoot });
  if (!check.ok) throw new Error(`the policy written for ${target.file} does not load: ${check.diagnostics.map((d) => d.message).join('; ')}`);
  writeFileAtomic(target.file, text);
  return { file: target.file, written: true, created: !existing, changes };
}

/** A policy id from a file name: `Digits Policy.yaml` → `digits-policy`. */
export function idFromFile(file: string): string {
  const stem = basename(file, extname(file))
    .toLowerCase()
    .replace(/[^a-z0-9._-]+/g, '-')
    .replace(/^[^a-z0-9]+/, '')
    .replace(/-+$/, '');
  return stem === '' ? 'measured' : stem;
}

function isSymbolicLink(file: string): boolean {
  try {
    return lstatSync(file).isSymbolicLink();
  } catch {
    return false;
  }
}
