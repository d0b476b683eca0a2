/**
 * The files `check --sarif` and `--junit` write from a real run over the bundled examples: the
 * SARIF log validates against the official SARIF 2.1.0 schema (OASIS standard; fixture in
 * tests/report/fixtures), and the JUnit report has one test case per config × requirement.
 */
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Ajv } from 'ajv';
import formatsModule from 'ajv-formats';
import { expect, test } from 'vitest';
import { runCli } from './run-cli.js';

test('--sarif and --junit from a run over examples/ and policies/', () => {
  const dir = mkdtempSync(join(tmpdir(), 'rankfloor-out-'));
  const sarifPath = join(dir, 'out.sarif');
  const junitPath = join(dir, 'out.xml');
  const r = runCli(['check', '--policy', 'policies/', '--sarif', sarifPath, '--junit', junitPath]);
  expect(r.code).toBe(1);

  const schema = JSON.parse(readFileSync(new URL('../report/fixtures/sarif-schema-2.1.0.json', import.meta.url), 'utf8')) as object;
  const ajv = new Ajv({ allErrors: true });
  formatsModule.default(ajv);
  const validate = ajv.compile(schema);
  const log = JSON.parse(readFileSync(sarifPath, 'utf8'));
  expect(validate(log), JSON.stringify(validate.errors)).toBe(true);
  const results = log.runs[0].results as { ruleId: string; level: string; locations: { physicalLocation: { artifactLocation: { uri: string }; region: { startLine: number } } }[] }[];
  const failed = results.filter((x) => x.ruleId === 'rankfloor/requirement-failed');
  expect(failed).toHaveLength(1);
  expect(failed[0]!.level).toBe('error');
  expect(failed[0]!.locations[0]!.physicalLocation.artifactLocation.uri).toBe('examples/renal-pair-net-trimmed.yaml');
  // without a base there is no changed line: the finding points at the bottleneck layer
  expect(failed[0]!.locations[0]!.physicalLocation.region.startLine).toBe(17);
  // every other requirement of the bundled examples is proven
  expect(results.filter((x) => x.ruleId === 'rankfloor/requirement-unproven')).toHaveLength(0);

  const xml = readFileSync(junitPath, 'utf8');
  // 10 configs × 2 requirements each
  expect(xml.match(/<testcase /g)).toHaveLength(20);
  expect(xml.match(/<failure /g)).toHaveLength(1);
  expect(xml).toMatch(/<testsuites [^>]*tests="20"[^>]*failures="1"/);
});
