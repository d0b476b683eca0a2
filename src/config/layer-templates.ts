/**
 * What the layer reader makes of the YAML before expansion: one template per YAML entry, checked
 * once however often a `repeat` copies it. Expansion (`expand-layers.ts`) turns templates into the
 * layers of the model, numbering them, wiring their `inputs` and labelling the copies.
 */
import type { Span } from '../diagnostic.js';
import type { FieldParameters, Layer, ParameterUse } from './model.js';

type BaseKey = 'index' | 'inputs' | 'name' | 'path' | 'span' | 'fieldSpans' | 'repeatIteration' | 'fieldParams';

/** The kind-specific part of a layer. */
export type LayerBody = Layer extends infer L ? (L extends Layer ? Omit<L, BaseKey> : never) : never;

/** Where a layer comes from in the YAML. */
export interface Site {
  readonly path: string;
  readonly span: Span;
  readonly fieldSpans: Readonly<Record<string, Span>>;
  /** In a definition: the parameters each field was computed from. */
  readonly fieldParams?: FieldParameters;
}

/** A value the config states for a layer, as written (for messages and spans). */
export interface Stated {
  readonly value: number;
  readonly span: Span;
  /** `model.layers[3].embed_dim`. */
  readonly where: string;
}

/**
 * A size a config states that can be checked only once widths are known (after expansion): the
 * layer's input width (`embed_dim`), its head width (`value_dim`), or at least its input positions
 * (a position table's `max_len`).
 */
export interface DeclaredSize extends Stated {
  readonly against: 'input-width' | 'head-width' | 'positions';
}

/** One layer to be made, and whether it carries its entry's name as its label. */
export interface MadeLayer {
  readonly body: LayerBody;
  readonly site: Site;
  readonly labelled?: boolean;
  /** Sizes to check against the layer's input once shapes are known. */
  readonly declared?: readonly DeclaredSize[];
  /**
   * A dense layer whose units are a multiple of the input width of the layer `offset` places
   * before it (0: itself) — a transformer block's MLP, and its map back to the block's width; its
   * `units` are filled in once shapes are known.
   */
  readonly unitsPerWidth?: Stated & { readonly offset: number };
  /** An embedding's own vocabulary (`num_embeddings`): checked against the token input, or gives it. */
  readonly vocabulary?: Stated;
}

/** The parts of a made layer that are resolved after expansion, by layer index. */
export type Pending = Pick<MadeLayer, 'declared' | 'unitsPerWidth' | 'vocabulary'>;

export interface NameDef {
  readonly text: string;
  readonly span: Span;
}

/** A `from:` reference: `enc1`, `down[2]`, or `input` (the model input). */
export interface NameRef {
  readonly text: string;
  readonly base: string;
  /** Explicit copy numbers (1-based), outermost repeat first. */
  readonly copies: readonly number[];
  readonly span: Span;
  /** `model.layers[5].concat.from`, for messages. */
  readonly where: string;
}

export type Template =
  /** A chain of layers from one entry (a conv with its norm and activation; a separable conv). */
  | { readonly t: 'chain'; readonly layers: readonly MadeLayer[]; readonly name?: NameDef }
  | {
      readonly t: 'repeat';
      readonly times: number;
      readonly timesSpan: Span;
      readonly timesPath: string;
      /** In a definition: the parameters the count was computed from. */
      readonly timesParams?: readonly ParameterUse[];
      readonly body: readonly Template[];
      readonly name?: NameDef;
    }
  | { readonly t: 'sequence'; readonly body: readonly Template[]; readonly name?: NameDef }
  | {
      readonly t: 'merge';
      /** Each path reads the block's input; an empty path is the identity. */
      readonly paths: readonly (readonly Template[])[];
      /** Named earlier layers merged too (skips). */
      readonly refs: readonly NameRef[];
      readonly merge: MadeLayer;
      /** Pointwise layers after the merge (from shortcut fields). */
      readonly after: readonly MadeLayer[];
      readonly name?: NameDef;
    };

/** How many layers the templates expand to (a float, possibly huge or infinite; never expanded). */
export function expandedCount(templates: readonly Template[]): number {
  let total = 0;
  for (const t of templates) total += countOne(t);
  return total;
}

export function countOne(t: Template): number {
  switch (t.t) {
    case 'chain':
      return t.layers.length;
    case 'repeat':
      return t.times * expandedCount(t.body);
    case 'sequence':
      return expandedCount(t.body);
    case 'merge':
      return t.paths.reduce((a, p) => a + expandedCount(p), 0) + 1 + t.after.length;
  }
}
