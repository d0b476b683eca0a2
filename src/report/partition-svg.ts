/**
 * A partition drawn on the input grid: side A hatched, side B plain, each position one cell. A
 * sequence of more than 128 steps is drawn row by row, 64 steps a row, like text. A grid too
 * large to draw cell by cell (more than 64 positions along an axis, more than 4,096 steps) is drawn
 * in blocks of k×k positions (k steps for sequences), a block that holds both sides cross-hatched
 * and called "both sides" in the legend, so that the picture never claims a side for a position it
 * does not show.
 */
import { xmlText } from './junit.js';

const MAX_CELLS_2D = 64;
/** A sequence up to this many cells is one row; a longer one is wrapped into rows of ROW_1D. */
const ONE_ROW_1D = 128;
const ROW_1D = 64;
const MAX_CELLS_1D = 4096;
const CELL_CLASSES = ['side-a', 'side-b', 'mixed'] as const;
const FILL = { 'side-a': 'url(#rf-pat-side-a)', 'side-b': 'url(#rf-pat-side-b)', mixed: 'url(#rf-pat-mixed)' } as const;

export interface PartitionCells {
  readonly rows: number;
  readonly cols: number;
  /** Positions per cell along each axis (1 when every position is a cell). */
  readonly block: number;
  /** 0 side A, 1 side B, 2 mixed, 3 none (past the end of a wrapped sequence); row-major. */
  readonly cells: Uint8Array;
  /** A sequence drawn row by row. */
  readonly wrapped: boolean;
}

/** The cells drawn for a mask: positions, or blocks of them when the grid is large. */
export function partitionCells(shape: readonly number[], side: Uint8Array): PartitionCells {
  const is2d = shape.length === 2;
  const h = is2d ? shape[0]! : 1;
  const w = is2d ? shape[1]! : (shape[0] ?? side.length);
  const block = is2d ? Math.max(1, Math.ceil(Math.max(h, w) / MAX_CELLS_2D)) : Math.max(1, Math.ceil(w / MAX_CELLS_1D));
  // Where position (r, c) is drawn: 2D by blocks; a sequence by blocks, wrapped into rows.
  const count1d = Math.ceil(w / block);
  const wrapped = !is2d && count1d > ONE_ROW_1D;
  const cols = is2d ? Math.ceil(w / block) : wrapped ? ROW_1D : count1d;
  const rows = is2d ? Math.ceil(h / block) : Math.ceil(count1d / cols);
  const cellOf = (r: number, c: number): number => (is2d ? Math.floor(r / block) * cols + Math.floor(c / block) : Math.floor(c / block));
  const seen = new Uint8Array(rows * cols); // bit 1: side A seen, bit 2: side B seen
  for (let r = 0; r < h; r++) for (let c = 0; c < w; c++) seen[cellOf(r, c)]! |= side[r * w + c] === 1 ? 1 : 2;
  const cells = seen.map((s) => (s === 1 ? 0 : s === 2 ? 1 : s === 3 ? 2 : 3));
  return { rows, cols, block, cells, wrapped };
}

export function partitionSvg(shape: readonly number[], side: Uint8Array, title: string, id: string): string {
  const { rows, cols, block, cells, wrapped } = partitionCells(shape, side);
  const square = shape.length === 2 || wrapped;
  const cell = Math.max(3, Math.min(16, shape.length === 2 ? Math.floor(288 / Math.max(rows, cols)) : Math.floor(448 / cols)));
  const cellH = square ? cell : 28;
  const gw = cols * cell;
  const gh = rows * cellH;
  const legendY = gh + 20;
  const width = Math.max(gw, 300) + 2;
  const notes = [
    ...(wrapped ? [`row by row, ${cols * block} steps a row`] : []),
    ...(block > 1 ? [`each cell: ${shape.length === 2 ? `${block}×${block} positions` : `${block} steps`}`] : []),
  ];
  const height = legendY + 6 + notes.length * 16;
  const out: string[] = [
    `<svg class="partition-grid" id="${id}" xmlns="http://www.w3.org/2000/svg" viewBox="-1 -1 ${width} ${height}" width="${width}" height="${height}" role="img" aria-labelledby="${id}-title" data-rows="${rows}" data-cols="${cols}" data-block="${block}">`,
    `<title id="${id}-title">${xmlText(title)}</title>`,
  ];
  // One path per class, one rectangle per run of equal cells in a row.
  const counts = [0, 0, 0];
  CELL_CLASSES.forEach((cls, k) => {
    let d = '';
    for (let r = 0; r < rows; r++) {
      let c = 0;
      while (c < cols) {
        if (cells[r * cols + c] !== k) {
          c++;
          continue;
        }
        const start = c;
        while (c < cols && cells[r * cols + c] === k) c++;
        counts[k]! += c - start;
        d += `M${start * cell} ${r * cellH}h${(c - start) * cell}v${cellH}h${-(c - start) * cell}z`;
      }
    }
    if (d !== '') out.push(`<path class="cells cells-${cls}" data-cells="${counts[k]}" d="${d}" fill="${FILL[cls]}"/>`);
  });
  out.push(`<rect class="grid-outline" x="0" y="0" width="${gw}" height="${gh}"/>`);
  const legend: [string, string][] = [
    ['side-a', 'side A'],
    ['side-b', 'side B'],
  ];
  if (counts[2]! > 0) legend.push(['mixed', 'both sides']);
  legend.forEach(([cls, text], i) => {
    const lx = i * 100;
    out.push(`<rect class="legend-swatch" x="${lx}" y="${legendY - 11}" width="14" height="14" fill="${FILL[cls as keyof typeof FILL]}"/><text class="legend" x="${lx + 19}" y="${legendY}">${text}</text>`);
  });
  notes.forEach((n, i) => out.push(`<text class="legend" x="0" y="${legendY + 16 * (i + 1)}">${n}</text>`));
  out.push('</svg>');
  return out.join('');
}
