/**
 * The human spelling of a place in the config, such as `model.layers[2].conv.channels`, used in
 * every message so that a reader can find the field without counting list entries by pointer.
 * Map keys are strings and sequence indices are numbers.
 */

export type PathSegment = string | number;

/** `whole` names the root itself, for messages about the document as a whole. */
export function formatFieldPath(segments: readonly PathSegment[], whole = 'the model'): string {
  let out = '';
  for (const s of segments) {
    if (typeof s === 'number') out += `[${s}]`;
    else if (/^[A-Za-z_][A-Za-z0-9_-]*$/.test(s)) out += out === '' ? s : `.${s}`;
    else out += `[${JSON.stringify(s)}]`;
  }
  return out === '' ? whole : out;
}
