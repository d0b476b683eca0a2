/**
 * How a policy combines with the policy it extends. Settings are the child's when it gives them,
 * else the parent's; named partitions are merged, a child's definition replacing the parent's of
 * the same name; requirements are the parent's, except that a child's requirement for the same
 * partition takes the parent's place, followed by the child's new ones in file order. Defaults
 * (tree surrogate, `unproven: warn`, `removal: warn`, no applies_to) and the per-requirement settings are filled
 * in only once, for the policy at the start of the chain: a requirement inherited from a parent
 * follows the settings of the policy that inherits it, unless it sets its own.
 */
import type { Span } from '../diagnostic.js';
import type { Surrogate } from '../cut/types.js';
import type { PolicyDocument } from './policy-document.js';
import type { DraftRequirement } from './requirements.js';
import type { NamedPartition, Policy, Requirement, UnprovenMode } from './policy.js';

/** A policy merged with its parents, settings still optional. */
export interface PolicyDraft {
  readonly id: string;
  readonly description: string;
  readonly file: string;
  readonly span: Span;
  readonly surrogate?: Surrogate;
  readonly modelPath?: string;
  readonly appliesTo?: readonly string[];
  readonly unproven?: UnprovenMode;
  readonly maxDropBits?: number;
  readonly removal?: UnprovenMode;
  readonly partitions: ReadonlyMap<string, NamedPartition>;
  readonly requirements: readonly DraftRequirement[];
  readonly chain: readonly string[];
}

export function mergePolicy(own: PolicyDocument & { readonly id: string; readonly description: string }, parent: PolicyDraft | undefined): PolicyDraft {
  const partitions = new Map(parent?.partitions ?? []);
  for (const [name, p] of own.partitions) partitions.set(name, p);
  const ownByKey = new Map(own.requirements.map((r) => [r.key, r]));
  const inherited = (parent?.requirements ?? []).map((r) => ownByKey.get(r.key) ?? r);
  const inheritedKeys = new Set(inherited.map((r) => r.key));
  const requirements = [...inherited, ...own.requirements.filter((r) => !inheritedKeys.has(r.key))];
  const surrogate = own.surrogate ?? parent?.surrogate;
  const modelPath = own.modelPath ?? parent?.modelPath;
  const appliesTo = own.appliesTo ?? parent?.appliesTo;
  const unproven = own.unproven ?? parent?.unproven;
  const maxDropBits = own.maxDropBits ?? parent?.maxDropBits;
  const removal = own.removal ?? parent?.removal;
  return {
    id: own.id,
    description: own.description,
    file: own.file,
    span: own.span,
    ...(surrogate !== undefined ? { surrogate } : {}),
    ...(modelPath !== undefined ? { modelPath } : {}),
    ...(appliesTo !== undefined ? { appliesTo } : {}),
    ...(unproven !== undefined ? { unproven } : {}),
    ...(maxDropBits !== undefined ? { maxDropBits } : {}),
    ...(removal !== undefined ? { removal } : {}),
    partitions,
    requirements,
    chain: [own.file, ...(parent?.chain ?? [])],
  };
}

export function finalisePolicy(draft: PolicyDraft): Policy {
  const unproven = draft.unproven ?? 'warn';
  const requirements = draft.requirements.map((r): Requirement => {
    const maxDropBits = r.maxDropBits ?? draft.maxDropBits;
    return {
      partition: r.partition,
      minRank: r.minRank,
      written: r.written,
      unproven: r.unproven ?? unproven,
      ...(maxDropBits !== undefined ? { maxDropBits } : {}),
      file: r.file,
      span: r.span,
    };
  });
  return {
    id: draft.id,
    description: draft.description,
    file: draft.file,
    surrogate: draft.surrogate ?? 'tree',
    ...(draft.modelPath !== undefined ? { modelPath: draft.modelPath } : {}),
    appliesTo: draft.appliesTo ?? [],
    partitions: draft.partitions,
    requirements,
    unproven,
    ...(draft.maxDropBits !== undefined ? { maxDropBits: draft.maxDropBits } : {}),
    removal: draft.removal ?? 'warn',
    chain: draft.chain,
    span: draft.span,
  };
}
