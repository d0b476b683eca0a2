/** `rankfloor bounds`: bounds per partition for one config, and the picture report on request. Orchestration only. */
import { parseArgs } from 'node:util';
import { loadConfigFile } from '../config/load-config.js';
import { defaultPartitions, resolvePartition, type Partition } from '../partition/partition.js';
import { computeBounds } from '../cut/bounds.js';
import type { Surrogate } from '../cut/types.js';
import { boundsJson } from '../report/bounds-json.js';
import { boundsText } from '../report/bounds-text.js';
import { ReportWriteError, writeReport } from '../check/write-report.js';
import { EXIT_INPUT, EXIT_OK, UsageError, oneOf, printDiagnostics, type Io } from './cli-support.js';
import { BOUNDS_HELP, parseOptions } from './help.js';

export async function boundsCommand(args: readonly string[], io: Io): Promise<number> {
  const { values, positionals } = parseArgs({ args: [...args], allowPositionals: true, strict: true, options: parseOptions(BOUNDS_HELP) }) as {
    values: { partition?: string[]; 'model-path'?: string; surrogate?: string; format?: string; picture?: string };
    positionals: string[];
  };
  if (positionals.length !== 1) throw new UsageError('bounds takes exactly one CONFIG file');
  const surrogate = oneOf(values.surrogate ?? 'tree', ['tree', 'overlap'], '--surrogate') as Surrogate;
  const format = oneOf(values.format ?? 'text', ['text', 'json'], '--format');
  const file = positionals[0]!;
  const loaded = loadConfigFile(file, values['model-path'] === undefined ? {} : { modelPath: values['model-path'] });
  if (!loaded.ok) {
    printDiagnostics(loaded.diagnostics, io);
    return EXIT_INPUT;
  }
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
  if (!outcome.ok) {
    printDiagnostics(outcome.diagnostics, io);
    return EXIT_INPUT;
  }
  const architecture = model.kind === 'layered' ? model.architecture : undefined;
  io.stdout(format === 'json' ? boundsJson(outcome.result, architecture) : boundsText(outcome.result, architecture));
  if (values.picture) {
    try {
      writeReport(values.picture, (await import('../report/picture-html.js')).boundsPicture(outcome.result, model, partitions));
    } catch (e) {
      if (!(e instanceof ReportWriteError)) throw e;
      io.stderr(`rankfloor: ${e.message}\n`);
      return EXIT_INPUT;
    }
  }
  return EXIT_OK;
}
