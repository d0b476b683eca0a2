/**
 * Fuzzing the command line in-process with generated hostile configs and policies (see
 * generate.ts). For every input: the exit code is 0, 1 or 2; nothing prints a stack trace or an
 * "internal error"; an exit 2 names the file (with line and column where there is one); a second
 * run prints the same bytes (every fourth input is run twice, to keep the suite fast; every input
 * with RANKFLOOR_FUZZ_RERUN=all). RANKFLOOR_FUZZ_COUNT raises the number of inputs (default 2,000),
 * RANKFLOOR_FUZZ_SEED changes the seed; a failure prints the seed, the index and the documents.
 *
 * Git is stubbed out (no repository): these runs are about reading input, and a git process per
 * run would cost more than the rest together.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, relative } from 'node:path';
import { afterAll, describe, expect, test, vi } from 'vitest';
import { run } from '../../src/cli/run.js';
import { fuzzCase, type FuzzCase } from './generate.js';

vi.mock('../../src/git/git.js', async (importOriginal) => ({
  ...(await importOriginal<typeof import('../../src/git/git.js')>()),
  openRepo: () => undefined,
}));

const COUNT = Number(process.env['RANKFLOOR_FUZZ_COUNT'] ?? 2000);
const SEED = Number(process.env['RANKFLOOR_FUZZ_SEED'] ?? 7);
const RERUN_EVERY = process.env['RANKFLOOR_FUZZ_RERUN'] === 'all' ? 1 : 4;
const dir = mkdtempSync(join(tmpdir(), 'rankfloor-fuzz-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

interface Outcome {
  code: number;
  stdout: string;
  stderr: string;
}

async function runCase(c: FuzzCase): Promise<{ outcome: Outcome; files: string[] }> {
  const config = join(dir, 'config.yaml');
  writeFileSync(config, c.config);
  const files = [config];
  let argv: string[];
  if (c.policy === undefined) argv = ['bounds', config, '--surrogate', c.surrogate];
  else {
    const policy = join(dir, 'policy.yaml');
    writeFileSync(policy, c.policy);
    files.push(policy);
    argv = ['check', '--policy', policy, '--root', dir, config];
  }
  let stdout = '';
  let stderr = '';
  const code = await run(argv, { stdout: (t) => (stdout += t), stderr: (t) => (stderr += t) });
  return { outcome: { code, stdout, stderr }, files };
}

function problems(c: FuzzCase, first: Outcome, second: Outcome, files: string[]): string[] {
  const out: string[] = [];
  if (![0, 1, 2].includes(first.code)) out.push(`exit code ${first.code}`);
  const all = first.stdout + first.stderr;
  if (/internal error/i.test(all)) out.push('an internal error');
  if (/^\s+at .+(:\d+:\d+\)?|\(native\))$/m.test(all)) out.push('a stack trace');
  if (first.code === 2) {
    // The check command names files relative to the working directory, bounds as given.
    const names = files.flatMap((f) => [f, relative(process.cwd(), f)]);
    if (!names.some((f) => first.stderr.includes(f))) out.push('an exit 2 that names no file');
    const dirs = [dir, relative(process.cwd(), dir)];
    for (const line of first.stderr.split('\n')) {
      if (/: error: .*\[[a-z-]+\/[a-z0-9.-]+\]$/.test(line) && !dirs.some((d) => line.startsWith(d))) out.push(`a diagnostic outside the inputs: ${line.slice(0, 200)}`);
    }
  }
  if (first.code !== second.code || first.stdout !== second.stdout || first.stderr !== second.stderr) out.push('different output on a rerun');
  if (out.length > 0) out.push(`seed ${SEED}, index ${c.index}`, `--- config ---\n${c.config.slice(0, 3000)}`, `--- policy ---\n${(c.policy ?? '(none)').slice(0, 3000)}`, `--- stderr ---\n${first.stderr.slice(0, 3000)}`);
  return out;
}

describe('fuzzing configs and policies', () => {
  test(`${COUNT} generated inputs (seed ${SEED})`, { timeout: 600_000 }, async () => {
    const codes = [0, 0, 0];
    for (let i = 0; i < COUNT; i++) {
      const c = fuzzCase(SEED, i);
      const first = await runCase(c);
      const second = i % RERUN_EVERY === 0 ? await runCase(c) : first;
      const found = problems(c, first.outcome, second.outcome, first.files);
      if (found.length > 0) expect.fail(found.join('\n'));
      codes[first.outcome.code] = (codes[first.outcome.code] ?? 0) + 1;
    }
    // The generator must reach every outcome, or it tests less than it claims.
    console.log(`fuzz: ${COUNT} inputs, exit 0: ${codes[0]}, exit 1: ${codes[1]}, exit 2: ${codes[2]}`);
    expect(codes.every((n) => n > 0)).toBe(true);
  });
});
