/**
 * `rankfloor check`: gate configs on team policies. Orchestration only — load policies, pick the
 * configs each governs, evaluate, render. Every input error is collected and reported with its
 * position while the other files are still checked; the exit code is 2 if any error occurred,
 * else 1 if a requirement failed, else 0.
 */
import { statSync } from 'node:fs';
import { relative, resolve, sep } from 'node:path';
import { parseArgs } from 'node:util';
import type { Diagnostic } from '../diagnostic.js';
import { loadConfigFile } from '../config/load-config.js';
import { loadPolicyDirectory, loadPolicyFile, policyApplies } from '../policy/load-policy.js';
import type { Policy } from '../policy/policy.js';
import { evaluatePolicy, type PolicyResult } from '../policy/evaluate.js';
import { checkJson } from '../report/check-json.js';
import { checkText } from '../report/check-text.js';
import { findRepoRoot, listYamlFiles, toRootRelative } from './repo-files.js';
import { EXIT_FAIL, EXIT_INPUT, EXIT_OK, UsageError, oneOf, printDiagnostics, type Io } from './cli-support.js';

export function checkCommand(args: readonly string[], io: Io): number {
  const { values, positionals } = parseArgs({
    args: [...args],
    allowPositionals: true,
    strict: true,
    options: {
      policy: { type: 'string' },
      format: { type: 'string' },
      quiet: { type: 'boolean' },
      root: { type: 'string' },
    },
  });
  if (!values.policy) throw new UsageError('check needs --policy FILE|DIR');
  const format = oneOf(values.format ?? 'text', ['text', 'json'], '--format');
  const root = values.root ? resolve(values.root) : findRepoRoot(process.cwd());
  const errors: Diagnostic[] = [];

  const policyPath = values.policy;
  let isDir: boolean;
  try {
    isDir = statSync(policyPath).isDirectory();
  } catch {
    throw new UsageError(`--policy ${policyPath}: no such file or directory`);
  }
  let policies: Policy[];
  if (isDir) {
    const loaded = loadPolicyDirectory(policyPath, { repoRoot: root });
    policies = loaded.policies;
    errors.push(...loaded.diagnostics);
  } else {
    const loaded = loadPolicyFile(policyPath, { repoRoot: root });
    policies = loaded.ok ? [loaded.policy] : [];
    if (!loaded.ok) errors.push(...loaded.diagnostics);
  }

  // Pairs of (config as the user sees it, policy). Explicit configs with a single policy file are
  // checked against it whatever its applies_to says: naming both is the request.
  const pairs: { config: string; policy: Policy }[] = [];
  const display = (rootRelative: string): string => relative(process.cwd(), resolve(root, rootRelative)).split(sep).join('/');
  if (positionals.length > 0) {
    for (const given of positionals) {
      const rel = toRootRelative(root, given);
      for (const p of policies) if (!isDir || policyApplies(p, rel)) pairs.push({ config: given, policy: p });
    }
  } else {
    const files = listYamlFiles(root);
    for (const rel of files) for (const p of policies) if (policyApplies(p, rel)) pairs.push({ config: display(rel), policy: p });
  }

  const results: PolicyResult[] = [];
  for (const { config, policy } of pairs) {
    const loaded = loadConfigFile(config, policy.modelPath === undefined ? {} : { modelPath: policy.modelPath });
    if (!loaded.ok) {
      errors.push(...loaded.diagnostics);
      continue;
    }
    const evaluated = evaluatePolicy(loaded.model, policy);
    if (evaluated.ok) results.push(evaluated.result);
    else errors.push(...evaluated.diagnostics);
  }

  const unique = dedupe(errors);
  if (format === 'json') io.stdout(checkJson(results, unique));
  else {
    io.stdout(checkText(results, { color: io.color ?? false, quiet: values.quiet ?? false }));
    if (positionals.length === 0 && pairs.length === 0 && unique.length === 0) io.stdout('no config matched the policies\' applies_to\n');
  }
  if (unique.length > 0) printDiagnostics(unique, io);
  if (unique.some((d) => d.severity === 'error')) return EXIT_INPUT;
  return results.some((r) => r.verdict === 'fail') ? EXIT_FAIL : EXIT_OK;
}

/** The same config error is found once per policy that governs the file; report it once. */
function dedupe(diagnostics: readonly Diagnostic[]): Diagnostic[] {
  const seen = new Set<string>();
  return diagnostics.filter((d) => {
    const key = `${d.file}:${d.span?.offset ?? -1}:${d.code}:${d.message}`;
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
}
