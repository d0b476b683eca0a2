/**
 * The whole `check` job as data, shared by the CLI and the GitHub Action: pick the policies (from
 * the base revision by default, so a pull request cannot loosen its own gate), pick the configs,
 * evaluate the head and, when comparing, the base; attribute changes to the minimal cut. Nothing
 * here prints. Input errors are collected, never thrown, so every other file is still checked.
 */
import { readFileSync, statSync } from 'node:fs';
import { relative, resolve, sep } from 'node:path';
import { dedupeDiagnostics, type Diagnostic } from '../diagnostic.js';
import { loadConfigText } from '../config/load-config.js';
import type { Model } from '../config/model.js';
import { diffModels, type FieldChange } from '../config/model-diff.js';
import { duplicateIdDiagnostic, loadPolicyDirectory, loadPolicyFile, loadPolicyText, policyApplies } from '../policy/load-policy.js';
import type { Policy, Requirement } from '../policy/policy.js';
import { evaluatePolicy, type PolicyResult, type RequirementResult } from '../policy/evaluate.js';
import { searchFixes, type Fix } from '../policy/fix-search.js';
import type { Bound } from '../cut/types.js';
import { changedFiles, ensureCommit, GitError, openRepo, readAtRevision, readStaged, resolveCommit, stagedFiles, type Repo } from '../git/git.js';
import { listFilesAtRevision } from '../git/list-tree.js';
import { findRepoRoot, listYamlFiles, toRootRelative } from './repo-files.js';

export interface CheckRequest {
  readonly cwd: string;
  /** Repository root; default: the git work tree of cwd, else the nearest `.git` above it. */
  readonly root?: string;
  /** Policy file or directory, relative to cwd. */
  readonly policy: string;
  /** Configs relative to cwd; empty: every config the policies' `applies_to` match. */
  readonly configs: readonly string[];
  /** Compare with this revision. */
  readonly base?: string;
  /** Only configs that differ from the base, plus those governed by a changed policy. */
  readonly changed?: boolean;
  /** Judge the staged version of each staged config against HEAD. */
  readonly staged?: boolean;
  readonly policyFrom?: 'base' | 'head';
  /** Count every unproven requirement as failing, whatever the policies say. */
  readonly unprovenFails?: boolean;
  /** JSON Pointer of the architecture in every config, instead of the policies' model_path. */
  readonly modelPath?: string;
}

export interface RequirementDelta {
  readonly base: { readonly upper: Bound; readonly lower: Bound | null } | null;
  /** head upper log2 − base upper log2; null without a base. */
  readonly changeBits: number | null;
  readonly maxDropBits: number | undefined;
  /** The drop is larger than max_drop_bits. */
  readonly dropFails: boolean;
  /** Changed fields of the pull request that lie on the head's minimal cut. */
  readonly attributed: readonly FieldChange[];
  /** For a drop that fails on its own: the single-field changes that bring it within the limit. */
  readonly fixes: readonly Fix[];
}

export interface CheckedConfig {
  readonly file: string;
  /** Root-relative, forward slashes: what annotations and SARIF name. */
  readonly path: string;
  readonly policy: Policy;
  /** Absent when the config was deleted by the change. */
  readonly result?: PolicyResult;
  readonly comparison: 'none' | 'new' | 'deleted' | 'compared';
  /** Parallel to result.requirements when compared. */
  readonly deltas?: readonly RequirementDelta[];
  readonly changes: readonly FieldChange[];
  readonly failing: boolean;
}

export interface PolicyNotice {
  readonly file: string;
  readonly path: string;
  readonly line: number;
  readonly message: string;
}

export interface CheckOutcome {
  readonly root: string;
  readonly base?: string;
  readonly checked: readonly CheckedConfig[];
  readonly notices: readonly PolicyNotice[];
  readonly errors: readonly Diagnostic[];
}

/** A problem with the request itself (not with a file): the CLI reports it as a usage error. */
export class CheckRequestError extends Error {
  override readonly name = 'CheckRequestError';
}

interface Sources {
  readonly repo?: Repo;
  readonly base?: string;
  /** Text of a root-relative path in the head: the working tree, or the index with --staged. */
  readonly head: (path: string) => string | null;
}

