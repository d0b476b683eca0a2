/**
 * JSON Pointers (RFC 6901), which name where the architecture sits in a config (`--model-path`)
 * and where each layer came from (`Layer.path`).
 */

export type PointerParse = { ok: true; segments: string[] } | { ok: false; message: string };

/** Splits a pointer such as `/training/model` into unescaped segments; `""` is the whole document. */
export function parsePointer(pointer: string): PointerParse {
  if (pointer === '') return { ok: true, segments: [] };
  if (!pointer.startsWith('/')) {
    return { ok: false, message: `the model path '${pointer}' is not a JSON pointer: it must be empty or start with '/', e.g. '/model' or '/training/model'` };
  }
  const segments: string[] = [];
  for (const raw of pointer.slice(1).split('/')) {
    if (/~(?![01])/.test(raw)) {
      return { ok: false, message: `the model path '${pointer}' has a bad escape in '${raw}': in a JSON pointer '~' must be followed by 0 ('~') or 1 ('/')` };
    }
    segments.push(raw.replace(/~1/g, '/').replace(/~0/g, '~'));
  }
  return { ok: true, segments };
}

export function escapeSegment(segment: string | number): string {
  return String(segment).replace(/~/g, '~0').replace(/\//g, '~1');
}

export function formatPointer(segments: readonly (string | number)[]): string {
  return segments.map((s) => '/' + escapeSegment(s)).join('');
}

/** A sequence index as RFC 6901 spells it: `0` or digits without a leading zero. */
export function isArrayIndex(segment: string): boolean {
  return /^(0|[1-9][0-9]*)$/.test(segment);
}
