/**
 * The words a layered config may use: the layer kinds, each kind's canonical fields, and the
 * alias spellings other frameworks use for them. The schema checks structure; this table is what
 * alias normalisation and "did you mean" hints read, so the two stay in one place.
 */

export const LAYER_KINDS = ['conv', 'pool', 'dense', 'recurrent', 'repeat'] as const;
export type LayerKindName = (typeof LAYER_KINDS)[number];

export function isLayerKind(word: string): word is LayerKindName {
  return (LAYER_KINDS as readonly string[]).includes(word);
}

/** Canonical fields of each kind's body, in the order reports list them. */
export const LAYER_FIELDS: ReadonlyMap<LayerKindName, readonly string[]> = new Map<LayerKindName, readonly string[]>([
  ['conv', ['channels', 'kernel', 'stride', 'padding', 'name']],
  ['pool', ['window', 'global', 'name']],
  ['dense', ['units', 'name']],
  ['recurrent', ['hidden', 'depth', 'name']],
  ['repeat', ['times', 'layers', 'name']],
]);

/** Alias → canonical field, per kind. */
export const FIELD_ALIASES: ReadonlyMap<LayerKindName, ReadonlyMap<string, string>> = new Map<LayerKindName, ReadonlyMap<string, string>>([
  ['conv', new Map([['out_channels', 'channels'], ['filters', 'channels'], ['kernel_size', 'kernel']])],
  ['pool', new Map([['pool_size', 'window']])],
  ['dense', new Map()],
  ['recurrent', new Map([['hidden_size', 'hidden'], ['num_layers', 'depth']])],
  ['repeat', new Map()],
]);

export const KIND_LIST_TEXT = LAYER_KINDS.join(', ');
