/**
 * The README's "Architecture definitions" section shows a complete definition and a config that
 * names it: the definition is the bundled file as it is (after its comment header), the config
 * loads against it with the values it states, and every parameter field the section lists is one
 * the definition schema has.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, test } from 'vitest';
import { loadConfigText } from '../../src/config/load-config.js';
import type { LayeredModel } from '../../src/config/model.js';
import { memorySource } from '../helpers/definitions.js';

const readme = readFileSync(new URL('../../README.md', import.meta.url), 'utf8');
const section = readme.slice(readme.indexOf('## Architecture definitions'), readme.indexOf('## Partitions'));
const blocks = [...section.matchAll(/```yaml\n([\s\S]*?)```/g)].map((m) => m[1]!);
const bundled = (path: string): string => readFileSync(new URL(`../../${path}`, import.meta.url), 'utf8');
const withoutHeader = (text: string): string => text.split('\n').filter((l) => !l.startsWith('#')).join('\n');

describe('README, Architecture definitions', () => {
  test('the definition shown is the bundled one', () => {
    expect(blocks).toHaveLength(2);
    expect(blocks[0]!.split('\n')[0]).toBe('# examples/arch/recurrent-sequence.yaml');
    expect(withoutHeader(blocks[0]!)).toBe(withoutHeader(bundled('examples/arch/recurrent-sequence.yaml')));
  });

  test('the config shown loads against it', () => {
    const definitions = memorySource({ 'examples/arch/recurrent-sequence.yaml': bundled('examples/arch/recurrent-sequence.yaml') });
    const r = loadConfigText(blocks[1]!, 'examples/train/gait-stride-clip.yaml', { definitions, configPath: 'examples/train/gait-stride-clip.yaml' });
    expect(r.ok).toBe(true);
    const m = (r as { model: LayeredModel }).model;
    expect(m.input.shape).toEqual([256]);
    expect(m.layers.map((l) => ('channels' in l ? l.channels : 'hidden' in l ? l.hidden : undefined)).filter((x) => x !== undefined)).toEqual([24, 24]);
  });

  test('the parameter fields it names are the schema’s', () => {
    const schema = JSON.parse(bundled('schema/definition.schema.json')) as { definitions: { parameter: { properties: Record<string, unknown> } } };
    const fields = Object.keys(schema.definitions.parameter.properties).sort();
    expect(fields).toEqual(['default', 'description', 'length', 'max', 'min', 'step', 'type']);
    for (const f of fields) expect(section).toContain(`\`${f}\``);
  });
});
