/**
 * The whole `check` job as data, shared by the CLI and the GitHub Action: pick the policies (from
 * the base revision by default, so a pull request cannot loosen its own gate), pick the configs,
 * evaluate the head and, when comparing, the base; attribute changes to the minimal cut; report
 * what a change removed from a policy's reach and what could not be checked. Nothing here prints.
 * Input errors are collected, never thrown, so every other file is still checked.
 *
 * A comparison costs a fixed number of git processes, whatever the number of configs: the base
 * tree is listed once and read in batches (git/revision-files.ts), one diff gives the changed
 * files and the renames, and git lists the working tree once.
 */
import { relative, resolve, sep } from 'node:path';
import picomatch from 'picomatch';
import { dedupeDiagnostics, type Diagnostic } from '../diagnostic.js';
import type { FieldChange } from '../config/model-diff.js';
import type { ArchitectureUse, Model } from '../config/model.js';
import { couldMatchBelow, policyApplies } from '../policy/applies-to.js';
import type { Policy } from '../policy/policy.js';
import type { PolicyResult } from '../policy/evaluate.js';
import type { Fix } from '../policy/fix-search.js';
import type { Bound } from '../cut/types.js';
import { changesSince, ensureCommit, openRepo, resolveCommit, RevisionFiles, stagedChanges, type Changes, type Repo } from '../git/git.js';
import { symlinkMessage } from '../files/work-tree.js';
import { startBaseEvaluation, type BaseAnswer, type BaseTask } from './base-evaluation.js';
import { compareWithBase, evaluateHead, type EvaluatedHead } from './compare-config.js';
import type { FileRead } from '../files/file-read.js';
import { discoverConfigs, YAML_FILE, type Selector, type SkippedPath } from './discover-configs.js';
import { indexFiles, workTreeFiles, type HeadFiles } from './head-files.js';
import { JudgingFiles } from './judging-files.js';
import { CheckDefinitions, definitionOf } from './definition-files.js';
import { loadJudgingPolicies, MissingPolicyError } from './load-judging-policies.js';
import { findRepoRoot, toRootRelative } from './repo-files.js';

export type { SkippedPath } from './discover-configs.js';

