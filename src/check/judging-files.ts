/**
 * One source of truth for everything that judges a change: policies, the files they extend, and
 * any other file a judging document names (shared architecture definitions are meant to come
 * through here too). When a change is compared with a base revision, such a file is read from
 * the base revision's git tree whenever that tree has it — never through the head's working tree,
 * never through a link — so a pull request cannot loosen its own gate by editing, replacing or
 * linking a file the base judges with. A file the head changes gets a notice and is not used; a
 * file only the head has (a new policy) is read from the head, links refused.
 */
import type { FileRead, Refusal } from '../files/file-read.js';
import type { RevisionFiles } from '../git/revision-files.js';
import type { DirectoryListing, HeadFiles } from './head-files.js';

export interface JudgingRead {
  readonly read: FileRead;
  readonly from: 'base' | 'head';
}

/** A judging file the head changes; the base version was used. */
export interface HeadChange {
  /** Root-relative. */
  readonly path: string;
  /** The first line of the head version that differs (1 when the head deleted the file). */
  readonly line: number;
  readonly deleted: boolean;
}

export class JudgingFiles {
  private readonly changes = new Map<string, HeadChange>();
  private readonly refusals = new Map<string, Refusal>();

  /** `judge` is the base revision when it judges; undefined when the head judges itself. */
  constructor(
    private readonly judge: RevisionFiles | undefined,
    private readonly head: HeadFiles,
  ) {}

  read(rel: string): JudgingRead {
    if (this.judge) {
      const base = this.judge.read(rel);
      if (base.kind !== 'absent') {
        if (base.kind === 'file') this.compareHead(rel, base.text);
        return { read: base, from: 'base' };
      }
    }
    return { read: this.head.read(rel), from: 'head' };
  }

  /** The files and links directly in `dir` on either side; a head listing that is refused (a link) is kept as a refusal. */
  list(dir: string): { readonly paths: readonly string[]; readonly refusal?: Refusal } {
    const paths = new Set<string>(this.judge?.isDirectory(dir) ? this.judge.children(dir) : []);
    const head: DirectoryListing = this.head.list(dir);
    if (head.kind === 'directory') for (const p of head.paths) paths.add(p);
    return { paths: [...paths].sort(), ...(head.kind === 'refused' ? { refusal: head } : {}) };
  }

  /** A directory on the judging side, or else in the head (without following links). */
  isDirectory(rel: string): boolean {
    if (this.judge?.isDirectory(rel)) return true;
    return this.head.list(rel).kind === 'directory';
  }

  exists(rel: string): boolean {
    return this.judge?.entry(rel) !== undefined || this.judge?.isDirectory(rel) === true || this.head.has(rel);
  }

  prefetch(paths: readonly string[]): void {
    this.judge?.prefetch(paths);
  }

  /** Judging files the head changed or deleted, by path. */
  headChanges(): HeadChange[] {
    return [...this.changes.values()].sort((a, b) => (a.path < b.path ? -1 : a.path > b.path ? 1 : 0));
  }

  /** Judging files whose head version is refused (a link where the base has a file): input errors. */
  headRefusals(): { readonly path: string; readonly refusal: Refusal }[] {
    return [...this.refusals].map(([path, refusal]) => ({ path, refusal })).sort((a, b) => (a.path < b.path ? -1 : a.path > b.path ? 1 : 0));
  }

  private compareHead(rel: string, baseText: string): void {
    if (this.changes.has(rel) || this.refusals.has(rel)) return;
    const head = this.head.read(rel);
    if (head.kind === 'refused') this.refusals.set(rel, head);
    else if (head.kind === 'absent') this.changes.set(rel, { path: rel, line: 1, deleted: true });
    else if (head.text !== baseText) this.changes.set(rel, { path: rel, line: firstDifferentLine(baseText, head.text), deleted: false });
  }
}

function firstDifferentLine(a: string, b: string): number {
  const x = a.split('\n');
  const y = b.split('\n');
  for (let i = 0; i < Math.max(x.length, y.length); i++) if (x[i] !== y[i]) return Math.min(i + 1, y.length);
  return 1;
}
