/**
 * Reading the working tree the way git sees it: inside the repository root, and never through a
 * symbolic link. A link anywhere on the way to a config or a policy — the file itself or one of
 * its directories — is refused with the link's path, because following it could read a file
 * outside the repository (a credential in `.git/config`, `/proc/self/environ`) and echo it in
 * annotations and reports, or swap the file a base policy points at for another one. The final
 * open uses O_NOFOLLOW, so a link planted between the check and the read is refused as well.
 */
import { closeSync, constants, fstatSync, lstatSync, openSync, readFileSync, type Stats } from 'node:fs';
import { join } from 'node:path';
import { MAX_DOCUMENT_BYTES } from '../config/limits.js';
import { refused, type FileRead } from './file-read.js';

/** What is at a root-relative path, looked at without following links. */
export type WorkTreeEntry =
  | { readonly kind: 'file'; readonly size: number }
  | { readonly kind: 'directory' }
  | { readonly kind: 'absent' }
  | { readonly kind: 'symlink'; readonly link: string }
  | { readonly kind: 'special' };

/** `rel` is root-relative with forward slashes; a path that leaves the root is never there. */
export function inspectWorkTree(root: string, rel: string): WorkTreeEntry {
  const segments = rel.split('/').filter((s) => s !== '' && s !== '.');
  if (segments.length === 0 || segments.includes('..') || /^[A-Za-z]:/.test(rel) || rel.startsWith('/')) return { kind: 'absent' };
  for (let i = 1; i <= segments.length; i++) {
    const sub = segments.slice(0, i).join('/');
    let s: Stats;
    try {
      s = lstatSync(join(root, sub));
    } catch {
      return { kind: 'absent' };
    }
    if (s.isSymbolicLink()) return { kind: 'symlink', link: sub };
    if (i < segments.length && !s.isDirectory()) return { kind: 'absent' };
    if (i === segments.length) {
      if (s.isFile()) return { kind: 'file', size: s.size };
      return s.isDirectory() ? { kind: 'directory' } : { kind: 'special' };
    }
  }
  return { kind: 'absent' };
}

/** The text of a root-relative file of the working tree; see the file header for what is refused. */
export function readWorkTree(root: string, rel: string): FileRead {
  const entry = inspectWorkTree(root, rel);
  switch (entry.kind) {
    case 'absent':
      return { kind: 'absent' };
    case 'symlink':
      return refused('symlink', symlinkMessage(rel, entry.link));
    case 'directory':
      return refused('directory', `${rel} is a directory, not a file`);
    case 'special':
      return refused('special', `${rel} is not a regular file`);
    case 'file':
      break;
  }
  if (entry.size > MAX_DOCUMENT_BYTES) {
    return refused('too-large', `${rel} is ${entry.size} bytes; files larger than ${MAX_DOCUMENT_BYTES} bytes (4 MiB) are refused`);
  }
  let fd: number | undefined;
  try {
    fd = openSync(join(root, rel), constants.O_RDONLY | (constants.O_NOFOLLOW ?? 0));
    const s = fstatSync(fd);
    if (!s.isFile()) return refused('special', `${rel} is not a regular file`);
    if (s.size > MAX_DOCUMENT_BYTES) return refused('too-large', `${rel} is ${s.size} bytes; files larger than ${MAX_DOCUMENT_BYTES} bytes (4 MiB) are refused`);
    return { kind: 'file', text: readFileSync(fd, 'utf8') };
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    if (code === 'ENOENT') return { kind: 'absent' };
    if (code === 'ELOOP') return refused('symlink', symlinkMessage(rel, rel));
    return refused('unreadable', `cannot read ${rel}: ${(err as Error).message}`);
  } finally {
    if (fd !== undefined) closeSync(fd);
  }
}

export function symlinkMessage(rel: string, link: string): string {
  const where = link === rel ? `${rel} is a symbolic link` : `${rel} lies behind the symbolic link ${link}`;
  return `${where}; links are never followed (they could lead outside the repository), point the check at the file itself`;
}
