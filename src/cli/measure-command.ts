/** `rankfloor measure`: measured dependency per partition from a data sample; minimums into a policy. Orchestration only. */
import { parseArgs } from 'node:util';
import { renderDiagnostic } from '../report/diagnostics.js';
import { runMeasure } from '../data/measure-job.js';
import { measureJson, measureText } from '../data/measure-report.js';
import { parseOptions, MEASURE_HELP } from './help.js';
import { EXIT_INPUT, EXIT_OK, UsageError, oneOf, printDiagnostics, type Io } from './cli-support.js';

interface MeasureValues {
  shape?: string;
  range?: string;
  labels?: string;
  'label-column'?: string;
  unlabelled?: boolean;
  length?: string;
  partition?: string[];
  policy?: string;
  write?: boolean;
  root?: string;
  batch?: string;
  samples?: string;
  epsilon?: string;
  format?: string;
}

export function measureCommand(args: readonly string[], io: Io): number {
  const { values, positionals } = parseArgs({ args: [...args], allowPositionals: true, strict: true, options: parseOptions(MEASURE_HELP) }) as {
    values: MeasureValues;
    positionals: string[];
  };
  if (positionals.length !== 1) throw new UsageError('measure takes exactly one DATA file or image folder');
  const format = oneOf(values.format ?? 'text', ['text', 'json'], '--format');
  const epsilon = values.epsilon === undefined ? undefined : Number(values.epsilon);
  if (epsilon !== undefined && !(epsilon > 0 && epsilon < 1)) throw new UsageError(`--epsilon must be a number between 0 and 1 (got '${values.epsilon}')`);
  const range = values.range === undefined ? undefined : numberList(values.range, '--range', false);
  if (range && (range.length !== 2 || !(range[0]! < range[1]!))) throw new UsageError(`--range takes LO,HI with LO < HI (got '${values.range}')`);
  const result = runMeasure({
    data: positionals[0]!,
    ...(values.shape !== undefined ? { shape: shapeOf(values.shape) } : {}),
    ...(range ? { range: { lo: range[0]!, hi: range[1]! } } : {}),
    ...(values.labels !== undefined ? { labelsFile: values.labels } : {}),
    ...(values['label-column'] !== undefined ? { labelColumn: values['label-column'] } : {}),
    unlabelled: values.unlabelled ?? false,
    ...(values.length !== undefined ? { length: positiveInteger(values.length, '--length') } : {}),
    ...(values.partition ? { partitions: values.partition } : {}),
    ...(values.policy !== undefined ? { policy: values.policy } : {}),
    write: values.write ?? false,
    cwd: process.cwd(),
    ...(values.root !== undefined ? { root: values.root } : {}),
    ...(values.batch !== undefined ? { batch: positiveInteger(values.batch, '--batch', 4) } : {}),
    ...(values.samples !== undefined ? { samples: positiveInteger(values.samples, '--samples', 2) } : {}),
    ...(epsilon !== undefined ? { epsilon } : {}),
  });
  if (!result.ok) {
    if ('usage' in result) throw new UsageError(result.usage);
    // Data files can be large: their diagnostics print without an excerpt; policy files with one.
    const fromData = result.diagnostics.filter((d) => d.code.startsWith('data/') && d.code !== 'data/partition-shape');
    for (const d of fromData) io.stderr(renderDiagnostic(d) + '\n');
    printDiagnostics(result.diagnostics.filter((d) => !fromData.includes(d)), io);
    return EXIT_INPUT;
  }
  io.stdout(format === 'json' ? measureJson(result.outcome) : measureText(result.outcome));
  return EXIT_OK;
}

export function positiveInteger(text: string, option: string, min = 1): number {
  if (!/^\d+$/.test(text.trim()) || Number(text) < min || !Number.isSafeInteger(Number(text))) throw new UsageError(`${option} must be a whole number, at least ${min} (got '${text}')`);
  return Number(text);
}

function numberList(text: string, option: string, integers: boolean): number[] {
  const parts = text.split(/[,x×]/).map((s) => s.trim());
  const numbers = parts.map(Number);
  if (parts.some((p) => p === '') || numbers.some((n) => !Number.isFinite(n) || (integers && (!Number.isSafeInteger(n) || n < 1)))) {
    throw new UsageError(`${option} takes ${integers ? 'positive whole numbers' : 'numbers'} separated by commas (got '${text}')`);
  }
  return numbers;
}

function shapeOf(text: string): number[] {
  const shape = numberList(text, '--shape', true);
  if (shape.length < 1 || shape.length > 2) throw new UsageError(`--shape takes LENGTH or HEIGHT,WIDTH (got '${text}')`);
  return shape;
}
