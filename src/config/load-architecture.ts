/**
 * A config that names an architecture definition instead of listing layers:
 *
 *   model:
 *     architecture: ../arch/residual.yaml
 *     width: 0.5
 *     stages: [2, 2, 2, 2]
 *
 * Every key beside `architecture` sets a parameter; an unknown one is an error with "did you
 * mean", a value of the wrong type or outside its declared range an error at the value. The
 * definition is read from its `DefinitionSource`, its model instantiated with the values, and the
 * result read by the same stages as a model written in a config (`modelFromTree`). Problems of
 * the config are reported in the config; problems of the definition, and of the model it makes
 * (a width computed as 0), in the definition file, saying how a computed value was computed.
 */
import type { Diagnostic, Span } from '../diagnostic.js';
import { closest } from '../text/suggest.js';
import type { DiagnosticSink } from './diagnostic-sink.js';
import { DefinitionSink, readDefinition, readParameterValue, type Definition, type ParameterDecl } from './definition-document.js';
import { resolveDefinitionPath, type DefinitionSource } from './definition-source.js';
import { instantiate, showValue, type ParameterBinding } from './instantiate-definition.js';
import { describeValue, displayPath, entryOf, fieldOf, type Located, type LocatedMap } from './located-value.js';
import type { LayeredModel, ParameterSetting, ParameterUse } from './model.js';
import { stringOf } from './located-read.js';

/** Reads a model tree (a config's, or an instantiated definition's) with the shared stages. */
export type ModelFromTree = (root: LocatedMap, sink: DiagnosticSink, paramsOf?: (node: Located) => readonly ParameterUse[]) => LayeredModel | 'explicit' | undefined;

/** A definition with the values a config set, from which the model can be made again with other values. */
export interface ArchitectureInstance {
  readonly definition: Definition;
  readonly configFile: string;
  readonly span: Span;
  readonly bindings: ReadonlyMap<string, ParameterBinding>;
  /** The declarations that judge the values (ranges from the judging side). */
  readonly judged: ReadonlyMap<string, ParameterDecl>;
}

export type ArchitectureLoad =
  | { readonly ok: true; readonly model: LayeredModel; readonly instance: ArchitectureInstance }
  | { readonly ok: false; readonly diagnostics: Diagnostic[] };

export interface ArchitectureRequest {
  readonly root: LocatedMap;
  readonly file: string;
  /** The config's root-relative path; undefined when it lies outside the repository. */
  readonly configRel: string | undefined;
  readonly source: DefinitionSource;
  readonly read: ModelFromTree;
}

