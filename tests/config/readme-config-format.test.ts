/**
 * The README's "Config format" section is the user's reference for the vocabulary: every kind
 * spelling and every field spelling the loader accepts is written there, and every YAML example
 * in it loads.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, test } from 'vitest';
import { KIND_SPELLINGS } from '../../src/config/kind-names.js';
import { LAYER_FIELDS, SHORTCUT_FIELDS, pointwiseFields } from '../../src/config/layer-vocabulary.js';
import { INPUT_ALIASES } from '../../src/config/field-aliases.js';
import { loadConfigText } from '../../src/config/load-config.js';

const readme = readFileSync(new URL('../../README.md', import.meta.url), 'utf8');
const section = readme.slice(readme.indexOf('## Config format'), readme.indexOf('## Architecture definitions'));
const quoted = new Set([...section.matchAll(/`([^`\n]+)`/g)].map((m) => m[1]!));

describe('README, Config format', () => {
  test('the section is there', () => {
    expect(section.length).toBeGreaterThan(5000);
  });

  test('every kind spelling is documented', () => {
    const missing = KIND_SPELLINGS.flat().filter((w) => !quoted.has(w));
    expect(missing).toEqual([]);
  });

  test('every field spelling of every kind is documented', () => {
    const specs = [...[...LAYER_FIELDS.values()].flat(), ...SHORTCUT_FIELDS, ...['activation', 'normalisation', 'dropout', 'scaling'].flatMap(pointwiseFields)];
    const spellings = [...new Set(specs.flatMap((s) => [s.name, ...(s.aliases ?? [])]))];
    expect(spellings.length).toBeGreaterThan(100);
    expect(spellings.filter((w) => !quoted.has(w))).toEqual([]);
  });

  test('the input aliases are documented', () => {
    expect([...INPUT_ALIASES.keys(), 'channels', 'representation', 'vocabulary'].filter((w) => !quoted.has(w))).toEqual([]);
  });

  test('every YAML example loads', () => {
    const blocks = [...section.matchAll(/```yaml\n([\s\S]*?)```/g)].map((m) => m[1]!);
    expect(blocks.length).toBe(6);
    for (const text of blocks) {
      const r = loadConfigText(text, 'README.md');
      expect(r.ok ? [] : r.diagnostics.map((d) => `${d.span?.line}:${d.span?.column} ${d.message}`)).toEqual([]);
    }
  });
});
