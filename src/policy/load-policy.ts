/**
 * The policy loader: a team's policy file (or a directory of them) → `Policy` values with the
 * extends chain resolved, or diagnostics for every problem found, in the extending file and in
 * the files it extends. Problems in users' files never throw; a missing schema file (a broken
 * installation) does.
 */
import { lstatSync, readdirSync, readFileSync } from 'node:fs';
import { join, relative, resolve, sep } from 'node:path';
import { dedupeDiagnostics, type Diagnostic, type Span } from '../diagnostic.js';
import { DiagnosticSink } from '../config/diagnostic-sink.js';
import { readPolicyDocument } from './policy-document.js';
import { finalisePolicy, mergePolicy, type PolicyDraft } from './policy-merge.js';
import { MAX_EXTENDS_DEPTH } from './policy-limits.js';
import { checkPartitionReferences } from './requirements.js';
import { MAX_DOCUMENT_BYTES } from '../config/limits.js';
import { inspectWorkTree, symlinkMessage } from '../files/work-tree.js';
import { inside, ReadRefusedError, resolveExtendsTarget, workTreeReader, type ReadFile } from './extends-target.js';
import type { Policy } from './policy.js';

export { policyApplies } from './applies-to.js';

export interface PolicyLoadOptions {
  /** Absolute path of the repository root; `extends` targets must lie inside it. */
  repoRoot: string;
}

export type PolicyLoadResult = { ok: true; policy: Policy } | { ok: false; diagnostics: Diagnostic[] };

export function loadPolicyFile(path: string, options: PolicyLoadOptions): PolicyLoadResult {
  const loaded = loadFromDisk(path, options);
  return loaded.draft ? { ok: true, policy: finalisePolicy(loaded.draft) } : { ok: false, diagnostics: loaded.diagnostics };
}

/**
 * `readFile` reads the files that `extends` names (default: the working tree, links refused). It
 * receives absolute paths below `options.repoRoot`, spelt from the root as given, and signals a
 * missing file by throwing an error whose `code` is `ENOENT` (see extends-target.ts).
 */
export function loadPolicyText(text: string, file: string, options: PolicyLoadOptions, readFile?: ReadFile): PolicyLoadResult {
  const loaded = loadChain(text, file, resolve(file), options, readFile, []);
  return loaded.draft ? { ok: true, policy: finalisePolicy(loaded.draft) } : { ok: false, diagnostics: loaded.diagnostics };
}

/**
 * Every `*.yaml` and `*.yml` file directly in `dir`, in name order. A file that fails to load
 * contributes diagnostics and the others still load; two policies with the same id are an error
 * at the second. A problem in a shared parent is reported once, not once per child.
 */
export function loadPolicyDirectory(dir: string, options: PolicyLoadOptions): { policies: Policy[]; diagnostics: Diagnostic[] } {
  let names: string[];
  try {
    const link = linkOnTheWay(dir, options.repoRoot);
    if (link !== undefined) {
      return { policies: [], diagnostics: [{ code: 'policy/symlink', message: symlinkMessage(dir, link), file: dir, severity: 'error' }] };
    }
    // Links among the files are listed, so that loading them reports them.
    names = readdirSync(dir, { withFileTypes: true })
      .filter((e) => /\.ya?ml$/.test(e.name) && (e.isFile() || e.isSymbolicLink()))
      .map((e) => e.name);
  } catch (err) {
    const reason = err instanceof Error ? err.message : String(err);
    return { policies: [], diagnostics: [{ code: 'policy/unreadable', message: `cannot read the policy directory: ${reason}`, file: dir, severity: 'error' }] };
  }
  names.sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));
  const policies: Policy[] = [];
  const diagnostics: Diagnostic[] = [];
  const report = (d: Diagnostic) => diagnostics.push(d);
  const firstById = new Map<string, Policy>();
  for (const name of names) {
    const file = join(dir, name);
    const loaded = loadFromDisk(file, options);
    loaded.diagnostics.forEach(report);
    if (!loaded.draft) continue;
    const policy = finalisePolicy(loaded.draft);
    const earlier = firstById.get(policy.id);
    if (earlier) {
      report(duplicateIdDiagnostic(policy.id, earlier.file, file, loaded.idSpan));
      continue;
    }
    firstById.set(policy.id, policy);
    policies.push(policy);
  }
  return { policies, diagnostics: dedupeDiagnostics(diagnostics) };
}

/** Two policies of one directory share an id: reported at the second. */
export function duplicateIdDiagnostic(id: string, earlierFile: string, file: string, span: Span | undefined): Diagnostic {
  return {
    code: 'policy/duplicate-id',
    message: `the policy id '${id}' is already used by ${earlierFile}; ids must be unique among the policies of a directory`,
    file,
    ...(span ? { span } : {}),
    severity: 'error',
  };
}

