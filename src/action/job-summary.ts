/**
 * The job summary of the action: what a reviewer reads on the run's page instead of the log. One
 * table per checked config with the requirement, the base and head capacity and the change in
 * bits, the full explanation of each failing requirement folded away in a <details> block, then
 * the policy notices, the input errors and whatever did not fit into annotations. It writes into
 * a sink with the shape of the Actions toolkit's summary builder, which is handed in, so the
 * summary can be rendered and tested without the toolkit.
 */
import type { CheckedConfig, CheckOutcome, RequirementDelta } from '../check/run-check.js';
import { formatDiagnosticLine } from '../diagnostic.js';
import { log2Big, type Bound } from '../cut/types.js';
import type { RequirementResult } from '../policy/evaluate.js';
import { bits } from '../report/bounds-text.js';
import { explainRequirement } from '../report/check-text.js';
import type { OverallVerdict } from '../report/check-json.js';
import type { AnnotationKind, AnnotationPlan } from './annotations.js';
import { requirementLabel, tallyRequirements } from './requirement-tally.js';

export type SummaryCell = string | { readonly data: string; readonly header?: boolean };

/** The part of the toolkit's summary builder this module uses; it does not escape HTML. */
export interface SummarySink {
  addHeading(text: string, level?: number | string): unknown;
  addTable(rows: SummaryCell[][]): unknown;
  addDetails(label: string, content: string): unknown;
  addRaw(text: string, addEOL?: boolean): unknown;
}

const NONE = '—';

const TABLE_HEAD: SummaryCell[] = ['partition', 'required (bits)', 'base (bits)', 'head (bits)', 'change (bits)', 'verdict'].map((data) => ({
  data,
  header: true,
}));

const KIND_WORDS: Readonly<Record<AnnotationKind, readonly [string, string]>> = {
  error: ['error', 'errors'],
  warning: ['warning', 'warnings'],
  notice: ['notice', 'notices'],
};

export function writeJobSummary(sink: SummarySink, outcome: CheckOutcome, verdict: OverallVerdict, overflow: AnnotationPlan['overflow']): void {
  sink.addHeading(`rankfloor: ${verdict}`, 2);
  sink.addRaw(`<p>${escapeHtml(headline(outcome))}</p>`, true);
  for (const c of outcome.checked) writeConfig(sink, c);
  if (outcome.notices.length > 0) {
    sink.addHeading('Policy notices', 3);
    sink.addRaw(list(outcome.notices.map((n) => `${n.file}:${n.line}: ${n.message}`)), true);
  }
  const errors = outcome.errors.filter((e) => e.severity === 'error');
  if (errors.length > 0) {
    sink.addHeading('Input errors', 3);
    sink.addRaw(list(errors.map(formatDiagnosticLine)), true);
  }
  if (overflow.length > 0) {
    sink.addHeading('Not shown as annotations', 3);
    for (const kind of ['error', 'warning', 'notice'] as const) {
      const rest = overflow.filter((o) => o.kind === kind);
      if (rest.length === 0) continue;
      // GitHub displays ten annotations of a kind per step; these would have been dropped silently.
      sink.addRaw(`<p>${rest.length} more ${KIND_WORDS[kind][rest.length === 1 ? 0 : 1]}:</p>`, true);
      sink.addRaw(list(rest.map(({ finding: f }) => `${f.file}:${f.line}:${f.column}: ${f.title}`)), true);
    }
  }
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

function writeConfig(sink: SummarySink, c: CheckedConfig): void {
  sink.addHeading(escapeHtml(`${c.file} — policy ${c.policy.id}`), 3);
  const r = c.result;
  if (!r) {
    sink.addRaw('<p>Deleted by this change: nothing to check.</p>', true);
    return;
  }
  if (c.comparison === 'new') sink.addRaw('<p>New config: no base version to compare with.</p>', true);
  const rows = r.requirements.map((q, i) => row(q, c.deltas?.[i]));
  sink.addTable([TABLE_HEAD, ...rows]);
  r.requirements.forEach((q, i) => {
    const d = c.deltas?.[i];
    const label = requirementLabel(q, d);
    if (!label.startsWith('fail')) return;
    sink.addDetails(escapeHtml(`${q.requirement.partition}: ${label} — why, and what restores it`), `<pre>${escapeHtml(explainRequirement(q, d).join('\n'))}</pre>`);
  });
}

function row(q: RequirementResult, d: RequirementDelta | undefined): SummaryCell[] {
  const head = capacity(q.bounds.upper, q.bounds.lower);
  const base = d?.base ? capacity(d.base.upper, d.base.lower) : NONE;
  const change = d?.changeBits === null || d?.changeBits === undefined ? NONE : signed(d.changeBits);
  return [q.requirement.partition, bits(log2Big(q.requirement.minRank)), base, head, change, requirementLabel(q, d)].map(escapeHtml);
}

/** Exact when the bounds meet, a range when both are known, else only the ceiling. */
function capacity(upper: Bound, lower: Bound | null): string {
  if (lower === null) return `≤ ${bits(upper.log2)}`;
  if (lower.rank === upper.rank) return bits(upper.log2);
  return `${bits(lower.log2)}–${bits(upper.log2)}`;
}

function signed(x: number): string {
  const s = bits(x);
  return x > 0 ? `+${s}` : s === '-0.00' ? '0.00' : s;
}

function list(items: readonly string[]): string {
  return `<ul>${items.map((i) => `<li>${escapeHtml(i)}</li>`).join('')}</ul>`;
}

export function escapeHtml(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}
