/**
 * The policy loader on single files: a policy that uses every field loads to exact values, and
 * each kind of mistake gives its diagnostic code at the exact line and column.
 */
import { afterEach, beforeEach, describe, expect, test } from 'vitest';
import { loadPolicyFile, loadPolicyText } from '../../src/policy/load-policy.js';
import { codesOf, failed, HEAD, policyOf, range, tempRepo, where, type TempRepo } from './helpers.js';

const FULL = `id: renal-pairs
description: Paired-organ scans need left/right coupling.
surrogate: overlap
model_path: /experiment/network
applies_to: ["examples/renal-*.yaml", "!examples/renal-old.yaml"]
unproven: fail
max_drop_bits: 2.5
partitions:
  organ-pair: {kind: left-right}
  lesion-roi: {kind: block, rows: [8, 24], cols: [8, 24]}
  strip: {kind: block, range: [0, 16]}
  sensor-set: {kind: positions, positions: [0, 5, 9]}
require:
  - {partition: organ-pair, min_rank: 64}
  - {partition: lesion-roi, min_rank: 2^40, unproven: warn}
  - {partition: checkerboard, min_bits: 12, max_drop_bits: 1}
  - {partition: 'block:0-4,0-8', min_bits: 1.5}
  - {partition: sensor-set, min_rank: "3**4"}
  - {partition: top-bottom, min_rank: 340282366920938463463374607431768211457}
  - partition: strip
    min_bits: 12.5
`;

test('removal: warn by default, fail when set, inherited through extends', () => {
  expect(policyOf(HEAD).removal).toBe('warn');
  expect(policyOf(`${HEAD}removal: fail\n`).removal).toBe('fail');
  const parent = `${HEAD}removal: fail\n`;
  const readFile = (): string => parent;
  expect(policyOf('id: c\ndescription: d\nextends: parent.yaml\n', { repoRoot: '/virtual', file: '/virtual/c.yaml', readFile }).removal).toBe('fail');
  expect(policyOf('id: c\ndescription: d\nextends: parent.yaml\nremoval: warn\n', { repoRoot: '/virtual', file: '/virtual/c.yaml', readFile }).removal).toBe('warn');
});

describe('a full valid policy', () => {
  const policy = policyOf(FULL, { file: 'policies/renal.yaml' });

  test('settings, as written', () => {
    expect(policy.id).toBe('renal-pairs');
    expect(policy.description).toBe('Paired-organ scans need left/right coupling.');
    expect(policy.file).toBe('policies/renal.yaml');
    expect(policy.surrogate).toBe('overlap');
    expect(policy.modelPath).toBe('/experiment/network');
    expect(policy.appliesTo).toEqual(['examples/renal-*.yaml', '!examples/renal-old.yaml']);
    expect(policy.unproven).toBe('fail');
    expect(policy.maxDropBits).toBe(2.5);
    expect(policy.chain).toEqual(['policies/renal.yaml']);
    expect(range(policy.span)).toBe('1:1-22:1');
  });

  test('named partitions become resolver specs, with the span of their name', () => {
    expect([...policy.partitions.values()].map((p) => [p.name, p.spec, p.file, range(p.span)])).toEqual([
      ['organ-pair', 'left-right', 'policies/renal.yaml', '9:3-9:13'],
      ['lesion-roi', 'block:8-24,8-24', 'policies/renal.yaml', '10:3-10:13'],
      ['strip', 'block:0-16', 'policies/renal.yaml', '11:3-11:8'],
      ['sensor-set', 'positions:0,5,9', 'policies/renal.yaml', '12:3-12:13'],
    ]);
  });

  test('exact minimums, overrides falling back to the policy settings, spans of the entries', () => {
    expect(
      policy.requirements.map((r) => [r.partition, r.minRank, r.written, r.unproven, r.maxDropBits, r.file, range(r.span)]),
    ).toEqual([
      ['organ-pair', 64n, 'min_rank: 64', 'fail', 2.5, 'policies/renal.yaml', '14:5-14:42'],
      ['lesion-roi', 2n ** 40n, 'min_rank: 2^40', 'warn', 2.5, 'policies/renal.yaml', '15:5-15:60'],
      ['checkerboard', 4096n, 'min_bits: 12', 'fail', 1, 'policies/renal.yaml', '16:5-16:62'],
      // ⌈2^1.5⌉ = ⌈2.828…⌉
      ['block:0-4,0-8', 3n, 'min_bits: 1.5', 'fail', 2.5, 'policies/renal.yaml', '17:5-17:48'],
      ['sensor-set', 81n, 'min_rank: 3**4', 'fail', 2.5, 'policies/renal.yaml', '18:5-18:46'],
      // 2^128 + 1: beyond a double, read from its digits.
      ['top-bottom', 2n ** 128n + 1n, 'min_rank: 340282366920938463463374607431768211457', 'fail', 2.5, 'policies/renal.yaml', '19:5-19:79'],
      // ⌈2^12.5⌉ = ⌈5792.618…⌉
      ['strip', 5793n, 'min_bits: 12.5', 'fail', 2.5, 'policies/renal.yaml', '20:5-22:1'],
    ]);
  });

  test('defaults when nothing is set', () => {
    const p = policyOf(HEAD);
    expect([p.surrogate, p.unproven, p.modelPath, p.maxDropBits, p.appliesTo, p.partitions.size, p.requirements]).toEqual([
      'tree',
      'warn',
      undefined,
      undefined,
      [],
      0,
      [],
    ]);
  });

  test('loadPolicyFile reads the same policy from disk', () => {
    const repo = tempRepo();
    try {
      const file = repo.write('policies/renal.yaml', FULL);
      const r = loadPolicyFile(file, { repoRoot: repo.root });
      expect(r.ok).toBe(true);
      if (!r.ok) return;
      expect(r.policy.file).toBe(file);
      expect(r.policy.requirements.map((x) => x.minRank)).toEqual([64n, 2n ** 40n, 4096n, 3n, 81n, 2n ** 128n + 1n, 5793n]);
    } finally {
      repo.remove();
    }
  });
});

