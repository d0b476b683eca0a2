/**
 * The parameters of a config that names an architecture definition, as a space a fix can search:
 * each number parameter, and each entry of a list parameter, with its current value, the range
 * the judging side declares and its step; and the model made again with one of them changed. The
 * search itself (`policy/parameter-fixes.ts`) knows nothing of definitions.
 */
import type { Span } from '../diagnostic.js';
import { DefinitionSink } from './definition-document.js';
import type { Exact } from './exact-number.js';
import { makeModel, type ArchitectureInstance, type ModelFromTree } from './load-architecture.js';
import type { LayeredModel } from './model.js';

export interface ParameterChoice {
  /** `width`, or `stages[2]` for one entry of a list. */
  readonly label: string;
  readonly name: string;
  /** The entry of a list parameter. */
  readonly index?: number;
  readonly value: Exact;
  /** Inclusive range, as the judging side declares it. */
  readonly min: Exact;
  readonly max: Exact;
  /** Fixes propose multiples of this. */
  readonly step: Exact;
  /** Where a fix edits: the config's value, or its `architecture` value when the default is used. */
  readonly span: Span;
  /** The config sets it (else the fix adds it). */
  readonly set: boolean;
}

export interface ParameterSpace {
  readonly choices: readonly ParameterChoice[];
  /** The model with one choice at `value`, or undefined when the definition makes no model with it. */
  withValue(choice: ParameterChoice, value: Exact): LayeredModel | undefined;
}

export function parameterSpace(instance: ArchitectureInstance, read: ModelFromTree): ParameterSpace {
  const choices: ParameterChoice[] = [];
  for (const decl of instance.definition.parameters.values()) {
    const judged = instance.judged.get(decl.name) ?? decl;
    const b = instance.bindings.get(decl.name)!;
    const common = { name: decl.name, min: judged.min, max: judged.max, step: decl.step };
    if (Array.isArray(b.value)) {
      (b.value as readonly Exact[]).forEach((value, index) => {
        choices.push({ ...common, label: `${decl.name}[${index}]`, index, value, span: b.itemSpans?.[index] ?? b.span ?? instance.span, set: b.span !== undefined });
      });
    } else choices.push({ ...common, label: decl.name, value: b.value as Exact, span: b.span ?? instance.span, set: b.span !== undefined });
  }
  return {
    choices,
    withValue(choice, value) {
      const old = instance.bindings.get(choice.name)!;
      const next = choice.index === undefined ? value : (old.value as readonly Exact[]).map((v, i) => (i === choice.index ? value : v));
      const bindings = new Map(instance.bindings);
      bindings.set(choice.name, { ...old, value: next });
      return makeModel({ ...instance, bindings }, read, new DefinitionSink(instance.definition.file));
    },
  };
}
