/**
 * The policies of a check, read through JudgingFiles: a policy file or every `*.yaml`/`*.yml`
 * directly in a policy directory (the union of the base's and the head's), each with its extends
 * chain, every file from the side that judges. Problems are diagnostics; a policy path that
 * exists on neither side is a request error.
 */
import type { Diagnostic } from '../diagnostic.js';
import { duplicateIdDiagnostic, loadPolicyText } from '../policy/load-policy.js';
import { ReadRefusedError } from '../policy/extends-target.js';
import type { Policy } from '../policy/policy.js';
import { refusalDiagnostic } from './input-errors.js';
import type { JudgingFiles } from './judging-files.js';
import { toRootRelative } from './repo-files.js';

export interface LoadedPolicies {
  readonly policies: readonly Policy[];
  /** --policy names a directory (on either side). */
  readonly directory: boolean;
  /** Root-relative paths of every file read for the policies: policy files and extends targets. */
  readonly files: ReadonlySet<string>;
}

export interface PolicyRequest {
  /** Root-relative path of --policy. */
  readonly rel: string;
  readonly root: string;
  /** How diagnostics name a root-relative file. */
  readonly display: (rel: string) => string;
  /** The file name handed to the loader, which resolves it against the process's working directory. */
  readonly loaderPath: (rel: string) => string;
  /** Receives the text of every file read, under the names diagnostics give it. */
  readonly sources?: Map<string, string>;
}

export class MissingPolicyError extends Error {
  override readonly name = 'MissingPolicyError';
}

export function loadJudgingPolicies(files: JudgingFiles, req: PolicyRequest, errors: Diagnostic[]): LoadedPolicies {
  if (!files.exists(req.rel)) throw new MissingPolicyError(req.rel);
  const directory = files.isDirectory(req.rel);
  let candidates: readonly string[];
  if (directory) {
    const listing = files.list(req.rel);
    if (listing.refusal) errors.push(refusalDiagnostic(listing.refusal, req.display(req.rel), 'policy'));
    candidates = listing.paths.filter((p) => /\.ya?ml$/.test(p));
  } else candidates = [req.rel];
  files.prefetch(candidates);

  const read = new Set<string>();
  const remember = (rel: string, text: string): string => {
    req.sources?.set(req.display(rel), text);
    req.sources?.set(req.loaderPath(rel), text);
    return text;
  };
  const readFile = (abs: string): string => {
    const rel = toRootRelative(req.root, abs);
    read.add(rel);
    const r = files.read(rel).read;
    if (r.kind === 'file') return remember(rel, r.text);
    if (r.kind === 'absent') throw Object.assign(new Error(`${rel} does not exist`), { code: 'ENOENT' });
    throw new ReadRefusedError(r.message, r.code);
  };
  const policies: Policy[] = [];
  const ids = new Map<string, string>();
  for (const rel of candidates) {
    read.add(rel);
    const r = files.read(rel).read;
    if (r.kind === 'absent') continue;
    if (r.kind === 'refused') {
      errors.push(refusalDiagnostic(r, req.display(rel), 'policy'));
      continue;
    }
    const loaded = loadPolicyText(remember(rel, r.text), req.loaderPath(rel), { repoRoot: req.root }, readFile);
    if (!loaded.ok) {
      errors.push(...loaded.diagnostics);
      continue;
    }
    const earlier = ids.get(loaded.policy.id);
    if (earlier !== undefined) {
      errors.push(duplicateIdDiagnostic(loaded.policy.id, earlier, req.display(rel), loaded.policy.span));
      continue;
    }
    ids.set(loaded.policy.id, req.display(rel));
    policies.push(loaded.policy);
  }
  return { policies, directory, files: read };
}
