/**
 * The capacity of one partition as bars in bits: what the policy requires, and the base's and the
 * head's proven lower and upper bounds. A dashed line at the requirement runs across every bar,
 * so that "provably short" (the head's upper bar stops before it), "proven" (the head's lower bar
 * passes it) and a drop (the head's bars shorter than the base's) show without reading a number.
 *
 * Every value drawn is the JSON report's value (the same `{rank, log2}` objects), written as JSON
 * writes it; each bar also carries it in `data-log2` and `data-rank`. Bars are told apart by their
 * row label and fill pattern (solid: proven lower bound, hatched: upper bound, cross-hatched:
 * requirement), never by colour alone. A bound far beyond the others (a huge bound, over 2^4,000,000)
 * is drawn to the edge and broken, with its value written beside it.
 */
import { MAX_RANK_BITS } from '../cut/types.js';
import type { RankJson } from './bounds-json.js';
import { xmlText } from './junit.js';

export type BarSeries = 'required' | 'base-lower' | 'base-upper' | 'head-lower' | 'head-upper';

export interface BarRow {
  readonly series: BarSeries;
  readonly label: string;
  /** The JSON value; null: nothing to draw (`missing` says why). */
  readonly value: RankJson | null;
  readonly missing?: string;
}

const LABEL_W = 84;
const BAR_W = 240;
/** Values are written in a column of their own, right of the bars and the break marks. */
const VALUE_X = LABEL_W + BAR_W + 34;
/** Character width of the monospace labels (11 px). */
const CHAR_W = 6.6;
const ROW_H = 24;
const BAR_H = 14;
const TOP = 30;
const AXIS_H = 26;
/** Bars up to this many times the anchor value keep the scale; longer ones are broken. */
const CLIP_FACTOR = 4;

const FILL: Readonly<Record<BarSeries, string>> = {
  required: 'url(#rf-pat-required)',
  'base-lower': 'url(#rf-pat-base-lower)',
  'base-upper': 'url(#rf-pat-base-upper)',
  'head-lower': 'url(#rf-pat-head-lower)',
  'head-upper': 'url(#rf-pat-head-upper)',
};

/** The value written for a bound, from its JSON form only. */
export function boundText(b: RankJson): string {
  if (b.rank === null) return `${b.log2} bits (more than 2^${MAX_RANK_BITS.toLocaleString('en-US')})`;
  return b.rank.length <= 15 ? `${b.log2} bits (rank ${b.rank})` : `${b.log2} bits (${b.rank.length} digits)`;
}

