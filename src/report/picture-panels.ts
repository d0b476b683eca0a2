/**
 * What the picture report shows, one panel per config × partition, taken from the JSON document
 * of the same run (`checkDocument`, `boundsDocument`) so that every number drawn is the number the
 * JSON report prints, plus what the JSON does not hold: the model to draw and the partition's
 * mask. Panels that matter come first: failing, then dropped, then unproven, then passing.
 */
import type { Model } from '../config/model.js';
import type { CheckOutcome } from '../check/run-check.js';
import type { Partition } from '../partition/partition.js';
import type { BoundsResult } from '../cut/types.js';
import type { DrawingMark } from './architecture-svg.js';
import { boundsDocument, type RankJson } from './bounds-json.js';
import type { BarRow } from './capacity-bars-svg.js';
import { requirementLabel, type RequirementLabel } from './requirement-label.js';
import { checkDocument, type RequirementDocument } from './check-json.js';
import { placeOf, type NetworkDrawing } from './network-drawing.js';

export type PanelState = 'fail' | 'fail-unproven' | 'drop' | 'fail-may-drop' | 'may-drop' | 'unproven' | 'pass' | 'exact' | 'bounded' | 'upper-only';

export interface CutDocument {
  readonly layer: number | string;
  readonly line: number;
  readonly dim: number;
  readonly count: number;
}

export interface Panel {
  readonly file: string;
  /** Absent for `bounds`. */
  readonly policy?: string;
  readonly surrogate: string;
  readonly partition: string;
  readonly description: string;
  readonly state: PanelState;
  /** The JSON `change_bits` when the head's upper bound is below the base's. */
  readonly dropBits?: number;
  readonly maxDropBits?: number | null;
  readonly rows: readonly BarRow[];
  readonly method: string;
  readonly cut: readonly CutDocument[];
  readonly fixes: readonly RequirementDocument['fix'][number][];
  readonly changes: readonly { layer: number | string; field: string; from: string; to: string; line: number; column: number }[];
  readonly model: Model;
  readonly partitionShape: readonly number[];
  readonly side: Uint8Array;
}

const STATE_OF_LABEL: Readonly<Record<RequirementLabel, PanelState>> = {
  fail: 'fail',
  'fail (unproven)': 'fail-unproven',
  'fail (drop)': 'drop',
  'fail (may have dropped)': 'fail-may-drop',
  'may have dropped': 'may-drop',
  unproven: 'unproven',
  pass: 'pass',
};

const ORDER: Readonly<Record<PanelState, number>> = { fail: 0, 'fail-unproven': 0, drop: 1, 'fail-may-drop': 1, 'may-drop': 2, unproven: 2, 'upper-only': 2, bounded: 3, exact: 3, pass: 3 };

export function checkPanels(outcome: CheckOutcome): Panel[] {
  const doc = checkDocument(outcome);
  const panels: Panel[] = [];
  doc.results.forEach((res, i) => {
    const c = outcome.checked[i]!;
    if (!c.result || !c.model) return;
    const model = c.model;
    const shape = model.kind === 'layered' ? model.input.shape : model.shape;
    res.requirements.forEach((r, j) => {
      const q = c.result!.requirements[j]!;
      const compared = 'base' in r;
      // The same word as every other output.
      const state = STATE_OF_LABEL[requirementLabel(q, c.deltas?.[j])];
      const base = compared ? r.base : undefined;
      const rows: BarRow[] = [{ series: 'required', label: 'required', value: r.required }];
      if (compared) {
        const none = 'none: no base version of this requirement';
        rows.push(
          { series: 'base-lower', label: 'base lower', value: base?.lower ?? null, missing: base ? 'none proven' : none },
          { series: 'base-upper', label: 'base upper', value: base?.upper ?? null, missing: none },
        );
      }
      rows.push(
        { series: 'head-lower', label: compared ? 'head lower' : 'lower', value: r.lower, missing: 'none proven (upper-only)' },
        { series: 'head-upper', label: compared ? 'head upper' : 'upper', value: r.upper },
      );
      panels.push({
        file: res.file,
        policy: res.policy,
        surrogate: res.surrogate,
        partition: r.partition,
        description: q.partition.description,
        state,
        ...(typeof r.change_bits === 'number' && r.change_bits < 0 ? { dropBits: r.change_bits } : {}),
        ...(compared ? { maxDropBits: r.max_drop_bits ?? null } : {}),
        rows,
        method: q.bounds.upper.method,
        cut: r.cut,
        fixes: r.fix,
        changes: r.attributed ?? [],
        model,
        partitionShape: shape,
        side: q.partition.side,
      });
    });
  });
  // Stable: within a state, the JSON report's order.
  return panels.map((p, k) => ({ p, k })).sort((a, b) => ORDER[a.p.state] - ORDER[b.p.state] || a.k - b.k).map(({ p }) => p);
}

