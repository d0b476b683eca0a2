/**
 * The JSON form of `rankfloor check`: one document with a version, the overall verdict, one
 * result per (config, policy), the policy notices, the selected files that were skipped and every
 * input error with its position. Ranks are decimal strings. Comparison fields appear only when a
 * base was compared; a config the change took out of a policy's reach has `removed` and no
 * requirements, with the verdict `fail` or `warn` as the policy's `removal` says.
 */
import type { CheckOutcome } from '../check/run-check.js';
import { log2Big } from '../cut/types.js';
import { boundJson, cutJson, roundLog } from './bounds-json.js';

export type OverallVerdict = 'pass' | 'fail' | 'error';

export function overallVerdict(outcome: CheckOutcome): OverallVerdict {
  if (outcome.errors.some((e) => e.severity === 'error')) return 'error';
  return outcome.checked.some((c) => c.failing) ? 'fail' : 'pass';
}

export function checkJson(outcome: CheckOutcome): string {
  return JSON.stringify(checkDocument(outcome), null, 2) + '\n';
}

/** The document `checkJson` prints, as values: the picture report draws these same numbers. */
export type CheckDocument = ReturnType<typeof checkDocument>;
export type RequirementDocument = CheckDocument['results'][number]['requirements'][number];

/** Results are in the order of `outcome.checked`, requirements in the order of each result's. */
export function checkDocument(outcome: CheckOutcome) {
  return {
    version: 1,
    verdict: overallVerdict(outcome),
    results: outcome.checked.map((c) => {
      const r = c.result;
      const removed = c.comparison === 'deleted' || c.comparison === 'moved-out';
      return {
        file: c.file,
        policy: c.policy.id,
        surrogate: c.policy.surrogate,
        verdict: c.failing ? 'fail' : removed ? 'warn' : 'pass',
        ...(c.comparison === 'none' ? {} : { comparison: c.comparison }),
        ...(c.renamedFrom !== undefined ? { renamed_from: c.renamedFrom } : {}),
        ...(c.movedTo ? { moved_to: c.movedTo.path, moved_why: c.movedTo.why } : {}),
        ...(c.architecture
          ? {
              architecture: {
                path: c.architecture.path,
                name: c.architecture.name,
                line: c.architecture.span.line,
                parameters: c.architecture.parameters.map((p) => ({ name: p.name, value: p.value, line: p.span?.line ?? null })),
              },
            }
          : {}),
        requirements: (r?.requirements ?? []).map((q, i) => {
          const d = c.deltas?.[i];
          return {
            partition: q.requirement.partition,
            required: { rank: q.requirement.minRank.toString(), log2: roundLog(log2Big(q.requirement.minRank)) },
            upper: boundJson(q.bounds.upper),
            lower: q.bounds.lower ? boundJson(q.bounds.lower) : null,
            status: q.bounds.status,
            verdict: q.verdict,
            cut: cutJson(q.bounds.upper.cut).map((e) => (c.architecture ? { ...e, file: c.architecture.path } : e)),
            fix: (q.failing ? q.fixes : d?.dropFails ? d.fixes : []).map((f) => ({
              layer: f.layer,
              field: f.field,
              ...(f.file !== undefined ? { file: f.file } : {}),
              line: f.line,
              column: f.column,
              ...(f.added ? { added: true } : {}),
              from: f.from,
              to: f.to,
              added_parameters: f.addedParameters.toString(),
              verdict: f.verdict,
              ...(f.rule !== undefined ? { rule: f.rule } : {}),
            })),
            ...(d
              ? {
                  base: d.base ? { upper: boundJson(d.base.upper), lower: d.base.lower ? boundJson(d.base.lower) : null } : null,
                  change_bits: d.changeBits === null ? null : roundLog(d.changeBits),
                  max_drop_bits: d.maxDropBits ?? null,
                  drop: d.drop,
                  drop_fails: d.dropFails,
                  attributed: d.attributed.map((a) => ({
                    layer: a.layer,
                    field: a.field,
                    from: a.from,
                    to: a.to,
                    ...(a.file !== undefined ? { file: a.file } : {}),
                    line: a.span.line,
                    column: a.span.column,
                    ...(a.effects ? { effects: a.effects.map((e) => ({ layer: e.layer, field: e.field, from: e.from, to: e.to })) } : {}),
                  })),
                }
              : {}),
          };
        }),
      };
    }),
    ...(outcome.notices.length > 0 ? { notices: outcome.notices.map((n) => ({ file: n.file, line: n.line, message: n.message })) } : {}),
    ...(outcome.skipped.length > 0 ? { skipped: outcome.skipped.map((x) => ({ path: x.path, reason: x.reason })) } : {}),
    errors: outcome.errors
      .filter((e) => e.severity === 'error')
      .map((e) => ({ file: e.file, line: e.span?.line ?? null, column: e.span?.column ?? null, message: e.message })),
  };
}
