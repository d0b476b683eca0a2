/**
 * One policy file on its own: YAML text → its own settings, named partitions and requirements,
 * with every problem found in the file as a diagnostic. The YAML, located-tree and schema stages
 * are the config loader's, so limits (size, aliases, nesting) and messages behave alike; their
 * diagnostics are taken over under `policy/` codes. What needs other files (the extends target,
 * partitions defined by a parent) is left to the chain loader.
 */
import { isMap, isScalar, LineCounter, parseDocument, type Document } from 'yaml';
import type { Diagnostic, Span } from '../diagnostic.js';
import type { Surrogate } from '../cut/types.js';
import { DiagnosticSink } from '../config/diagnostic-sink.js';
import { parsePointer } from '../config/json-pointer.js';
import { MAX_DOCUMENT_BYTES } from '../config/limits.js';
import { convertNode, describeValue, displayPath, fieldOf, type Located, type LocatedMap } from '../config/located-value.js';
import { asMap, stringOf } from '../config/located-read.js';
import { spanFromOffsets } from '../config/source-span.js';
import { reportYamlErrors } from '../config/yaml-errors.js';
import { appliesToProblem } from './applies-to.js';
import { NAME_PATTERN, readNamedPartitions } from './named-partitions.js';
import { reportPolicySchemaErrors } from './policy-schema.js';
import type { NamedPartition, UnprovenMode } from './policy.js';
import { dropBitsOf, readRequirements, unprovenModeOf, type DraftRequirement, type PartitionReference } from './requirements.js';

/** What one file says, before its parent is merged in; absent settings are inherited. */
export interface PolicyDocument {
  readonly file: string;
  readonly span: Span;
  readonly id?: string;
  readonly idSpan?: Span;
  readonly description?: string;
  readonly extends?: { readonly path: string; readonly span: Span };
  readonly surrogate?: Surrogate;
  readonly modelPath?: string;
  readonly appliesTo?: readonly string[];
  readonly unproven?: UnprovenMode;
  readonly maxDropBits?: number;
  readonly removal?: UnprovenMode;
  readonly partitions: ReadonlyMap<string, NamedPartition>;
  /** Every name under `partitions`, including those whose definition is invalid. */
  readonly declaredPartitions: ReadonlySet<string>;
  readonly requirements: readonly DraftRequirement[];
  readonly references: readonly PartitionReference[];
}

/**
 * Reads a policy file. Returns undefined when the text cannot be read as a policy at all (too
 * large, not YAML, not a mapping); otherwise the parts that are well formed, with diagnostics for
 * the others in `sink`, so that an extends chain can still be followed and checked in one pass.
 */
export function readPolicyDocument(text: string, file: string, sink: DiagnosticSink): PolicyDocument | undefined {
  const bytes = Buffer.byteLength(text, 'utf8');
  if (bytes > MAX_DOCUMENT_BYTES) {
    sink.error('policy/too-large', `the policy file is ${bytes} bytes; files larger than ${MAX_DOCUMENT_BYTES} bytes (4 MiB) are refused`);
    return undefined;
  }
  const lines = new LineCounter();
  const doc = parseDocument(text, { lineCounter: lines, prettyErrors: false, uniqueKeys: true });
  const partitionKeys = partitionKeyOffsets(doc);
  adopt(sink, file, (scratch) => reportYamlErrors(doc, lines, scratch), (d) =>
    d.code === 'config/duplicate-key' && d.span && partitionKeys.has(d.span.offset) ? 'policy/duplicate-partition' : policyCode(d.code),
  );
  if (sink.count > 0) return undefined;

  const start = spanFromOffsets(lines, 0, 0);
  const root = adopt(sink, file, (scratch) => convertNode(doc, lines, scratch, doc.contents, [], start, { rootName: 'the policy', subject: 'policy' }));
  if (!root) return undefined;
  if (root.kind !== 'map') {
    const empty = root.kind === 'scalar' && root.value === null;
    sink.error(
      empty ? 'policy/empty' : 'policy/type',
      `${empty ? 'the policy file is empty' : `the policy file holds ${describeValue(root)}`}; a policy is a mapping with at least 'id' and 'description'`,
      root.span,
    );
    return undefined;
  }
  adopt(sink, file, (scratch) => reportPolicySchemaErrors(root, scratch));
  return readFields(root, file, text, sink);
}

