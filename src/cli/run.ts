/**
 * The command line: argument parsing and orchestration only. `run` never exits the process and
 * never prints a stack trace for bad input; it returns the exit code (0 pass, 1 policy violated,
 * 2 usage or input error) so that tests can call it directly.
 */
import { readFileSync } from 'node:fs';
import { parseArgs } from 'node:util';
import type { Diagnostic } from '../diagnostic.js';
import { loadConfigFile } from '../config/load-config.js';
import { defaultPartitions, resolvePartition, type Partition } from '../partition/partition.js';
import { computeBounds } from '../cut/bounds.js';
import type { Surrogate } from '../cut/types.js';
import { renderDiagnostic } from '../report/diagnostics.js';
import { boundsJson } from '../report/bounds-json.js';
import { boundsText } from '../report/bounds-text.js';

export interface Io {
  readonly stdout: (text: string) => void;
  readonly stderr: (text: string) => void;
}

export const EXIT_OK = 0;
export const EXIT_FAIL = 1;
export const EXIT_INPUT = 2;

const USAGE = `usage:
  rankfloor bounds CONFIG [--partition P]... [--model-path PTR] [--surrogate tree|overlap] [--format text|json]

partitions: start-end, interleaved (1D); left-right, top-bottom, checkerboard (2D);
            positions:0,2,5; block:r0-r1,c0-c1 (2D) or block:a-b (1D), half-open ranges
`;

class UsageError extends Error {
  override readonly name = 'UsageError';
}

export async function run(argv: readonly string[], io: Io): Promise<number> {
  const [command, ...rest] = argv;
  try {
    switch (command) {
      case 'bounds':
        return boundsCommand(rest, io);
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
    if (e instanceof UsageError || (e instanceof TypeError && 'code' in e && String(e.code).startsWith('ERR_PARSE_ARGS'))) {
      io.stderr(`rankfloor: ${(e as Error).message}\n${USAGE}`);
      return EXIT_INPUT;
    }
    io.stderr(`rankfloor: internal error (please report it with the config that caused it): ${(e as Error).message}\n`);
    return EXIT_INPUT;
  }
}

function boundsCommand(args: readonly string[], io: Io): number {
  const { values, positionals } = parseArgs({
    args: [...args],
    allowPositionals: true,
    strict: true,
    options: {
      partition: { type: 'string', short: 'p', multiple: true },
      'model-path': { type: 'string' },
      surrogate: { type: 'string' },
      format: { type: 'string' },
    },
  });
  if (positionals.length !== 1) throw new UsageError('bounds takes exactly one CONFIG file');
  const surrogate = oneOf(values.surrogate ?? 'tree', ['tree', 'overlap'], '--surrogate') as Surrogate;
  const format = oneOf(values.format ?? 'text', ['text', 'json'], '--format');
  const file = positionals[0]!;
  const loaded = loadConfigFile(file, values['model-path'] === undefined ? {} : { modelPath: values['model-path'] });
  if (!loaded.ok) return reportDiagnostics(loaded.diagnostics, io);
  const model = loaded.model;
  const shape = model.kind === 'explicit' ? model.shape : model.input.shape;
  const specs = values.partition ?? defaultPartitions(shape);
  const partitions: Partition[] = [];
  for (const spec of specs) {
    const r = resolvePartition(spec, shape);
    if (!r.ok) throw new UsageError(`--partition ${spec}: ${r.message}`);
    partitions.push(r.partition);
  }
  const outcome = computeBounds(model, partitions, { surrogate });
  if (!outcome.ok) return reportDiagnostics(outcome.diagnostics, io);
  io.stdout(format === 'json' ? boundsJson(outcome.result) : boundsText(outcome.result));
  return EXIT_OK;
}

function oneOf(value: string, allowed: readonly string[], option: string): string {
  if (!allowed.includes(value)) throw new UsageError(`${option} must be one of ${allowed.join(', ')} (got '${value}')`);
  return value;
}

/** Prints diagnostics with source excerpts and returns the input-error exit code. */
export function reportDiagnostics(diagnostics: readonly Diagnostic[], io: Io): number {
  const sources = new Map<string, string | undefined>();
  for (const d of diagnostics) {
    if (!sources.has(d.file)) {
      let text: string | undefined;
      try {
        text = readFileSync(d.file, 'utf8');
      } catch {
        text = undefined;
      }
      sources.set(d.file, text);
    }
    io.stderr(renderDiagnostic(d, sources.get(d.file)) + '\n');
  }
  return EXIT_INPUT;
}
