#!/usr/bin/env node
/** Entry point of the `rankfloor` binary: it only starts `run` and sets the exit code. */
import { guardStdio } from './stdio-guard.js';
import { run } from './run.js';

guardStdio(process.stdout, process.stderr);
const code = await run(process.argv.slice(2), {
  stdout: (t) => process.stdout.write(t),
  stderr: (t) => process.stderr.write(t),
  color: process.stdout.isTTY === true && !process.env['NO_COLOR'],
});
process.exitCode = code;
