/**
 * What happens when standard output or standard error cannot be written: the reader went away
 * (`rankfloor check | head`, EPIPE), the disk is full (ENOSPC), the descriptor is bad. The output
 * is then incomplete, so the process ends with exit code 2 — nothing can hide a 2 — after one line
 * on standard error that says which stream failed and why (no stack trace). When standard error
 * itself is the stream that failed, the exit is silent. The line is written synchronously, since
 * the process ends right after it.
 */
import { writeSync } from 'node:fs';
import { EXIT_INPUT } from './cli-support.js';

interface Guarded {
  on(event: 'error', listener: (err: Error) => void): unknown;
}

export function guardStdio(stdout: Guarded, stderr: Guarded, exit: (code: number) => never = process.exit): void {
  let failed = false;
  const onError = (which: 'output' | 'error') => (err: Error) => {
    if (failed) return;
    failed = true;
    const code = (err as NodeJS.ErrnoException).code ?? err.message;
    const why = code === 'EPIPE' ? 'the reader closed it early (EPIPE)' : code;
    if (which === 'output') {
      try {
        writeSync(2, `rankfloor: cannot write to standard output: ${why}; the output is incomplete\n`);
      } catch {
        // standard error is gone too: exit silently
      }
    }
    exit(EXIT_INPUT);
  };
  stdout.on('error', onError('output'));
  stderr.on('error', onError('error'));
}
