/**
 * Verdicts: one config against one policy. A requirement fails when the upper bound is below its
 * minimum (provably short), passes when the lower bound reaches it, and is unproven in between;
 * an unproven requirement counts as the policy says (`warn` or `fail`). Failing requirements get
 * the fixes that would restore them. Comparisons are exact integer comparisons.
 */
import type { Diagnostic } from '../diagnostic.js';
import type { Model } from '../config/model.js';
import type { ParameterSpace } from '../config/parameter-space.js';
import { resolvePartition, type Partition } from '../partition/partition.js';
import { computeBounds } from '../cut/bounds.js';
import type { PartitionBounds, Surrogate } from '../cut/types.js';
import { searchFixes, type Fix } from './fix-search.js';
import { maxDropBitsOf, type Policy, type Requirement } from './policy.js';

export type RequirementVerdict = 'pass' | 'fail' | 'unproven';

export interface RequirementResult {
  readonly requirement: Requirement;
  readonly partition: Partition;
  readonly bounds: PartitionBounds;
  readonly verdict: RequirementVerdict;
  /** Whether this requirement makes the check fail (a fail, or an unproven one counted as fail). */
  readonly failing: boolean;
  readonly fixes: readonly Fix[];
}

export interface PolicyResult {
  readonly file: string;
  readonly policy: Policy;
  readonly surrogate: Surrogate;
  readonly verdict: 'pass' | 'fail';
  readonly requirements: readonly RequirementResult[];
  readonly notes: readonly string[];
}

export type EvaluateOutcome = { ok: true; result: PolicyResult } | { ok: false; diagnostics: Diagnostic[] };

export interface EvaluateOptions {
  /** Search for fixes of failing requirements (default true). */
  readonly fixes?: boolean;
  /** A config built from an architecture definition: fixes search its parameters first. */
  readonly parameters?: ParameterSpace;
}

export function verdictOf(b: PartitionBounds, minRank: bigint): RequirementVerdict {
  if (b.upper.rank < minRank) return 'fail';
  if (b.lower !== null && b.lower.rank >= minRank) return 'pass';
  return 'unproven';
}

export function evaluatePolicy(model: Model, policy: Policy, options: EvaluateOptions = {}): EvaluateOutcome {
  const shape = model.kind === 'explicit' ? model.shape : model.input.shape;
  const partitions: Partition[] = [];
  const diagnostics: Diagnostic[] = [];
  for (const req of policy.requirements) {
    const spec = policy.partitions.get(req.partition)?.spec ?? req.partition;
    const r = resolvePartition(spec, shape);
    if (r.ok) partitions.push({ ...r.partition, label: req.partition });
    else {
      diagnostics.push({
        code: 'policy/partition-does-not-fit',
        message: `requirement on '${req.partition}' cannot be checked for ${model.file}: ${r.message}`,
        file: req.file,
        span: req.span,
        severity: 'error',
      });
    }
  }
  if (diagnostics.length > 0) return { ok: false, diagnostics };
  const surrogate = policy.surrogate;
  // The certified probe only has to prove each minimum (and runs only where the rules do not),
  // unless the requirement limits drops against a base: a proven drop needs the base's lower
  // bound as high as it goes, so there it runs towards the upper bound.
  const probeTargets = policy.requirements.map((r) => (maxDropBitsOf(r, policy) === undefined ? r.minRank : undefined));
  const outcome = computeBounds(model, partitions, { surrogate, probeTargets });
  if (!outcome.ok) return outcome;
  // Building the network once more per probe is the price of exact fixes; only failing
  // requirements of layered models pay it.
  const wantFixes = options.fixes ?? true;
  const requirements = policy.requirements.map((req, i): RequirementResult => {
    const bounds = outcome.result.partitions[i]!;
    const verdict = verdictOf(bounds, req.minRank);
    const failing = verdict === 'fail' || (verdict === 'unproven' && req.unproven === 'fail');
    const fixes =
      failing && wantFixes && model.kind === 'layered'
        ? searchFixes(model, partitions[i]!, req.minRank, req.unproven, surrogate, new Set(bounds.upper.cut.map((c) => c.layer)), options.parameters)
        : [];
    return { requirement: req, partition: partitions[i]!, bounds, verdict, failing, fixes };
  });
  return {
    ok: true,
    result: {
      file: model.file,
      policy,
      surrogate,
      verdict: requirements.some((r) => r.failing) ? 'fail' : 'pass',
      requirements,
      notes: outcome.result.notes,
    },
  };
}
