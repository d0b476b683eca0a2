/**
 * Standard output that cannot be written — a reader that went away (`| head`), a full disk — ends
 * the run with exit code 2 and one line on standard error, never a stack trace.
 */
import { spawn, spawnSync } from 'node:child_process';
import { closeSync, existsSync, openSync } from 'node:fs';
import { describe, expect, test } from 'vitest';
import { CLI, REPO } from './run-cli.js';
const ARGS = ['check', '--policy', 'policies/', 'examples/'];

describe('write errors on the standard streams', () => {
  test('a reader that closes standard output early (EPIPE): exit 2, one line, no stack trace', async () => {
    const child = spawn(process.execPath, [CLI, ...ARGS], { cwd: REPO, stdio: ['ignore', 'pipe', 'pipe'], env: { ...process.env, NO_COLOR: '1' } });
    child.stdout.destroy();
    let stderr = '';
    child.stderr.setEncoding('utf8').on('data', (t: string) => (stderr += t));
    const code = await new Promise<number | null>((done) => child.on('close', (c) => done(c)));
    expect(code).toBe(2);
    expect(stderr).toBe('rankfloor: cannot write to standard output: the reader closed it early (EPIPE); the output is incomplete\n');
  });

  test.skipIf(!existsSync('/dev/full'))('a full disk under standard output (ENOSPC): exit 2, one line', () => {
    const full = openSync('/dev/full', 'w');
    try {
      const r = spawnSync(process.execPath, [CLI, ...ARGS], { cwd: REPO, stdio: ['ignore', full, 'pipe'], encoding: 'utf8' });
      expect(r.status).toBe(2);
      expect(r.stderr).toBe('rankfloor: cannot write to standard output: ENOSPC; the output is incomplete\n');
    } finally {
      closeSync(full);
    }
  });

  test.skipIf(!existsSync('/dev/full'))('a full disk under standard error: exit 2, silently', () => {
    const full = openSync('/dev/full', 'w');
    try {
      const r = spawnSync(process.execPath, [CLI, 'bounds', 'no/such/config.yaml'], { cwd: REPO, stdio: ['ignore', 'pipe', full], encoding: 'utf8' });
      expect(r.status).toBe(2);
      expect(r.stdout).toBe('');
    } finally {
      closeSync(full);
    }
  });
});
