/**
 * The files of one revision — a commit or the index — listed once and read in batches, so that a
 * comparison costs a fixed number of git processes however many configs it touches: one listing
 * (`ls-tree -r` or `ls-files --stage`) and, per batch of reads, one `cat-file --batch-check` (sizes,
 * and which objects are missing) and one `cat-file --batch` (the contents). A path is looked up in
 * the listing, so "not there" is an exact answer; entries that are not plain files (symbolic
 * links, submodules, conflicts) and objects missing from the store are refusals, never "absent".
 */
import { refused, type FileRead } from '../files/file-read.js';
import { checkRootRelativePath } from './git-input.js';
import { type Repo } from './repo.js';
import { MAX_FILE_BYTES, runGitOk } from './run-git.js';

export interface TreeEntry {
  /** Root-relative, forward slashes. */
  readonly path: string;
  /** 100644, 100755 (file), 120000 (symbolic link), 160000 (submodule). */
  readonly mode: string;
  readonly id: string;
  /** Index only: more than one stage (an unresolved merge conflict). */
  readonly conflicted?: boolean;
}

type Blob = Buffer | { readonly missing: true } | { readonly size: number };

export class RevisionFiles {
  private readonly blobs = new Map<string, Blob>();
  private readonly dirs = new Set<string>();

  private constructor(
    private readonly repo: Repo,
    /** How messages name the side: `at 1a2b3c4d5e6f` or `in the index`. */
    readonly label: string,
    private readonly entries: ReadonlyMap<string, TreeEntry>,
  ) {
    for (const path of entries.keys()) {
      for (let i = path.indexOf('/'); i !== -1; i = path.indexOf('/', i + 1)) this.dirs.add(path.slice(0, i));
    }
  }

  /** Every file of `commit` (a full commit id). */
  static atCommit(repo: Repo, commit: string): RevisionFiles {
    const out = runGitOk(repo.root, ['ls-tree', '-r', '-z', '--full-tree', commit]).toString('utf8');
    const entries = new Map<string, TreeEntry>();
    for (const record of out.split('\0')) {
      const m = /^(\d{6}) (\w+) ([0-9a-f]+)\t([\s\S]+)$/.exec(record);
      if (m) entries.set(m[4]!, { path: m[4]!, mode: m[1]!, id: m[3]! });
    }
    return new RevisionFiles(repo, `at ${commit.slice(0, 12)}`, entries);
  }

  /** Every file staged in the index (what the next commit would hold). */
  static inIndex(repo: Repo): RevisionFiles {
    const out = runGitOk(repo.root, ['ls-files', '--stage', '-z', '--full-name']).toString('utf8');
    const entries = new Map<string, TreeEntry>();
    for (const record of out.split('\0')) {
      const m = /^(\d{6}) ([0-9a-f]+) (\d)\t([\s\S]+)$/.exec(record);
      if (!m) continue;
      const path = m[4]!;
      const conflicted = m[3] !== '0' || entries.has(path);
      entries.set(path, { path, mode: m[1]!, id: m[2]!, ...(conflicted ? { conflicted } : {}) });
    }
    return new RevisionFiles(repo, 'in the index', entries);
  }

  /** Root-relative paths of every entry (files, links, submodules), sorted. */
  paths(): string[] {
    return [...this.entries.keys()].sort();
  }

  entry(path: string): TreeEntry | undefined {
    return this.entries.get(path);
  }

  isDirectory(path: string): boolean {
    const dir = path.replace(/\/+$/, '');
    return dir === '' || this.dirs.has(dir);
  }

  /** Root-relative paths of the entries directly in `dir` ('' for the root), sorted; not subdirectories. */
  children(dir: string): string[] {
    const prefix = dir === '' ? '' : `${dir.replace(/\/+$/, '')}/`;
    return this.paths().filter((p) => p.startsWith(prefix) && !p.slice(prefix.length).includes('/'));
  }

