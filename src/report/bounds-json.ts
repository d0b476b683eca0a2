/**
 * The JSON form of `rankfloor bounds`: one document, ranks as decimal strings (they exceed 2^53),
 * log2 rounded to 6 decimals, keys in a fixed order so that the same input gives the same bytes.
 */
import type { ArchitectureUse } from '../config/model.js';
import type { Bound, BoundsResult, CutEntry, ProbeCertificate } from '../cut/types.js';

/** A rank as the JSON writes it: decimal digits (null beyond the bit limit) and its log2. */
export interface RankJson {
  rank: string | null;
  log2: number;
}

/** `rank`: null for a huge bound (more than MAX_RANK_BITS bits), known by its log2 only. */
export interface BoundJson extends RankJson {
  /** The rule that proved it. */
  method: string;
  /** A certified probe's minor, for anyone to re-check (DEVELOPERS.md, "Certified probe"). */
  certificate?: CertificateJson;
}

/** A probe certificate with its rows and columns as ranges (`"0-80,82"`, inclusive). */
export interface CertificateJson {
  scheme: number;
  prime: number;
  seed: number;
  /** A layered model: probe inputs per side (the probe matrix is probes × probes). */
  probes?: number;
  /** An explicit network: the whole matricisation at the drawn tensors, rows × columns. */
  matricisation?: [number, number];
  rows: string;
  cols: string;
  determinant: number;
}

export function boundJson(b: Bound): BoundJson {
  return {
    rank: b.huge ? null : b.rank.toString(),
    log2: roundLog(b.log2),
    method: b.method,
    ...(b.certificate ? { certificate: certificateJson(b.certificate) } : {}),
  };
}

function certificateJson(c: ProbeCertificate): CertificateJson {
  const size = 'probes' in c ? { probes: c.probes } : { matricisation: [c.matricisation[0], c.matricisation[1]] as [number, number] };
  return { scheme: c.scheme, prime: c.prime, seed: c.seed, ...size, rows: indexRanges(c.rows), cols: indexRanges(c.cols), determinant: c.determinant };
}

/** Ascending indices as comma-separated inclusive ranges: [0, 1, 2, 5] → "0-2,5". */
export function indexRanges(list: readonly number[]): string {
  const parts: string[] = [];
  for (let i = 0; i < list.length; ) {
    let j = i;
    while (j + 1 < list.length && list[j + 1] === list[j]! + 1) j++;
    parts.push(j === i ? `${list[i]}` : `${list[i]}-${list[j]}`);
    i = j + 1;
  }
  return parts.join(',');
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
