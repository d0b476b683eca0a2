/**
 * Typed reads from the located tree that tolerate malformed input: they return undefined for a
 * value of the wrong shape, because the schema has already reported it, so the semantic checks
 * can still run over the rest of the model and report everything in one pass.
 */
import type { Span } from '../diagnostic.js';
import { fieldOf, type Located, type LocatedMap } from './located-value.js';

export function asMap(node: Located | undefined): LocatedMap | undefined {
  return node?.kind === 'map' ? node : undefined;
}

export function positiveIntegerOf(node: Located | undefined): number | undefined {
  return node?.kind === 'scalar' && typeof node.value === 'number' && Number.isSafeInteger(node.value) && node.value >= 1 ? node.value : undefined;
}

export function nonNegativeIntegerOf(node: Located | undefined): number | undefined {
  return node?.kind === 'scalar' && typeof node.value === 'number' && Number.isSafeInteger(node.value) && node.value >= 0 ? node.value : undefined;
}

export function stringOf(node: Located | undefined): string | undefined {
  return node?.kind === 'scalar' && typeof node.value === 'string' ? node.value : undefined;
}

export function booleanOf(node: Located | undefined): boolean | undefined {
  return node?.kind === 'scalar' && typeof node.value === 'boolean' ? node.value : undefined;
}

/** A list of positive integers, or undefined if it is not one. */
export function positiveIntegerListOf(node: Located | undefined): number[] | undefined {
  if (node?.kind !== 'seq') return undefined;
  const out: number[] = [];
  for (const item of node.items) {
    const n = positiveIntegerOf(item);
    if (n === undefined) return undefined;
    out.push(n);
  }
  return out;
}

/** The value spans of the given canonical fields that are present. */
export function fieldSpansOf(body: LocatedMap, fields: readonly string[]): Record<string, Span> {
  const out: Record<string, Span> = {};
  for (const f of fields) {
    const v = fieldOf(body, f);
    if (v) out[f] = v.span;
  }
  return out;
}
