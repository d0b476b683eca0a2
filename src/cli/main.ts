#!/usr/bin/env node
/** Entry point of the `rankfloor` binary: it only starts `run` and sets the exit code. */
import { run } from './run.js';

const code = await run(process.argv.slice(2), {
  stdout: (t) => process.stdout.write(t),
  stderr: (t) => process.stderr.write(t),
  color: process.stdout.isTTY === true && !process.env['NO_COLOR'],
});
process.exitCode = code;
