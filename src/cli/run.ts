/**
 * The command line: dispatch to a command. `run` never exits the process and never prints a
 * stack trace for bad input; it returns the exit code (0 pass, 1 policy violated, 2 usage or
 * input error) so that tests can call it directly. A command's modules are loaded only when that
 * command runs, so `--help`, `--version` and a usage error start in a few milliseconds.
 */
import { TOOL_VERSION } from '../version.js';
import { EXIT_INPUT, EXIT_OK, UsageError, type Io } from './cli-support.js';
import { COMMANDS, commandHelp, overview } from './help.js';

export type { Io } from './cli-support.js';
export { EXIT_FAIL, EXIT_INPUT, EXIT_OK } from './cli-support.js';

export async function run(argv: readonly string[], io: Io): Promise<number> {
  const [command, ...rest] = argv;
  const usage = COMMANDS.find((c) => c.name === command);
  try {
    switch (command) {
      case 'bounds':
      case 'check':
      case 'measure':
      case 'ratchet':
        if (rest.includes('--help') || rest.includes('-h')) {
          io.stdout(commandHelp(usage!));
          return EXIT_OK;
        }
        return await runCommand(command, rest, io);
      case '--version':
      case '-V':
      case 'version':
        io.stdout(`rankfloor ${TOOL_VERSION}\n`);
        return EXIT_OK;
      case 'help': {
        const topic = COMMANDS.find((c) => c.name === rest[0]);
        if (rest.length > 0 && !topic) throw new UsageError(`no help for '${rest[0]}'; commands: ${COMMANDS.map((c) => c.name).join(', ')}`);
        io.stdout(topic ? commandHelp(topic) : overview(TOOL_VERSION));
        return EXIT_OK;
      }
      case undefined:
      case '--help':
      case '-h':
        io.stdout(overview(TOOL_VERSION));
        return command === undefined ? EXIT_INPUT : EXIT_OK;
      default:
        throw new UsageError(`unknown command '${command}'`);
    }
  } catch (e) {
    if (e instanceof UsageError || isParseArgsError(e)) {
      const help = usage ? `run 'rankfloor ${usage.name} --help' for its options` : "run 'rankfloor --help' for the commands";
      io.stderr(`rankfloor: ${(e as Error).message}\n${help}\n`);
      return EXIT_INPUT;
    }
    io.stderr(`rankfloor: internal error (please report it with the config that caused it): ${(e as Error).message}\n`);
    return EXIT_INPUT;
  }
}

/** Loads the command's modules only when it runs. */
async function runCommand(command: 'bounds' | 'check' | 'measure' | 'ratchet', rest: readonly string[], io: Io): Promise<number> {
  switch (command) {
    case 'bounds':
      return (await import('./bounds-command.js')).boundsCommand(rest, io);
    case 'check':
      return (await import('./check-command.js')).checkCommand(rest, io);
    case 'measure':
      return (await import('./measure-command.js')).measureCommand(rest, io);
    case 'ratchet':
      return (await import('./ratchet-command.js')).ratchetCommand(rest, io);
  }
}

function isParseArgsError(e: unknown): boolean {
  return e instanceof TypeError && 'code' in e && String((e as { code: unknown }).code).startsWith('ERR_PARSE_ARGS');
}