describe('structural errors, with exact positions', () => {
  test('an unknown field with a did-you-mean, and no second report of the field it misspells', () => {
    const r = loadPolicyText('id: p\ndescripton: x\n', 'p.yaml', { repoRoot: process.cwd() });
    const ds = failed(r);
    expect(ds.map(where)).toEqual(['policy/unknown-field@2:1']);
    expect(ds[0]!.message).toContain("did you mean 'description'?");
    expect(ds[0]!.file).toBe('p.yaml');
  });

  test('an unknown field inside a requirement', () => {
    const ds = failed(loadPolicyText(`${HEAD}require:\n  - {partition: left-right, min_rnak: 4}\n`, 'p.yaml', { repoRoot: process.cwd() }));
    expect(ds.map(where)).toEqual(['policy/unknown-field@4:29']);
    expect(ds[0]!.message).toContain("did you mean 'min_rank'?");
  });

  test('missing id and description', () => {
    expect(codesOf('surrogate: tree\n')).toEqual(['policy/missing-field@1:1']);
    expect(failed(loadPolicyText('surrogate: tree\n', 'p.yaml', { repoRoot: '/' }))[0]!.message).toMatch(/'id'.*'description'/);
  });

  test('wrong types', () => {
    expect(codesOf(`id: 7\ndescription: [a]\napplies_to: examples/*.yaml\nmax_drop_bits: "2"\npartitions: []\nrequire: {}\n`)).toEqual([
      'policy/type@1:5',
      'policy/type@2:14',
      'policy/type@3:13',
      'policy/type@4:16',
      'policy/type@5:13',
      'policy/type@6:10',
    ]);
  });

  test('a min_rank that is neither an integer nor a power', () => {
    expect(codesOf(`${HEAD}require:\n  - {partition: left-right, min_rank: 2^x}\n`)).toEqual(['policy/invalid-min-rank@4:39']);
    expect(codesOf(`${HEAD}require:\n  - {partition: left-right, min_rank: "0^3"}\n`)).toEqual(['policy/invalid-min-rank@4:39']);
    expect(codesOf(`${HEAD}require:\n  - {partition: left-right, min_rank: "2 ^ -1"}\n`)).toEqual(['policy/invalid-min-rank@4:39']);
    expect(codesOf(`${HEAD}require:\n  - {partition: left-right, min_rank: 0}\n`)).toEqual(['policy/invalid-number@4:39']);
    expect(codesOf(`${HEAD}require:\n  - {partition: left-right, min_rank: 64.5}\n`)).toEqual(['policy/invalid-number@4:39']);
    // 1.0e+30 is an integer to YAML, but not one a double holds exactly (written with a dot and
    // a signed exponent, which YAML 1.1 reads as the same number).
    expect(codesOf(`${HEAD}require:\n  - {partition: left-right, min_rank: 1.0e+30}\n`)).toEqual(['policy/invalid-min-rank@4:39']);
  });

  test('both or neither of min_rank and min_bits', () => {
    // Both: at the later of the two keys. Neither: at the entry.
    expect(codesOf(`${HEAD}require:\n  - {partition: left-right, min_rank: 4, min_bits: 2}\n`)).toEqual(['policy/min-rank-or-bits@4:42']);
    expect(codesOf(`${HEAD}require:\n  - {partition: left-right}\n`)).toEqual(['policy/min-rank-or-bits@4:5']);
  });

  test('an unknown unproven value, at the policy and at a requirement', () => {
    expect(codesOf(`${HEAD}unproven: maybe\n`)).toEqual(['policy/invalid-value@3:11']);
    expect(codesOf(`${HEAD}removal: ignore\n`)).toEqual(['policy/invalid-value@3:10']);
    const ds = failed(loadPolicyText(`${HEAD}require:\n  - {partition: left-right, min_rank: 4, unproven: fial}\n`, 'p.yaml', { repoRoot: '/' }));
    expect(ds.map(where)).toEqual(['policy/invalid-value@4:52']);
    expect(ds[0]!.message).toContain("did you mean 'fail'?");
  });

  test('an unknown surrogate, a bad model path, a bad id, a negative max_drop_bits', () => {
    expect(codesOf(`id: Renal Pairs\ndescription: d\nsurrogate: tre\nmodel_path: model\nmax_drop_bits: -1\n`)).toEqual([
      'policy/invalid-id@1:5',
      'policy/invalid-value@3:12',
      'policy/model-path@4:13',
      'policy/invalid-number@5:16',
    ]);
    expect(codesOf(`${HEAD}model_path: /a/~2\n`)).toEqual(['policy/model-path@3:13']);
  });

  test('min_bits beyond what the loader computes exactly', () => {
    expect(codesOf(`${HEAD}require:\n  - {partition: left-right, min_bits: 1.1234567}\n`)).toEqual(['policy/invalid-min-bits@4:39']);
    expect(codesOf(`${HEAD}require:\n  - {partition: left-right, min_bits: 70000.5}\n`)).toEqual(['policy/invalid-min-bits@4:39']);
    expect(codesOf(`${HEAD}require:\n  - {partition: left-right, min_bits: 1000001}\n`)).toEqual(['policy/invalid-number@4:39']);
    expect(codesOf(`${HEAD}require:\n  - {partition: left-right, min_bits: -1}\n`)).toEqual(['policy/invalid-number@4:39']);
  });

  test('a minimum above 2^1000000 is refused before it is computed', () => {
    expect(codesOf(`${HEAD}require:\n  - {partition: left-right, min_rank: "3^700000"}\n`)).toEqual(['policy/minimum-too-large@4:39']);
    expect(codesOf(`${HEAD}require:\n  - {partition: left-right, min_rank: "2^99999999999999999999"}\n`)).toEqual(['policy/minimum-too-large@4:39']);
    expect(codesOf(`${HEAD}require:\n  - {partition: left-right, min_rank: "${'9'.repeat(301_031)}"}\n`)).toEqual(['policy/minimum-too-large@4:39']);
  });

  test('duplicate requirements for one partition, also when written with other spacing', () => {
    const text = `${HEAD}require:\n  - {partition: left-right, min_rank: 4}\n  - {partition: 'block:0-2, 0-2', min_rank: 4}\n  - {partition: left-right, min_bits: 3}\n  - {partition: 'block:0-2,0-2', min_rank: 5}\n`;
    expect(codesOf(text)).toEqual(['policy/duplicate-requirement@6:17', 'policy/duplicate-requirement@7:17']);
  });

  test('partitions that are neither named nor built in, or built-in specs that are malformed', () => {
    const text = `${HEAD}partitions:\n  organ-pair: {kind: left-right}\nrequire:\n  - {partition: organ-piar, min_rank: 4}\n  - {partition: 'blok:0-4', min_rank: 4}\n  - {partition: 'block:4-2', min_rank: 4}\n  - {partition: 'left-right:3', min_rank: 4}\n  - {partition: 'positions:', min_rank: 4}\n`;
    const ds = failed(loadPolicyText(text, 'p.yaml', { repoRoot: '/' }));
    expect(ds.map(where)).toEqual([
      'policy/unknown-partition@6:17',
      'policy/unknown-partition@7:17',
      'policy/invalid-partition-spec@8:17',
      'policy/invalid-partition-spec@9:17',
      'policy/invalid-partition-spec@10:17',
    ]);
    expect(ds[0]!.message).toContain("did you mean 'organ-pair'?");
    expect(ds[1]!.message).toContain("did you mean 'block'?");
  });

  test('built-in specs are accepted without a shape; whether they fit is decided per config', () => {
    const p = policyOf(`${HEAD}require:\n  - {partition: 'block:0-9999,0-2', min_rank: 2}\n  - {partition: 'positions:0, 7,100000', min_rank: 2}\n  - {partition: start-end, min_rank: 2}\n`);
    expect(p.requirements.map((r) => r.partition)).toEqual(['block:0-9999,0-2', 'positions:0, 7,100000', 'start-end']);
  });

  test('applies_to patterns must be relative', () => {
    const text = `${HEAD}applies_to: ["/abs/*.yaml", "../x/*.yaml", "a/../b.yaml", "C:/x.yaml", "!/x", "ok/*.yaml", "..ok/*.yaml"]\n`;
    expect(codesOf(text)).toEqual([
      'policy/applies-to@3:14',
      'policy/applies-to@3:29',
      'policy/applies-to@3:44',
      'policy/applies-to@3:59',
      'policy/applies-to@3:72',
    ]);
    expect(codesOf(`${HEAD}applies_to: [""]\n`)).toEqual(['policy/invalid-value@3:14']);
  });

  test('YAML problems: syntax, a repeated key, an alias bomb, an empty or scalar document, a too-large text', () => {
    expect(codesOf('id: [p\n')).toEqual(['policy/yaml@2:1']);
    expect(codesOf(`${HEAD}id: q\n`)).toEqual(['policy/duplicate-key@3:1']);
    const bomb = ['a: &a [x, x, x, x, x, x, x, x, x, x]'];
    for (let i = 1; i < 4; i++) bomb.push(`${String.fromCharCode(97 + i)}: &${String.fromCharCode(97 + i)} [${Array(10).fill(`*${String.fromCharCode(96 + i)}`).join(', ')}]`);
    // The 101st expansion is the second *a inside the anchor &b, where the message points.
    expect(codesOf(`${HEAD}${bomb.join('\n')}\n`)).toEqual(['policy/alias-limit@4:12']);
    expect(codesOf('')).toEqual(['policy/empty@1:1']);
    expect(codesOf('just text\n')).toEqual(['policy/type@1:1']);
    expect(codesOf(`${HEAD}#${'x'.repeat(4 * 1024 * 1024)}\n`)).toEqual(['policy/too-large']);
  });

  test('an unreadable or too large file on disk', () => {
    const repo = tempRepo();
    try {
      const missing = loadPolicyFile(repo.path('nope.yaml'), { repoRoot: repo.root });
      expect(failed(missing).map(where)).toEqual(['policy/unreadable']);
      const big = repo.write('big.yaml', `${HEAD}#${'x'.repeat(4 * 1024 * 1024)}\n`);
      expect(failed(loadPolicyFile(big, { repoRoot: repo.root })).map(where)).toEqual(['policy/too-large']);
    } finally {
      repo.remove();
    }
  });

  test('every problem of a file is reported in one pass, in source order', () => {
    const text = `id: p\ndescription: d\nunproven: maybe\nrequire:\n  - {partition: left-rigth, min_rank: 2^x}\n  - {partition: left-right}\n`;
    expect(codesOf(text)).toEqual(['policy/invalid-value@3:11', 'policy/unknown-partition@5:17', 'policy/invalid-min-rank@5:39', 'policy/min-rank-or-bits@6:5']);
  });
});

describe('a shared repository fixture', () => {
  let repo: TempRepo;
  beforeEach(() => {
    repo = tempRepo();
  });
  afterEach(() => repo.remove());

  test('messages name the policy, not "the model"', () => {
    const file = repo.write('p.yaml', 'surrogate: tree\n');
    const ds = failed(loadPolicyFile(file, { repoRoot: repo.root }));
    expect(ds[0]!.message.startsWith('the policy is missing')).toBe(true);
  });
});