export function runCheck(req: CheckRequest): CheckOutcome {
  const repo = openRepo(req.cwd);
  const root = req.root ? resolve(req.cwd, req.root) : (repo?.root ?? findRepoRoot(req.cwd));
  const comparing = req.base !== undefined || req.staged === true;
  if (comparing && !repo) throw new CheckRequestError(`${req.staged ? '--staged' : '--base'} needs a git repository; ${req.cwd} is not in one`);
  const base = comparing ? resolveBase(repo!, req) : undefined;
  const display = (path: string): string => relative(req.cwd, resolve(root, path)).split(sep).join('/') || path;
  const sources: Sources = {
    ...(repo ? { repo } : {}),
    ...(base ? { base } : {}),
    head: (path) => (req.staged ? readStaged(repo!, path) : readWorkTree(root, path)),
  };
  const errors: Diagnostic[] = [];
  const notices: PolicyNotice[] = [];
  const policyRel = toRootRelative(root, resolve(req.cwd, req.policy));
  const loadedPolicies = loadPolicies(req, root, policyRel, sources, display, errors, notices);
  const strict = req.unprovenFails
    ? loadedPolicies.map((p) => ({ ...p, unproven: 'fail' as const, requirements: p.requirements.map((r) => ({ ...r, unproven: 'fail' as const })) }))
    : loadedPolicies;
  const policies = req.modelPath === undefined ? strict : strict.map((p) => ({ ...p, modelPath: req.modelPath }));

  // Which (config, policy) pairs to check.
  const singleFile = !isDirectoryAnywhere(root, policyRel, sources);
  const candidates = new Set<string>();
  if (req.configs.length > 0) for (const c of req.configs) candidates.add(toRootRelative(root, resolve(req.cwd, c)));
  else {
    for (const f of req.staged ? stagedFiles(repo!).map((s) => s.path) : listYamlFiles(root)) candidates.add(f);
    if (base && !req.staged) for (const f of listFilesAtRevision(repo!, base, '')) if (/\.ya?ml$/i.test(f)) candidates.add(f);
  }
  let selected = [...candidates].sort();
  if ((req.changed || req.staged) && base && repo) {
    const changed = new Set((req.staged ? stagedFiles(repo) : changedFiles(repo, base, { against: 'worktree' })).map((c) => c.path));
    const policyChanged = (p: Policy): boolean => p.chain.some((f) => changed.has(toRootRelative(root, resolve(req.cwd, f))));
    selected = selected.filter((f) => changed.has(f) || policies.some((p) => policyChanged(p) && policyApplies(p, f)));
  }
  const checked: CheckedConfig[] = [];
  for (const path of selected) {
    for (const policy of policies) {
      const explicit = req.configs.length > 0 && singleFile;
      if (!explicit && !policyApplies(policy, path)) continue;
      if (path === policyRel || policy.chain.some((f) => toRootRelative(root, resolve(req.cwd, f)) === path)) continue;
      const one = checkOne(path, display(path), policy, sources, errors);
      if (one) checked.push(one);
    }
  }
  return { root, ...(base ? { base } : {}), checked, notices, errors: dedupeDiagnostics(errors) };
}

function resolveBase(repo: Repo, req: CheckRequest): string | undefined {
  if (req.staged && req.base === undefined) return resolveCommit(repo, 'HEAD');
  const rev = req.base!;
  const sha = resolveCommit(repo, rev);
  if (sha) return sha;
  if (/^[0-9a-f]{40}([0-9a-f]{24})?$/i.test(rev)) {
    const fetched = ensureCommit(repo, rev);
    if (fetched.ok) return resolveCommit(repo, rev);
    throw new CheckRequestError(fetched.message);
  }
  throw new CheckRequestError(`--base ${rev}: no such commit in this repository; check out with full history (for example fetch-depth: 0)`);
}

function readWorkTree(root: string, path: string): string | null {
  try {
    return readFileSync(resolve(root, path), 'utf8');
  } catch {
    return null;
  }
}

function isDirectoryAnywhere(root: string, policyRel: string, s: Sources): boolean {
  try {
    if (statSync(resolve(root, policyRel)).isDirectory()) return true;
  } catch {
    // not in the working tree: look at the base
  }
  return s.repo && s.base ? listFilesAtRevision(s.repo, s.base, policyRel).some((f) => f !== policyRel) : false;
}

