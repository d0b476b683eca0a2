/**
 * The SARIF log is checked against the official SARIF 2.1.0 schema (a fixture, see
 * fixtures/README.md), with URI formats enforced, so a log a code-scanning service would reject
 * fails here first. The broken-log cases make sure the validator itself can say no.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { Ajv, type ValidateFunction } from 'ajv';
import formatsModule from 'ajv-formats';
import type { Finding, FindingRule } from '../../src/report/finding.js';
import { FINGERPRINT_KEY, relativeUri, ruleId, sarifLog, sarifText } from '../../src/report/sarif.js';

const schema = JSON.parse(readFileSync(new URL('./fixtures/sarif-schema-2.1.0.json', import.meta.url), 'utf8')) as object;

function validator(): ValidateFunction {
  // Ajv's default class is draft-07, the schema's own dialect; without the format plugin, `uri`
  // and `uri-reference` would not be checked at all.
  const ajv = new Ajv({ allErrors: true });
  formatsModule.default(ajv);
  return ajv.compile(schema);
}

const validate = validator();

function expectValid(log: unknown): void {
  const ok = validate(log);
  expect(validate.errors ?? [], JSON.stringify(validate.errors, null, 2)).toEqual([]);
  expect(ok).toBe(true);
}

const TOOL = { version: '0.1.0' };

function finding(over: Partial<Finding> & { rule: FindingRule }): Finding {
  return {
    level: 'error',
    title: `${over.rule} title`,
    message: 'explanation',
    file: 'configs/model.yaml',
    line: 3,
    column: 5,
    fingerprint: `fp-${over.rule}`,
    ...over,
  };
}

const EVERY_RULE: Finding[] = [
  finding({
    rule: 'requirement-failed',
    title: 'left-right needs rank ≥ 2^40, the config allows at most 2^12',
    message: 'bottleneck: 4 bonds of dimension 8 from layer 2 (line 9)\nfix: layer 2 channels: 8 → 1024',
    line: 9,
    column: 15,
  }),
  finding({ rule: 'requirement-unproven', level: 'warning', file: 'configs/other model.yaml', line: 1, column: 1 }),
  finding({ rule: 'capacity-drop', file: 'configs/model.yaml', line: 12, column: 3 }),
  finding({ rule: 'policy-changed', level: 'notice', file: 'policies/team.yaml', line: 1, column: 1 }),
  finding({ rule: 'input-error', file: 'configs/broken.yaml', line: 4, column: 7, message: 'unknown field `chanels`; did you mean `channels`?' }),
  finding({ rule: 'config-removed', level: 'warning', file: 'configs/gone.yaml', line: undefined, column: undefined }),
  finding({ rule: 'definition-changed', level: 'notice', file: 'arch/residual.yaml', line: 30, column: 1 }),
  finding({ rule: 'capacity-may-have-dropped', level: 'warning', file: 'configs/model.yaml', line: 14, column: 3 }),
];

interface Result {
  ruleId: string;
  ruleIndex: number;
  level: string;
  message: { text: string };
  locations?: { physicalLocation: { artifactLocation: { uri: string; uriBaseId: string }; region?: { startLine: number; startColumn?: number } } }[];
  partialFingerprints: Record<string, string>;
}

interface Run {
  tool: { driver: { name: string; version: string; rules: { id: string; name: string; defaultConfiguration: { level: string } }[] } };
  results: Result[];
}

function run(log: object): Run {
  return (log as { runs: Run[] }).runs[0]!;
}

describe('sarifLog against the SARIF 2.1.0 schema', () => {
  it('accepts a log with a finding of every rule kind', () => {
    const log = sarifLog(EVERY_RULE, TOOL);
    expectValid(log);
    expect(run(log).results.map((r) => r.ruleId).sort()).toEqual(
      ['capacity-drop', 'capacity-may-have-dropped', 'config-removed', 'definition-changed', 'input-error', 'policy-changed', 'requirement-failed', 'requirement-unproven'].map((r) => `rankfloor/${r}`),
    );
  });

  it('accepts the log of a clean run', () => {
    const log = sarifLog([], TOOL);
    expectValid(log);
    expect(run(log).results).toEqual([]);
    expect(run(log).tool.driver.rules).toHaveLength(8);
  });

  it('accepts the text form, which parses back to the same log', () => {
    const text = sarifText(EVERY_RULE, TOOL);
    expect(text.endsWith('}\n')).toBe(true);
    expect(text).toBe(JSON.stringify(sarifLog(EVERY_RULE, TOOL), null, 2) + '\n');
    expectValid(JSON.parse(text));
  });

  it('gives every result a location: the file alone when no line is known (code scanning rejects a result without one)', () => {
    const log = sarifLog(
      [
        finding({ rule: 'input-error', line: 0, column: 0, file: 'configs/unreadable.yaml' }),
        finding({ rule: 'input-error', line: 2, column: 0, fingerprint: 'b' }),
        finding({ rule: 'policy-changed', level: 'notice', file: '', fingerprint: 'c' }),
      ],
      TOOL,
    );
    expectValid(log);
    // Sorted by file: '' first, then configs/model.yaml, then configs/unreadable.yaml.
    const [noFile, noColumn, noRegion] = run(log).results;
    expect(noFile!.locations).toEqual([{ physicalLocation: { artifactLocation: { uri: '.', uriBaseId: '%SRCROOT%' }, region: { startLine: 3, startColumn: 5 } } }]);
    expect(noRegion!.locations).toEqual([{ physicalLocation: { artifactLocation: { uri: 'configs/unreadable.yaml', uriBaseId: '%SRCROOT%' } } }]);
    expect(noRegion!.locations![0]!.physicalLocation.region).toBeUndefined();
    expect(noColumn!.locations![0]!.physicalLocation.region).toEqual({ startLine: 2 });
  });

  describe('rejects broken logs, so the check above means something', () => {
    const good = (): Record<string, unknown> => JSON.parse(sarifText(EVERY_RULE, TOOL)) as Record<string, unknown>;

    it('a wrong version', () => {
      expect(validate({ ...good(), version: '2.0.0' })).toBe(false);
    });

    it('a result without a message', () => {
      const log = good();
      delete (run(log).results[0] as Partial<Result>).message;
      expect(validate(log)).toBe(false);
    });

    it('a level outside the enumeration', () => {
      const log = good();
      run(log).results[0]!.level = 'notice';
      expect(validate(log)).toBe(false);
    });

    it('an artifact URI with a raw space', () => {
      const log = good();
      run(log).results[0]!.locations![0]!.physicalLocation.artifactLocation.uri = 'configs/my model.yaml';
      expect(validate(log)).toBe(false);
    });

    it('a line number of zero', () => {
      const log = good();
      run(log).results[0]!.locations![0]!.physicalLocation.region!.startLine = 0;
      expect(validate(log)).toBe(false);
    });
  });
});

describe('sarifLog content', () => {
  it('lists all seven rules in a fixed order, and each result points at its own rule', () => {
    const rules = run(sarifLog(EVERY_RULE, TOOL)).tool.driver.rules;
    expect(rules.map((r) => r.id)).toEqual([
      'rankfloor/requirement-failed',
      'rankfloor/requirement-unproven',
      'rankfloor/capacity-drop',
      'rankfloor/policy-changed',
      'rankfloor/input-error',
      'rankfloor/config-removed',
      'rankfloor/definition-changed',
      'rankfloor/capacity-may-have-dropped',
    ]);
    expect(rules.map((r) => r.name)).toEqual(['RequirementFailed', 'RequirementUnproven', 'CapacityDrop', 'PolicyChanged', 'InputError', 'ConfigRemoved', 'DefinitionChanged', 'CapacityMayHaveDropped']);
    for (const r of run(sarifLog(EVERY_RULE, TOOL)).results) expect(rules[r.ruleIndex]!.id).toBe(r.ruleId);
    // The same indices whichever findings occur.
    const only = run(sarifLog([finding({ rule: 'input-error' })], TOOL)).results[0]!;
    expect(only.ruleIndex).toBe(4);
  });

  it('names the tool and its version, with no absolute paths, times or generated ids', () => {
    const log = sarifLog(EVERY_RULE, { version: '1.2.3' });
    expect(run(log).tool.driver.name).toBe('rankfloor');
    expect(run(log).tool.driver.version).toBe('1.2.3');
    const text = sarifText(EVERY_RULE, TOOL);
    expect(text).not.toMatch(/file:/);
    expect(text).not.toMatch(/\d{4}-\d{2}-\d{2}T/);
    expect(text).not.toMatch(/guid/i);
    expect(text).not.toContain(process.cwd());
  });

  it("maps levels, 'notice' to 'note'", () => {
    const byRule = new Map(run(sarifLog(EVERY_RULE, TOOL)).results.map((r) => [r.ruleId, r.level]));
    expect(byRule.get(ruleId('requirement-failed'))).toBe('error');
    expect(byRule.get(ruleId('requirement-unproven'))).toBe('warning');
    expect(byRule.get(ruleId('policy-changed'))).toBe('note');
  });

  it('puts title and explanation into the message, and the position into the region', () => {
    const r = run(sarifLog([EVERY_RULE[0]!], TOOL)).results[0]!;
    expect(r.message.text).toBe(`${EVERY_RULE[0]!.title}\n\n${EVERY_RULE[0]!.message}`);
    expect(r.locations).toEqual([
      { physicalLocation: { artifactLocation: { uri: 'configs/model.yaml', uriBaseId: '%SRCROOT%' }, region: { startLine: 9, startColumn: 15 } } },
    ]);
    expect(r.partialFingerprints).toEqual({ [FINGERPRINT_KEY]: 'fp-requirement-failed' });
  });

  it('keeps fingerprints when line numbers change', () => {
    const before = sarifLog(EVERY_RULE, TOOL);
    const after = sarifLog(
      EVERY_RULE.map((f) => ({ ...f, line: (f.line ?? 1) + 40, column: (f.column ?? 1) + 2 })),
      TOOL,
    );
    const prints = (log: object): Map<string, string> =>
      new Map(run(log).results.map((r) => [r.ruleId, r.partialFingerprints[FINGERPRINT_KEY]!]));
    expect(prints(after)).toEqual(prints(before));
    expect(run(after).results.map((r) => r.locations?.[0]?.physicalLocation.region?.startLine)).not.toEqual(
      run(before).results.map((r) => r.locations?.[0]?.physicalLocation.region?.startLine),
    );
  });
});

describe('the run category of a matrix job', () => {
  it('is the automation id `<category>/` (SARIF 2.1.0: leading components of runAutomationDetails.id name the category)', () => {
    const log = sarifLog(EVERY_RULE, { ...TOOL, category: 'gpu-models' });
    expectValid(log);
    expect((run(log) as unknown as { automationDetails: unknown }).automationDetails).toEqual({ id: 'gpu-models/' });
    expect((run(sarifLog(EVERY_RULE, { ...TOOL, category: 'lang/ts/' })) as unknown as { automationDetails: unknown }).automationDetails).toEqual({ id: 'lang/ts/' });
    expect('automationDetails' in run(sarifLog(EVERY_RULE, TOOL))).toBe(false);
  });
});

describe('relative URIs', () => {
  it('percent-encodes each path segment and keeps the slashes', () => {
    expect(relativeUri('configs/my model/net v2.yaml')).toBe('configs/my%20model/net%20v2.yaml');
    expect(relativeUri('configs/über#1?.yaml')).toBe('configs/%C3%BCber%231%3F.yaml');
    expect(relativeUri('100%/a.yaml')).toBe('100%25/a.yaml');
    expect(relativeUri('plain/path-with_safe.chars~.yaml')).toBe('plain/path-with_safe.chars~.yaml');
  });

  it('never lets a colon in the first segment read as a scheme', () => {
    expect(relativeUri('c:odd/name.yaml')).toBe('c%3Aodd/name.yaml');
  });

  it('normalises backslashes and a leading ./', () => {
    expect(relativeUri('configs\\win dows\\a.yaml')).toBe('configs/win%20dows/a.yaml');
    expect(relativeUri('./configs/a.yaml')).toBe('configs/a.yaml');
  });

  it('writes encoded URIs into the log, which still validates', () => {
    const log = sarifLog([finding({ rule: 'requirement-failed', file: 'configs/my model/net [v2].yaml' })], TOOL);
    expectValid(log);
    expect(run(log).results[0]!.locations![0]!.physicalLocation.artifactLocation.uri).toBe('configs/my%20model/net%20%5Bv2%5D.yaml');
  });
});

describe('ordering', () => {
  it('sorts results by file, line, column, rule and fingerprint', () => {
    const fs: Finding[] = [
      finding({ rule: 'requirement-failed', file: 'b.yaml', line: 1, column: 1, fingerprint: 'x' }),
      finding({ rule: 'requirement-unproven', file: 'a.yaml', line: 10, column: 1, fingerprint: 'x' }),
      finding({ rule: 'requirement-failed', file: 'a.yaml', line: 2, column: 9, fingerprint: 'x' }),
      finding({ rule: 'requirement-failed', file: 'a.yaml', line: 2, column: 3, fingerprint: 'z' }),
      finding({ rule: 'requirement-failed', file: 'a.yaml', line: 2, column: 3, fingerprint: 'y' }),
      finding({ rule: 'capacity-drop', file: 'a.yaml', line: 2, column: 3, fingerprint: 'z' }),
    ];
    const order = run(sarifLog(fs, TOOL)).results.map(
      (r) => `${r.locations![0]!.physicalLocation.artifactLocation.uri}:${r.locations![0]!.physicalLocation.region!.startLine}:${r.locations![0]!.physicalLocation.region!.startColumn} ${r.ruleId} ${r.partialFingerprints[FINGERPRINT_KEY]}`,
    );
    expect(order).toEqual([
      'a.yaml:2:3 rankfloor/capacity-drop z',
      'a.yaml:2:3 rankfloor/requirement-failed y',
      'a.yaml:2:3 rankfloor/requirement-failed z',
      'a.yaml:2:9 rankfloor/requirement-failed x',
      'a.yaml:10:1 rankfloor/requirement-unproven x',
      'b.yaml:1:1 rankfloor/requirement-failed x',
    ]);
  });

  it('gives byte-identical text whatever the order of the findings', () => {
    const expected = sarifText(EVERY_RULE, TOOL);
    const reversed = [...EVERY_RULE].reverse();
    const rotated = [...EVERY_RULE.slice(2), ...EVERY_RULE.slice(0, 2)];
    expect(sarifText(reversed, TOOL)).toBe(expected);
    expect(sarifText(rotated, TOOL)).toBe(expected);
    expect(sarifText(EVERY_RULE, TOOL)).toBe(expected);
  });

  it('does not reorder the caller’s array', () => {
    const fs = [...EVERY_RULE].reverse();
    const copy = [...fs];
    sarifLog(fs, TOOL);
    expect(fs).toEqual(copy);
  });
});
