/**
 * The model's input and analysed output. `input.channels` (or `features`, `in_channels`,
 * `num_channels`) is the data's raw channel count — 1 for grayscale, 3 for RGB — and never M;
 * `input.representation` sets M. A shape written with its channel axis (`[3, 224, 224]` or
 * `[224, 224, 3]`) is accepted when that axis equals the channels, and dropped. `output.position`
 * picks the analysed position of a dense-prediction model. `input.vocabulary` (or `vocab_size`, …)
 * makes a token input: M is then V, and neither channels nor a representation may be given.
 */
import type { DiagnosticSink } from './diagnostic-sink.js';
import { displayPath, entryOf, fieldOf, type Located, type LocatedMap } from './located-value.js';
import { fieldSpansOf, positiveIntegerListOf, positiveIntegerOf, nonNegativeIntegerOf } from './located-read.js';
import type { InputSpec, OutputSpec, ParameterUse } from './model.js';
import { normaliseWord } from './pointwise-ops.js';

/** Reads `input` (already schema-checked; undefined when it is not valid). */
export function readInput(node: LocatedMap | undefined, sink: DiagnosticSink, paramsOf?: (node: Located) => readonly ParameterUse[]): InputSpec | undefined {
  if (!node) return undefined;
  const shapeNode = fieldOf(node, 'shape');
  const given = positiveIntegerListOf(shapeNode);
  const channelsNode = fieldOf(node, 'channels');
  const channels = positiveIntegerOf(channelsNode);
  const reprNode = fieldOf(node, 'representation');
  const representation = positiveIntegerOf(reprNode);
  const vocabNode = fieldOf(node, 'vocabulary');
  const vocabulary = positiveIntegerOf(vocabNode);
  if (!shapeNode || !given || given.length < 1 || given.length > 3) return undefined;
  if ((channelsNode && channels === undefined) || (reprNode && representation === undefined) || (vocabNode && vocabulary === undefined)) return undefined;
  if (vocabulary !== undefined && !tokenFieldsAgree(node, sink)) return undefined;
  let shape = given;
  if (given.length === 3) {
    const at = displayPath(shapeNode);
    const text = `[${given.join(', ')}]`;
    if (channels === undefined) {
      sink.error(
        'config/input-shape',
        `${at} is ${text}: only 1D ([length]) and 2D ([height, width]) grids are supported; if one entry is the channel count, give it as input.channels too (e.g. channels: ${Math.min(given[0]!, given[2]!)}) and it is dropped, or write the shape without it`,
        shapeNode.span,
      );
      return undefined;
    }
    const first = given[0] === channels ? given.slice(1) : undefined;
    const last = given[2] === channels ? given.slice(0, 2) : undefined;
    if (first && last && (first[0] !== last[0] || first[1] !== last[1])) {
      sink.error('config/input-shape', `${at} is ${text}, and both its first and its last entry equal input.channels (${channels}); write [height, width]`, shapeNode.span);
      return undefined;
    }
    const kept = first ?? last;
    if (!kept) {
      sink.error(
        'config/input-shape',
        `${at} is ${text}, but neither its first nor its last entry equals input.channels (${channels}); write [height, width] (only 1D and 2D grids are supported)`,
        shapeNode.span,
      );
      return undefined;
    }
    shape = kept;
  }
  const fieldParams: Record<string, readonly ParameterUse[]> = {};
  for (const [field, value] of [['shape', shapeNode], ['channels', channelsNode], ['representation', reprNode]] as const) {
    const used = value && paramsOf ? paramsOf(value) : [];
    if (used.length > 0) fieldParams[field] = used;
  }
  const written = entryOf(node, 'channels')?.writtenKey;
  const featuresAsChannels = written !== undefined && normaliseWord(written) === 'features';
  return {
    shape,
    ...(representation !== undefined ? { representation } : {}),
    ...(channels !== undefined ? { channels } : {}),
    ...(vocabulary !== undefined ? { vocabulary } : {}),
    ...(featuresAsChannels ? { featuresAsChannels: true } : {}),
    span: node.span,
    fieldSpans: fieldSpansOf(node, ['shape', 'representation', 'channels', 'vocabulary']),
    ...(Object.keys(fieldParams).length > 0 ? { fieldParams } : {}),
  };
}

/**
 * A token input carries exactly V functions per position and no channels: `representation` and
 * `channels` beside a vocabulary are reported at their keys.
 */
function tokenFieldsAgree(node: LocatedMap, sink: DiagnosticSink): boolean {
  const vocab = entryOf(node, 'vocabulary')!.writtenKey;
  let ok = true;
  for (const [field, why] of [
    ['representation', 'a token position supports exactly its V indicator functions, so M = V'],
    ['channels', 'a token position holds one token, not channels'],
  ] as const) {
    const entry = entryOf(node, field);
    if (!entry) continue;
    sink.error('config/conflicting-fields', `${displayPath(node)} gives both '${vocab}' and '${entry.writtenKey}': ${why}; drop '${entry.writtenKey}'`, entry.keySpan);
    ok = false;
  }
  return ok;
}

/** Reads `output` (already schema-checked): `position: [r, c]`, or an integer in 1D. */
export function readOutput(node: LocatedMap | undefined): OutputSpec | undefined {
  if (!node) return {};
  const p = fieldOf(node, 'position');
  if (!p) return { span: node.span };
  const one = nonNegativeIntegerOf(p);
  const list = p.kind === 'seq' ? p.items.map(nonNegativeIntegerOf) : undefined;
  if (one !== undefined) return { position: [one], span: p.span };
  if (list && list.every((v) => v !== undefined)) return { position: list as number[], span: p.span };
  return undefined;
}
