/** `rankfloor ratchet`: a blessed config's proven capacities, less a margin, as a policy's minimums. Orchestration only. */
import { parseArgs } from 'node:util';
import type { Surrogate } from '../cut/types.js';
import { runRatchet } from '../data/ratchet-job.js';
import { ratchetJson, ratchetText } from '../data/ratchet-report.js';
import { parseOptions, RATCHET_HELP } from './help.js';
import { EXIT_INPUT, EXIT_OK, UsageError, oneOf, printDiagnostics, type Io } from './cli-support.js';
import { positiveInteger } from './measure-command.js';

interface RatchetValues {
  margin?: string;
  partition?: string[];
  policy?: string;
  write?: boolean;
  root?: string;
  'model-path'?: string;
  surrogate?: string;
  format?: string;
}

export function ratchetCommand(args: readonly string[], io: Io): number {
  const { values, positionals } = parseArgs({ args: [...args], allowPositionals: true, strict: true, options: parseOptions(RATCHET_HELP) }) as {
    values: RatchetValues;
    positionals: string[];
  };
  if (positionals.length !== 1) throw new UsageError('ratchet takes exactly one CONFIG file');
  const format = oneOf(values.format ?? 'text', ['text', 'json'], '--format');
  const result = runRatchet({
    config: positionals[0]!,
    margin: values.margin === undefined ? 0 : positiveInteger(values.margin, '--margin', 0),
    ...(values.surrogate !== undefined ? { surrogate: oneOf(values.surrogate, ['tree', 'overlap'], '--surrogate') as Surrogate } : {}),
    ...(values['model-path'] !== undefined ? { modelPath: values['model-path'] } : {}),
    ...(values.partition ? { partitions: values.partition } : {}),
    ...(values.policy !== undefined ? { policy: values.policy } : {}),
    write: values.write ?? false,
    cwd: process.cwd(),
    ...(values.root !== undefined ? { root: values.root } : {}),
  });
  if (!result.ok) {
    if ('usage' in result) throw new UsageError(result.usage);
    printDiagnostics(result.diagnostics, io);
    return EXIT_INPUT;
  }
  io.stdout(format === 'json' ? ratchetJson(result.outcome) : ratchetText(result.outcome));
  return EXIT_OK;
}
