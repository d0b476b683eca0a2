/**
 * Readers of the blocks: `repeat` and `sequence` (lists of layers), `residual` (main path +
 * shortcut), `branches` (parallel paths merged by concatenation or sum) and the skips `add` /
 * `concat` (`from:` an earlier named layer). Blocks become merge layers at expansion; here their
 * paths are read once and their names and references are recorded.
 */
import { displayPath, type Located } from './located-value.js';
import { readChoice, readPositiveInteger } from './field-readers.js';
import type { MadeLayer, NameRef, Template } from './layer-templates.js';
import { requireField, type EntryRead, type ReaderContext } from './entry-read.js';
import { readShortcutFields } from './shortcut-fields.js';

export function readRepeat(r: EntryRead, ctx: ReaderContext): Template | undefined {
  const hasTimes = requireField(r, 'times', 'how many copies', ctx);
  const hasLayers = requireField(r, 'layers', 'the layers to repeat', ctx);
  const timesNode = r.fields.get('times');
  const times = timesNode && readPositiveInteger(timesNode, ctx);
  const layersNode = r.fields.get('layers');
  const body = layersNode && ctx.readList(layersNode, false);
  if (!hasTimes || !hasLayers || !timesNode || times === undefined || !body) return undefined;
  const timesParams = ctx.paramsOf?.(timesNode) ?? [];
  return {
    t: 'repeat',
    times,
    timesSpan: timesNode.span,
    timesPath: displayPath(timesNode),
    ...(timesParams.length > 0 ? { timesParams } : {}),
    body,
    ...(r.name ? { name: r.name } : {}),
  };
}

export function readSequence(r: EntryRead, ctx: ReaderContext): Template | undefined {
  if (!requireField(r, 'layers', 'the layers, in order', ctx)) return undefined;
  const body = ctx.readList(r.fields.get('layers')!, false);
  if (!body) return undefined;
  return { t: 'sequence', body, ...(r.name ? { name: r.name } : {}) };
}

function mergeOf(r: EntryRead, mode: 'sum' | 'concat', origin: 'residual' | 'branches' | 'skip'): MadeLayer {
  return { body: { kind: 'merge', mode, origin }, site: r.site, labelled: true };
}

function block(r: EntryRead, ctx: ReaderContext, paths: (Template[] | undefined)[], refs: NameRef[] | undefined, merge: MadeLayer, ok: boolean): Template | undefined {
  const after = readShortcutFields(r.fields, ctx);
  if (!ok || !after || !refs || paths.some((p) => p === undefined)) return undefined;
  return { t: 'merge', paths: paths as Template[][], refs, merge, after, ...(r.name ? { name: r.name } : {}) };
}

export function readResidual(r: EntryRead, ctx: ReaderContext): Template | undefined {
  const ok = requireField(r, 'layers', 'the main path, a list of layers', ctx);
  const mainNode = r.fields.get('layers');
  const main = mainNode && ctx.readList(mainNode, false);
  const shortcutNode = r.fields.get('shortcut');
  const shortcut = shortcutNode ? ctx.readPath(shortcutNode) : [];
  return block(r, ctx, [main, shortcut], [], mergeOf(r, 'sum', 'residual'), ok);
}

const MERGE_MODES = new Map<string, 'sum' | 'concat'>([
  ['concat', 'concat'],
  ['concatenate', 'concat'],
  ['cat', 'concat'],
  ['sum', 'sum'],
  ['add', 'sum'],
]);

export function readBranches(r: EntryRead, ctx: ReaderContext): Template | undefined {
  let ok = requireField(r, 'paths', 'a list of paths, each a list of layers', ctx);
  const modeNode = r.fields.get('merge');
  const mode = modeNode ? readChoice(modeNode, ctx, MERGE_MODES, ['concat', 'sum']) : 'concat';
  if (!mode) ok = false;
  const pathsNode = r.fields.get('paths');
  const paths: (Template[] | undefined)[] = [];
  if (pathsNode) {
    if (pathsNode.kind !== 'seq' || pathsNode.items.length < 2) {
      const got = pathsNode.kind === 'seq' ? `${pathsNode.items.length} path${pathsNode.items.length === 1 ? '' : 's'}` : 'no list';
      ctx.sink.error('config/branches', `${displayPath(pathsNode)} must list at least two paths (each a list of layers; an empty list is the identity), got ${got}`, pathsNode.span);
      ok = false;
    } else {
      for (const p of pathsNode.items) paths.push(ctx.readPath(p));
    }
  }
  return block(r, ctx, paths, [], mergeOf(r, mode ?? 'concat', 'branches'), ok);
}

export function readSkip(r: EntryRead, ctx: ReaderContext): Template | undefined {
  const ok = requireField(r, 'from', 'the name of the earlier layer to merge with', ctx);
  const fromNode = r.fields.get('from');
  const refs = fromNode ? readRefs(fromNode, ctx) : [];
  const mode = r.entry.match.reader === 'add' ? 'sum' : 'concat';
  return block(r, ctx, [[]], refs, mergeOf(r, mode, 'skip'), ok);
}

/** `enc1`, `down[2]`, `input`, or a list of them. */
function readRefs(node: Located, ctx: ReaderContext): NameRef[] | undefined {
  const items = node.kind === 'seq' ? node.items : [node];
  if (items.length === 0) {
    ctx.sink.error('config/invalid-value', `${displayPath(node)} is empty; name at least one earlier layer`, node.span);
    return undefined;
  }
  const out: NameRef[] = [];
  let ok = true;
  for (const item of items) {
    const m = item.kind === 'scalar' && typeof item.value === 'string' ? /^([^[\]]+)((?:\[[1-9][0-9]*\])*)$/.exec(item.value) : null;
    if (!m) {
      const got = item.kind === 'scalar' ? JSON.stringify(item.value) : `a ${item.kind === 'map' ? 'mapping' : 'list'}`;
      ctx.sink.error('config/invalid-value', `${displayPath(item)} must name an earlier layer ('enc1', or one copy of a repeated layer such as 'down[2]'), got ${got}`, item.span);
      ok = false;
      continue;
    }
    const copies = [...m[2]!.matchAll(/\[([0-9]+)\]/g)].map((c) => Number(c[1]));
    out.push({ text: m[0], base: m[1]!, copies, span: item.span, where: displayPath(item) });
  }
  return ok ? out : undefined;
}
