/**
 * Typed reads of layer field values that report what is wrong with a value where it is written:
 * a positive integer, a size per grid axis (`3` or `[3, 5]`), a choice among words with their
 * spellings, a boolean, a rate. Each returns undefined after reporting, so a layer reader can go
 * on and report every problem of the model in one pass. Messages name the field as written
 * (`model.layers[0].out_channels`), never a canonical name the user did not type.
 */
import type { DiagnosticSink } from './diagnostic-sink.js';
import { describeValue, displayPath, type Located } from './located-value.js';
import { closest } from '../text/suggest.js';
import { normaliseWord } from './pointwise-ops.js';
import type { ParameterUse } from './model.js';

export interface ReadContext {
  readonly sink: DiagnosticSink;
  /** Grid axes of the input (1 or 2), when the input shape is valid. */
  readonly dims: number | undefined;
  /** `[32, 32]`, for messages about per-axis lists. */
  readonly shapeText: string;
  /** `model.input.shape`, likewise. */
  readonly shapePath: string;
  /** In an architecture definition: the parameters a value (and everything inside it) was computed from. */
  readonly paramsOf?: (node: Located) => readonly ParameterUse[];
}

function isInteger(node: Located): node is Located & { kind: 'scalar'; value: number } {
  return node.kind === 'scalar' && typeof node.value === 'number' && Number.isSafeInteger(node.value);
}

function wrong(node: Located, ctx: ReadContext, what: string, numeric: boolean): undefined {
  const isNumber = node.kind === 'scalar' && typeof node.value === 'number';
  const code = numeric && isNumber ? 'config/invalid-number' : 'config/type';
  ctx.sink.error(code, `${displayPath(node)} must be ${what}, got ${describeValue(node)}`, node.span);
  return undefined;
}

export function readPositiveInteger(node: Located, ctx: ReadContext): number | undefined {
  return isInteger(node) && node.value >= 1 ? node.value : wrong(node, ctx, 'a positive integer', true);
}

export function readNonNegativeInteger(node: Located, ctx: ReadContext): number | undefined {
  return isInteger(node) && node.value >= 0 ? node.value : wrong(node, ctx, 'a non-negative integer', true);
}

/**
 * A size for every grid axis: one integer (broadcast) or a list with one entry per axis of the
 * input. `min` is 1 for kernels, strides and factors, 0 for padding amounts.
 */
export function readPerAxis(node: Located, ctx: ReadContext, min: 0 | 1 = 1): number[] | undefined {
  const one = min === 1 ? readPositiveInteger : readNonNegativeInteger;
  const noun = min === 1 ? 'positive integer' : 'non-negative integer';
  if (node.kind === 'scalar' && typeof node.value === 'number') {
    const v = one(node, ctx);
    return v === undefined || ctx.dims === undefined ? undefined : new Array<number>(ctx.dims).fill(v);
  }
  if (node.kind !== 'seq') {
    const form = ctx.dims === 1 ? '[n]' : '[height, width]';
    return wrong(node, ctx, `a ${noun} or a list ${form}`, false);
  }
  const values = node.items.map((item) => one(item, ctx));
  if (values.some((v) => v === undefined) || ctx.dims === undefined) return undefined;
  if (values.length !== ctx.dims) {
    const form = ctx.dims === 1 ? '[n]' : '[height, width]';
    ctx.sink.error(
      'config/dimension-mismatch',
      `${displayPath(node)} has ${values.length} entries, but ${ctx.shapePath} is ${ctx.shapeText} (${ctx.dims}D); give one integer for every axis or ${form}`,
      node.span,
    );
    return undefined;
  }
  return values as number[];
}

export function readBoolean(node: Located, ctx: ReadContext): boolean | undefined {
  return node.kind === 'scalar' && typeof node.value === 'boolean' ? node.value : wrong(node, ctx, 'true or false', false);
}

/** A field that is read only at one value (`align_corners: false`); other values are explained. */
export function readOnly(node: Located, ctx: ReadContext, value: boolean, why: string): boolean {
  const v = readBoolean(node, ctx);
  if (v === undefined) return false;
  if (v === value) return true;
  ctx.sink.error('config/unsupported-value', `${displayPath(node)} is ${String(v)}, which is not read: ${why}`, node.span);
  return false;
}

/**
 * One of a set of words, compared like kind names (case, `_` and `-` ignored). `choices` maps
 * each accepted spelling to its value; `shown` are the spellings the message lists.
 */
export function readChoice<T>(node: Located, ctx: ReadContext, choices: ReadonlyMap<string, T>, shown: readonly string[]): T | undefined {
  if (node.kind === 'scalar' && typeof node.value === 'string') {
    const hit = lookupChoice(node.value, choices);
    if (hit !== undefined) return hit;
    const guess = closest(normaliseWord(node.value), shown.map(normaliseWord));
    const said = guess ? shown.find((s) => normaliseWord(s) === guess) : undefined;
    ctx.sink.error(
      'config/invalid-value',
      `${displayPath(node)} must be one of ${shown.map((s) => `'${s}'`).join(', ')}, got ${describeValue(node)}${said ? ` (did you mean '${said}'?)` : ''}`,
      node.span,
    );
    return undefined;
  }
  return wrong(node, ctx, `one of ${shown.map((s) => `'${s}'`).join(', ')}`, false);
}

export function lookupChoice<T>(word: string, choices: ReadonlyMap<string, T>): T | undefined {
  const n = normaliseWord(word);
  for (const [k, v] of choices) if (normaliseWord(k) === n) return v;
  return undefined;
}

/** A probability in [0, 1) (dropout). */
export function readRate(node: Located, ctx: ReadContext): number | undefined {
  if (node.kind === 'scalar' && typeof node.value === 'number' && node.value >= 0 && node.value < 1) return node.value;
  return wrong(node, ctx, 'a number from 0 up to (not including) 1', true);
}

/** A non-empty string. */
export function readText(node: Located, ctx: ReadContext): string | undefined {
  if (node.kind === 'scalar' && typeof node.value === 'string') {
    if (node.value.length > 0) return node.value;
    ctx.sink.error('config/invalid-value', `${displayPath(node)} must be a non-empty string`, node.span);
    return undefined;
  }
  return wrong(node, ctx, 'a string', false);
}
