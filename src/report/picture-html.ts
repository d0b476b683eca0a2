/**
 * The picture report: one self-contained HTML file (inline SVG and CSS, no script, nothing
 * fetched) that a reviewer opens from a CI artifact. For each config × partition that matters —
 * failing, dropped and unproven first — it draws the capacity bars, the partition on the input
 * grid and the network with its minimal cut, the fix and the changed fields marked on their
 * layers. Every number comes from the JSON document of the same run (see picture-panels.ts).
 *
 * Deterministic: the same run gives the same bytes (no dates, ids from positions in the report).
 */
import type { CheckOutcome } from '../check/run-check.js';
import type { BoundsResult } from '../cut/types.js';
import type { Model } from '../config/model.js';
import type { Partition } from '../partition/partition.js';
import { TOOL_VERSION } from '../version.js';
import { architectureSvg, layoutForPanels, tooLargeText } from './architecture-svg.js';
import type { Placed } from './graph-layout.js';
import { boundText, capacityBarsSvg } from './capacity-bars-svg.js';
import { checkDocument } from './check-json.js';
import { xmlText } from './junit.js';
import { drawNetwork, type NetworkDrawing } from './network-drawing.js';
import { partitionSvg } from './partition-svg.js';
import { boundsPanels, checkPanels, panelMarks, rowValue, type Panel, type PanelState } from './picture-panels.js';

/** Panels drawn in full; the others are rows of the overview table only. */
export const MAX_DRAWN_PANELS = 40;

/** Nodes laid out over all the networks of one picture. */
export const MAX_LAID_OUT_NODES = 2000;

const STATE_WORDS: Readonly<Record<PanelState, readonly [badge: string, words: string]>> = {
  fail: ['✗ FAIL', "provably short: the head's upper bound is below the requirement"],
  'fail-unproven': ['✗ FAIL (unproven)', 'not proven to reach the requirement, and this policy counts unproven as failing'],
  drop: ['✗ FAIL (drop)', "a proven drop: the head's upper bound is below the base's lower bound by more than max_drop_bits"],
  'fail-may-drop': ['✗ FAIL (may have dropped)', 'only the upper bounds fell by more than max_drop_bits; this requirement counts unproven as failing'],
  'may-drop': ['? MAY HAVE DROPPED', 'only the upper bounds fell by more than max_drop_bits: the capacity may have dropped, or only a loose ceiling moved'],
  unproven: ['? UNPROVEN', 'the upper bound allows the requirement, but no rule proves a lower bound that reaches it'],
  pass: ['✓ PASS', "proven: the head's lower bound reaches the requirement"],
  exact: ['= EXACT', 'the lower and the upper bound are equal'],
  bounded: ['↕ BOUNDED', 'both bounds are known and differ'],
  'upper-only': ['↑ UPPER ONLY', 'no rule proves a lower bound here'],
};

const SURROGATE_WORDS: Readonly<Record<string, string>> = {
  tree: 'tree surrogate (per-position linear maps, product pooling)',
  overlap: 'overlap surrogate (linear maps over kernel windows, product pooling)',
};

export function checkPicture(outcome: CheckOutcome): string {
  const doc = checkDocument(outcome);
  const panels = checkPanels(outcome);
  const configs = new Set(doc.results.map((r) => r.file)).size;
  const intro = `${configs} config${configs === 1 ? '' : 's'}, ${doc.results.length} config × policy check${doc.results.length === 1 ? '' : 's'}, ${panels.length} requirement${panels.length === 1 ? '' : 's'}${outcome.base ? `, compared with base ${outcome.base.slice(0, 12)}` : ''}. Verdict: ${doc.verdict}.`;
  const other: string[] = [];
  const removed = doc.results.filter((r) => r.comparison === 'deleted' || r.comparison === 'moved-out');
  if (removed.length > 0) {
    other.push('<h2>Configs taken out of a policy’s reach</h2><ul>');
    for (const r of removed) other.push(`<li>${xmlText(`${r.file} (policy ${r.policy}): ${r.moved_to !== undefined ? `moved to ${r.moved_to}: ${r.moved_why}` : 'deleted'}; ${r.verdict}`)}</li>`);
    other.push('</ul>');
  }
  if (doc.errors.length > 0) {
    other.push('<h2>Input errors</h2><ul>');
    for (const e of doc.errors) other.push(`<li>${xmlText(`${e.file}${e.line !== null ? `:${e.line}:${e.column}` : ''}: ${e.message}`)}</li>`);
    other.push('</ul>');
  }
  return page('rankfloor check — capacity picture', intro, panels, other.join(''));
}

