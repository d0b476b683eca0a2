/**
 * `check --sarif` / `--junit` / `--picture` and `bounds --picture` when the report cannot be
 * written: exit code 2 and one line on standard error, no stack trace and no partial file. The
 * full disk is simulated by replacing the file system's `writeSync` for this test file (in-process
 * run of the command line).
 */
import { mkdtempSync, readdirSync, realpathSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, expect, test, vi } from 'vitest';
import { run } from '../../src/cli/run.js';

const state = vi.hoisted(() => ({ diskFull: false }));
vi.mock('node:fs', async (importOriginal) => {
  const real = await importOriginal<typeof import('node:fs')>();
  const writeSync = ((...args: Parameters<typeof real.writeSync>) => {
    if (state.diskFull) throw Object.assign(new Error('ENOSPC: no space left on device, write'), { code: 'ENOSPC' });
    return (real.writeSync as (...a: unknown[]) => number)(...args);
  }) as typeof real.writeSync;
  return { ...real, default: { ...real, writeSync }, writeSync };
});

const dir = realpathSync(mkdtempSync(join(tmpdir(), 'rankfloor-full-')));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

test('a full disk while writing the SARIF log: exit 2, one line, nothing left behind', async () => {
  const out: string[] = [];
  const err: string[] = [];
  state.diskFull = true;
  let code: number;
  try {
    code = await run(['check', '--policy', 'policies/', '--format', 'json', '--sarif', join(dir, 'out.sarif')], {
      stdout: (t) => out.push(t),
      stderr: (t) => err.push(t),
    });
  } finally {
    state.diskFull = false;
  }
  expect(code).toBe(2);
  expect(err).toEqual([`rankfloor: cannot write ${join(dir, 'out.sarif')}: ENOSPC: no space left on device\n`]);
  expect(readdirSync(dir)).toEqual([]);
});

test.each([
  ['check', ['check', '--policy', 'policies/', '--picture']],
  ['bounds', ['bounds', 'examples/renal-pair-net-trimmed.yaml', '--picture']],
])('a full disk while %s writes the picture report: exit 2, one line, nothing left behind', async (_, args) => {
  const err: string[] = [];
  state.diskFull = true;
  let code: number;
  try {
    code = await run([...args, join(dir, 'out.html')], { stdout: () => {}, stderr: (t) => err.push(t) });
  } finally {
    state.diskFull = false;
  }
  expect(code).toBe(2);
  expect(err).toEqual([`rankfloor: cannot write ${join(dir, 'out.html')}: ENOSPC: no space left on device\n`]);
  expect(readdirSync(dir)).toEqual([]);
});