export function loadArchitecture(req: ArchitectureRequest, sink: DiagnosticSink): ArchitectureLoad {
  const fail = (more: Diagnostic[] = []): ArchitectureLoad => ({ ok: false, diagnostics: [...sink.sorted(), ...more] });
  const archEntry = entryOf(req.root, 'architecture')!;
  const archNode = archEntry.value;
  const written = stringOf(archNode);
  if (written === undefined || written.trim() === '') {
    sink.error('config/architecture', `${displayPath(archNode)} must be the path of an architecture definition, relative to this config (e.g. ../arch/residual.yaml), got ${describeValue(archNode)}`, archNode.span);
    return fail();
  }
  if (req.configRel === undefined) {
    sink.error('config/architecture-outside-root', `${displayPath(archNode)}: this config lies outside the repository root, so its definition cannot be read; definitions are read only from inside the repository`, archNode.span);
    return fail();
  }
  const where = resolveDefinitionPath(written, req.configRel);
  if (!where.ok) {
    sink.error(where.code, where.message, archNode.span);
    return fail();
  }
  const rel = where.rel;
  const display = req.source.display(rel);
  const read = req.source.read(rel);
  if (read.kind !== 'file') {
    const [code, message] =
      read.kind === 'absent'
        ? ['config/architecture-missing', `architecture '${written}': there is no file ${rel} in the repository`]
        : [read.code === 'symlink' ? 'config/architecture-symlink' : read.code === 'too-large' ? 'config/architecture-too-large' : 'config/architecture-unreadable', `architecture '${written}': ${read.message}`];
    sink.error(code, message, archNode.span);
    return fail();
  }
  const defSink = new DefinitionSink(display);
  const definition = readDefinition(read.text, display, rel, defSink);
  if (!definition) {
    sink.error('config/architecture-failed', `architecture '${written}': ${display} did not load (its problems are listed with it)`, archNode.span);
    return fail(defSink.sorted());
  }
  const judged = judgingDeclarations(definition, req.source, rel);

  const bindings = new Map<string, ParameterBinding>();
  const names = [...definition.parameters.keys()];
  for (const entry of req.root.entries) {
    if (entry === archEntry) continue;
    const decl = judged.get(entry.key) ?? definition.parameters.get(entry.key);
    if (!decl) {
      const guess = closest(entry.key, names);
      const list = names.length > 0 ? `its parameters are ${names.join(', ')}` : 'it declares no parameters';
      sink.error(
        'config/unknown-parameter',
        `'${entry.writtenKey}' is not a parameter of ${display}${guess ? ` (did you mean '${guess}'?)` : ''}; ${list} (a config that names an architecture sets only its parameters)`,
        entry.keySpan,
      );
      continue;
    }
    const own = definition.parameters.get(entry.key);
    const judging = own && judged.get(entry.key) !== own ? ` (its range as the base revision declares it in ${display}: a change cannot widen a range for its own configs)` : ` (declared in ${display})`;
    const value = readParameterValue(entry.value, decl, sink, 'config', displayPath(entry.value), judging);
    if (value === undefined) continue;
    const span = entry.value.span;
    const itemSpans = entry.value.kind === 'seq' ? { itemSpans: entry.value.items.map((item) => item.span) } : {};
    bindings.set(entry.key, { value, span, ...itemSpans, where: `${sink.file}:${span.line}:${span.column}` });
  }
  if (sink.count > 0) return fail();
  for (const [name, decl] of definition.parameters) if (!bindings.has(name)) bindings.set(name, { value: decl.default, where: `the default in ${display}` });

  const instance: ArchitectureInstance = { definition, configFile: req.file, span: archNode.span, bindings, judged };
  const model = makeModel(instance, req.read, defSink);
  if (!model) {
    sink.error('config/architecture-failed', `architecture '${written}': ${display} does not make a model with these parameters (its problems are listed with it)`, archNode.span);
    return fail(defSink.sorted());
  }
  return { ok: true, model, instance };
}

/** The model of an instance, or undefined with diagnostics in `defSink` (the definition file's). */
export function makeModel(instance: ArchitectureInstance, read: ModelFromTree, defSink: DefinitionSink): LayeredModel | undefined {
  const def = instance.definition;
  const made = instantiate(def, instance.bindings, defSink);
  if (!made) return undefined;
  if (entryOf(made.root, 'network') !== undefined) {
    defSink.error('definition/network', `${displayPath(fieldOf(made.root, 'network')!)}: a definition describes a layered model (input and layers); write an explicit network in the config itself`, entryOf(made.root, 'network')!.keySpan);
    return undefined;
  }
  const model = read(made.root, defSink, made.paramsOf);
  if (model === undefined || model === 'explicit' || defSink.count > 0) return undefined;
  const parameters: ParameterSetting[] = [...def.parameters.values()].map((decl) => {
    const b = instance.bindings.get(decl.name)!;
    return { name: decl.name, value: showValue(b.value), ...(b.span ? { span: b.span } : {}), declared: decl.span };
  });
  return { ...model, architecture: { file: def.file, path: def.path, name: def.name, span: instance.span, parameters } };
}

/**
 * The declarations that judge the config's values: the judging side's version of the definition
 * (the base revision's in a check) for every parameter it declares with the same type, else the
 * definition's own. A judging version that does not load judges nothing.
 */
function judgingDeclarations(def: Definition, source: DefinitionSource, rel: string): ReadonlyMap<string, ParameterDecl> {
  const out = new Map(def.parameters);
  const judging = source.judging?.(rel);
  if (judging?.kind !== 'file') return out;
  const other = readDefinition(judging.text, def.file, rel, new DefinitionSink(def.file));
  if (!other) return out;
  for (const [name, decl] of other.parameters) {
    const own = def.parameters.get(name);
    if (own && own.type === decl.type && (own.length === decl.length || own.type !== 'list')) {
      if (sameRange(own, decl)) continue;
      out.set(name, { ...own, min: decl.min, max: decl.max });
    }
  }
  return out;
}

function sameRange(a: ParameterDecl, b: ParameterDecl): boolean {
  return a.min.n === b.min.n && a.min.d === b.min.d && a.max.n === b.max.n && a.max.d === b.max.d;
}
