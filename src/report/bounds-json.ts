/**
 * The JSON form of `rankfloor bounds`: one document, ranks as decimal strings (they exceed 2^53),
 * log2 rounded to 6 decimals, keys in a fixed order so that the same input gives the same bytes.
 */
import type { ArchitectureUse } from '../config/model.js';
import type { Bound, BoundsResult, CutEntry } from '../cut/types.js';

export interface BoundJson {
  /** Decimal digits; null for a huge bound (more than MAX_RANK_BITS bits), known by its log2 only. */
  rank: string | null;
  log2: number;
}

export function boundJson(b: Bound): BoundJson {
  return { rank: b.huge ? null : b.rank.toString(), log2: roundLog(b.log2) };
}

export function cutJson(cut: readonly CutEntry[]): { layer: number | string; line: number; dim: number; count: number }[] {
  return cut.map((c) => ({ layer: c.layer, line: c.line, dim: c.dim, count: c.count }));
}

export function roundLog(x: number): number {
  return Math.round(x * 1e6) / 1e6;
}

/** `architecture`: the definition a config names; the cut's lines are that file's. */
export function boundsJson(result: BoundsResult, architecture?: ArchitectureUse): string {
  return JSON.stringify(boundsDocument(result, architecture), null, 2) + '\n';
}

/** The document `boundsJson` prints, as values: the picture report draws these same numbers. */
export type BoundsDocument = ReturnType<typeof boundsDocument>;

export function boundsDocument(result: BoundsResult, architecture?: ArchitectureUse) {
  return {
    file: result.file,
    surrogate: result.surrogate,
    ...(architecture
      ? { architecture: { file: architecture.file, name: architecture.name, parameters: architecture.parameters.map((p) => ({ name: p.name, value: p.value, line: p.span?.line ?? null })) } }
      : {}),
    partitions: result.partitions.map((p) => ({
      partition: p.partition,
      upper: boundJson(p.upper),
      lower: p.lower ? boundJson(p.lower) : null,
      status: p.status,
      cut: cutJson(p.upper.cut),
    })),
  };
}
