/**
 * The config loader: YAML text → normalised `Model`, or the full list of problems as diagnostics.
 * Stages, each of which can stop the load with diagnostics: size cap, YAML syntax, the model path,
 * reading the model subtree (alias and depth caps), input-alias normalisation, the size
 * arithmetic (before anything is allocated), the structural schema of the model around its
 * layers, the layer reader and expansion of the builders, and shape inference of a layered model.
 * Problems in the user's file never throw; a missing schema
 * file (a broken installation) does.
 */
import { readFileSync, statSync } from 'node:fs';
import { LineCounter, parseDocument } from 'yaml';
import type { Diagnostic } from '../diagnostic.js';
import type { Model } from './model.js';
import { buildExplicitModel } from './build-explicit.js';
import { buildLayeredModel } from './build-layered.js';
import { DiagnosticSink } from './diagnostic-sink.js';
import { normaliseFieldAliases } from './field-aliases.js';
import { parsePointer } from './json-pointer.js';
import { MAX_DOCUMENT_BYTES } from './limits.js';
import { convertNode, entryOf, toPlain, type Located } from './located-value.js';
import type { ParameterUse } from './model.js';
import { repositoryOf, workTreeDefinitions, type DefinitionSource } from './definition-source.js';
import { loadArchitecture, type ModelFromTree } from './load-architecture.js';
import { parameterSpace, type ParameterSpace } from './parameter-space.js';
import { compiledModelSchema, validateAgainstSchema } from './model-schema.js';
import { resolveModelNode } from './model-pointer.js';
import { checkLayerEntryCount } from './layer-entry-count.js';
import { inferShapes } from './model-shapes.js';
import { checkModelSizes } from './size-limits.js';
import { reportSchemaErrors } from './schema-errors.js';
import { reportYamlErrors } from './yaml-errors.js';

export { MAX_EXPANDED_LAYERS } from './limits.js';

export interface LoadOptions {
  /** JSON Pointer (RFC 6901) of the architecture inside the file; default `/model`. */
  modelPath?: string;
  /**
   * Where a config that names an architecture definition reads it; default: the working tree of
   * the repository around the config file (the nearest directory above it with `.git`), links refused.
   */
  definitions?: DefinitionSource;
  /** The config's path relative to the repository root (definition paths are relative to it); default: from `file`. */
  configPath?: string;
}

/** `parameters` is set for a config that names an architecture definition: fixes search over them. */
export type LoadResult = { ok: true; model: Model; parameters?: ParameterSpace } | { ok: false; diagnostics: Diagnostic[] };

export const DEFAULT_MODEL_PATH = '/model';

export function loadConfigFile(path: string, options: LoadOptions = {}): LoadResult {
  const sink = new DiagnosticSink(path);
  let text: string;
  try {
    const size = statSync(path).size;
    if (size > MAX_DOCUMENT_BYTES) return tooLarge(sink, size);
    text = readFileSync(path, 'utf8');
  } catch (err) {
    const reason = err instanceof Error ? err.message : String(err);
    sink.error('config/unreadable', `cannot read the config file: ${reason}`);
    return { ok: false, diagnostics: sink.sorted() };
  }
  return loadConfigText(text, path, options);
}

export function loadConfigText(text: string, file: string, options: LoadOptions = {}): LoadResult {
  const sink = new DiagnosticSink(file);
  const fail = (): LoadResult => ({ ok: false, diagnostics: sink.sorted() });

  const bytes = Buffer.byteLength(text, 'utf8');
  if (bytes > MAX_DOCUMENT_BYTES) return tooLarge(sink, bytes);

  const modelPath = options.modelPath ?? DEFAULT_MODEL_PATH;
  const pointer = parsePointer(modelPath);
  if (!pointer.ok) {
    sink.error('config/model-path', pointer.message);
    return fail();
  }

  const lines = new LineCounter();
  const doc = parseDocument(text, { lineCounter: lines, prettyErrors: false, uniqueKeys: true });
  reportYamlErrors(doc, lines, sink);
  if (sink.count > 0) return fail();

  const found = resolveModelNode(doc, lines, sink, modelPath, pointer.segments);
  if (!found) return fail();
  const root = convertNode(doc, lines, sink, found.node, found.segments, found.fallback);
  if (!root) return fail();

  if (root.kind === 'map' && entryOf(root, 'architecture') !== undefined) {
    const around = options.definitions && options.configPath !== undefined ? undefined : repositoryOf(file);
    const source = options.definitions ?? workTreeDefinitions(around!.root);
    const configRel = insideRoot(options.configPath ?? around!.configRel);
    const read: ModelFromTree = (tree, into, paramsOf) => {
      const m = modelFromTree(tree, file, into, paramsOf);
      return m?.kind === 'explicit' ? 'explicit' : m;
    };
    const loaded = loadArchitecture({ root, file, configRel, source, read }, sink);
    if (!loaded.ok) return { ok: false, diagnostics: loaded.diagnostics };
    return { ok: true, model: loaded.model, parameters: parameterSpace(loaded.instance, read) };
  }
  const model = modelFromTree(root, file, sink);
  if (sink.count > 0 || !model) {
    if (sink.count === 0) throw new Error(`config loader: no model and no diagnostic for ${file} (a loader bug)`);
    return fail();
  }
  return { ok: true, model };
}

/**
 * The stages after the tree is read: input aliases, the size arithmetic, the schema around the
 * layers, the layer reader and expansion, and shapes. Undefined, or diagnostics in `sink`, when
 * the tree is not a model. `paramsOf` is given for an instantiated definition.
 */
function modelFromTree(root: Located, file: string, sink: DiagnosticSink, paramsOf?: (node: Located) => readonly ParameterUse[]): Model | undefined {
  normaliseFieldAliases(root, sink);
  if (!checkLayerEntryCount(root, sink)) return undefined;
  checkModelSizes(root, sink);
  const schema = compiledModelSchema();
  reportSchemaErrors(validateAgainstSchema(toPlain(root)), root, schema.locations, sink);

  let model: Model | undefined;
  if (root.kind === 'map') {
    const explicit = entryOf(root, 'network') !== undefined;
    const layered = ['input', 'output', 'layers', 'weight_sharing'].some((k) => entryOf(root, k) !== undefined);
    if (explicit && !layered) model = buildExplicitModel(root, file, sink);
    else if (layered && !explicit) model = buildLayeredModel(root, file, sink, paramsOf);
  }
  if (model?.kind === 'layered' && sink.count === 0) {
    const shapes = inferShapes(model);
    if (!shapes.ok) for (const d of shapes.diagnostics) sink.error(d.code, d.message, d.span);
  }
  return sink.count > 0 ? undefined : model;
}

function insideRoot(rel: string): string | undefined {
  return rel === '' || rel === '..' || rel.startsWith('../') || /^[A-Za-z]:/.test(rel) || rel.startsWith('/') ? undefined : rel;
}

function tooLarge(sink: DiagnosticSink, bytes: number): LoadResult {
  sink.error(
    'config/too-large',
    `the config is ${bytes} bytes; files larger than ${MAX_DOCUMENT_BYTES} bytes (4 MiB) are refused`,
  );
  return { ok: false, diagnostics: sink.sorted() };
}
