/**
 * The terminal form of `rankfloor check`, written for the reviewer of a pull request: for each
 * failing requirement, the partition in words, what the policy needs and what the config allows,
 * the layers that form the bottleneck (with their YAML lines), the change of the pull request that
 * lies on the cut, and the smallest single-field changes that would restore it. Passing and
 * unproven requirements get one line each.
 */
import type { CheckedConfig, CheckOutcome, RequirementDelta } from '../check/run-check.js';
import { boundsMeet, log2Big } from '../cut/types.js';
import type { RequirementResult } from '../policy/evaluate.js';
import type { ArchitectureUse } from '../config/model.js';
import type { FieldChange, LayerEffect } from '../config/model-diff.js';
import type { Fix } from '../policy/fix-search.js';
import { bits, boundRank, capacityBits, cutLabel, shortRank } from './bounds-text.js';
import { labelCount, requirementLabel, type RequirementLabel } from './requirement-label.js';

export interface TextOptions {
  readonly color: boolean;
  /** Print failing requirements only. */
  readonly quiet: boolean;
}

const SURROGATE_WORDS = {
  tree: 'tree surrogate (per-position linear maps, product pooling)',
  overlap: 'overlap surrogate (linear maps over kernel windows, product pooling)',
} as const;

export function checkText(outcome: CheckOutcome, options: TextOptions): string {
  const paint = (code: string, s: string): string => (options.color ? `\u001b[${code}m${s}\u001b[0m` : s);
  const out: string[] = [];
  let fails = 0;
  let unproven = 0;
  let passes = 0;
  if (outcome.base) out.push(`compared with base ${outcome.base.slice(0, 12)}`, '');
  for (const n of outcome.notices) out.push(`${paint('36', 'notice')}  ${n.file}:${n.line}: ${n.message}`, '');
  if (!options.quiet && outcome.skipped.length > 0) {
    for (const x of outcome.skipped) out.push(`${paint('36', 'skipped')} ${x.path}: ${x.reason}`);
    out.push('');
  }
  for (const c of outcome.checked) {
    if (!c.result) {
      if (c.failing) fails++;
      if (!options.quiet || c.failing) out.push(`${paint(c.failing ? '1;31' : '33', c.failing ? 'REMOVED ' : 'removed ')}  ${removalMessage(c)}`, '');
      continue;
    }
    const r = c.result;
    const all = r.requirements.map((q, i) => ({ q, d: c.deltas?.[i], label: requirementLabel(q, c.deltas?.[i]) }));
    const shown = all.filter(({ label }) => !options.quiet || labelCount(label) === 'failing');
    for (const { label } of all) {
      const n = labelCount(label);
      if (n === 'failing') fails++;
      else if (n === 'unproven') unproven++;
      else passes++;
    }
    if (shown.length === 0) continue;
    const against = c.comparison === 'new' ? ', new config (no base to compare)' : c.renamedFrom !== undefined ? `, renamed from ${c.renamedFrom}` : '';
    const built = c.architecture ? `, built from ${c.architecture.path} (${c.architecture.name})` : '';
    out.push(`${c.file} — policy ${r.policy.id} (${r.policy.file}), ${SURROGATE_WORDS[r.surrogate]}${built}${against}`);
    for (const { q, d, label } of shown) {
      if (labelCount(label) === 'failing') {
        const [first, ...rest] = explainRequirement(q, d, c.architecture);
        out.push(`  ${labelText(label, paint)}  ${first}`, ...rest.map((l) => `            ${l}`));
      } else {
        const dropped = d?.drop === 'possible' ? `; ${possibleDrop(q, d)}` : '';
        out.push(`  ${labelText(label, paint)}  ${requirementSummary(q)}${d ? `; ${change(q, d)}` : ''}${dropped}`);
      }
    }
    if (!options.quiet) for (const n of r.notes) out.push(`  note: ${n}`);
    out.push('');
  }
  out.push(closingLine(outcome, { fails, unproven, passes }));
  return out.join('\n') + '\n';
}

