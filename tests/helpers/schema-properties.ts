/**
 * A walk over a JSON Schema that lists every named property with its location, for the meta-tests
 * that check every field of a shipped schema is described.
 */

/** Every named property anywhere in the schema, as `location: schema`. */
export function properties(node: unknown, at = ''): [string, Record<string, unknown>][] {
  if (node === null || typeof node !== 'object') return [];
  const out: [string, Record<string, unknown>][] = [];
  for (const [k, v] of Object.entries(node)) {
    if (k === 'properties' && v && typeof v === 'object') {
      for (const [name, prop] of Object.entries(v)) out.push([`${at}/properties/${name}`, prop as Record<string, unknown>]);
    }
    out.push(...properties(v, `${at}/${k}`));
  }
  return out;
}