  /** Reads the plain files among `paths` in one batch; later `read` calls are answered from it. */
  prefetch(paths: readonly string[]): void {
    const ids = new Set<string>();
    for (const p of paths) {
      const e = this.entries.get(p);
      if (e && isPlainFile(e) && !e.conflicted && !this.blobs.has(e.id)) ids.add(e.id);
    }
    if (ids.size > 0) for (const [id, blob] of readBlobs(this.repo, [...ids])) this.blobs.set(id, blob);
  }

  read(path: string): FileRead {
    checkRootRelativePath(path);
    const e = this.entries.get(path);
    const what = `${path} ${this.label}`;
    if (e === undefined) {
      return this.dirs.has(path) ? refused('directory', `${what} is a directory, not a file`) : { kind: 'absent' };
    }
    if (e.conflicted) return refused('conflict', `${what} has unresolved merge conflicts; resolve them and stage the result`);
    if (e.mode === '120000') return refused('symlink', `${what} is a symbolic link; links are never followed, point the check at the file itself`);
    if (e.mode === '160000') return refused('submodule', `${what} is a submodule, not a file`);
    if (!isPlainFile(e)) return refused('special', `${what} is not a regular file (mode ${e.mode})`);
    if (!this.blobs.has(e.id)) this.prefetch([path]);
    const blob = this.blobs.get(e.id);
    if (blob === undefined || (!Buffer.isBuffer(blob) && 'missing' in blob)) {
      return refused(
        'missing-object',
        `${what} (object ${e.id.slice(0, 12)}) is missing from this clone's object store, so it cannot be compared; fetch the missing history (a full clone) and run again`,
      );
    }
    if (!Buffer.isBuffer(blob)) {
      return refused('too-large', `${what} is ${blob.size} bytes; files larger than ${MAX_FILE_BYTES} bytes (4 MiB) are refused`);
    }
    // Decoded the way the work-tree reader decodes files, so the same bytes give the same text.
    return { kind: 'file', text: blob.toString('utf8') };
  }
}

function isPlainFile(e: TreeEntry): boolean {
  return e.mode === '100644' || e.mode === '100755' || e.mode === '100664';
}

/**
 * Two processes for any number of objects: sizes and presence first, so that nothing over the
 * size cap is read, then the contents of the rest in one stream.
 */
function readBlobs(repo: Repo, ids: readonly string[]): Map<string, Blob> {
  const out = new Map<string, Blob>();
  const check = runGitOk(repo.root, ['cat-file', '--batch-check'], { input: ids.map((id) => `${id}\n`).join('') }).toString('utf8');
  const wanted: { id: string; size: number }[] = [];
  for (const line of check.split('\n')) {
    const m = /^([0-9a-f]+) (?:(missing)|(\w+) (\d+))$/.exec(line);
    if (!m) continue;
    const id = m[1]!;
    if (m[2] || m[3] !== 'blob') out.set(id, { missing: true });
    else if (Number(m[4]) > MAX_FILE_BYTES) out.set(id, { size: Number(m[4]) });
    else wanted.push({ id, size: Number(m[4]) });
  }
  if (wanted.length === 0) return out;
  const total = wanted.reduce((n, w) => n + w.size + w.id.length + 32, 0);
  const data = runGitOk(repo.root, ['cat-file', '--batch'], { input: wanted.map((w) => `${w.id}\n`).join(''), maxBuffer: total + 1024 });
  let at = 0;
  while (at < data.length) {
    const eol = data.indexOf(0x0a, at);
    if (eol === -1) break;
    const header = data.subarray(at, eol).toString('utf8');
    const m = /^([0-9a-f]+) (?:(missing)|(\w+) (\d+))$/.exec(header);
    if (!m) break;
    if (m[2]) {
      out.set(m[1]!, { missing: true });
      at = eol + 1;
      continue;
    }
    const size = Number(m[4]);
    out.set(m[1]!, Buffer.from(data.subarray(eol + 1, eol + 1 + size)));
    at = eol + 1 + size + 1;
  }
  // An object that vanished between the two calls, or output cut short, reads as missing.
  for (const w of wanted) if (!out.has(w.id)) out.set(w.id, { missing: true });
  return out;
}
