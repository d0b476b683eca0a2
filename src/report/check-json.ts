/**
 * The JSON form of `rankfloor check`: one document with a version, the overall verdict, one
 * result per (config, policy) and every input error with its position. Ranks are decimal strings.
 */
import type { Diagnostic } from '../diagnostic.js';
import type { PolicyResult } from '../policy/evaluate.js';
import { log2Big } from '../cut/types.js';
import { boundJson, cutJson, roundLog } from './bounds-json.js';

export type OverallVerdict = 'pass' | 'fail' | 'error';

export function overallVerdict(results: readonly PolicyResult[], errors: readonly Diagnostic[]): OverallVerdict {
  if (errors.some((e) => e.severity === 'error')) return 'error';
  return results.some((r) => r.verdict === 'fail') ? 'fail' : 'pass';
}

export function checkJson(results: readonly PolicyResult[], errors: readonly Diagnostic[]): string {
  const doc = {
    version: 1,
    verdict: overallVerdict(results, errors),
    results: results.map((r) => ({
      file: r.file,
      policy: r.policy.id,
      surrogate: r.surrogate,
      verdict: r.verdict,
      requirements: r.requirements.map((q) => ({
        partition: q.requirement.partition,
        required: { rank: q.requirement.minRank.toString(), log2: roundLog(log2Big(q.requirement.minRank)) },
        upper: boundJson(q.bounds.upper),
        lower: q.bounds.lower ? boundJson(q.bounds.lower) : null,
        status: q.bounds.status,
        verdict: q.verdict,
        cut: cutJson(q.bounds.upper.cut),
        fix: q.fixes.map((f) => ({
          layer: f.layer,
          field: f.field,
          line: f.line,
          column: f.column,
          from: f.from,
          to: f.to,
          added_parameters: f.addedParameters.toString(),
          verdict: f.verdict,
        })),
      })),
    })),
    errors: errors
      .filter((e) => e.severity === 'error')
      .map((e) => ({ file: e.file, line: e.span?.line ?? null, column: e.span?.column ?? null, message: e.message })),
  };
  return JSON.stringify(doc, null, 2) + '\n';
}
