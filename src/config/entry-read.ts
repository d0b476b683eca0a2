/**
 * What every kind reader receives: the entry with its fields resolved, where it sits, and its
 * name; and the two steps most readers share (a required field, the shortcut pointwise layers).
 */
import type { Located } from './located-value.js';
import { displayPath } from './located-value.js';
import { readBoolean, readPositiveInteger, type ReadContext } from './field-readers.js';
import type { LayerEntry } from './layer-entry.js';
import type { LayerFields } from './layer-fields.js';
import type { MadeLayer, NameDef, Site, Template } from './layer-templates.js';
import { readShortcutFields } from './shortcut-fields.js';

/** One entry, its fields resolved, ready for its kind's reader. */
export interface EntryRead {
  readonly entry: LayerEntry;
  readonly fields: LayerFields;
  /** Path, span and field spans of the entry as a whole. */
  readonly site: Site;
  readonly name?: NameDef;
}

export interface ReaderContext extends ReadContext {
  /** Reads a nested list of layers (a block's path); `allowEmpty` for paths that may be the identity. */
  readList(node: Located, allowEmpty: boolean): Template[] | undefined;
  /**
   * Reads one path of a block: a list of layers (empty: the identity), nothing (the identity), or
   * a single layer entry.
   */
  readPath(node: Located): Template[] | undefined;
}

/** The entry's layers, followed by the pointwise layers of its shortcut fields when it has them. */
export function chainOf(r: EntryRead, ctx: ReadContext, layers: readonly MadeLayer[], shortcuts: boolean): Template | undefined {
  const after = shortcuts ? readShortcutFields(r.fields, ctx) : [];
  if (!after) return undefined;
  return { t: 'chain', layers: [...layers, ...after], ...(r.name ? { name: r.name } : {}) };
}

/** Reports a missing required field at the body and returns false. */
export function requireField(r: EntryRead, field: string, what: string, ctx: ReadContext): boolean {
  if (r.fields.has(field)) return true;
  if (r.fields.wasSuggested(field)) return false;
  ctx.sink.error('config/missing-field', `${displayPath(r.entry.body)} is missing '${field}' (${what})`, r.entry.body.span);
  return false;
}

/** An optional positive integer field: undefined when absent, false after an error. */
export function optionalPositive(r: EntryRead, field: string, ctx: ReadContext): number | undefined | false {
  const node = r.fields.get(field);
  if (!node) return undefined;
  return readPositiveInteger(node, ctx) ?? false;
}

/** `bias: false` is recorded for the parameter count; absent or true is the default. */
export function readBias(r: EntryRead, ctx: ReadContext): { bias?: false } | undefined {
  const node = r.fields.get('bias');
  if (!node) return {};
  const b = readBoolean(node, ctx);
  if (b === undefined) return undefined;
  return b ? {} : { bias: false };
}
