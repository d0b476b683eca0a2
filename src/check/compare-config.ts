/**
 * One config under one policy: the head version evaluated, and when a base revision is compared,
 * the base version (at the same path, or at the path a rename came from) evaluated too, with the
 * change in bits per requirement, the drop limit, the changed fields on the new minimal cut and the
 * widths that would bring a failing drop back within the limit. The two halves are separate steps
 * so that the base versions can be evaluated all together, beside the heads (see base-evaluation.ts).
 */
import type { Diagnostic } from '../diagnostic.js';
import { loadConfigText } from '../config/load-config.js';
import type { Model } from '../config/model.js';
import type { DefinitionSource } from '../config/definition-source.js';
import type { ParameterSpace } from '../config/parameter-space.js';
import { widthSources } from '../config/width-sources.js';
import { diffModels, type FieldChange } from '../config/model-diff.js';
import type { FileRead } from '../files/file-read.js';
import { maxDropBitsOf, type Policy } from '../policy/policy.js';
import type { Bound } from '../cut/types.js';
import { evaluatePolicy, type PolicyResult, type RequirementResult } from '../policy/evaluate.js';
import { searchFixes } from '../policy/fix-search.js';
import type { BaseAnswer } from './base-evaluation.js';
import { refusalDiagnostic } from './input-errors.js';
import type { CheckedConfig, DropKind, RequirementDelta } from './run-check.js';

export interface EvaluatedHead {
  readonly path: string;
  readonly file: string;
  readonly policy: Policy;
  readonly text: string;
  readonly model: Model;
  readonly result: PolicyResult;
  /** For a config built from an architecture definition: its parameters, for the fixes of a failing drop. */
  readonly parameters?: ParameterSpace;
}

/** The head half; problems go to `errors` and give undefined. `definitions`: where the head reads architecture definitions. */
export function evaluateHead(path: string, file: string, policy: Policy, head: FileRead, errors: Diagnostic[], definitions?: DefinitionSource): EvaluatedHead | undefined {
  if (head.kind === 'refused') {
    errors.push(refusalDiagnostic(head, file, 'config'));
    return undefined;
  }
  if (head.kind === 'absent') {
    errors.push({ code: 'config/unreadable', message: 'cannot read the config file: it does not exist', file, severity: 'error' });
    return undefined;
  }
  const loaded = loadConfig(head.text, file, policy, errors, definitions ? { definitions, configPath: path } : undefined);
  if (!loaded) return undefined;
  const { model, parameters } = loaded;
  const evaluated = evaluatePolicy(model, policy, parameters ? { parameters } : {});
  if (!evaluated.ok) {
    errors.push(...evaluated.diagnostics);
    return undefined;
  }
  return { path, file, policy, text: head.text, model, result: evaluated.result, ...(parameters ? { parameters } : {}) };
}

/**
 * The comparison of an evaluated head with its base. `base` is undefined when nothing is compared,
 * `basePath` when the base has no version; `answer` is the base's evaluation (undefined when the
 * base version does not load under today's rules, which compares the head with nothing).
 */
export function compareWithBase(
  head: EvaluatedHead,
  base: { readonly basePath: string | undefined; readonly read: FileRead | undefined; readonly answer: BaseAnswer | undefined } | undefined,
  errors: Diagnostic[],
): CheckedConfig | undefined {
  const { path, file, policy, model, result } = head;
  const architecture = model.kind === 'layered' && model.architecture ? { architecture: model.architecture } : {};
  const plain = { file, path, policy, result, model, ...architecture, changes: [], failing: result.verdict === 'fail' };
  if (!base) return { ...plain, comparison: 'none' };
  if (base.basePath === undefined || base.read === undefined || base.read.kind === 'absent') return { ...plain, comparison: 'new' };
  if (base.read.kind === 'refused') {
    // A base version that cannot be read is never taken for "no base": the drop check would be skipped.
    errors.push(refusalDiagnostic(base.read, file, 'config'));
    return undefined;
  }
  const renamed = base.basePath !== path ? { renamedFrom: base.basePath } : {};
  if (!base.answer) return { ...plain, ...renamed, comparison: 'new' };
  const changes = diffModels(base.answer.model, model);
  const deltas = result.requirements.map((q) => delta(q, base.answer!.result, policy, changes, model, head.parameters));
  const failing = result.verdict === 'fail' || deltas.some((d) => d.dropFails);
  return { file, path, policy, result, model, ...architecture, ...renamed, comparison: 'compared', deltas, changes, failing };
}

