/**
 * The head side of a check: the version of each file a change proposes. Locally and in CI that is
 * the working tree (read without following links, see files/work-tree.ts); before a commit it is
 * the index. Both answer the same two questions, so the check does not care which it has.
 */
import { readdirSync } from 'node:fs';
import { join } from 'node:path';
import { refused, type FileRead } from '../files/file-read.js';
import { inspectWorkTree, readWorkTree, symlinkMessage } from '../files/work-tree.js';
import type { RevisionFiles } from '../git/revision-files.js';

/** The entries directly in a directory, or why it cannot be listed. */
export type DirectoryListing = { readonly kind: 'directory'; readonly paths: readonly string[] } | Exclude<FileRead, { kind: 'file' }>;

export interface HeadFiles {
  /** `in the working tree` or `in the index`, for messages. */
  readonly label: string;
  read(rel: string): FileRead;
  /** Root-relative paths of the files and links directly in `dir`, sorted. */
  list(dir: string): DirectoryListing;
  /** Whether anything (a file, a link, a directory) is at `rel`. */
  has(rel: string): boolean;
}

export function workTreeFiles(root: string): HeadFiles {
  return {
    label: 'in the working tree',
    read: (rel) => readWorkTree(root, rel),
    list(dir) {
      const entry = dir === '' ? ({ kind: 'directory' } as const) : inspectWorkTree(root, dir);
      if (entry.kind === 'absent') return { kind: 'absent' };
      if (entry.kind === 'symlink') return refused('symlink', symlinkMessage(dir, entry.link));
      if (entry.kind !== 'directory') return refused('special', `${dir} is not a directory`);
      const prefix = dir === '' ? '' : `${dir}/`;
      const paths = readdirSync(join(root, dir), { withFileTypes: true })
        .filter((e) => e.isFile() || e.isSymbolicLink())
        .map((e) => `${prefix}${e.name}`)
        .sort();
      return { kind: 'directory', paths };
    },
    has: (rel) => inspectWorkTree(root, rel).kind !== 'absent',
  };
}

export function indexFiles(index: RevisionFiles): HeadFiles {
  return {
    label: index.label,
    read: (rel) => index.read(rel),
    list: (dir) => (index.isDirectory(dir) ? { kind: 'directory', paths: index.children(dir) } : { kind: 'absent' }),
    has: (rel) => index.entry(rel) !== undefined || index.isDirectory(rel),
  };
}