function loadPolicies(
  req: CheckRequest,
  root: string,
  policyRel: string,
  s: Sources,
  display: (p: string) => string,
  errors: Diagnostic[],
  notices: PolicyNotice[],
): Policy[] {
  const policyPath = resolve(req.cwd, req.policy);
  // The loaders resolve paths against the process's working directory and report them as given:
  // short relative paths when that is the request's cwd, absolute ones otherwise.
  const loaderPath = (rel: string): string => (resolve(req.cwd) === process.cwd() ? display(rel) : resolve(root, rel));
  const fromBase = s.base !== undefined && (req.policyFrom ?? 'base') === 'base';
  if (!s.base) {
    let isDir: boolean;
    try {
      isDir = statSync(policyPath).isDirectory();
    } catch {
      throw new CheckRequestError(`--policy ${req.policy}: no such file or directory`);
    }
    if (isDir) {
      const loaded = loadPolicyDirectory(loaderPath(policyRel), { repoRoot: root });
      errors.push(...loaded.diagnostics);
      return loaded.policies;
    }
    const loaded = loadPolicyFile(loaderPath(policyRel), { repoRoot: root });
    if (!loaded.ok) errors.push(...loaded.diagnostics);
    return loaded.ok ? [loaded.policy] : [];
  }
  // Comparing: every policy file of the base and of the head.
  const repo = s.repo!;
  const base = s.base;
  const isDir = isDirectoryAnywhere(root, policyRel, s);
  const files = new Set<string>();
  if (isDir) {
    for (const f of listFilesAtRevision(repo, base, policyRel)) if (isDirectChild(policyRel, f)) files.add(f);
    try {
      for (const f of listYamlFiles(resolve(root, policyRel))) if (!f.includes('/')) files.add(`${policyRel}/${f}`);
    } catch {
      // the head deleted the directory: the base still governs
    }
  } else files.add(policyRel);
  const policies: Policy[] = [];
  const ids = new Map<string, string>();
  for (const f of [...files].filter((x) => /\.ya?ml$/i.test(x)).sort()) {
    const headText = s.head(f) ?? readWorkTree(root, f);
    const baseText = readAtRevision(repo, base, f);
    const useBase = fromBase && baseText !== null;
    const text = useBase ? baseText : headText;
    if (text === null) {
      if (!isDir) throw new CheckRequestError(`--policy ${req.policy}: no such file at the base or in the working tree`);
      continue;
    }
    if (useBase && headText !== null && headText !== baseText) {
      notices.push({
        file: display(f),
        path: f,
        line: firstDifferentLine(baseText, headText),
        message: `the pull request changes this policy; it is judged with the base revision's version (a change cannot loosen its own gate)`,
      });
    }
    const readAt = (abs: string): string => {
      const rel = toRootRelative(root, abs);
      const t = useBase ? readAtRevision(repo, base, rel) : (s.head(rel) ?? readWorkTree(root, rel));
      if (t === null) throw Object.assign(new Error(`${rel} does not exist`), { code: 'ENOENT' });
      return t;
    };
    const loaded = loadPolicyText(text, loaderPath(f), { repoRoot: root }, readAt);
    if (!loaded.ok) {
      errors.push(...loaded.diagnostics);
      continue;
    }
    const earlier = ids.get(loaded.policy.id);
    if (earlier !== undefined) {
      errors.push(duplicateIdDiagnostic(loaded.policy.id, earlier, display(f), loaded.policy.span));
      continue;
    }
    ids.set(loaded.policy.id, display(f));
    policies.push(loaded.policy);
  }
  return policies;
}

function isDirectChild(dir: string, path: string): boolean {
  const prefix = dir === '' || dir === '.' ? '' : `${dir.replace(/\/+$/, '')}/`;
  return path.startsWith(prefix) && !path.slice(prefix.length).includes('/');
}

function firstDifferentLine(a: string, b: string): number {
  const x = a.split('\n');
  const y = b.split('\n');
  for (let i = 0; i < Math.max(x.length, y.length); i++) if (x[i] !== y[i]) return Math.min(i + 1, y.length);
  return 1;
}

