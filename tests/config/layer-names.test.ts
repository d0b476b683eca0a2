/**
 * Layer names: unique in the model, copies made by `repeat` numbered `name[i]` (outermost repeat
 * first), references by `from:` resolved to the same iteration's copy inside the repeat that
 * defines the name, and to an explicit copy from outside it. Every mistake is positioned at the
 * name or the reference.
 */
import { describe, expect, test } from 'vitest';
import { codesAt, diagnostics, layered, loadLayered } from './helpers.js';

const REPEATED = `    - conv: {channels: 4, name: stem}
    - repeat:
        times: 3
        layers:
          - conv: {channels: 4, kernel: 3, name: a}
          - conv: {channels: 4, kernel: 3}
          - add: {from: a, name: join}
`;

describe('labels', () => {
  test('copies are numbered from 1; references inside the repeat read the same iteration', () => {
    const m = loadLayered(layered(REPEATED));
    expect(m.layers.map((l) => l.name)).toEqual(['stem', 'a[1]', undefined, 'join[1]', 'a[2]', undefined, 'join[2]', 'a[3]', undefined, 'join[3]']);
    expect(m.layers.map((l) => l.inputs)).toEqual([[-1], [0], [1], [2, 1], [3], [4], [5, 4], [6], [7], [8, 7]]);
  });

  test('nested repeats: name[outer][inner]', () => {
    const m = loadLayered(
      layered(`    - repeat:
        times: 2
        layers:
          - repeat:
              times: 2
              layers:
                - conv: {channels: 4, name: c}
`),
    );
    expect(m.layers.map((l) => l.name)).toEqual(['c[1][1]', 'c[1][2]', 'c[2][1]', 'c[2][2]']);
  });

  test('from outside the repeat, one copy is named explicitly', () => {
    const m = loadLayered(layered(REPEATED + "    - concat: {from: ['a[1]', 'join[3]', stem]}\n"));
    expect(m.layers[10]!.inputs).toEqual([9, 1, 9, 0]);
  });

  test('a name defined outside an inner repeat, used inside it, is the outer iteration’s copy', () => {
    const m = loadLayered(
      layered(`    - conv: {channels: 4}
    - repeat:
        times: 2
        layers:
          - conv: {channels: 4, name: head}
          - repeat:
              times: 2
              layers:
                - conv: {channels: 4}
                - add: {from: head}
`),
    );
    const adds = m.layers.filter((l) => l.kind === 'merge');
    expect(adds.map((l) => l.inputs[1])).toEqual([1, 1, 6, 6]);
    expect(m.layers[1]!.name).toBe('head[1]');
    expect(m.layers[6]!.name).toBe('head[2]');
  });
});

describe('name errors', () => {
  test('a duplicate name: at the second, naming the line of the first', () => {
    const d = diagnostics(layered('    - conv: {channels: 4, name: x}\n    - conv: {channels: 4, name: x}\n'));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/duplicate-name@7:33']);
    expect(d[0]!.message).toBe(
      "the layer name 'x' is already used on line 6; names must be unique in the model (the copies a repeat makes are numbered x[1], x[2], … by themselves)",
    );
  });

  test('a duplicate between a block and a layer inside it', () => {
    expect(codesAt(layered('    - conv: {channels: 4}\n    - residual: {name: r, layers: [{conv: {channels: 4, name: r}}]}\n'))).toEqual(['config/duplicate-name@7:24']);
  });

  test('an unknown name: did you mean', () => {
    const d = diagnostics(layered('    - conv: {channels: 4, name: encoder1}\n    - concat: {from: encoder2}\n'));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/unknown-name@7:22']);
    expect(d[0]!.message).toBe(
      "model.layers[1].concat.from: no layer before this one is named 'encoder2' (did you mean 'encoder1'?); give the layer a 'name' to merge with it",
    );
  });

  test('a name defined later, or the merge’s own block', () => {
    const d = diagnostics(layered('    - conv: {channels: 4}\n    - add: {from: later}\n    - conv: {channels: 4, name: later}\n    - residual: {name: r, layers: [{add: {from: r}}]}\n'));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/forward-reference@7:19', 'config/forward-reference@9:49']);
    expect(d[0]!.message).toBe("model.layers[1].add.from names 'later', which is defined later (line 8); a merge reads only layers that come before it");
  });

  test('a repeated name from outside its repeat must name one copy', () => {
    const d = diagnostics(layered(REPEATED + '    - add: {from: a}\n'));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/ambiguous-name@13:19']);
    expect(d[0]!.message).toBe("model.layers[2].add.from: 'a' is inside a repeat (line 8) that this merge is outside of, so it names 3 copies; name one, e.g. 'a[3]'");
  });

  test('copy numbers: out of range, too many, on a name that is not repeated, inside its own repeat', () => {
    const d = diagnostics(
      layered(
        REPEATED.replace('add: {from: a, name: join}', "add: {from: 'a[1]', name: join}") +
          "    - add: {from: 'a[4]'}\n    - add: {from: 'a[1][1]'}\n    - add: {from: 'stem[1]'}\n    - add: {from: 'input[1]'}\n",
      ),
    );
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual([
      'config/invalid-copy@12:25',
      'config/invalid-copy@13:19',
      'config/invalid-copy@14:19',
      'config/invalid-copy@15:19',
      'config/invalid-copy@16:19',
    ]);
    expect(d[0]!.message).toBe("model.layers[1].repeat.layers[2].add.from is 'a[1]', but inside the repeat that copies it, 'a' already means the copy of the same iteration");
    expect(d[1]!.message).toBe("model.layers[2].add.from is 'a[4]', but the repeat on line 8 makes 3 copies");
  });

  test("names may not use brackets or be 'input'", () => {
    expect(codesAt(layered("    - conv: {channels: 4, name: 'a[1]'}\n    - conv: {channels: 4, name: input}\n"))).toEqual([
      'config/invalid-name@6:33',
      'config/invalid-name@7:33',
    ]);
  });
});
