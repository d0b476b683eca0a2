/**
 * `transformer_block`: sugar of our own for the block most transformers repeat, expanded (like
 * `residual`) into the layers it stands for. Pre-norm (the default):
 *
 *   residual{layer_norm, attention} → residual{layer_norm, dense(mlp), activation, dense(width)}
 *
 * post-norm: residual{attention} → layer_norm → residual{dense(mlp), activation, dense(width)} →
 * layer_norm. The MLP width is `mlp`, or `mlp_ratio` (default 4, common practice) times the block
 * width; the block width is `width` when stated, else the width of the block's input (filled in
 * once shapes are known). Normalisation and dropout are the identity in the surrogate, so pre- and
 * post-norm blocks have the same bounds. `depth: N` makes a stack of N blocks (a `repeat`).
 */
import { displayPath } from './located-value.js';
import { readChoice, readPositiveInteger, type ReadContext } from './field-readers.js';
import type { LayerBody, MadeLayer, Site, Stated, Template } from './layer-templates.js';
import { optionalPositive, readBias, type EntryRead, type ReaderContext } from './entry-read.js';
import { readActivation } from './shortcut-fields.js';
import { pointwiseOpOf, type PointwiseOp } from './pointwise-ops.js';
import { readAttentionFields, stated } from './read-sequence-layers.js';

/** Common practice: the MLP is four times as wide as the block (Vaswani et al. 2017, 2048 for 512). */
const DEFAULT_MLP_RATIO = 4;

const PLACEMENTS = new Map<string, 'pre' | 'post'>([
  ['pre', 'pre'],
  ['pre_norm', 'pre'],
  ['prenorm', 'pre'],
  ['post', 'post'],
  ['post_norm', 'post'],
  ['postnorm', 'post'],
]);

const NORM_TYPES = new Map<string, string>([
  ['layer', 'layernorm'],
  ['layer_norm', 'layernorm'],
  ['layernorm', 'layernorm'],
  ['rms', 'rmsnorm'],
  ['rms_norm', 'rmsnorm'],
  ['rmsnorm', 'rmsnorm'],
]);

/** `norm: pre|post` or `norm_first: true|false` (not both). */
function readPlacement(r: EntryRead, ctx: ReadContext): 'pre' | 'post' | undefined {
  const normNode = r.fields.get('norm');
  const firstNode = r.fields.get('norm_first');
  if (normNode && firstNode) {
    ctx.sink.error('config/conflicting-fields', `${displayPath(r.entry.body)} gives both '${r.fields.written('norm')}' and '${r.fields.written('norm_first')}'; keep one of them`, r.fields.keySpan('norm_first') ?? firstNode.span);
    return undefined;
  }
  if (normNode) return readChoice(normNode, ctx, PLACEMENTS, ['pre', 'post']);
  if (firstNode) {
    if (firstNode.kind === 'scalar' && typeof firstNode.value === 'boolean') return firstNode.value ? 'pre' : 'post';
    ctx.sink.error('config/type', `${displayPath(firstNode)} must be true or false, got ${firstNode.kind === 'scalar' ? String(firstNode.value) : `a ${firstNode.kind === 'map' ? 'mapping' : 'list'}`}`, firstNode.span);
    return undefined;
  }
  return 'pre';
}

/** The MLP's hidden width: a number, or a multiple of the block width still to be resolved. */
type MlpWidth = { readonly units: number } | { readonly ratio: Stated };

function readMlp(r: EntryRead, ctx: ReadContext, width: number | undefined): MlpWidth | undefined {
  const mlpNode = r.fields.get('mlp');
  const ratioNode = r.fields.get('mlp_ratio');
  if (mlpNode && ratioNode) {
    ctx.sink.error('config/conflicting-fields', `${displayPath(r.entry.body)} gives both '${r.fields.written('mlp')}' and '${r.fields.written('mlp_ratio')}'; give the MLP's width or its ratio, not both`, r.fields.keySpan('mlp_ratio') ?? ratioNode.span);
    return undefined;
  }
  if (mlpNode) {
    const units = readPositiveInteger(mlpNode, ctx);
    return units === undefined ? undefined : { units };
  }
  let ratio: Stated = { value: DEFAULT_MLP_RATIO, span: r.entry.kindSpan, where: `the default mlp_ratio ${DEFAULT_MLP_RATIO} of ${displayPath(r.entry.body)}` };
  if (ratioNode) {
    if (ratioNode.kind !== 'scalar' || typeof ratioNode.value !== 'number' || !(ratioNode.value > 0) || !Number.isFinite(ratioNode.value)) {
      ctx.sink.error('config/type', `${displayPath(ratioNode)} must be a positive number, got ${ratioNode.kind === 'scalar' ? String(ratioNode.value) : `a ${ratioNode.kind === 'map' ? 'mapping' : 'list'}`}`, ratioNode.span);
      return undefined;
    }
    ratio = stated(ratioNode, ratioNode.value);
  }
  if (width === undefined) return { ratio };
  const units = ratio.value * width;
  if (!Number.isSafeInteger(units)) {
    ctx.sink.error('config/mlp-width', `${ratio.where} is ${ratio.value}, and ${ratio.value} × the width ${width} is not a whole number of units; give the MLP's width instead (e.g. mlp: ${Math.max(1, Math.round(units))})`, ratio.span);
    return undefined;
  }
  return { units };
}

