/**
 * What every command shares: the I/O seam that tests replace, exit codes, usage errors, and the
 * printing of diagnostics with source excerpts.
 */
import { readFileSync } from 'node:fs';
import type { Diagnostic } from '../diagnostic.js';
import { renderDiagnostic, splitLines } from '../report/diagnostics.js';

export interface Io {
  readonly stdout: (text: string) => void;
  readonly stderr: (text: string) => void;
  /** Colour the text report (only when standard output is a terminal). */
  readonly color?: boolean;
}

export const EXIT_OK = 0;
export const EXIT_FAIL = 1;
export const EXIT_INPUT = 2;

export class UsageError extends Error {
  override readonly name = 'UsageError';
}

export function oneOf(value: string, allowed: readonly string[], option: string): string {
  if (!allowed.includes(value)) throw new UsageError(`${option} must be one of ${allowed.join(', ')} (got '${value}')`);
  return value;
}

/**
 * Prints diagnostics (with the offending source line where it can be read) on stderr. `given`
 * holds the texts a command already read; when it is passed, nothing is read again from disk
 * (a file may have changed, or be a link, since the command read it).
 */
export function printDiagnostics(diagnostics: readonly Diagnostic[], io: Io, given?: ReadonlyMap<string, string>): void {
  const sources = new Map<string, string[] | undefined>();
  for (const [file, text] of given ?? []) sources.set(file, splitLines(text));
  for (const d of diagnostics) {
    if (!sources.has(d.file) && !given) {
      let lines: string[] | undefined;
      try {
        lines = splitLines(readFileSync(d.file, 'utf8'));
      } catch {
        lines = undefined;
      }
      sources.set(d.file, lines);
    }
    io.stderr(renderDiagnostic(d, sources.get(d.file)) + '\n');
  }
}
