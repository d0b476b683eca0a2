/**
 * A partition drawn on the input grid: side A hatched, side B plain, each position one cell. A
 * grid too large to draw cell by cell (more than 64 positions along an axis, 128 for sequences)
 * is drawn in blocks of k×k positions (k positions for sequences), a block that holds both sides
 * cross-hatched and called "mixed" in the legend and the title, so that the picture never claims
 * a side for a position it does not show.
 */
import { xmlText } from './junit.js';

const MAX_CELLS_2D = 64;
const MAX_CELLS_1D = 128;
const CELL_CLASSES = ['side-a', 'side-b', 'mixed'] as const;
const FILL = { 'side-a': 'url(#rf-pat-side-a)', 'side-b': 'url(#rf-pat-side-b)', mixed: 'url(#rf-pat-mixed)' } as const;

export interface PartitionCells {
  readonly rows: number;
  readonly cols: number;
  /** Positions per cell along each axis (1 when every position is a cell). */
  readonly block: number;
  /** 0 side A, 1 side B, 2 mixed; row-major. */
  readonly cells: Uint8Array;
}

/** The cells drawn for a mask: positions, or blocks of them when the grid is large. */
export function partitionCells(shape: readonly number[], side: Uint8Array): PartitionCells {
  const is2d = shape.length === 2;
  const h = is2d ? shape[0]! : 1;
  const w = is2d ? shape[1]! : (shape[0] ?? side.length);
  const block = is2d ? Math.max(1, Math.ceil(Math.max(h, w) / MAX_CELLS_2D)) : Math.max(1, Math.ceil(w / MAX_CELLS_1D));
  const rows = is2d ? Math.ceil(h / block) : 1;
  const cols = Math.ceil(w / block);
  const seen = new Uint8Array(rows * cols); // bit 1: side A seen, bit 2: side B seen
  for (let r = 0; r < h; r++) {
    const cr = is2d ? Math.floor(r / block) : 0;
    for (let c = 0; c < w; c++) seen[cr * cols + Math.floor(c / block)]! |= side[r * w + c] === 1 ? 1 : 2;
  }
  const cells = seen.map((s) => (s === 1 ? 0 : s === 2 ? 1 : 2));
  return { rows, cols, block, cells };
}

export function partitionSvg(shape: readonly number[], side: Uint8Array, title: string, id: string): string {
  const { rows, cols, block, cells } = partitionCells(shape, side);
  const cell = shape.length === 2 ? Math.max(3, Math.min(16, Math.floor(224 / Math.max(rows, cols)))) : Math.max(3, Math.min(16, Math.floor(448 / cols)));
  const cellH = shape.length === 2 ? cell : 28;
  const gw = cols * cell;
  const gh = rows * cellH;
  const legendY = gh + 20;
  const width = Math.max(gw, 300) + 2;
  const height = legendY + (block > 1 ? 38 : 22);
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
  if (block > 1) {
    const unit = shape.length === 2 ? `${block}×${block} positions` : `${block} positions`;
    out.push(`<text class="legend" x="0" y="${legendY + 16}">each cell: ${unit}</text>`);
  }
  out.push('</svg>');
  return out.join('');
}