export function boundsPicture(result: BoundsResult, model: Model, partitions: readonly Partition[]): string {
  const panels = boundsPanels(result, model, partitions);
  const intro = `${result.file}: ${panels.length} partition${panels.length === 1 ? '' : 's'}, ${SURROGATE_WORDS[result.surrogate]}.`;
  return page('rankfloor bounds — capacity picture', intro, panels, '');
}

function page(heading: string, intro: string, panels: readonly Panel[], other: string): string {
  const drawn = panels.slice(0, MAX_DRAWN_PANELS);
  const parts = [
    '<!DOCTYPE html>',
    '<html lang="en"><head><meta charset="utf-8">',
    '<meta name="viewport" content="width=device-width, initial-scale=1">',
    // Nothing may be fetched: no script, no external style, image, font or frame.
    `<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'; img-src data:">`,
    `<title>${xmlText(heading)}</title>`,
    `<style>${CSS}</style></head><body>`,
    DEFS,
    `<header><h1>${xmlText(heading)}</h1><p class="intro">${xmlText(intro)}</p></header>`,
    LEGEND,
    overview(panels),
  ];
  if (panels.length > drawn.length) {
    parts.push(`<p class="note">The first ${drawn.length} of ${panels.length} requirements are drawn below; the others are in the table above and in the JSON report.</p>`);
  }
  const figures = networkFigures(drawn);
  drawn.forEach((p, i) => parts.push(panelHtml(p, i + 1, figures[i]!)));
  parts.push(other, `<footer>rankfloor ${xmlText(TOOL_VERSION)} · numbers as in the JSON report (bits are log2 of the rank)</footer></body></html>`, '');
  return parts.join('\n');
}

function overview(panels: readonly Panel[]): string {
  const head = ['#', 'config', 'policy', 'partition', 'verdict', 'required', 'base upper', 'head lower', 'head upper'];
  const cell = (v: ReturnType<typeof rowValue>): string => (v === undefined ? '—' : v === null ? 'none' : boundText(v));
  const rows = panels.map((p, i) => {
    const n = i + 1;
    const ref = n <= MAX_DRAWN_PANELS ? `<a href="#p${n}">${n}</a>` : String(n);
    const cells = [p.file, p.policy ?? '—', p.partition, STATE_WORDS[p.state][0], cell(rowValue(p, 'required')), cell(rowValue(p, 'base-upper')), cell(rowValue(p, 'head-lower')), cell(rowValue(p, 'head-upper'))];
    return `<tr class="state-${p.state}"><td>${ref}</td>${cells.map((c) => `<td>${xmlText(c)}</td>`).join('')}</tr>`;
  });
  return `<table class="overview"><thead><tr>${head.map((h) => `<th scope="col">${h}</th>`).join('')}</tr></thead><tbody>${rows.join('')}</tbody></table>`;
}

/** A panel's network: its drawing, its marks, and the shared layout or why there is none. */
interface NetworkFigure {
  readonly drawing: NetworkDrawing;
  readonly marks: ReturnType<typeof panelMarks>;
  readonly layout: Placed | { readonly reason: string };
}

/**
 * One drawing and one layout per model, shared by its panels, while the nodes laid out stay within
 * MAX_LAID_OUT_NODES (a layout's time grows with its nodes); networks past that are described in
 * words, with their marks listed.
 */
function networkFigures(panels: readonly Panel[]): NetworkFigure[] {
  const drawings = new Map<Model, NetworkDrawing>();
  for (const p of panels) if (!drawings.has(p.model)) drawings.set(p.model, drawNetwork(p.model));
  const marks = panels.map((p) => panelMarks(p, drawings.get(p.model)!));
  const layouts = new Map<Model, NetworkFigure['layout']>();
  let laidOut = 0;
  for (const [model, drawing] of drawings) {
    const tooLarge = tooLargeText(drawing);
    if (tooLarge !== undefined) layouts.set(model, { reason: tooLarge });
    else if (laidOut + drawing.nodes.length > MAX_LAID_OUT_NODES) {
      layouts.set(model, { reason: `This network is not drawn: the networks drawn above reach the ${MAX_LAID_OUT_NODES.toLocaleString('en-US')} nodes this picture lays out.` });
    } else {
      laidOut += drawing.nodes.length;
      layouts.set(model, layoutForPanels(drawing, panels.flatMap((p, i) => (p.model === model ? [marks[i]!.placed] : []))));
    }
  }
  return panels.map((p, i) => {
    const layout = layouts.get(p.model)!;
    // Without a drawing, every mark is listed in words.
    const m = 'reason' in layout ? { placed: [], unplaced: [...marks[i]!.unplaced, ...marks[i]!.placed.map(({ place: _, ...rest }) => rest)] } : marks[i]!;
    return { drawing: drawings.get(p.model)!, marks: m, layout };
  });
}

