/**
 * Report files (JSON, SARIF, JUnit, and any report format added later) are written by this one
 * writer, shared by the CLI and the Action. Their paths often lie inside a checked-out pull
 * request, which may plant a symbolic link where a report is expected, so the writer never
 * follows one: the text goes into a temporary file created exclusively (O_EXCL, O_NOFOLLOW) in the
 * target's own directory and is renamed over the target, and a target that exists but is not a
 * regular file is refused. A reader never sees half a report, and a failed write (a full disk, a
 * read-only directory) leaves no partial file behind and is reported as one line.
 */
import { randomBytes } from 'node:crypto';
import * as fs from 'node:fs';
import { basename, dirname, isAbsolute, join, relative, resolve } from 'node:path';

/** A report file that could not be written; `message` is one line, meant for the user. */
export class ReportWriteError extends Error {
  override readonly name = 'ReportWriteError';
}

/** The file-system calls the writer makes; tests replace some to simulate failures. */
export interface WriterFs {
  readonly openSync: typeof fs.openSync;
  readonly writeSync: (fd: number, buffer: Buffer, offset: number, length: number) => number;
  readonly fsyncSync: typeof fs.fsyncSync;
  readonly closeSync: typeof fs.closeSync;
  readonly renameSync: typeof fs.renameSync;
}

export interface WriteReportOptions {
  /**
   * Refuse a target outside this directory, judged after resolving the links of the part of the
   * path that exists (the Action's workspace).
   */
  readonly inside?: string;
  readonly fs?: Partial<WriterFs>;
}

const CREATE_FLAGS = fs.constants.O_WRONLY | fs.constants.O_CREAT | fs.constants.O_EXCL | (fs.constants.O_NOFOLLOW ?? 0);

export function writeReport(path: string, content: string, options: WriteReportOptions = {}): void {
  const io: WriterFs = { ...fs, ...options.fs } as WriterFs;
  const target = resolve(path);
  const refuse = (why: string): never => {
    throw new ReportWriteError(`cannot write ${path}: ${why}`);
  };
  if (options.inside !== undefined) {
    const root = realOrSelf(resolve(options.inside));
    if (!isInside(resolve(options.inside), target) && !isInside(root, target)) refuse(`it is outside ${options.inside}`);
    if (!isInside(root, realOrSelf(nearestExisting(dirname(target))))) refuse(`its directory leads, through a symbolic link, outside ${options.inside}`);
  }
  const dir = dirname(target);
  try {
    fs.mkdirSync(dir, { recursive: true });
  } catch (err) {
    refuse(reason(err));
  }
  if (options.inside !== undefined && !isInside(realOrSelf(resolve(options.inside)), realOrSelf(dir))) {
    refuse(`its directory leads, through a symbolic link, outside ${options.inside}`);
  }
  const existing = lstatOrUndefined(target);
  if (existing && !existing.isFile()) refuse(`it exists and is ${kindOf(existing)}, not a regular file; refusing to replace it`);

  const tmp = join(dir, `.${basename(target)}.${randomBytes(6).toString('hex')}.tmp`);
  let fd: number | undefined;
  try {
    fd = io.openSync(tmp, CREATE_FLAGS, 0o666);
    const bytes = Buffer.from(content, 'utf8');
    for (let done = 0; done < bytes.length; ) done += io.writeSync(fd, bytes, done, bytes.length - done);
    io.fsyncSync(fd);
    io.closeSync(fd);
    fd = undefined;
    io.renameSync(tmp, target);
  } catch (err) {
    if (fd !== undefined) {
      try {
        fs.closeSync(fd);
      } catch {
        // already failing; the temporary file is removed below
      }
    }
    try {
      fs.unlinkSync(tmp);
    } catch {
      // never created, or already renamed
    }
    refuse(reason(err));
  }
}

/** Node's message without its trailing ", syscall 'path'" ("ENOSPC: no space left on device"), on one line. */
function reason(err: unknown): string {
  const message = err instanceof Error ? err.message : String(err);
  return (message.split('\n')[0] ?? '').replace(/, [a-z]+(?: '.*')?$/, '');
}

function kindOf(s: fs.Stats): string {
  if (s.isSymbolicLink()) return 'a symbolic link';
  if (s.isDirectory()) return 'a directory';
  return 'a special file';
}

function lstatOrUndefined(path: string): fs.Stats | undefined {
  try {
    return fs.lstatSync(path);
  } catch {
    return undefined;
  }
}

function nearestExisting(dir: string): string {
  let d = dir;
  while (lstatOrUndefined(d) === undefined) {
    const up = dirname(d);
    if (up === d) return d;
    d = up;
  }
  return d;
}

function realOrSelf(path: string): string {
  try {
    return fs.realpathSync(path);
  } catch {
    return path;
  }
}

function isInside(root: string, path: string): boolean {
  const rel = relative(root, path);
  return !isAbsolute(rel) && !/^\.\.(?:[\\/]|$)/.test(rel);
}