function load(text: string, file: string, policy: Policy, errors: Diagnostic[]): Model | undefined {
  const loaded = loadConfigText(text, file, policy.modelPath === undefined ? {} : { modelPath: policy.modelPath });
  if (!loaded.ok) {
    errors.push(...loaded.diagnostics);
    return undefined;
  }
  return loaded.model;
}

function checkOne(path: string, file: string, policy: Policy, s: Sources, errors: Diagnostic[]): CheckedConfig | undefined {
  let headText: string | null;
  let baseText: string | null = null;
  try {
    headText = s.head(path);
    if (s.repo && s.base) baseText = readAtRevision(s.repo, s.base, path);
  } catch (e) {
    if (!(e instanceof GitError)) throw e;
    errors.push({ code: 'git/read', message: e.message, file, severity: 'error' });
    return undefined;
  }
  if (headText === null) {
    if (baseText !== null) return { file, path, policy, comparison: 'deleted', changes: [], failing: false };
    errors.push({ code: 'config/unreadable', message: 'cannot read the config file: it does not exist', file, severity: 'error' });
    return undefined;
  }
  const head = load(headText, file, policy, errors);
  if (!head) return undefined;
  const evaluated = evaluatePolicy(head, policy);
  if (!evaluated.ok) {
    errors.push(...evaluated.diagnostics);
    return undefined;
  }
  const result = evaluated.result;
  if (!s.base) return { file, path, policy, result, comparison: 'none', changes: [], failing: result.verdict === 'fail' };
  if (baseText === null) return { file, path, policy, result, comparison: 'new', changes: [], failing: result.verdict === 'fail' };
  // A base config that no longer loads (under today's rules) is compared with nothing.
  const quiet: Diagnostic[] = [];
  const baseModel = load(baseText, file, policy, quiet);
  const baseEval = baseModel ? evaluatePolicy(baseModel, policy, { fixes: false }) : undefined;
  if (!baseModel || !baseEval || !baseEval.ok) return { file, path, policy, result, comparison: 'new', changes: [], failing: result.verdict === 'fail' };
  const changes = diffModels(baseModel, head);
  const deltas = result.requirements.map((q) => delta(q, baseEval.result, policy, changes, head));
  const failing = result.verdict === 'fail' || deltas.some((d) => d.dropFails);
  return { file, path, policy, result, comparison: 'compared', deltas, changes, failing };
}

function delta(q: RequirementResult, base: PolicyResult, policy: Policy, changes: readonly FieldChange[], head: Model): RequirementDelta {
  const b = base.requirements.find((x) => x.requirement.partition === q.requirement.partition);
  const maxDropBits = maxDrop(q.requirement, policy);
  const cutLayers = new Set(q.bounds.upper.cut.map((c) => c.layer));
  const attributed = changes.filter((c) => cutLayers.has(c.layer));
  if (!b) return { base: null, changeBits: null, maxDropBits, dropFails: false, attributed, fixes: [] };
  const changeBits = q.bounds.upper.log2 - b.bounds.upper.log2;
  // Exact: a drop of more than k bits means base > head · 2^k; fractional limits compare in log2.
  const limit = maxDropBits;
  const dropFails =
    limit !== undefined &&
    (Number.isInteger(limit) ? b.bounds.upper.rank > q.bounds.upper.rank << BigInt(limit) : -changeBits > limit + 1e-9);
  // A drop within k bits needs head ≥ ⌈base / 2^k⌉; the fix search finds the widths that reach it.
  const fixes =
    dropFails && !q.failing && head.kind === 'layered' && limit !== undefined && Number.isInteger(limit)
      ? searchFixes(head, q.partition, (b.bounds.upper.rank + (1n << BigInt(limit)) - 1n) >> BigInt(limit), 'warn', policy.surrogate, cutLayers)
      : [];
  return { base: { upper: b.bounds.upper, lower: b.bounds.lower }, changeBits, maxDropBits, dropFails, attributed, fixes };
}

function maxDrop(r: Requirement, p: Policy): number | undefined {
  return r.maxDropBits ?? p.maxDropBits;
}
