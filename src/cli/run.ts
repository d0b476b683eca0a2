/**
 * The command line: dispatch to a command. `run` never exits the process and never prints a
 * stack trace for bad input; it returns the exit code (0 pass, 1 policy violated, 2 usage or
 * input error) so that tests can call it directly.
 */
import { boundsCommand } from './bounds-command.js';
import { checkCommand } from './check-command.js';
import { measureCommand } from './measure-command.js';
import { ratchetCommand } from './ratchet-command.js';
import { EXIT_INPUT, EXIT_OK, UsageError, type Io } from './cli-support.js';

export type { Io } from './cli-support.js';
export { EXIT_FAIL, EXIT_INPUT, EXIT_OK } from './cli-support.js';

const USAGE = `usage:
  rankfloor bounds CONFIG [--partition P]... [--model-path PTR] [--surrogate tree|overlap] [--format text|json]
  rankfloor check --policy FILE|DIR [CONFIG...] [--format text|json] [--quiet] [--root DIR]
  rankfloor measure DATA [--shape H,W] [--labels FILE | --label-column C] [--partition P]... [--policy FILE [--write]] [--batch N] [--format text|json]
  rankfloor ratchet CONFIG [--policy FILE [--write]] [--margin BITS] [--partition P]... [--surrogate tree|overlap] [--format text|json]

partitions: start-end, interleaved (1D); left-right, top-bottom, checkerboard (2D);
            positions:0,2,5; block:r0-r1,c0-c1 (2D) or block:a-b (1D), half-open ranges
exit codes: 0 nothing fails, 1 a requirement fails, 2 usage or input error
`;

export async function run(argv: readonly string[], io: Io): Promise<number> {
  const [command, ...rest] = argv;
  try {
    switch (command) {
      case 'bounds':
        return boundsCommand(rest, io);
      case 'check':
        return checkCommand(rest, io);
      case 'measure':
        return measureCommand(rest, io);
      case 'ratchet':
        return ratchetCommand(rest, io);
      case undefined:
      case 'help':
      case '--help':
      case '-h':
        io.stdout(USAGE);
        return command === undefined ? EXIT_INPUT : EXIT_OK;
      default:
        throw new UsageError(`unknown command '${command}'`);
    }
  } catch (e) {
    if (e instanceof UsageError || isParseArgsError(e)) {
      io.stderr(`rankfloor: ${(e as Error).message}\n${USAGE}`);
      return EXIT_INPUT;
    }
    io.stderr(`rankfloor: internal error (please report it with the config that caused it): ${(e as Error).message}\n`);
    return EXIT_INPUT;
  }
}

function isParseArgsError(e: unknown): boolean {
  return e instanceof TypeError && 'code' in e && String((e as { code: unknown }).code).startsWith('ERR_PARSE_ARGS');
}
