/**
 * Values that YAML 1.1 loaders read differently from rankfloor's YAML 1.2 are positioned errors
 * that give both readings. The 1.1 readings are checked against the examples of the YAML 1.1
 * type repository (yaml.org/type/int.html, float.html, bool.html, null.html), whose forms all
 * denote 685230 (ints) and 685230.15 (floats); the 1.2 readings against the YAML 1.2.2 core
 * schema (section 10.3.2).
 */
import { describe, expect, test } from 'vitest';
import { parseDocument, type Scalar } from 'yaml';
import { yaml11Reading, yamlVersionProblem } from '../../src/config/yaml-versions.js';
import { codesAt, diagnostics } from '../config/helpers.js';
import { codesOf, HEAD } from '../policy/helpers.js';

describe('YAML 1.1 readings (yaml.org/type examples)', () => {
  test.each([
    ['685230', 685230], // int.html: canonical
    ['+685_230', 685230], // decimal
    ['02472256', 685230], // octal
    ['0x_0A_74_AE', 685230], // hexadecimal
    ['0b1010_0111_0100_1010_1110', 685230], // binary
    ['190:20:30', 685230], // sexagesimal
    ['6.8523015e+5', 685230.15], // float.html: canonical
    ['685.230_15e+03', 685230.15], // exponential
    ['685_230.15', 685230.15], // fixed
    ['190:20:30.15', 685230.15], // sexagesimal
    ['-.inf', -Infinity], // negative infinity
  ])('%s reads as %d', (source, value) => {
    expect(yaml11Reading(source)).toBeCloseTo(value, 6);
  });

  test('booleans, null and strings (bool.html, null.html)', () => {
    for (const t of ['y', 'Y', 'yes', 'Yes', 'YES', 'true', 'True', 'TRUE', 'on', 'On', 'ON']) expect(yaml11Reading(t)).toBe(true);
    for (const f of ['n', 'N', 'no', 'No', 'NO', 'false', 'False', 'FALSE', 'off', 'Off', 'OFF']) expect(yaml11Reading(f)).toBe(false);
    for (const z of ['~', 'null', 'Null', 'NULL', '']) expect(yaml11Reading(z)).toBeNull();
    // no dot before the exponent, or an unsigned exponent: not a 1.1 float
    for (const s of ['1e3', '1.5e3', '09', '0o17', 'same', '2^10']) expect(yaml11Reading(s)).toBe(s);
  });
});

describe('values read differently by the two versions', () => {
  const problem = (text: string): string | undefined => {
    const doc = parseDocument(`v: ${text}`);
    const node = (doc.contents as unknown as { items: { value: Scalar }[] }).items[0]!.value;
    return yamlVersionProblem(node, node.value as string | number | boolean | null);
  };

  test.each([
    ['017', 'the integer 17', 'the integer 15'],
    ['1:30', 'the string "1:30"', 'the integer 90'],
    ['yes', 'the string "yes"', 'the boolean true'],
    ['off', 'the string "off"', 'the boolean false'],
    ['n', 'the string "n"', 'the boolean false'],
    ['1_000', 'the string "1_000"', 'the integer 1000'],
    ['0b11', 'the string "0b11"', 'the integer 3'],
    ['0o17', 'the integer 15', 'the string "0o17"'],
    ['1e3', 'the integer 1000', 'the string "1e3"'],
    ['09', 'the integer 9', 'the string "09"'],
  ])('%s: YAML 1.2 reads %s, YAML 1.1 %s', (text, read12, read11) => {
    const message = problem(text);
    expect(message).toContain(`YAML 1.2 (rankfloor: ${read12})`);
    expect(message).toContain(`(loaders common in training code: ${read11})`);
  });

  test.each(['17', '0x1F', 'true', 'false', '1.5', '"017"', "'yes'", '!!str 017', 'null', '~', 'conv', '1.0e+30', '.inf'])(
    '%s reads the same in both',
    (text) => {
      expect(problem(text)).toBeUndefined();
    },
  );
});

describe('in configs and policies', () => {
  test('channels: 017 and weight_sharing: no are errors at the value', () => {
    const text = 'model:\n  input: {shape: [16], features: 2}\n  weight_sharing: no\n  layers:\n    - conv: {channels: 017}\n';
    expect(codesAt(text)).toContain('config/yaml-version@5:24');
    expect(codesAt(text)).toContain('config/yaml-version@3:19');
    const d = diagnostics(text).find((x) => x.span?.line === 5)!;
    expect(d.message).toContain('the integer 17');
    expect(d.message).toContain('the integer 15');
  });

  test('only the values rankfloor reads count: the rest of a training file may use any form', () => {
    const text = 'optimizer: {nesterov: yes, steps: 1_000}\nmodel:\n  input: {shape: [16], features: 2}\n  layers:\n    - conv: {channels: 4}\n';
    expect(() => codesAt(text)).toThrow(/expected diagnostics/);
  });

  test('a policy with unproven: no and a sexagesimal min_rank', () => {
    const text = `${HEAD}unproven: no\nrequire:\n  - {partition: left-right, min_rank: 1:30}\n`;
    expect(codesOf(text)).toEqual(expect.arrayContaining(['policy/yaml-version@3:11', 'policy/yaml-version@5:39']));
  });
});
