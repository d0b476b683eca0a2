/**
 * CI checkouts are often shallow (one commit deep), so the base commit of a pull request may be
 * missing locally. This fetches that one commit from `origin`, once, and otherwise explains how to
 * check out with enough history, instead of failing later with "unknown revision".
 */
import { GitError } from './git-error.js';
import { isShallow, resolveCommit, type Repo } from './repo.js';
import { firstLine, runGit, runGitOk } from './run-git.js';

export type EnsureResult = { ok: true } | { ok: false; message: string };

const FETCH_TIMEOUT_MS = 300_000;
const FULL_ID = /^(?:[0-9a-f]{40}|[0-9a-f]{64})$/;
const HINT =
  'Check out the repository with full history (for GitHub Actions: `fetch-depth: 0` in actions/checkout; ' +
  'elsewhere `git fetch --unshallow origin`).';

// Per Repo object, so a check that asks for the same missing commit again does not fetch again.
const attempts = new WeakMap<Repo, Map<string, EnsureResult>>();

/** Makes commit `sha` present, fetching it from origin if needed; see EnsureResult. */
export function ensureCommit(repo: Repo, sha: string): EnsureResult {
  if (resolveCommit(repo, sha) !== undefined) return { ok: true };
  const id = sha.toLowerCase();
  if (!FULL_ID.test(id)) {
    return { ok: false, message: `commit '${sha}' is not in this clone, and only a full commit id can be fetched. ${HINT}` };
  }
  let tried = attempts.get(repo);
  if (tried === undefined) attempts.set(repo, (tried = new Map()));
  const earlier = tried.get(id);
  if (earlier !== undefined) return earlier;
  const result = fetchCommit(repo, id);
  tried.set(id, result);
  return result;
}

function fetchCommit(repo: Repo, id: string): EnsureResult {
  const remotes = runGitOk(repo.root, ['remote']).toString('utf8').split('\n');
  if (!remotes.includes('origin')) {
    return { ok: false, message: `commit ${id} is not in this clone, and there is no remote named origin to fetch it from. ${HINT}` };
  }
  const shallow = isShallow(repo);
  // --depth=1 keeps a shallow clone small; in a full clone it would turn the clone shallow, so
  // there the commit comes with whatever history is missing.
  const args = ['fetch', '--quiet', '--no-tags', '--no-recurse-submodules', ...(shallow ? ['--depth=1'] : []), 'origin', id];
  let why: string;
  try {
    const r = runGit(repo.root, args, { timeoutMs: FETCH_TIMEOUT_MS });
    if (r.status === 0 && resolveCommit(repo, id) !== undefined) return { ok: true };
    why = firstLine(r.stderr) || `git fetch exited with status ${r.status}`;
  } catch (err) {
    if (!(err instanceof GitError)) throw err;
    why = err.message;
  }
  const clone = shallow ? 'this shallow clone' : 'this clone';
  return { ok: false, message: `commit ${id} is not in ${clone}, and fetching it from origin failed (${why}). ${HINT}` };
}