/** What a change did to a config a policy governed at the base, and how the policy counts it. */
export function removalMessage(c: CheckedConfig): string {
  const counts = c.failing ? `policy ${c.policy.id} counts this as failing (removal: fail)` : `policy ${c.policy.id} counts this as a warning (set removal: fail to make it fail)`;
  if (c.movedTo) {
    return `${c.path} was governed by policy ${c.policy.id} at the base and is renamed to ${c.movedTo.path}, which it does not check: ${c.movedTo.why}; ${counts}`;
  }
  return `${c.path} was governed by policy ${c.policy.id} at the base and this change deletes it; ${counts}`;
}

function plural(n: number, word: string): string {
  return `${n} ${word}${n === 1 ? '' : 's'}`;
}

/**
 * The last line: configs (each config × policy pair is one check) and requirements counted
 * apart, each group adding up to its total.
 */
export function closingLine(outcome: CheckOutcome, requirements: { fails: number; unproven: number; passes: number }): string {
  const configs = new Set(outcome.checked.map((c) => c.path)).size;
  const policies = new Set(outcome.checked.map((c) => c.policy.id)).size;
  const checks = { failing: 0, unproven: 0, passing: 0, deleted: 0 };
  for (const c of outcome.checked) {
    if (!c.result) checks.deleted++;
    else if (c.failing) checks.failing++;
    else if (c.result.requirements.some((q, i) => labelCount(requirementLabel(q, c.deltas?.[i])) === 'unproven')) checks.unproven++;
    else checks.passing++;
  }
  const deleted = checks.deleted > 0 ? `, ${checks.deleted} deleted` : '';
  const total = requirements.fails + requirements.unproven + requirements.passes;
  return (
    `${plural(configs, 'config')} against ${plural(policies, 'policy').replace('policys', 'policies')}: ` +
    `${plural(outcome.checked.length, 'check')} (${checks.failing} failing, ${checks.unproven} unproven, ${checks.passing} passing${deleted}); ` +
    `${plural(total, 'requirement')} (${requirements.fails} failing, ${requirements.unproven} unproven, ${requirements.passes} passing)`
  );
}

const LABEL_TEXT: Readonly<Record<RequirementLabel, readonly [string, string]>> = {
  fail: ['1;31', 'FAIL    '],
  'fail (unproven)': ['1;31', 'UNPROVEN'],
  'fail (drop)': ['1;31', 'DROP    '],
  'fail (may have dropped)': ['1;31', 'DROP?   '],
  'may have dropped': ['33', 'DROP?   '],
  unproven: ['33', 'UNPROVEN'],
  pass: ['32', 'PASS    '],
};

function labelText(label: RequirementLabel, paint: (c: string, s: string) => string): string {
  const [colour, text] = LABEL_TEXT[label];
  return paint(colour, text);
}

function needs(q: RequirementResult): string {
  const min = q.requirement.minRank;
  return `rank ≥ ${shortRank(min, log2Big(min))} (${bits(log2Big(min))} bits)`;
}

function range(q: RequirementResult): string {
  const b = q.bounds;
  const upper = `${boundRank(b.upper)} (${bits(b.upper.log2)} bits)`;
  if (b.status === 'exact') return `exactly ${upper}`;
  if (!b.lower) return `at most ${upper}; no lower bound proven`;
  return `between ${boundRank(b.lower)} (${bits(b.lower.log2)} bits) and ${upper}`;
}

/** One line: what the requirement needs and what the config allows. */
export function requirementSummary(q: RequirementResult): string {
  return `${q.requirement.partition}: needs ${needs(q)}; the config allows ${range(q)}`;
}

/** Base and head capacity in bits (a number when exact, a range, or a ceiling) and the upper bound's change. */
function change(q: RequirementResult, d: RequirementDelta): string {
  if (!d.base || d.changeBits === null) return 'no base requirement to compare';
  const sign = d.changeBits > 0 ? '+' : '';
  const exact = q.bounds.status === 'exact' && d.base.lower !== null && boundsMeet(d.base.lower, d.base.upper);
  return `base ${capacityBits(d.base.upper, d.base.lower)} bits → head ${capacityBits(q.bounds.upper, q.bounds.lower)} bits (${exact ? '' : 'upper bound '}${sign}${bits(d.changeBits)})`;
}

