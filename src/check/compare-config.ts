/**
 * One config under one policy: the head version evaluated, and when a base revision is compared,
 * the base version (at the same path, or at the path a rename came from) evaluated too, with the
 * change in bits per requirement, the drop limit, the changed fields on the new minimal cut and the
 * widths that would bring a failing drop back within the limit.
 */
import type { Diagnostic } from '../diagnostic.js';
import { loadConfigText } from '../config/load-config.js';
import type { Model } from '../config/model.js';
import { diffModels, type FieldChange } from '../config/model-diff.js';
import type { FileRead } from '../files/file-read.js';
import type { Policy, Requirement } from '../policy/policy.js';
import { evaluatePolicy, type PolicyResult, type RequirementResult } from '../policy/evaluate.js';
import { searchFixes } from '../policy/fix-search.js';
import { refusalDiagnostic } from './input-errors.js';
import type { CheckedConfig, RequirementDelta } from './run-check.js';

export interface ConfigSides {
  readonly head: (rel: string) => FileRead;
  /** Absent when nothing is compared. */
  readonly base?: (rel: string) => FileRead;
}

/**
 * `basePath` is where the base version lives (the path itself, or a rename's source), undefined
 * when the base has none. Problems go to `errors`; undefined means the pair could not be checked.
 */
export function compareConfig(path: string, basePath: string | undefined, file: string, policy: Policy, sides: ConfigSides, errors: Diagnostic[]): CheckedConfig | undefined {
  const head = sides.head(path);
  if (head.kind === 'refused') {
    errors.push(refusalDiagnostic(head, file, 'config'));
    return undefined;
  }
  if (head.kind === 'absent') {
    errors.push({ code: 'config/unreadable', message: 'cannot read the config file: it does not exist', file, severity: 'error' });
    return undefined;
  }
  const model = load(head.text, file, policy, errors);
  if (!model) return undefined;
  const evaluated = evaluatePolicy(model, policy);
  if (!evaluated.ok) {
    errors.push(...evaluated.diagnostics);
    return undefined;
  }
  const result = evaluated.result;
  const plain = { file, path, policy, result, changes: [], failing: result.verdict === 'fail' };
  if (!sides.base) return { ...plain, comparison: 'none' };
  if (basePath === undefined) return { ...plain, comparison: 'new' };
  const base = sides.base(basePath);
  if (base.kind === 'refused') {
    // A base version that cannot be read is never taken for "no base": the drop check would be skipped.
    errors.push(refusalDiagnostic(base, file, 'config'));
    return undefined;
  }
  if (base.kind === 'absent') return { ...plain, comparison: 'new' };
  const renamed = basePath !== path ? { renamedFrom: basePath } : {};
  // A base config that no longer loads (under today's rules) is compared with nothing.
  const baseModel = load(base.text, file, policy, []);
  const baseEval = baseModel ? evaluatePolicy(baseModel, policy, { fixes: false }) : undefined;
  if (!baseModel || !baseEval || !baseEval.ok) return { ...plain, ...renamed, comparison: 'new' };
  const changes = diffModels(baseModel, model);
  const deltas = result.requirements.map((q) => delta(q, baseEval.result, policy, changes, model));
  const failing = result.verdict === 'fail' || deltas.some((d) => d.dropFails);
  return { file, path, policy, result, ...renamed, comparison: 'compared', deltas, changes, failing };
}

function load(text: string, file: string, policy: Policy, errors: Diagnostic[]): Model | undefined {
  const loaded = loadConfigText(text, file, policy.modelPath === undefined ? {} : { modelPath: policy.modelPath });
  if (!loaded.ok) {
    errors.push(...loaded.diagnostics);
    return undefined;
  }
  return loaded.model;
}

function delta(q: RequirementResult, base: PolicyResult, policy: Policy, changes: readonly FieldChange[], head: Model): RequirementDelta {
  const b = base.requirements.find((x) => x.requirement.partition === q.requirement.partition);
  const maxDropBits = maxDrop(q.requirement, policy);
  const cutLayers = new Set(q.bounds.upper.cut.map((c) => c.layer));
  const attributed = changes.filter((c) => cutLayers.has(c.layer));
  if (!b) return { base: null, changeBits: null, maxDropBits, dropFails: false, attributed, fixes: [] };
  const changeBits = q.bounds.upper.log2 - b.bounds.upper.log2;
  // Exact: a drop of more than k bits means base > head · 2^k; fractional limits compare in log2.
  const limit = maxDropBits;
  const dropFails =
    limit !== undefined &&
    (Number.isInteger(limit) ? b.bounds.upper.rank > q.bounds.upper.rank << BigInt(limit) : -changeBits > limit + 1e-9);
  // A drop within k bits needs head ≥ ⌈base / 2^k⌉; the fix search finds the widths that reach it.
  const fixes =
    dropFails && !q.failing && head.kind === 'layered' && limit !== undefined && Number.isInteger(limit)
      ? searchFixes(head, q.partition, (b.bounds.upper.rank + (1n << BigInt(limit)) - 1n) >> BigInt(limit), 'warn', policy.surrogate, cutLayers)
      : [];
  return { base: { upper: b.bounds.upper, lower: b.bounds.lower }, changeBits, maxDropBits, dropFails, attributed, fixes };
}

function maxDrop(r: Requirement, p: Policy): number | undefined {
  return r.maxDropBits ?? p.maxDropBits;
}