function panelHtml(p: Panel, n: number, figure: NetworkFigure): string {
  const id = `p${n}`;
  const [badge, words] = STATE_WORDS[p.state];
  const { drawing, marks, layout } = figure;
  const what = `${p.file}${p.policy !== undefined ? `, policy ${p.policy}` : ''}, partition ${p.partition}`;
  const out = [
    `<section class="panel state-${p.state}" id="${id}" data-file="${xmlText(p.file)}" data-partition="${xmlText(p.partition)}"${p.policy !== undefined ? ` data-policy="${xmlText(p.policy)}"` : ''} data-state="${p.state}">`,
    `<h2><span class="badge">${badge}</span> ${xmlText(p.file)} · ${xmlText(p.partition)}</h2>`,
    `<p class="sub">${xmlText(`${p.policy !== undefined ? `policy ${p.policy} · ` : ''}${SURROGATE_WORDS[p.surrogate] ?? p.surrogate} · side A: ${p.description}`)}</p>`,
    `<p class="words">${xmlText(words)}${p.dropBits !== undefined ? xmlText(`; ↓ may have dropped: the upper bound changed by ${p.dropBits} bits against the base${p.maxDropBits !== undefined && p.maxDropBits !== null ? ` (max_drop_bits ${p.maxDropBits})` : ''}`) : ''}.</p>`,
    '<div class="panel-body"><div class="side">',
    `<figure class="fig-bars">${capacityBarsSvg(p.rows, `Capacity across ${p.partition} in bits: ${p.rows.map((r) => `${r.label} ${r.value ? boundText(r.value) : (r.missing ?? 'none')}`).join('; ')}`, `${id}-bars`)}<figcaption>Capacity in bits. Solid: proven lower bound; hatched: upper bound; cross-hatched: the policy's minimum (dashed line).</figcaption></figure>`,
    `<figure class="fig-partition">${partitionSvg(p.partitionShape, p.side, `Partition ${p.partition} on the input grid: side A is ${p.description}`, `${id}-grid`)}<figcaption>The partition on the input grid (side A hatched).</figcaption></figure>`,
    '</div>',
    `<figure class="fig-network">${'reason' in layout ? `<p class="too-large">${xmlText(layout.reason)}</p>` : architectureSvg(drawing, layout, marks.placed, `The network of ${what}, from input to head; the minimal cut (${p.method}) marked on ${p.cut.length} layer entr${p.cut.length === 1 ? 'y' : 'ies'}`, `${id}-net`)}<figcaption>${xmlText(networkCaption(p, drawing))}</figcaption></figure>`,
    '</div>',
  ];
  if (marks.unplaced.length > 0) {
    out.push('<ul class="unplaced">');
    for (const m of marks.unplaced) {
      const data = Object.entries(m.data)
        .map(([k, v]) => ` data-${k}="${xmlText(String(v))}"`)
        .join('');
      out.push(`<li class="${m.kind}-mark"${data}>${xmlText(m.text)}</li>`);
    }
    out.push('</ul>');
  }
  out.push('</section>');
  return out.join('');
}

function networkCaption(p: Panel, drawing: NetworkDrawing): string {
  const dashed = drawing.edges.some((e) => e.kind === 'shortcut' || e.kind === 'skip') ? ' (dashed edges: shortcuts and skips)' : '';
  const parts = [
    p.model.kind === 'layered'
      ? `The network from input to head, laid out as a layered graph${dashed}.`
      : 'The tensors of the network and their bonds (a bond of three or more tensors drawn as a copy-tensor node), with the input positions whose open legs they hold.',
  ];
  parts.push(
    p.cut.length > 0
      ? `Minimal cut (${p.method}): ${p.cut.length} entr${p.cut.length === 1 ? 'y' : 'ies'}, marked ✂ with a dashed outline; the bonds cut are drawn thick.`
      : `Upper bound: ${p.method}.`,
  );
  if (p.fixes.length > 0) parts.push(`Fix: ${p.fixes.length} single-field change${p.fixes.length === 1 ? '' : 's'} that restore the requirement, marked on the layer.`);
  if (p.changes.length > 0) parts.push(`Marked "this change": fields the change touched on the cut.`);
  if (drawing.folded > 0) parts.push(`${drawing.folded} pointwise layer${drawing.folded === 1 ? '' : 's'} shown inside the box of the layer before (+ …).`);
  return parts.join(' ');
}