/** `where`: the definitions and the config's root-relative path, for a config that names an architecture. */
export function loadConfig(
  text: string,
  file: string,
  policy: Policy,
  errors: Diagnostic[],
  where?: { readonly definitions: DefinitionSource; readonly configPath: string },
): { readonly model: Model; readonly parameters?: ParameterSpace } | undefined {
  const loaded = loadConfigText(text, file, { ...(policy.modelPath === undefined ? {} : { modelPath: policy.modelPath }), ...where });
  if (!loaded.ok) {
    errors.push(...loaded.diagnostics);
    return undefined;
  }
  return loaded.parameters ? { model: loaded.model, parameters: loaded.parameters } : { model: loaded.model };
}

/**
 * The changes on the head's minimal cut: a field of a layer whose width a cut bond carries
 * (`widthSources`), or a parameter that changed one, its effects there listed first. When none is
 * on the cut but the requirement lost capacity and every change is a parameter's (the definition
 * and the rest of the config are the same on both sides), those parameters made the whole
 * difference, and they are the change to look at.
 */
function onTheCut(changes: readonly FieldChange[], head: Model, cutLayers: ReadonlySet<number | string>, lost: boolean): FieldChange[] {
  const on = head.kind === 'layered' ? widthSources(head, cutLayers) : cutLayers;
  const first = (c: FieldChange): FieldChange => (c.effects ? { ...c, effects: [...c.effects].sort((a, b) => Number(on.has(b.layer)) - Number(on.has(a.layer))) } : c);
  const hit = changes.filter((c) => on.has(c.layer) || c.effects?.some((e) => on.has(e.layer)) === true).map(first);
  if (hit.length > 0 || !lost || changes.length === 0 || changes.some((c) => c.layer !== 'parameter')) return hit;
  return changes.filter((c) => (c.effects?.length ?? 0) > 0).map(first);
}

function delta(q: RequirementResult, base: PolicyResult, policy: Policy, changes: readonly FieldChange[], head: Model, parameters: ParameterSpace | undefined): RequirementDelta {
  const b = base.requirements.find((x) => x.requirement.partition === q.requirement.partition);
  const maxDropBits = maxDropBitsOf(q.requirement, policy);
  const cutLayers = new Set(q.bounds.upper.cut.map((c) => c.layer));
  if (!b) return { base: null, changeBits: null, maxDropBits, drop: 'none', dropFails: false, attributed: onTheCut(changes, head, cutLayers, false), fixes: [] };
  const changeBits = q.bounds.upper.log2 - b.bounds.upper.log2;
  const attributed = onTheCut(changes, head, cutLayers, q.bounds.upper.log2 < b.bounds.upper.log2);
  const limit = maxDropBits;
  const drop: DropKind =
    limit === undefined
      ? 'none'
      : b.bounds.lower !== null && exceedsBy(b.bounds.lower, q.bounds.upper, limit)
        ? 'proven'
        : exceedsBy(b.bounds.upper, q.bounds.upper, limit)
          ? 'possible'
          : 'none';
  const dropFails = drop === 'proven' || (drop === 'possible' && q.requirement.unproven === 'fail');
  // No drop of more than k bits needs head ≥ ⌈base / 2^k⌉: for a proven drop, the upper bound's
  // (the check then no longer flags it); for a possible one, the lower bound's (it is then proven
  // that nothing dropped). A bound beyond the bit limit gives no exact target.
  const fixes =
    dropFails && !q.failing && head.kind === 'layered' && limit !== undefined && Number.isInteger(limit) && !b.bounds.upper.huge
      ? searchFixes(head, q.partition, (b.bounds.upper.rank + (1n << BigInt(limit)) - 1n) >> BigInt(limit), drop === 'proven' ? 'warn' : 'fail', policy.surrogate, cutLayers, parameters)
      : [];
  return { base: { upper: b.bounds.upper, lower: b.bounds.lower }, changeBits, maxDropBits, drop, dropFails, attributed, fixes };
}

/**
 * a > c · 2^k: exact on integers for an integer k; by log2 for a fractional k or a bound beyond
 * the bit limit (known by its log2 only), where only a difference larger than the rounding of
 * the log2 values (10^-9 of their size) counts.
 */
export function exceedsBy(a: Bound, c: Bound, k: number): boolean {
  if (!a.huge && !c.huge && Number.isInteger(k)) return a.rank > c.rank << BigInt(k);
  return a.log2 - c.log2 > k + 1e-9 * Math.max(1, a.log2, c.log2);
}