function readFields(root: LocatedMap, file: string, text: string, sink: DiagnosticSink): PolicyDocument {
  const idNode = fieldOf(root, 'id');
  const id = stringOf(idNode);
  if (id !== undefined && idNode && !NAME_PATTERN.test(id)) {
    sink.error(
      'policy/invalid-id',
      `${displayPath(idNode)} is '${id}'; a policy id is lower-case letters, digits, '.', '_' or '-', starting with a letter or digit (e.g. renal-pairs)`,
      idNode.span,
    );
  }
  const extendsNode = fieldOf(root, 'extends');
  const extendsPath = stringOf(extendsNode);
  const modelPathNode = fieldOf(root, 'model_path');
  const modelPath = stringOf(modelPathNode);
  if (modelPath !== undefined && modelPathNode) {
    const parsed = parsePointer(modelPath);
    if (!parsed.ok) sink.error('policy/model-path', `${displayPath(modelPathNode)}: ${parsed.message}`, modelPathNode.span);
  }
  const surrogate = stringOf(fieldOf(root, 'surrogate'));
  const appliesTo = readAppliesTo(fieldOf(root, 'applies_to'), sink);
  const unproven = unprovenModeOf(fieldOf(root, 'unproven'));
  const maxDropBits = dropBitsOf(fieldOf(root, 'max_drop_bits'));
  const removal = unprovenModeOf(fieldOf(root, 'removal'));
  const partitionsNode = asMap(fieldOf(root, 'partitions'));
  const partitions = partitionsNode ? readNamedPartitions(partitionsNode, file, sink) : new Map<string, NamedPartition>();
  const requireNode = fieldOf(root, 'require');
  const sourceOf = (node: Located) => text.slice(node.span.offset, node.span.endOffset);
  const { requirements, references } = requireNode?.kind === 'seq' ? readRequirements(requireNode, file, sourceOf, sink) : { requirements: [], references: [] };
  const description = stringOf(fieldOf(root, 'description'));
  return {
    file,
    span: root.span,
    ...(id !== undefined && idNode ? { id, idSpan: idNode.span } : {}),
    ...(description !== undefined ? { description } : {}),
    ...(extendsPath !== undefined && extendsPath !== '' && extendsNode ? { extends: { path: extendsPath, span: extendsNode.span } } : {}),
    ...(surrogate === 'tree' || surrogate === 'overlap' ? { surrogate } : {}),
    ...(modelPath !== undefined ? { modelPath } : {}),
    ...(appliesTo !== undefined ? { appliesTo } : {}),
    ...(unproven !== undefined ? { unproven } : {}),
    ...(maxDropBits !== undefined ? { maxDropBits } : {}),
    ...(removal !== undefined ? { removal } : {}),
    partitions,
    declaredPartitions: new Set(partitionsNode?.entries.map((e) => e.key) ?? []),
    requirements,
    references,
  };
}

function readAppliesTo(node: Located | undefined, sink: DiagnosticSink): string[] | undefined {
  if (node?.kind !== 'seq') return undefined;
  const out: string[] = [];
  for (const item of node.items) {
    const pattern = stringOf(item);
    // The empty string is the schema's to report.
    if (pattern === undefined || pattern === '') continue;
    const problem = appliesToProblem(pattern);
    if (problem) sink.error('policy/applies-to', `${displayPath(item)}: ${problem}`, item.span);
    else out.push(pattern);
  }
  return out;
}

/** Start offsets of the keys directly inside the top-level `partitions` mapping. */
function partitionKeyOffsets(doc: Document): Set<number> {
  const out = new Set<number>();
  if (!isMap(doc.contents)) return out;
  for (const pair of doc.contents.items) {
    if (!isScalar(pair.key) || pair.key.value !== 'partitions' || !isMap(pair.value)) continue;
    for (const inner of pair.value.items) if (isScalar(inner.key) && inner.key.range) out.add(inner.key.range[0]);
  }
  return out;
}

/** `config/unknown-field` → `policy/unknown-field`: the shared readers speak for the config loader. */
export function policyCode(code: string): string {
  return code.startsWith('config/') ? `policy/${code.slice('config/'.length)}` : code;
}

/** Runs a shared reader against a scratch sink and takes its diagnostics over under policy codes. */
function adopt<T>(sink: DiagnosticSink, file: string, run: (scratch: DiagnosticSink) => T, rename: (d: Diagnostic) => string = (d) => policyCode(d.code)): T {
  const scratch = new DiagnosticSink(file);
  const result = run(scratch);
  for (const d of scratch.sorted()) sink.error(rename(d), d.message, d.span);
  return result;
}