const STRIPES = (id: string, bg: string, fg: string, size: number, width: number, angle: number): string =>
  `<pattern id="${id}" patternUnits="userSpaceOnUse" width="${size}" height="${size}" patternTransform="rotate(${angle})"><rect width="${size}" height="${size}" fill="${bg}"/><line x1="0" y1="0" x2="0" y2="${size}" stroke="${fg}" stroke-width="${width}"/></pattern>`;
const CROSS = (id: string, bg: string, fg: string, size: number): string =>
  `<pattern id="${id}" patternUnits="userSpaceOnUse" width="${size}" height="${size}" patternTransform="rotate(45)"><rect width="${size}" height="${size}" fill="${bg}"/><path d="M0 0V${size}M0 0H${size}" stroke="${fg}" stroke-width="1.5"/></pattern>`;
const SOLID = (id: string, fill: string): string => `<pattern id="${id}" patternUnits="userSpaceOnUse" width="4" height="4"><rect width="4" height="4" fill="${fill}"/></pattern>`;
const DOTS = (id: string, bg: string, fg: string): string =>
  `<pattern id="${id}" patternUnits="userSpaceOnUse" width="6" height="6"><rect width="6" height="6" fill="${bg}"/><circle cx="3" cy="3" r="1" fill="${fg}"/></pattern>`;

/** Patterns and markers, defined once and referenced by every figure. */
const DEFS = [
  '<svg class="defs" aria-hidden="true" width="0" height="0" focusable="false"><defs>',
  SOLID('rf-pat-head-lower', '#2b5f9e'),
  STRIPES('rf-pat-head-upper', '#ffffff', '#2b5f9e', 6, 2.5, 45),
  SOLID('rf-pat-base-lower', '#7d7d7d'),
  STRIPES('rf-pat-base-upper', '#ffffff', '#6b6b6b', 6, 2.5, -45),
  CROSS('rf-pat-required', '#ffffff', '#1a1a1a', 6),
  STRIPES('rf-pat-side-a', '#a9c6ec', '#2b5f9e', 5, 2, 45),
  SOLID('rf-pat-side-b', '#f7f7f7'),
  CROSS('rf-pat-mixed', '#eeeeee', '#777777', 5),
  STRIPES('rf-pat-cut', '#fdeceb', '#f3b4ae', 8, 2, 45),
  DOTS('rf-pat-fix', '#e6f4e4', '#7fbf7a'),
  STRIPES('rf-pat-change', '#fff5dc', '#f0d28c', 6, 1.5, 90),
  '<marker id="rf-arrow" viewBox="0 0 10 10" refX="9" refY="5" markerUnits="userSpaceOnUse" markerWidth="9" markerHeight="9" orient="auto-start-reverse"><path d="M0 0L10 5L0 10z" fill="#555"/></marker>',
  '</defs></svg>',
].join('');

const LEGEND = [
  '<section class="legend" aria-label="How to read the figures"><h2>How to read the figures</h2><ul>',
  '<li><svg width="28" height="14" aria-hidden="true"><rect width="28" height="14" fill="url(#rf-pat-head-lower)" class="swatch"/></svg> proven lower bound (solid; grey for the base)</li>',
  '<li><svg width="28" height="14" aria-hidden="true"><rect width="28" height="14" fill="url(#rf-pat-head-upper)" class="swatch"/></svg> upper bound (hatched)</li>',
  '<li><svg width="28" height="14" aria-hidden="true"><rect width="28" height="14" fill="url(#rf-pat-required)" class="swatch"/></svg> the policy’s minimum (cross-hatched bar, dashed line)</li>',
  '<li><svg width="28" height="14" aria-hidden="true"><rect width="28" height="14" fill="url(#rf-pat-cut)" class="swatch"/></svg> ✂ a layer of the minimal cut (dashed outline)</li>',
  '<li><svg width="28" height="14" aria-hidden="true"><rect width="28" height="14" fill="url(#rf-pat-fix)" class="swatch"/></svg> fix: a single-field change that restores the requirement</li>',
  '<li><svg width="28" height="14" aria-hidden="true"><rect width="28" height="14" fill="url(#rf-pat-change)" class="swatch"/></svg> this change: a field the change touched on the cut</li>',
  '<li><svg width="28" height="14" aria-hidden="true"><rect width="28" height="14" fill="url(#rf-pat-side-a)" class="swatch"/></svg> side A of the partition; <svg width="28" height="14" aria-hidden="true"><rect width="28" height="14" fill="url(#rf-pat-side-b)" class="swatch"/></svg> side B</li>',
  '</ul></section>',
].join('');