interface Loaded {
  readonly draft?: PolicyDraft;
  readonly idSpan?: Span;
  readonly diagnostics: Diagnostic[];
}

/** A file of the extends chain being loaded, for cycle reports. */
interface ChainLink {
  readonly real: string;
  readonly display: string;
}

function loadFromDisk(path: string, options: PolicyLoadOptions): Loaded {
  let text: string;
  try {
    text = readTopFile(path, options.repoRoot);
  } catch (err) {
    const refusal = err instanceof ReadRefusedError ? err.reason : undefined;
    const reason = err instanceof Error ? err.message : String(err);
    const d: Diagnostic = {
      code: refusal === 'too-large' ? 'policy/too-large' : refusal === 'symlink' ? 'policy/symlink' : 'policy/unreadable',
      message: refusal === 'too-large' || refusal === 'symlink' ? reason : `cannot read the policy file: ${reason}`,
      file: path,
      severity: 'error',
    };
    return { diagnostics: [d] };
  }
  return loadChain(text, path, resolve(path), options, undefined, []);
}

/**
 * The file named on the command line or found in a directory: below the repository root it is
 * read like every other file there (links refused on the whole way); elsewhere the file itself
 * must not be a link.
 */
function readTopFile(path: string, repoRoot: string): string {
  const root = resolve(repoRoot);
  const abs = resolve(path);
  if (inside(abs, root)) return workTreeReader(root)(abs);
  if (lstatSync(abs).isSymbolicLink()) throw new ReadRefusedError(symlinkMessage(path, path), 'symlink');
  const text = readFileSync(abs, 'utf8');
  const bytes = Buffer.byteLength(text, 'utf8');
  if (bytes > MAX_DOCUMENT_BYTES) throw new ReadRefusedError(`the policy file is ${bytes} bytes; files larger than ${MAX_DOCUMENT_BYTES} bytes (4 MiB) are refused`, 'too-large');
  return text;
}

/** The symbolic link (as a path below the root) on the way to `path`, if there is one. */
function linkOnTheWay(path: string, repoRoot: string): string | undefined {
  const root = resolve(repoRoot);
  const abs = resolve(path);
  if (!inside(abs, root) || abs === root) return undefined;
  const entry = inspectWorkTree(root, relative(root, abs).split(sep).join('/'));
  return entry.kind === 'symlink' ? entry.link : undefined;
}

/**
 * Loads one file and, through `extends`, its ancestors. `stack` holds the files that extend this
 * one, outermost first. The file's own problems come first in the result, then its parent's.
 */
function loadChain(
  text: string,
  file: string,
  real: string,
  options: PolicyLoadOptions,
  readFile: ReadFile | undefined,
  stack: readonly ChainLink[],
): Loaded {
  const sink = new DiagnosticSink(file);
  const doc = readPolicyDocument(text, file, sink);
  const inherited: Diagnostic[] = [];
  let parent: PolicyDraft | undefined;
  if (doc?.extends) {
    const at = doc.extends.span;
    const chain = [...stack, { real, display: file }];
    const target = resolveExtendsTarget(doc.extends.path, file, options.repoRoot, readFile);
    if (!target.ok) {
      sink.error(target.code, target.message, at);
    } else if (chain.some((link) => link.real === target.real)) {
      const from = chain.findIndex((link) => link.real === target.real);
      const cycle = [...chain.slice(from).map((link) => link.display), target.display].join(' → ');
      sink.error('policy/extends-cycle', `extends '${doc.extends.path}' closes a cycle: ${cycle}; a policy cannot extend itself, directly or through others`, at);
    } else if (chain.length >= MAX_EXTENDS_DEPTH) {
      sink.error('policy/extends-too-deep', `extends '${doc.extends.path}' makes the extends chain longer than ${MAX_EXTENDS_DEPTH} files`, at);
    } else {
      const loaded = loadChain(target.text, target.display, target.real, options, readFile, chain);
      inherited.push(...loaded.diagnostics);
      if (loaded.draft) parent = loaded.draft;
      else sink.error('policy/extends-failed', `extends '${doc.extends.path}': ${target.display} did not load (its problems are listed with it)`, at);
    }
  }
  if (doc) {
    const visible = new Set([...(parent?.partitions.keys() ?? []), ...doc.declaredPartitions]);
    checkPartitionReferences(doc.references, visible, sink);
  }
  if (!doc || sink.count > 0 || doc.id === undefined || doc.description === undefined) {
    if (sink.count === 0) throw new Error(`policy loader: no policy and no diagnostic for ${file} (a loader bug)`);
    return { diagnostics: [...sink.sorted(), ...inherited] };
  }
  const draft = mergePolicy({ ...doc, id: doc.id, description: doc.description }, parent);
  return { draft, ...(doc.idSpan ? { idSpan: doc.idSpan } : {}), diagnostics: inherited };
}
