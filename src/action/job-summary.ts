/**
 * The job summary of the action: what a reviewer reads on the run's page instead of the log. One
 * table per checked config with the requirement, the base and head capacity and the change in
 * bits, the full explanation of each failing requirement folded away in a <details> block, then
 * the configs the change took out of a policy's reach, the policy notices, the skipped files, the
 * input errors and whatever did not fit into annotations.
 *
 * Each failing requirement also gets a compact flowchart of its network with the minimal cut
 * marked, folded away too: a Mermaid code block, which GitHub draws.
 *
 * The summary is rendered as HTML blocks. File names, messages and layer names come from the
 * pull request, so every piece of text is escaped, line breaks included: a blank line would end
 * an HTML block, and whatever followed it (`## rankfloor: pass`) would render as Markdown. The
 * only blank lines are the ones written around each flowchart's code block, whose labels hold no
 * quote, backtick or line break (mermaid-flowchart.ts). GitHub refuses a step summary over 1 MiB,
 * so whole sections are kept while they fit and a note then points to the JSON report, which has
 * everything.
 */
import type { CheckedConfig, CheckOutcome, RequirementDelta } from '../check/run-check.js';
import { formatDiagnosticLine } from '../diagnostic.js';
import { log2Big } from '../cut/types.js';
import type { RequirementResult } from '../policy/evaluate.js';
import { bits, capacityBits } from '../report/bounds-text.js';
import { explainRequirement, removalMessage } from '../report/check-text.js';
import { checkDocument, type CheckDocument, type OverallVerdict } from '../report/check-json.js';
import { requirementFlowchart } from '../report/mermaid-flowchart.js';
import { drawNetwork, type NetworkDrawing } from '../report/network-drawing.js';
import type { Model } from '../config/model.js';
import { panelMarks } from '../report/picture-panels.js';
import type { AnnotationKind, AnnotationPlan } from './annotations.js';
import { requirementLabel, tallyRequirements } from './requirement-tally.js';

/** GitHub's limit for one step's summary ("supports content up to a size of 1024k"). */
export const SUMMARY_LIMIT_BYTES = 1024 * 1024;

export interface SummaryOptions {
  /** Where the JSON report is, for the note on a cut summary. */
  readonly reportPath?: string;
  readonly limitBytes?: number;
}

const NONE = '—';

const TABLE_HEAD = ['partition', 'required (bits)', 'base (bits)', 'head (bits)', 'change (bits)', 'verdict'];

const KIND_WORDS: Readonly<Record<AnnotationKind, readonly [string, string]>> = {
  error: ['error', 'errors'],
  warning: ['warning', 'warnings'],
  notice: ['notice', 'notices'],
};

/** The whole summary, each line ending in '\n'; only the lines around a flowchart's code block are blank. */
export function renderJobSummary(outcome: CheckOutcome, verdict: OverallVerdict, overflow: AnnotationPlan['overflow'], options: SummaryOptions = {}): string {
  const head = [heading(2, `rankfloor: ${verdict}`), `<p>${escapeHtml(headline(outcome))}</p>\n`].join('');
  const doc = checkDocument(outcome);
  const drawings = new Map<Model, NetworkDrawing>();
  const drawingOf = (m: Model): NetworkDrawing => drawings.get(m) ?? drawings.set(m, drawNetwork(m)).get(m)!;
  const sections: string[] = outcome.checked.map((c, i) => configSection(c, doc.results[i]!, drawingOf));
  if (outcome.notices.length > 0) sections.push(heading(3, 'Policy notices') + list(outcome.notices.map((n) => `${n.file}:${n.line}: ${n.message}`)));
  if (outcome.skipped.length > 0) sections.push(heading(3, 'Selected but not checked') + list(outcome.skipped.map((x) => `${x.path}: ${x.reason}`)));
  const errors = outcome.errors.filter((e) => e.severity === 'error');
  if (errors.length > 0) sections.push(heading(3, 'Input errors') + list(errors.map(formatDiagnosticLine)));
  if (overflow.length > 0) {
    let s = heading(3, 'Not shown as annotations');
    for (const kind of ['error', 'warning', 'notice'] as const) {
      const rest = overflow.filter((o) => o.kind === kind);
      if (rest.length === 0) continue;
      // GitHub displays ten annotations of a kind per step; these would have been dropped silently.
      s += `<p>${rest.length} more ${KIND_WORDS[kind][rest.length === 1 ? 0 : 1]}:</p>\n`;
      s += list(rest.map(({ finding: f }) => `${f.file}${f.line !== undefined ? `:${f.line}:${f.column ?? 1}` : ''}: ${f.title}`));
    }
    sections.push(s);
  }
  return fit(head, sections, options);
}