const CSS = [
  'body{font:14px/1.45 system-ui,-apple-system,"Segoe UI",sans-serif;color:#1a1a1a;background:#fff;margin:0 auto;padding:16px 24px;max-width:1400px}',
  'h1{font-size:22px;margin:0 0 4px}h2{font-size:17px;margin:0 0 4px}',
  '.intro,.sub,.note{color:#333;margin:2px 0}',
  'svg text{font:11px ui-monospace,"DejaVu Sans Mono",Menlo,Consolas,monospace;fill:#1a1a1a}',
  '.legend ul{list-style:none;padding:0;display:flex;flex-wrap:wrap;gap:6px 22px;margin:4px 0 12px}.legend li{display:flex;align-items:center;gap:6px}',
  '.swatch{stroke:#333;stroke-width:1}',
  'table.overview{border-collapse:collapse;margin:8px 0 16px;font-size:13px}table.overview th,table.overview td{border:1px solid #bbb;padding:3px 7px;text-align:left;vertical-align:top}',
  'table.overview th{background:#f0f0f0}',
  '.panel{border:1px solid #bbb;border-left-width:8px;border-radius:4px;padding:12px 16px;margin:18px 0}',
  '.panel.state-fail,.panel.state-fail-unproven,.panel.state-drop{border-left-color:#b3261e;border-left-style:double}',
  '.panel.state-unproven,.panel.state-upper-only{border-left-color:#b7791f;border-left-style:dashed}',
  '.panel.state-pass,.panel.state-exact,.panel.state-bounded{border-left-color:#2f7d32}',
  '.badge{display:inline-block;border:2px solid currentColor;border-radius:3px;padding:0 6px;font-size:14px;margin-right:6px}',
  '.state-fail .badge,.state-fail-unproven .badge,.state-drop .badge{color:#b3261e}.state-unproven .badge,.state-upper-only .badge{color:#8a5a00}.state-pass .badge,.state-exact .badge,.state-bounded .badge{color:#2f7d32}',
  '.words{font-weight:600;margin:4px 0 8px}',
  // The network on the left (it is tall), the bars and the partition beside it; stacked on narrow screens.
  '.panel-body{display:grid;grid-template-columns:auto minmax(0,1fr);grid-template-areas:"net side";gap:12px 36px;align-items:start}',
  '.side{grid-area:side;display:flex;flex-direction:column;gap:6px}.fig-network{grid-area:net}.side svg{max-width:100%;height:auto}',
  '@media (max-width:900px){.panel-body{grid-template-columns:minmax(0,1fr);grid-template-areas:"side" "net"}}',
  'figure{margin:6px 0}figcaption{font-size:12px;color:#444;max-width:460px}.fig-network figcaption{max-width:340px}',
  '.fig-network{overflow-x:auto}',
  '.bar{stroke:#1a1a1a;stroke-width:0.8}.bar-break{stroke:#1a1a1a;stroke-width:1.5;fill:none}',
  '.required-line{stroke:#b3261e;stroke-width:1.5;stroke-dasharray:5 3}.required-label{fill:#b3261e}',
  '.axis line{stroke:#555}.tick,.axis-unit,.bar-missing{fill:#555}',
  '.grid-outline{fill:none;stroke:#1a1a1a;stroke-width:1}',
  '.legend-swatch{stroke:#333;stroke-width:1}',
  '.edge{fill:none;stroke:#555;stroke-width:1.3}.edge-shortcut,.edge-skip{stroke-dasharray:6 4}.edge.cut-edge{stroke:#b3261e;stroke-width:3}',
  '.edge-label text{fill:#444}',
  '.node-box{fill:#fff;stroke:#444;stroke-width:1.2}.node-input .node-box,.node-head .node-box{fill:#f1f1f1}.node-merge .node-box{rx:14px}',
  '.node.on-cut .node-box{stroke:#b3261e;stroke-width:3;stroke-dasharray:7 3}',
  '.node-title{font-weight:700}',
  '.cut-mark .mark-text{fill:#8c1d18;font-weight:700}.fix-mark .mark-text{fill:#1e5a20;font-weight:700}.change-mark .mark-text{fill:#6b4a00;font-weight:700}',
  '.too-large{font-style:italic}',
  'footer{margin-top:24px;color:#555;font-size:12px}',
  '@media print{.panel{break-inside:avoid}}',
].join('\n');
