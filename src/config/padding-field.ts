/**
 * The `padding` of a window layer: a word (`same`, `valid`, `causal` where the kind allows it) or
 * the zeros added on each side, one integer for every axis or one per axis (`1`, `[1, 2]`), as
 * frameworks that count padding in positions write it.
 */
import type { Located } from './located-value.js';
import type { Padding } from './model.js';
import { readChoice, readPerAxis, type ReadContext } from './field-readers.js';

export type PaddingWord = 'same' | 'valid' | 'causal';

export function readPadding(node: Located, ctx: ReadContext, words: readonly PaddingWord[]): Padding | undefined {
  if (node.kind === 'scalar' && typeof node.value === 'number') {
    const amount = readPerAxis(node, ctx, 0);
    return amount && { mode: 'explicit', amount };
  }
  if (node.kind === 'seq') {
    const amount = readPerAxis(node, ctx, 0);
    return amount && { mode: 'explicit', amount };
  }
  const word = readChoice(node, ctx, new Map(words.map((w) => [w, w])), words);
  return word && { mode: word };
}
