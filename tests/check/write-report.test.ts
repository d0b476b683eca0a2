/**
 * The one writer of report files: whole files through an exclusively created temporary file,
 * never through a symbolic link, refused outside a given directory, and nothing partial left
 * behind when the disk fills up. The attacks are the ones a pull request can stage in the
 * checked-out tree: a link where the report (or the old fixed temporary name) will be written.
 */
import { lstatSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, realpathSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, test } from 'vitest';
import { ReportWriteError, writeReport } from '../../src/check/write-report.js';

let dir: string;
let outside: string;
beforeEach(() => {
  dir = realpathSync(mkdtempSync(join(tmpdir(), 'rankfloor-write-')));
  outside = realpathSync(mkdtempSync(join(tmpdir(), 'rankfloor-outside-')));
  writeFileSync(join(outside, 'victim.txt'), 'precious\n');
});
afterEach(() => {
  rmSync(dir, { recursive: true, force: true });
  rmSync(outside, { recursive: true, force: true });
});

function failure(run: () => void): ReportWriteError {
  try {
    run();
  } catch (e) {
    if (e instanceof ReportWriteError) return e;
    throw e;
  }
  throw new Error('expected a ReportWriteError');
}

describe('writes whole files', () => {
  test('creates directories, replaces a regular file, leaves no temporary file', () => {
    const target = join(dir, 'reports', 'out.sarif');
    writeReport(target, 'one\n');
    writeReport(target, 'two\n');
    expect(readFileSync(target, 'utf8')).toBe('two\n');
    expect(readdirSync(join(dir, 'reports'))).toEqual(['out.sarif']);
  });
});

describe('never through a symbolic link', () => {
  test('a link at the target is refused and the file it points to is untouched', () => {
    symlinkSync(join(outside, 'victim.txt'), join(dir, 'out.sarif'));
    const e = failure(() => writeReport(join(dir, 'out.sarif'), 'x'));
    expect(e.name).toBe('ReportWriteError');
    expect(e.message).toBe(`cannot write ${join(dir, 'out.sarif')}: it exists and is a symbolic link, not a regular file; refusing to replace it`);
    expect(readFileSync(join(outside, 'victim.txt'), 'utf8')).toBe('precious\n');
    expect(lstatSync(join(dir, 'out.sarif')).isSymbolicLink()).toBe(true);
  });

  test('a link planted at the temporary name the previous writer used (<path>.tmp-<pid>) is not followed', () => {
    const target = join(dir, 'out.json');
    symlinkSync(join(outside, 'victim.txt'), `${target}.tmp-${process.pid}`);
    writeReport(target, '{}\n');
    expect(readFileSync(join(outside, 'victim.txt'), 'utf8')).toBe('precious\n');
    expect(readFileSync(target, 'utf8')).toBe('{}\n');
  });

  test('a directory at the target is refused', () => {
    mkdirSync(join(dir, 'out.xml'));
    expect(failure(() => writeReport(join(dir, 'out.xml'), 'x')).message).toContain('it exists and is a directory, not a regular file');
  });
});

describe('inside a directory (the Action workspace)', () => {
  test('.. and absolute paths outside are refused, and so is a directory link leading outside', () => {
    expect(failure(() => writeReport(join(dir, '..', 'x.sarif'), 'x', { inside: dir })).message).toMatch(/: it is outside /);
    expect(failure(() => writeReport(join(outside, 'x.sarif'), 'x', { inside: dir })).message).toMatch(/: it is outside /);
    symlinkSync(outside, join(dir, 'reports'));
    expect(failure(() => writeReport(join(dir, 'reports', 'x.sarif'), 'x', { inside: dir })).message).toMatch(/through a symbolic link, outside/);
    expect(readdirSync(outside)).toEqual(['victim.txt']);
    writeReport(join(dir, 'ok', 'x.sarif'), 'x', { inside: dir });
    expect(readFileSync(join(dir, 'ok', 'x.sarif'), 'utf8')).toBe('x');
  });
});

describe('a failing disk', () => {
  test('a write that fails half-way leaves the old file and no temporary file, with a one-line message', () => {
    const target = join(dir, 'out.sarif');
    writeFileSync(target, 'old\n');
    let calls = 0;
    const full = (): number => {
      if (calls++ > 0) throw Object.assign(new Error('ENOSPC: no space left on device, write'), { code: 'ENOSPC' });
      return 3;
    };
    const e = failure(() => writeReport(target, 'a longer new report\n', { fs: { writeSync: full } }));
    expect(e.message).toBe(`cannot write ${target}: ENOSPC: no space left on device`);
    expect(readFileSync(target, 'utf8')).toBe('old\n');
    expect(readdirSync(dir)).toEqual(['out.sarif']);
  });

  test('a directory that cannot be created', () => {
    writeFileSync(join(dir, 'file'), '');
    const e = failure(() => writeReport(join(dir, 'file', 'out.sarif'), 'x'));
    expect(e.message).toMatch(/^cannot write .*out\.sarif: (EEXIST|ENOTDIR): /);
    expect(e.message).not.toContain('\n');
  });
});
