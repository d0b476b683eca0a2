/**
 * A team's capacity policy after loading: `extends` resolved (child requirements replace the
 * parent's for the same partition), named partitions collected, minimums as exact integers.
 * Everything keeps the span it came from, so verdicts and errors can point at the policy line.
 */
import type { Span } from '../diagnostic.js';
import type { Surrogate } from '../cut/types.js';

export type UnprovenMode = 'warn' | 'fail';

export interface Requirement {
  /** A built-in partition spec (`left-right`, `block:0-4,0-8`) or a name from `partitions`. */
  readonly partition: string;
  /** The minimum separation rank, exact. `min_bits: b` means ⌈2^b⌉. */
  readonly minRank: bigint;
  /** How the minimum was written (`min_rank: 2^40`, `min_bits: 12`), for reports. */
  readonly written: string;
  readonly unproven: UnprovenMode;
  /** Largest allowed drop in bits against the base revision (used by `--base`). */
  readonly maxDropBits?: number;
  /** The policy file that declared this requirement (a parent's, when inherited) and its span. */
  readonly file: string;
  readonly span: Span;
}

export interface NamedPartition {
  readonly name: string;
  /** Equivalent spec string for resolvePartition, e.g. `block:8-24,8-24`. */
  readonly spec: string;
  readonly file: string;
  readonly span: Span;
}

export interface Policy {
  readonly id: string;
  readonly description: string;
  /** Path of the policy file as given (relative to the working directory or absolute). */
  readonly file: string;
  readonly surrogate: Surrogate;
  /** JSON Pointer to the architecture inside the configs it governs; default `/model`. */
  readonly modelPath?: string;
  /** Globs relative to the repository root (inherited from the parent when absent). */
  readonly appliesTo: readonly string[];
  readonly partitions: ReadonlyMap<string, NamedPartition>;
  readonly requirements: readonly Requirement[];
  readonly unproven: UnprovenMode;
  readonly maxDropBits?: number;
  /**
   * What a config this policy governs at the base revision counts as when a change deletes it,
   * renames it out of applies_to or to another extension: a warning (default) or a failure.
   */
  readonly removal: UnprovenMode;
  /** The files of the extends chain, this file first. */
  readonly chain: readonly string[];
  readonly span: Span;
}

/** The drop limit of a requirement: its own `max_drop_bits`, else its policy's (undefined: none). */
export function maxDropBitsOf(r: Requirement, p: Policy): number | undefined {
  return r.maxDropBits ?? p.maxDropBits;
}