function fit(head: string, sections: readonly string[], options: SummaryOptions): string {
  const limit = options.limitBytes ?? SUMMARY_LIMIT_BYTES;
  const size = (s: string): number => Buffer.byteLength(s, 'utf8');
  const whole = head + sections.join('');
  if (size(whole) <= limit) return whole;
  const note = (left: number): string =>
    `<p><strong>${escapeHtml(
      `This summary stops here to stay under GitHub's 1 MiB limit for a step summary; ${left} more section${left === 1 ? '' : 's'} ` +
        `(configs, notices, errors) are in the JSON report${options.reportPath ? ` at ${options.reportPath}` : ''} (the action's \`report\` output).`,
    )}</strong></p>\n`;
  let out = head;
  let kept = 0;
  // The note is measured with the largest count it can show, so that adding it never overflows.
  const reserve = size(note(sections.length));
  // The size so far is carried along: measuring the growing text again for every section is quadratic.
  let used = size(out);
  while (kept < sections.length && used + size(sections[kept]!) + reserve <= limit) {
    used += size(sections[kept]!);
    out += sections[kept++];
  }
  return out + note(sections.length - kept);
}

function headline(outcome: CheckOutcome): string {
  if (outcome.checked.length === 0) {
    return outcome.errors.length > 0 ? 'No config could be checked.' : 'Nothing to check: no config matched (or none changed).';
  }
  const t = tallyRequirements(outcome);
  const against = outcome.base ? ` against base ${outcome.base.slice(0, 12)}` : '';
  const plural = (n: number, one: string, many: string): string => `${n} ${n === 1 ? one : many}`;
  return (
    `${plural(outcome.checked.length, 'config × policy check', 'config × policy checks')}${against}: ` +
    `${plural(t.failing, 'failing requirement', 'failing requirements')}, ${t.unproven} unproven, ${t.passing} passing.`
  );
}

function configSection(c: CheckedConfig, doc: CheckDocument['results'][number], drawingOf: (m: Model) => NetworkDrawing): string {
  let s = heading(3, `${c.file} — policy ${c.policy.id}`);
  const r = c.result;
  if (!r) return s + `<p>${escapeHtml(`${c.failing ? 'Failing' : 'Warning'}: ${removalMessage(c)}.`)}</p>\n`;
  if (c.comparison === 'new') s += '<p>New config: no base version to compare with.</p>\n';
  if (c.renamedFrom !== undefined) s += `<p>${escapeHtml(`Renamed from ${c.renamedFrom}; compared with its base version there.`)}</p>\n`;
  if (c.architecture) s += `<p>${escapeHtml(`Built from the architecture definition ${c.architecture.path} (${c.architecture.name}).`)}</p>\n`;
  const rows = r.requirements.map((q, i) => row(q, c.deltas?.[i]));
  s += `<table><tr>${TABLE_HEAD.map((h) => `<th>${escapeHtml(h)}</th>`).join('')}</tr>${rows.map((cells) => `<tr>${cells.map((x) => `<td>${escapeHtml(x)}</td>`).join('')}</tr>`).join('')}</table>\n`;
  r.requirements.forEach((q, i) => {
    const d = c.deltas?.[i];
    const label = requirementLabel(q, d);
    if (!label.startsWith('fail')) return;
    const summary = escapeHtml(`${q.requirement.partition}: ${label} — why, and what restores it`);
    s += `<details><summary>${summary}</summary><pre>${escapeHtml(explainRequirement(q, d, c.architecture).join('\n'))}</pre></details>\n`;
    if (c.model) s += flowchartSection(drawingOf(c.model), q.requirement.partition, doc.requirements[i]!);
  });
  return s;
}

/** The requirement's flowchart, folded: Markdown needs the blank lines around its code block. */
function flowchartSection(drawing: NetworkDrawing, partition: string, r: CheckDocument['results'][number]['requirements'][number]): string {
  const chart = requirementFlowchart(drawing, panelMarks({ cut: r.cut, fixes: r.fix, changes: r.attributed ?? [] }, drawing).placed);
  if (chart === undefined) return '';
  const summary = escapeHtml(`${partition}: the network and its minimal cut (diagram)`);
  return `<details><summary>${summary}</summary>\n\n\`\`\`mermaid\n${chart}\`\`\`\n\n</details>\n`;
}

function row(q: RequirementResult, d: RequirementDelta | undefined): string[] {
  const head = capacityBits(q.bounds.upper, q.bounds.lower);
  const base = d?.base ? capacityBits(d.base.upper, d.base.lower) : NONE;
  const change = d?.changeBits === null || d?.changeBits === undefined ? NONE : signed(d.changeBits);
  return [q.requirement.partition, bits(log2Big(q.requirement.minRank)), base, head, change, requirementLabel(q, d)];
}


function signed(x: number): string {
  const s = bits(x);
  return x > 0 ? `+${s}` : s === '-0.00' ? '0.00' : s;
}

function heading(level: number, text: string): string {
  return `<h${level}>${escapeHtml(text)}</h${level}>\n`;
}

function list(items: readonly string[]): string {
  return `<ul>${items.map((i) => `<li>${escapeHtml(i)}</li>`).join('')}</ul>\n`;
}

/**
 * Text for HTML content and attributes, on one line: line breaks become character references,
 * which a <pre> still shows as line breaks but which cannot end the HTML block.
 */
export function escapeHtml(s: string): string {
  return s
    .replace(/&/g, '&amp;')
    .replace(/</g, '&lt;')
    .replace(/>/g, '&gt;')
    .replace(/"/g, '&quot;')
    .replace(/\r/g, '&#13;')
    .replace(/\n/g, '&#10;');
}
