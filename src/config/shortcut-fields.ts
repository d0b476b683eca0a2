/**
 * Pointwise layers written as fields of a weighted layer or a block — `norm: batch` (or
 * `batch_norm: true`), `activation: relu`, `dropout: 0.1` — become pointwise layers after it, in
 * the order normalisation → activation → dropout, the order most networks apply them in (common
 * practice; the surrogate reads all three as the identity, so the order never changes a bound).
 * Each layer's span is its field (key and value), so a report can point at `activation: relu`.
 */
import type { Located } from './located-value.js';
import { displayPath, pointerOf } from './located-value.js';
import type { PointwiseOp } from './pointwise-ops.js';
import { normaliseWord, opsOf, pointwiseOpOf } from './pointwise-ops.js';
import { pointwiseOpNamed } from './kind-names.js';
import { lookupChoice, readBoolean, readRate, type ReadContext } from './field-readers.js';
import type { LayerFields } from './layer-fields.js';
import type { MadeLayer } from './layer-templates.js';
import { spanJoin } from './source-span.js';
import { closest } from '../text/suggest.js';

/** `norm:` values beside the op names themselves (`batch_norm`, `BatchNorm2d`). */
const NORM_WORDS = new Map<string, string>([
  ['batch', 'batch_norm'],
  ['layer', 'layer_norm'],
  ['group', 'group_norm'],
  ['instance', 'instance_norm'],
  ['local_response', 'local_response_norm'],
  ['rms', 'rms_norm'],
]);

/** Values that mean "no such layer". */
const NONE_WORDS = new Set(['none', 'null', 'linear', 'identity', 'false', 'off']);

const BOOLEAN_NORMS: readonly [string, string][] = [
  ['batch_norm', 'batch_norm'],
  ['layer_norm', 'layer_norm'],
];

export function readShortcutFields(fields: LayerFields, ctx: ReadContext): MadeLayer[] | undefined {
  let ok = true;
  const out: MadeLayer[] = [];
  const add = (field: string, node: Located, op: PointwiseOp): void => {
    const keySpan = fields.keySpan(field) ?? node.span;
    out.push({
      body: { kind: 'pointwise', family: op.family, op: op.op },
      site: { path: pointerOf(node), span: spanJoin(keySpan, node.span), fieldSpans: { [field]: node.span } },
    });
  };

  const norms: { field: string; node: Located; op: PointwiseOp }[] = [];
  const normNode = fields.get('norm');
  if (normNode) {
    const op = readNorm(normNode, ctx);
    if (op === undefined) ok = false;
    else if (op !== null) norms.push({ field: 'norm', node: normNode, op });
  }
  for (const [field, opName] of BOOLEAN_NORMS) {
    const node = fields.get(field);
    if (!node) continue;
    const on = readBoolean(node, ctx);
    if (on === undefined) ok = false;
    else if (on) norms.push({ field, node, op: pointwiseOpOf(normaliseWord(opName))! });
  }
  if (norms.length > 1) {
    const second = norms[1]!;
    ctx.sink.error(
      'config/conflicting-fields',
      `${displayPath(fields.body)} gives a normalisation twice ('${fields.written(norms[0]!.field)}' and '${fields.written(second.field)}'); keep one`,
      fields.keySpan(second.field) ?? second.node.span,
    );
    ok = false;
  } else if (norms.length === 1) {
    add(norms[0]!.field, norms[0]!.node, norms[0]!.op);
  }

  const actNode = fields.get('activation');
  if (actNode) {
    const op = readActivation(actNode, ctx);
    if (op === undefined) ok = false;
    else if (op !== null) add('activation', actNode, op);
  }

  const dropNode = fields.get('dropout');
  if (dropNode) {
    const rate = readRate(dropNode, ctx);
    if (rate === undefined) ok = false;
    else if (rate > 0) add('dropout', dropNode, pointwiseOpOf('dropout')!);
  }
  return ok ? out : undefined;
}

function isNone(node: Located): boolean {
  if (node.kind !== 'scalar') return false;
  if (node.value === null || node.value === false) return true;
  return typeof node.value === 'string' && NONE_WORDS.has(node.value.toLowerCase());
}

/** null: the field says "none". */
function readNorm(node: Located, ctx: ReadContext): PointwiseOp | null | undefined {
  if (isNone(node)) return null;
  if (node.kind === 'scalar' && typeof node.value === 'string') {
    const short = lookupChoice(node.value, NORM_WORDS);
    const op = short !== undefined ? pointwiseOpOf(normaliseWord(short)) : pointwiseOpNamed(node.value);
    if (op?.family === 'normalisation') return op;
  }
  return badOp(node, ctx, 'a normalisation', [...NORM_WORDS.keys(), 'none']);
}

/** An activation function name; null for `linear`/`none`. */
export function readActivation(node: Located, ctx: ReadContext, noneAllowed = true): PointwiseOp | null | undefined {
  if (noneAllowed && isNone(node)) return null;
  if (node.kind === 'scalar' && typeof node.value === 'string') {
    const op = pointwiseOpNamed(node.value);
    if (op?.family === 'activation') return op;
    if (op) {
      ctx.sink.error('config/invalid-value', `${displayPath(node)} names ${op.op}, which is a ${op.family} layer, not an activation`, node.span);
      return undefined;
    }
  }
  return badOp(node, ctx, 'an activation function', [...opsOf('activation'), ...(noneAllowed ? ['linear'] : [])]);
}

function badOp(node: Located, ctx: ReadContext, what: string, known: readonly string[]): undefined {
  const word = node.kind === 'scalar' && typeof node.value === 'string' ? node.value : undefined;
  const guess = word ? closest(word, known) : undefined;
  const got = word !== undefined ? `'${word}'` : node.kind === 'scalar' ? String(node.value) : `a ${node.kind === 'map' ? 'mapping' : 'list'}`;
  ctx.sink.error(
    word !== undefined ? 'config/invalid-value' : 'config/type',
    `${displayPath(node)} must be ${what} (${known.join(', ')}), got ${got}${guess ? ` (did you mean '${guess}'?)` : ''}`,
    node.span,
  );
  return undefined;
}