export interface CheckRequest {
  readonly cwd: string;
  /** Repository root; default: the git work tree of cwd, else the nearest `.git` above it. */
  readonly root?: string;
  /** Policy file or directory, relative to cwd. */
  readonly policy: string;
  /** Configs relative to cwd; empty: every config the policies' `applies_to` (or `configGlobs`) match. */
  readonly configs: readonly string[];
  /** Root-relative globs (a leading ! excludes) that narrow the configs when none is named. */
  readonly configGlobs?: readonly string[];
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

/**
 * `proven`: the head's upper bound is below the base's lower bound by more than max_drop_bits, so
 * the capacity certainly fell by more; `possible`: only the upper bounds fell that much (the
 * capacity may have dropped, or only a loose ceiling moved); `none`.
 */
export type DropKind = 'proven' | 'possible' | 'none';

export interface RequirementDelta {
  readonly base: { readonly upper: Bound; readonly lower: Bound | null } | null;
  /** head upper log2 − base upper log2; null without a base. */
  readonly changeBits: number | null;
  readonly maxDropBits: number | undefined;
  readonly drop: DropKind;
  /** The drop makes the check fail: a proven one, or a possible one the requirement's `unproven` counts as failing. */
  readonly dropFails: boolean;
  /** Changed fields of the pull request that lie on the head's minimal cut. */
  readonly attributed: readonly FieldChange[];
  /**
   * For a drop that fails on its own: single-field changes after which the upper bound no longer
   * drops by more than the limit (a proven drop), or after which the lower bound proves it did
   * not (a possible drop: only fixes that prove it).
   */
  readonly fixes: readonly Fix[];
}

export interface CheckedConfig {
  readonly file: string;
  /** Root-relative, forward slashes: what annotations and SARIF name. */
  readonly path: string;
  readonly policy: Policy;
  /** Absent when the change removed the config from the policy's reach. */
  readonly result?: PolicyResult;
  /** The head's model that `result` judges (for reports that draw it); absent with `result`. */
  readonly model?: Model;
  /**
   * `deleted`: governed at the base, gone from the head. `moved-out`: renamed to a path the policy
   * does not check (outside applies_to, another extension, a link); see `movedTo`.
   */
  readonly comparison: 'none' | 'new' | 'deleted' | 'moved-out' | 'compared';
  /** The base path of a renamed config, which was compared with its old self. */
  readonly renamedFrom?: string;
  /** The architecture definition the head config names, and the parameter values it uses. */
  readonly architecture?: ArchitectureUse;
  /** Where a moved-out config went, and why the policy does not check it there. */
  readonly movedTo?: { readonly path: string; readonly why: string };
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
  /** The file is an architecture definition, not a policy. */
  readonly definition?: true;
}

export interface CheckOutcome {
  readonly root: string;
  readonly base?: string;
  readonly checked: readonly CheckedConfig[];
  readonly notices: readonly PolicyNotice[];
  /** Files a policy (or the request) selects that are not checked, with the reason. */
  readonly skipped: readonly SkippedPath[];
  readonly errors: readonly Diagnostic[];
  /**
   * The text of each file the check read, by the name its diagnostics use: what an excerpt must
   * quote (the base version of a policy, not the working tree's; never a file through a link).
   */
  readonly sources?: ReadonlyMap<string, string>;
}

/** A problem with the request itself (not with a file): the CLI reports it as a usage error. */
export class CheckRequestError extends Error {
  override readonly name = 'CheckRequestError';
}

const CHANGED_POLICY =
  "the pull request changes this policy; it is judged with the base revision's version (a change cannot loosen its own gate)";
const DELETED_POLICY =
  "the pull request deletes this policy; it is judged with the base revision's version (a change cannot loosen its own gate)";

const CHANGED_DEFINITION =
  "the pull request changes this architecture definition; the configs that name it are built with this version on the head side (it is the architecture they have once merged) and with the base revision's on the base side, and their parameter values are judged with the base revision's declarations";
const DELETED_DEFINITION = 'the pull request deletes this architecture definition; configs that still name it cannot be built';

export function runCheck(req: CheckRequest): CheckOutcome {
  const repo = openRepo(req.cwd);
  const root = req.root ? resolve(req.cwd, req.root) : (repo?.root ?? findRepoRoot(req.cwd));
  const comparing = req.base !== undefined || req.staged === true;
  if (comparing && !repo) throw new CheckRequestError(`${req.staged ? '--staged' : '--base'} needs a git repository; ${req.cwd} is not in one`);
  const base = comparing ? resolveBase(repo!, req) : undefined;
  const display = (path: string): string => relative(req.cwd, resolve(root, path)).split(sep).join('/') || path;
  const errors: Diagnostic[] = [];

  // The two sides. Everything that judges comes from the base when it has it.
  const baseFiles = base ? RevisionFiles.atCommit(repo!, base) : undefined;
  const index = req.staged ? RevisionFiles.inIndex(repo!) : undefined;
  const head: HeadFiles = index ? indexFiles(index) : workTreeFiles(root);
  const judging = new JudgingFiles((req.policyFrom ?? 'base') === 'base' ? baseFiles : undefined, head);

  const policyRel = toRootRelative(root, resolve(req.cwd, req.policy));
  if (policyRel === '..' || policyRel.startsWith('../') || policyRel === '' || /^[A-Za-z]:/.test(policyRel)) {
    throw new CheckRequestError(`--policy ${req.policy}: policies are read from inside the repository root ${root} (give --root)`);
  }
  // The loaders resolve paths against the process's working directory and report them as given:
  // short relative paths when that is the request's cwd, absolute ones otherwise.
  const loaderPath = (rel: string): string => (resolve(req.cwd) === process.cwd() ? display(rel) : resolve(root, rel));
  const sources = new Map<string, string>();
  let loaded;
  try {
    loaded = loadJudgingPolicies(judging, { rel: policyRel, root, display, loaderPath, sources }, errors);
  } catch (e) {
    if (!(e instanceof MissingPolicyError)) throw e;
    throw new CheckRequestError(`--policy ${req.policy}: no such file or directory${base ? ' at the base revision or in the working tree' : ''}`);
  }
  const notices: PolicyNotice[] = judging.headChanges().map((c) => ({
    file: display(c.path),
    path: c.path,
    line: c.line,
    message: c.deleted ? DELETED_POLICY : CHANGED_POLICY,
  }));
  for (const { path, refusal } of judging.headRefusals()) errors.push({ code: `policy/${refusal.code === 'symlink' ? 'symlink' : 'unreadable'}`, message: refusal.message, file: display(path), severity: 'error' });
  const strict = req.unprovenFails
    ? loaded.policies.map((p) => ({ ...p, unproven: 'fail' as const, requirements: p.requirements.map((r) => ({ ...r, unproven: 'fail' as const })) }))
    : loaded.policies;
  const policies = req.modelPath === undefined ? strict : strict.map((p) => ({ ...p, modelPath: req.modelPath }));

  // Which files are candidates, on each side.
  const explicit = req.configs.length > 0 || req.configGlobs !== undefined;
  const singleFile = !loaded.directory;
  const selector = req.configGlobs !== undefined ? globSelector(req.configGlobs) : policySelector(policies);
  const skipped: SkippedPath[] = [];
  const headPaths = new Set<string>();
  const basePaths = new Set<string>();
  if (req.configs.length > 0) {
    for (const c of req.configs) {
      const rel = toRootRelative(root, resolve(req.cwd, c));
      if (rel === '' || rel === '..' || rel.startsWith('../') || /^[A-Za-z]:/.test(rel)) {
        errors.push({ code: 'config/outside-root', message: `the config is outside the repository root ${root}; only files inside the repository are read`, file: c, severity: 'error' });
      } else {
        headPaths.add(rel);
        basePaths.add(rel);
      }
    }
  } else if (index) {
    for (const f of stagedChanges(repo!).files) if (selector.matches(f.path)) headPaths.add(f.path);
  } else {
    const found = discoverConfigs(root, repo, selector);
    for (const f of found.files) headPaths.add(f);
    for (const l of found.links) errors.push({ code: 'config/symlink', message: symlinkMessage(l.path, l.link), file: display(l.path), severity: 'error' });
    skipped.push(...found.skipped);
  }
  if (baseFiles && req.configs.length === 0) for (const p of baseFiles.paths()) if (YAML_FILE.test(p) && selector.matches(p)) basePaths.add(p);

  const governs = (p: Policy, path: string): boolean => (explicit && singleFile) || policyApplies(p, path);
  // What changed, and which deletions and additions git paired as renames.
  const changes: Changes | undefined = base ? (index ? stagedChanges(repo!) : changesSince(repo!, base, { against: 'worktree' })) : undefined;
  const renamedFrom = new Map<string, string>();
  for (const [from, to] of changes?.renames ?? []) renamedFrom.set(to, from);
  let selected = [...new Set([...headPaths, ...basePaths])].sort();
  if ((req.changed || req.staged) && changes) {
    const changed = new Set(changes.files.map((c) => c.path));
    const policyChanged = (p: Policy): boolean => p.chain.some((f) => changed.has(toRootRelative(root, resolve(req.cwd, f))));
    // A changed file that is no candidate config may be a definition that unchanged configs name.
    const candidates = new Set(selected);
    const others = changes.files.some((c) => !candidates.has(c.path));
    const namesChanged = (f: string): boolean => {
      if (!others) return false;
      const r = head.has(f) ? head.read(f) : baseFiles?.read(f);
      if (r?.kind !== 'file') return false;
      return policies.some((p) => governs(p, f) && changed.has(definitionOf(r.text, f, p) ?? ''));
    };
    index?.prefetch(selected);
    selected = selected.filter((f) => changed.has(f) || policies.some((p) => policyChanged(p) && policyApplies(p, f)) || namesChanged(f));
  }

  const checkable = (p: Policy, path: string): string | undefined => {
    if (!YAML_FILE.test(path)) return 'not a YAML file (.yaml or .yml)';
    if (!governs(p, path)) return `outside the applies_to of policy ${p.id}`;
    const r = head.read(path);
    return r.kind === 'file' ? undefined : r.kind === 'refused' ? r.message : 'not there';
  };
  const baseOf = (path: string): string | undefined => {
    if (!baseFiles) return undefined;
    if (baseFiles.entry(path)) return path;
    const from = renamedFrom.get(path);
    return from !== undefined && baseFiles.entry(from) && !head.has(from) ? from : undefined;
  };
  index?.prefetch(selected);
  baseFiles?.prefetch(selected.flatMap((p) => [p, renamedFrom.get(p) ?? p]));

  // Each slot is a finished entry (a removal) or a pair still to compare, in report order.
  interface Pair {
    readonly path: string;
    readonly policy: Policy;
    readonly head: FileRead;
    readonly basePath: string | undefined;
    readonly base: FileRead | undefined;
    /** Index of the base version in the batch, when it must be evaluated. */
    task?: number;
  }
  const slots: (CheckedConfig | Pair)[] = [];
  const policySkipped = new Set<string>();
  for (const path of selected) {
    const there = head.has(path);
    for (const policy of policies) {
      if (!governs(policy, path)) continue;
      if (loaded.files.has(path)) {
        if (there && !policySkipped.has(path)) skipped.push({ path, reason: 'a policy file of this check, not a config' });
        policySkipped.add(path);
        continue;
      }
      if (there || !baseFiles?.entry(path)) {
        const basePath = baseOf(path);
        slots.push({ path, policy, head: head.read(path), basePath, base: basePath === undefined ? undefined : baseFiles!.read(basePath) });
        continue;
      }
      // Governed at the base, not in the head: deleted, or renamed somewhere this policy does not check.
      const to = changes?.renames.get(path);
      const why = to === undefined ? undefined : checkable(policy, to);
      if (to !== undefined && why === undefined) continue; // compared at its new path
      slots.push({
        file: display(path),
        path,
        policy,
        comparison: to === undefined ? 'deleted' : 'moved-out',
        ...(to !== undefined ? { movedTo: { path: to, why: why! } } : {}),
        changes: [],
        failing: policy.removal === 'fail',
      });
    }
  }

  // The architecture definitions the configs name: the base side's from the base revision, read
  // in one batch; the head side's from the head, with the base revision's declarations.
  const definitions = new CheckDefinitions(head, baseFiles, judging, display, sources);
  const refs = slots.map((slot) => {
    if (!('head' in slot)) return {};
    const headRef = slot.head.kind === 'file' ? definitionOf(slot.head.text, slot.path, slot.policy) : undefined;
    const baseRef = slot.base?.kind === 'file' ? definitionOf(slot.base.text, slot.basePath!, slot.policy) : undefined;
    return { headRef, baseRef };
  });
  definitions.prefetch(refs.flatMap((r) => [r.headRef, r.baseRef].filter((x): x is string => x !== undefined)));

  // The base versions that differ from their heads (or whose definition does) are evaluated as one
  // batch, beside the heads.
  const tasks: BaseTask[] = [];
  slots.forEach((slot, i) => {
    if (!('head' in slot) || slot.base?.kind !== 'file') return;
    const { baseRef } = refs[i]!;
    if (slot.head.kind === 'file' && slot.head.text === slot.base.text && (baseRef === undefined || !definitions.differs(baseRef))) return;
    const texts = definitions.baseTexts(baseRef);
    slot.task = tasks.push({ text: slot.base.text, file: display(slot.path), policy: slot.policy, path: slot.basePath!, ...(texts ? { definitions: texts } : {}) }) - 1;
  });
  const collect = startBaseEvaluation(tasks);
  const heads = slots.map((slot) => {
    if (!('head' in slot)) return undefined;
    if (slot.head.kind === 'file') sources.set(display(slot.path), slot.head.text);
    return evaluateHead(slot.path, display(slot.path), slot.policy, slot.head, errors, definitions.head);
  });
  // A definition the head changes is reported like a changed policy (it was read through JudgingFiles).
  const reported = new Set(notices.map((n) => n.path));
  for (const c of judging.headChanges()) {
    if (reported.has(c.path) || !definitions.read.has(c.path)) continue;
    notices.push({ file: display(c.path), path: c.path, line: c.line, message: c.deleted ? DELETED_DEFINITION : CHANGED_DEFINITION, definition: true });
  }
  const answers: readonly BaseAnswer[] = tasks.length > 0 ? collect() : [];
  const checked: CheckedConfig[] = [];
  slots.forEach((slot, i) => {
    if (!('head' in slot)) {
      checked.push(slot);
      return;
    }
    const evaluated: EvaluatedHead | undefined = heads[i];
    if (!evaluated) return;
    // An unchanged base version has the head's own evaluation.
    const answer = slot.task !== undefined ? answers[slot.task] : { model: evaluated.model, result: evaluated.result };
    const one = compareWithBase(evaluated, baseFiles ? { basePath: slot.basePath, read: slot.base, answer } : undefined, errors);
    if (one) checked.push(one);
  });
  skipped.sort((a, b) => (a.path < b.path ? -1 : a.path > b.path ? 1 : 0));
  return { root, ...(base ? { base } : {}), checked, notices, skipped, errors: dedupeDiagnostics(errors), sources };
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

function policySelector(policies: readonly Policy[]): Selector {
  return {
    matches: (path) => policies.some((p) => policyApplies(p, path)),
    couldMatchBelow: (dir) => policies.some((p) => couldMatchBelow(p.appliesTo, dir)),
  };
}

/** The Action's `configs` globs: matched like applies_to (root-relative, dot files, the same on every runner). */
function globSelector(globs: readonly string[]): Selector {
  const clean = (g: string): string => g.replace(/^(\.\/)+/, '');
  const positive = globs.filter((g) => !g.startsWith('!')).map(clean);
  const negative = globs.filter((g) => g.startsWith('!')).map((g) => clean(g.slice(1)));
  const options = { dot: true, windows: false };
  const include = positive.length > 0 ? picomatch(positive, options) : () => false;
  const exclude = negative.length > 0 ? picomatch(negative, options) : () => false;
  return { matches: (path) => include(path) && !exclude(path), couldMatchBelow: (dir) => couldMatchBelow(positive, dir) };
}