export function readTransformerBlock(r: EntryRead, ctx: ReaderContext): Template | undefined {
  const attention = readAttentionFields(r, ctx);
  const widthNode = r.fields.get('width');
  const width = widthNode?.kind === 'scalar' && typeof widthNode.value === 'number' && Number.isSafeInteger(widthNode.value) && widthNode.value >= 1 ? widthNode.value : undefined;
  const mlp = readMlp(r, ctx, width);
  const placement = readPlacement(r, ctx);
  const typeNode = r.fields.get('norm_type');
  const normWord = typeNode ? readChoice(typeNode, ctx, NORM_TYPES, ['layer', 'rms']) : 'layernorm';
  const actNode = r.fields.get('activation');
  const act = actNode ? readActivation(actNode, ctx) : pointwiseOpOf('gelu')!;
  const depth = optionalPositive(r, 'depth', ctx);
  const bias = readBias(r, ctx);
  if (!attention || !mlp || !placement || !normWord || act === undefined || depth === false || !bias) return undefined;

  const at = (part: string, fields: readonly string[] = []): Site => ({ path: `${r.site.path}/${part}`, span: r.site.span, fieldSpans: r.fields.spans(fields) });
  const made = (part: string, body: LayerBody, fields: readonly string[] = [], more: Partial<MadeLayer> = {}): MadeLayer => ({ body, site: at(part, fields), ...more });
  const norm = (part: string): MadeLayer => {
    const op = pointwiseOpOf(normWord)!;
    return made(part, { kind: 'pointwise', family: op.family, op: op.op }, ['norm', 'norm_first', 'norm_type']);
  };
  const activation = (op: PointwiseOp): MadeLayer => made('mlp/activation', { kind: 'pointwise', family: op.family, op: op.op }, ['activation']);
  const sum = (part: string): MadeLayer => made(part, { kind: 'merge', mode: 'sum', origin: 'residual' });

  const attn = made('attention', attention.body, ['heads', 'head_dim', 'width', 'causal', 'mask', 'window'], attention.declared.length > 0 ? { declared: attention.declared } : {});
  const mlpIn =
    'units' in mlp
      ? made('mlp/in', { kind: 'dense', units: mlp.units, ...bias }, r.fields.has('mlp') ? ['mlp'] : [])
      : made('mlp/in', { kind: 'dense', units: 0, ...bias }, [], { unitsPerWidth: { ...mlp.ratio, offset: 0 } });
  // The map back reads the MLP's width and writes the block's: the width the MLP's first map reads.
  const back = { value: 1, span: r.entry.kindSpan, where: `the output of ${displayPath(r.entry.body)}`, offset: act ? -2 : -1 };
  const mlpOut = width !== undefined ? made('mlp/out', { kind: 'dense', units: width, ...bias }, ['width']) : made('mlp/out', { kind: 'dense', units: 0, ...bias }, [], { unitsPerWidth: back });
  const mlpPath = [mlpIn, ...(act ? [activation(act)] : []), mlpOut];

  const chain = (layers: MadeLayer[]): Template => ({ t: 'chain', layers });
  const residual = (main: MadeLayer[], merge: MadeLayer, after: MadeLayer[]): Template => ({ t: 'merge', paths: [[chain(main)], []], refs: [], merge, after });
  const blocks: Template[] =
    placement === 'pre'
      ? [residual([norm('attention/norm'), attn], sum('attention/sum'), []), residual([norm('mlp/norm'), ...mlpPath], sum('mlp/sum'), [])]
      : [residual([attn], sum('attention/sum'), [norm('attention/norm')]), residual(mlpPath, sum('mlp/sum'), [norm('mlp/norm')])];
  const one: Template = { t: 'sequence', body: blocks, ...(r.name ? { name: r.name } : {}) };
  const depthNode = r.fields.get('depth');
  if (depth === undefined || !depthNode) return one;
  return { t: 'repeat', times: depth, timesSpan: depthNode.span, timesPath: displayPath(depthNode), body: [one] };
}
