/**
 * The terminal form of `rankfloor check`, written for the reviewer of a pull request: for each
 * failing requirement, the partition in words, what the policy needs and what the config allows,
 * the layers that form the bottleneck (with their YAML lines), and the smallest single-field
 * changes that would restore it. Passing and unproven requirements get one line each.
 */
import { log2Big } from '../cut/types.js';
import type { PolicyResult, RequirementResult } from '../policy/evaluate.js';
import { bits, cutLabel, shortRank } from './bounds-text.js';

export interface TextOptions {
  readonly color: boolean;
  /** Print failing requirements only. */
  readonly quiet: boolean;
}

const SURROGATE_WORDS = {
  tree: 'tree surrogate (per-position linear maps, product pooling)',
  overlap: 'overlap surrogate (linear maps over kernel windows, product pooling)',
} as const;

export function checkText(results: readonly PolicyResult[], options: TextOptions): string {
  const paint = (code: string, s: string): string => (options.color ? `\u001b[${code}m${s}\u001b[0m` : s);
  const out: string[] = [];
  let fails = 0;
  let unproven = 0;
  let passes = 0;
  for (const r of results) {
    const shown = r.requirements.filter((q) => !options.quiet || q.failing);
    for (const q of r.requirements) {
      if (q.failing) fails++;
      else if (q.verdict === 'unproven') unproven++;
      else passes++;
    }
    if (shown.length === 0) continue;
    out.push(`${r.file} — policy ${r.policy.id} (${r.policy.file}), ${SURROGATE_WORDS[r.surrogate]}`);
    for (const q of shown) {
      if (q.failing) out.push(...failureBlock(q, paint));
      else out.push(`  ${label(q, paint)}  ${oneLine(q)}`);
    }
    if (!options.quiet) for (const n of r.notes) out.push(`  note: ${n}`);
    out.push('');
  }
  const parts = [`${fails} failing`, `${unproven} unproven (warnings)`, `${passes} passing`];
  out.push(`${results.length} config × policy checks: ${parts.join(', ')}`);
  return out.join('\n') + '\n';
}

function label(q: RequirementResult, paint: (c: string, s: string) => string): string {
  if (q.failing) return paint('1;31', q.verdict === 'fail' ? 'FAIL    ' : 'UNPROVEN');
  if (q.verdict === 'unproven') return paint('33', 'UNPROVEN');
  return paint('32', 'PASS    ');
}

function needs(q: RequirementResult): string {
  const min = q.requirement.minRank;
  return `rank ≥ ${shortRank(min, log2Big(min))} (${bits(log2Big(min))} bits)`;
}

function range(q: RequirementResult): string {
  const b = q.bounds;
  const upper = `${shortRank(b.upper.rank, b.upper.log2)} (${bits(b.upper.log2)} bits)`;
  if (b.status === 'exact') return `exactly ${upper}`;
  if (!b.lower) return `at most ${upper}; no lower bound proven`;
  return `between ${shortRank(b.lower.rank, b.lower.log2)} (${bits(b.lower.log2)} bits) and ${upper}`;
}

function oneLine(q: RequirementResult): string {
  return `${q.requirement.partition}: needs ${needs(q)}; the config allows ${range(q)}`;
}

function failureBlock(q: RequirementResult, paint: (c: string, s: string) => string): string[] {
  const req = q.requirement;
  const b = q.bounds;
  const lines = [`  ${label(q, paint)}  ${req.partition} — ${q.partition.description}`];
  lines.push(`            needs   ${needs(q)}  [${req.written}, ${req.file}:${req.span.line}]`);
  if (q.verdict === 'fail') {
    const short = log2Big(req.minRank) - b.upper.log2;
    lines.push(`            allows  ${range(q)} — provably short by ${bits(short)} bits`);
  } else {
    lines.push(`            allows  ${range(q)} — not proven to reach the minimum, and this policy counts unproven as failing`);
  }
  if (b.upper.cut.length > 0) {
    const crossing = b.upper.cut.map((c) => `${c.count} bond${c.count === 1 ? '' : 's'} of dimension ${c.dim} from ${cutLabel(c.layer)} (line ${c.line})`);
    lines.push(`            bottleneck (${b.upper.method}): ${crossing.join('; ')}`);
  } else {
    lines.push(`            bottleneck: ${b.upper.method}`);
  }
  if (q.fixes.length === 0) {
    lines.push('            fix: no single width or depth field on or next to the cut restores it; the architecture needs a larger change');
  } else {
    lines.push('            fix (smallest change of one field, cheapest first):');
    for (const f of q.fixes) {
      const who = f.layer === 'input' ? 'input' : `layer ${f.layer}`;
      const proof = f.verdict === 'pass' ? 'then proven' : 'then no longer provably short';
      lines.push(`              line ${f.line}:${f.column}  ${who} ${f.field}: ${f.from} → ${f.to}  (+${f.addedParameters.toLocaleString('en-US')} parameters; ${proof})`);
    }
  }
  return lines;
}
