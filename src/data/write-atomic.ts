/**
 * A policy file is written whole or not at all: the text goes to a new temporary file in the
 * same directory (the directory is made if missing; the file is created exclusively, so an existing file or a symbolic link there is never
 * followed), is flushed, and is renamed over the target. A target that is a symbolic link is
 * refused rather than replaced or followed.
 */
import { closeSync, fsyncSync, lstatSync, mkdirSync, openSync, renameSync, unlinkSync, writeSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';

export class UnsafeTargetError extends Error {
  override readonly name = 'UnsafeTargetError';
}

let counter = 0;

export function writeFileAtomic(path: string, text: string): void {
  let mode = 0o644;
  try {
    const st = lstatSync(path);
    if (st.isSymbolicLink()) throw new UnsafeTargetError(`${path} is a symbolic link; write the policy to the file it points to, or to a new path`);
    if (!st.isFile()) throw new UnsafeTargetError(`${path} exists and is not a regular file`);
    mode = st.mode & 0o777;
  } catch (e) {
    if (e instanceof UnsafeTargetError) throw e;
    if ((e as NodeJS.ErrnoException).code !== 'ENOENT') throw e;
  }
  const dir = dirname(path);
  mkdirSync(dir, { recursive: true });
  const tmp = join(dir, `.${basename(path)}.${process.pid}.${counter++}.tmp`);
  const fd = openSync(tmp, 'wx', mode);
  try {
    writeSync(fd, text);
    fsyncSync(fd);
    closeSync(fd);
    renameSync(tmp, path);
  } catch (e) {
    try {
      closeSync(fd);
    } catch {
      // already closed
    }
    try {
      unlinkSync(tmp);
    } catch {
      // nothing to clean
    }
    throw e;
  }
}