export function boundsPanels(result: BoundsResult, model: Model, partitions: readonly Partition[]): Panel[] {
  const doc = boundsDocument(result, model.kind === 'layered' ? model.architecture : undefined);
  const shape = model.kind === 'layered' ? model.input.shape : model.shape;
  return doc.partitions.map((p, i) => ({
    file: doc.file,
    surrogate: doc.surrogate,
    partition: p.partition,
    description: partitions[i]!.description,
    state: p.status,
    rows: [
      { series: 'head-lower', label: 'lower', value: p.lower, missing: 'none proven (upper-only)' },
      { series: 'head-upper', label: 'upper', value: p.upper },
    ],
    method: result.partitions[i]!.upper.method,
    cut: p.cut,
    fixes: [],
    changes: [],
    model,
    partitionShape: shape,
    side: partitions[i]!.side,
  }));
}

/** What a requirement marks on its model's drawing, in the JSON report's form. */
export type MarkSource = Pick<Panel, 'cut' | 'fixes' | 'changes'>;

/** The marks a panel puts on its model's drawing; a mark whose layer is not drawn has no place. */
export function panelMarks(panel: MarkSource, drawing: NetworkDrawing): { placed: DrawingMark[]; unplaced: Omit<DrawingMark, 'place'>[] } {
  const placed: DrawingMark[] = [];
  const unplaced: Omit<DrawingMark, 'place'>[] = [];
  const add = (label: number | string, line: number | undefined, mark: Omit<DrawingMark, 'place'>): void => {
    const place = placeOf(drawing, label, line);
    if (place) placed.push({ ...mark, place });
    else unplaced.push(mark);
  };
  for (const c of panel.cut) {
    add(c.layer, c.line, { kind: 'cut', text: cutText(c), data: { layer: c.layer, line: c.line, dim: c.dim, count: c.count } });
  }
  for (const f of panel.fixes) {
    add(f.layer, undefined, {
      kind: 'fix',
      text: `fix: ${f.field} ${f.from} → ${f.to} (+${f.added_parameters} parameters)`,
      data: { layer: f.layer, field: f.field, line: f.line, from: f.from, to: f.to, 'added-parameters': f.added_parameters, verdict: f.verdict },
    });
  }
  for (const a of panel.changes) {
    add(a.layer, undefined, { kind: 'change', text: `this change: ${a.field} ${a.from} → ${a.to}`, data: { layer: a.layer, field: a.field, line: a.line, from: a.from, to: a.to } });
  }
  return { placed, unplaced };
}

export function cutText(c: CutDocument): string {
  return `✂ cut: ${c.count} bond${c.count === 1 ? '' : 's'} × dim ${c.dim}`;
}

/** The bounds of a panel's bar rows by series, for the overview table. */
export function rowValue(panel: Panel, series: BarRow['series']): RankJson | null | undefined {
  const row = panel.rows.find((r) => r.series === series);
  return row === undefined ? undefined : row.value;
}