/** A drop that only the upper bounds show, and how the requirement counts it. */
function possibleDrop(q: RequirementResult, d: RequirementDelta): string {
  const base = d.base!;
  const proven = base.lower ? `the base is proven to reach ${bits(base.lower.log2)} bits (${base.lower.method})` : 'no lower bound of the base is proven';
  const counted = d.dropFails ? 'counted as failing (unproven: fail)' : 'counted as a warning (unproven: warn)';
  return (
    `may have dropped: the upper bound fell by ${bits(-d.changeBits!)} bits, more than max_drop_bits = ${d.maxDropBits}, ` +
    `but ${proven} and the head allows ${bits(q.bounds.upper.log2)} bits, so no drop of more than ${d.maxDropBits} bits is proven; ${counted}`
  );
}

/**
 * The explanation of a failing requirement, plain text, first line a title. Shared by the text
 * report, annotations, SARIF and JUnit so that they all say the same.
 */
export function explainRequirement(q: RequirementResult, d?: RequirementDelta, architecture?: ArchitectureUse): string[] {
  const req = q.requirement;
  const b = q.bounds;
  const lines = [`${req.partition} — ${q.partition.description}`];
  // Layer lines of a model built from a definition are that file's.
  const at = (line: number, file?: string): string => (file ? `${file}:${line}` : `line ${line}`);
  const layerFile = architecture?.path;
  lines.push(`needs   ${needs(q)}  [${req.written}, ${req.file}:${req.span.line}]`);
  if (q.verdict === 'fail') {
    lines.push(`allows  ${range(q)} — provably short by ${bits(log2Big(req.minRank) - b.upper.log2)} bits`);
  } else if (q.failing) {
    lines.push(`allows  ${range(q)} — not proven to reach the minimum, and this policy counts unproven as failing`);
  } else {
    lines.push(`allows  ${range(q)}`);
  }
  if (d) {
    lines.push(`change  ${change(q, d)}`);
    if (d.drop === 'proven') {
      const base = d.base!.lower!;
      lines.push(
        `        a proven drop of more than max_drop_bits = ${d.maxDropBits}: the base was proven to reach ${bits(base.log2)} bits (${base.method}), ` +
          `the head allows at most ${bits(q.bounds.upper.log2)} bits; it fails even though the minimum may still hold`,
      );
    } else if (d.drop === 'possible') lines.push(`        ${possibleDrop(q, d)}`);
    for (const a of d.attributed) lines.push(`        ${attributionText(a)}`);
  }
  if (architecture) lines.push(`model   built from ${architecture.path} (${architecture.name}) with ${architecture.parameters.map((p) => `${p.name} = ${p.value}`).join(', ')}`);
  if (b.upper.cut.length > 0) {
    const crossing = b.upper.cut.map((c) => `${c.count} bond${c.count === 1 ? '' : 's'} of dimension ${c.dim} from ${cutLabel(c.layer)} (${at(c.line, layerFile)})`);
    lines.push(`bottleneck (${b.upper.method}): ${crossing.join('; ')}`);
  } else {
    lines.push(`bottleneck: ${b.upper.method}`);
  }
  const dropOnly = !q.failing && d?.dropFails === true;
  const fixes = q.failing ? q.fixes : dropOnly ? d.fixes : undefined;
  if (fixes) {
    if (fixes.length === 0 && q.failing && q.verdict === 'unproven') {
      lines.push(...unprovenAdvice(q));
    } else if (fixes.length === 0 && dropOnly && d.drop === 'possible') {
      lines.push(...possibleDropAdvice(q, d));
    } else if (fixes.length === 0) {
      lines.push('fix: no single width or depth field on or next to the cut restores it; the architecture needs a larger change');
    } else {
      lines.push(architecture ? 'fix (smallest change of one parameter, then of one field of the definition; cheapest first):' : 'fix (smallest change of one field, cheapest first):');
      for (const f of fixes) {
        const who = f.layer === 'parameter' ? 'parameter' : f.layer === 'input' ? 'input' : `layer ${f.layer}`;
        const add = f.added ? ` (the default; add ${f.field}: ${f.to} to the config)` : '';
        lines.push(`  ${f.file ? `${f.file}:${f.line}:${f.column}` : `line ${f.line}:${f.column}`}  ${who} ${f.field}: ${f.from} → ${f.to}${add}  (+${f.addedParameters.toLocaleString('en-US')} parameters; ${fixOutcome(f, dropOnly)})`);
      }
    }
  }
  return lines;
}

