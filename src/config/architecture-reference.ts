/**
 * Which architecture definition a config names, found without loading the config: the
 * `architecture` value at the model path, resolved against the config's root-relative path. A
 * check needs it before loading — to read a base version's definition from the base revision for
 * the batch that evaluates base versions, to tell whether an unchanged config's definition
 * changed, and to select the configs of a changed definition (`--changed`). Anything unusual (no
 * such key, not a string, a path outside the repository) is no reference here; loading the
 * config reports it.
 */
import { isAlias, isMap, isScalar, isSeq, parseDocument, type Document } from 'yaml';
import { resolveDefinitionPath } from './definition-source.js';
import { parsePointer } from './json-pointer.js';
import { MAX_DOCUMENT_BYTES } from './limits.js';

/** A quick test that lets most configs skip the parse. */
const MENTIONS = /architecture["']?\s*:/;

/** The root-relative path of the definition the config at `configPath` names, if it names one. */
export function definitionReference(text: string, configPath: string, modelPath = '/model'): string | undefined {
  if (!MENTIONS.test(text) || Buffer.byteLength(text, 'utf8') > MAX_DOCUMENT_BYTES) return undefined;
  const pointer = parsePointer(modelPath);
  if (!pointer.ok) return undefined;
  const doc = parseDocument(text, { prettyErrors: false, uniqueKeys: true });
  if (doc.errors.length > 0) return undefined;
  let node: unknown = doc.contents;
  for (const segment of [...pointer.segments, 'architecture']) node = child(doc, node, segment);
  if (isAlias(node)) node = node.resolve(doc);
  const written = isScalar(node) && typeof node.value === 'string' ? node.value : undefined;
  if (written === undefined || written.trim() === '') return undefined;
  const where = resolveDefinitionPath(written, configPath);
  return where.ok ? where.rel : undefined;
}

function child(doc: Document, node: unknown, segment: string): unknown {
  const here = isAlias(node) ? node.resolve(doc) : node;
  if (isMap(here)) return here.items.find((p) => isScalar(p.key) && String(p.key.value) === segment)?.value;
  if (isSeq(here) && /^(0|[1-9][0-9]*)$/.test(segment)) return here.items[Number(segment)];
  return undefined;
}