export function capacityBarsSvg(rows: readonly BarRow[], title: string, id: string): string {
  const required = rows.find((r) => r.series === 'required')?.value ?? null;
  const scale = axisFor(rows);
  const height = TOP + rows.length * ROW_H + AXIS_H;
  const texts = [...rows.map((r) => (r.value ? boundText(r.value) + ', beyond the axis' : (r.missing ?? 'none'))), 'bits (log2 of the rank)'];
  const width = Math.ceil(VALUE_X + Math.max(...texts.map((t) => [...t].length)) * CHAR_W + 8);
  const x = (v: number): number => LABEL_W + (Math.min(v, scale.max) / scale.max) * BAR_W;
  const out: string[] = [
    `<svg class="capacity-bars" id="${id}" xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${width} ${height}" width="${width}" height="${height}" role="img" aria-labelledby="${id}-title">`,
    `<title id="${id}-title">${xmlText(title)}</title>`,
  ];
  rows.forEach((r, i) => {
    const y = TOP + i * ROW_H;
    const cy = y + ROW_H / 2;
    const data = r.value ? ` data-log2="${r.value.log2}" data-rank="${r.value.rank ?? 'null'}"` : ' data-log2="null" data-rank="null"';
    out.push(`<g class="bar-row" data-series="${r.series}"${data}>`);
    out.push(`<text class="row-label" x="${LABEL_W - 8}" y="${cy + 4}" text-anchor="end">${xmlText(r.label)}</text>`);
    if (!r.value) {
      out.push(`<text class="bar-missing" x="${VALUE_X}" y="${cy + 4}">${xmlText(r.missing ?? 'none')}</text>`, '</g>');
      return;
    }
    const v = r.value.log2;
    const broken = r.value.rank === null || v > scale.max;
    const end = broken ? LABEL_W + BAR_W + 10 : x(v);
    const w = Math.max(end - LABEL_W, v > 0 ? 1.5 : 0);
    out.push(`<rect class="bar bar-${r.series}${broken ? ' bar-broken' : ''}" x="${LABEL_W}" y="${y + (ROW_H - BAR_H) / 2}" width="${fmt(w)}" height="${BAR_H}" fill="${FILL[r.series]}"/>`);
    if (broken) {
      // Two slanted strokes across the bar: the bar goes on beyond the axis.
      const bx = LABEL_W + BAR_W + 2;
      const top = y + (ROW_H - BAR_H) / 2 - 3;
      const bottom = top + BAR_H + 6;
      out.push(`<path class="bar-break" d="M${bx} ${bottom}L${bx + 5} ${top}M${bx + 4} ${bottom}L${bx + 9} ${top}"/>`);
    }
    const beyond = broken && r.value.rank !== null ? ', beyond the axis' : '';
    out.push(`<text class="bar-value" x="${VALUE_X}" y="${cy + 4}">${xmlText(boundText(r.value) + beyond)}</text>`, '</g>');
  });
  // The requirement as a dashed line across every row, labelled at the top.
  if (required && required.rank !== null && required.log2 <= scale.max) {
    const rx = fmt(x(required.log2));
    out.push(
      `<line class="required-line" x1="${rx}" x2="${rx}" y1="${TOP - 6}" y2="${TOP + rows.length * ROW_H}"/>`,
      `<text class="required-label" x="${rx}" y="${TOP - 10}" text-anchor="middle">required</text>`,
    );
  }
  // The axis, in bits.
  const ay = TOP + rows.length * ROW_H + 4;
  out.push(`<g class="axis"><line x1="${LABEL_W}" x2="${LABEL_W + BAR_W}" y1="${ay}" y2="${ay}"/>`);
  for (let t = 0; t <= scale.max + 1e-9; t += scale.step) {
    const tx = fmt(LABEL_W + (t / scale.max) * BAR_W);
    out.push(`<line x1="${tx}" x2="${tx}" y1="${ay}" y2="${ay + 4}"/><text class="tick" x="${tx}" y="${ay + 15}" text-anchor="middle">${tickText(t)}</text>`);
  }
  out.push(`<text class="axis-unit" x="${VALUE_X}" y="${ay + 15}">bits (log2 of the rank)</text></g>`, '</svg>');
  return out.join('');
}

/**
 * The scale: the values that decide a verdict (the requirement and the proven lower bounds; with
 * neither, the smallest upper bound) stay readable, and a bar more than CLIP_FACTOR times longer
 * is broken.
 */
export function axisFor(rows: readonly BarRow[]): { max: number; step: number } {
  const finite = rows.filter((r) => r.value !== null && r.value.rank !== null);
  const values = finite.map((r) => r.value!.log2);
  // The requirement and the proven lower bounds.
  const lowers = finite.filter((r) => !r.series.endsWith('upper')).map((r) => r.value!.log2);
  const uppers = rows.filter((r) => r.series.endsWith('upper') && r.value).map((r) => (r.value!.rank === null ? Infinity : r.value!.log2));
  let anchor = Math.max(0, ...lowers);
  // Upper bounds alone (no requirement, no proven lower bound): the smallest one.
  if (anchor <= 0 && uppers.length > 0) anchor = Math.min(...uppers);
  if (!Number.isFinite(anchor) || anchor <= 0) anchor = Math.max(0, ...values);
  if (anchor <= 0) anchor = 1;
  const top = Math.max(anchor, ...values.filter((v) => v <= anchor * CLIP_FACTOR));
  const step = niceStep(top / 4);
  return { max: Math.max(step, Math.ceil(top / step - 1e-9) * step), step };
}

function niceStep(x: number): number {
  const p = 10 ** Math.floor(Math.log10(x));
  for (const m of [1, 2, 2.5, 5, 10]) if (m * p >= x - 1e-12) return m * p;
  return 10 * p;
}

function tickText(t: number): string {
  return Number.isInteger(t) ? t.toLocaleString('en-US') : String(Math.round(t * 1000) / 1000);
}

function fmt(x: number): string {
  return String(Math.round(x * 10) / 10);
}