/** Most layer changes a parameter's line lists before it counts the rest. */
const EFFECTS_SHOWN = 4;

/** One attributed change: where it is, and for a parameter, what it did to the layers (those on the cut first). */
function attributionText(a: FieldChange): string {
  const where = a.file ? `${a.file}:${a.span.line}:${a.span.column}` : `line ${a.span.line}:${a.span.column}`;
  if (a.layer === 'parameter' || (a.layer === 'model' && a.effects)) {
    const what = a.layer === 'parameter' ? `parameter ${a.field}` : a.field;
    const effects = a.effects ?? [];
    const shrank = effects.filter(shrinks);
    const name = (e: LayerEffect): string => (typeof e.layer === 'number' ? `layer ${e.layer}` : e.layer);
    const listed = (shrank.length > 0 ? shrank : effects).slice(0, EFFECTS_SHOWN).map((e) => `${e.field === 'layer' ? `layer ${e.layer}` : `${name(e)} ${e.field}`} ${e.from} → ${e.to}`);
    const rest = (shrank.length > 0 ? shrank : effects).length - listed.length;
    const verb = shrank.length > 0 ? 'it shrinks' : effects.length > 0 ? 'it changes' : 'it changes no layer';
    return `this change: ${where} ${what}: ${a.from} → ${a.to}; ${verb}${listed.length > 0 ? ` ${listed.join(', ')}` : ''}${rest > 0 ? ` and ${rest} more` : ''}`;
  }
  const who = typeof a.layer === 'number' ? `layer ${a.layer}` : a.layer === 'input' ? 'input' : `layer ${a.layer}`;
  return `this change on the cut: ${where} ${who} ${a.field}: ${a.from} → ${a.to}`;
}

/** A layer change that takes capacity away: a smaller number, or a layer removed. */
function shrinks(e: LayerEffect): boolean {
  if (e.to === '(removed)') return true;
  const from = Number(e.from.replace(/^\[|\]$/g, '').split(',')[0]);
  const to = Number(e.to.replace(/^\[|\]$/g, '').split(',')[0]);
  return Number.isFinite(from) && Number.isFinite(to) && to < from;
}

/** What a fix achieves: proven by a named rule, or only no longer refuted by the upper bound. */
function fixOutcome(f: Fix, drop: boolean): string {
  if (f.verdict === 'pass') return f.rule === undefined ? 'then proven' : `then proven by ${f.rule}`;
  return drop ? 'then the upper bound no longer drops by more than the limit; not proven' : 'then no longer provably short';
}

/**
 * A drop only the ceilings show, counted as failing, with no single change that proves the head
 * keeps the base's capacity: say what would settle it, never that the capacity fell.
 */
function possibleDropAdvice(q: RequirementResult, d: RequirementDelta): string[] {
  const k = d.maxDropBits!;
  const need = d.base!.upper.log2 - k;
  return [
    `not disproven: the head may keep the base's capacity; no single width or depth change on or next to the cut makes a lower bound prove at least ${bits(need)} bits (the base's upper bound less ${k} bits)`,
    `to settle it: a proven lower bound of the head of at least ${bits(need)} bits, a tighter upper bound of the base (which rule proves what, and where, is listed under "The rules" in DEVELOPERS.md), a larger max_drop_bits, or unproven: warn for this requirement`,
  ];
}

/**
 * An unproven requirement is not disproven: the upper bound allows the minimum, only no rule
 * proves a lower bound that reaches it. Say what would prove it, never that it is short.
 */
function unprovenAdvice(q: RequirementResult): string[] {
  const min = q.requirement.minRank;
  const proven = q.bounds.lower ? `the rules prove ${boundRank(q.bounds.lower)} (${q.bounds.lower.method})` : 'no rule proves a lower bound here';
  return [
    `not disproven: the config may well reach ${shortRank(min, log2Big(min))}; ${proven}, and no single width or depth change on or next to the cut raises the proven bound to the minimum`,
    `to prove it: a proven lower bound of at least ${shortRank(min, log2Big(min))} (which rule proves what, and where, is listed under "The rules" in DEVELOPERS.md), a smaller minimum, or unproven: warn for this requirement`,
  ];
}
