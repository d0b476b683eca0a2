/**
 * Collects the diagnostics of one load so that the loader can report every problem it finds,
 * not just the first, and hands them back in a fixed order (by source offset) so that output and
 * tests are stable. At most MAX_DIAGNOSTICS_PER_FILE are handed back, then one that counts the
 * rest and points at the first of them.
 */
import type { Diagnostic, Span } from '../diagnostic.js';
import { MAX_DIAGNOSTICS_PER_FILE } from './limits.js';

export class DiagnosticSink {
  private readonly items: Diagnostic[] = [];
  private readonly seen = new Set<string>();

  constructor(readonly file: string) {}

  error(code: string, message: string, span?: Span): void {
    // One problem at one place is reported once, even when a YAML alias makes the validator see
    // it at several paths.
    const key = span ? `${code}\u0000${span.offset}\u0000${span.endOffset}` : `${code}\u0000${message}`;
    if (this.seen.has(key)) return;
    this.seen.add(key);
    this.items.push(span ? { code, message, file: this.file, span, severity: 'error' } : { code, message, file: this.file, severity: 'error' });
  }

  get count(): number {
    return this.items.length;
  }

  /** Sorted by offset (position-less ones first), then by end, code and message; capped. */
  sorted(): Diagnostic[] {
    const all = [...this.items].sort(
      (a, b) =>
        (a.span?.offset ?? -1) - (b.span?.offset ?? -1) ||
        (a.span?.endOffset ?? -1) - (b.span?.endOffset ?? -1) ||
        compare(a.code, b.code) ||
        compare(a.message, b.message),
    );
    if (all.length <= MAX_DIAGNOSTICS_PER_FILE) return all;
    const next = all[MAX_DIAGNOSTICS_PER_FILE]!;
    const more = all.length - MAX_DIAGNOSTICS_PER_FILE;
    const message = `and ${more.toLocaleString('en-US')} more problem${more === 1 ? '' : 's'} in this file from here on, not listed (only the first ${MAX_DIAGNOSTICS_PER_FILE} are); fix these and run again`;
    const summary: Diagnostic = next.span
      ? { code: 'input/more-problems', message, file: this.file, span: next.span, severity: 'error' }
      : { code: 'input/more-problems', message, file: this.file, severity: 'error' };
    return [...all.slice(0, MAX_DIAGNOSTICS_PER_FILE), summary];
  }
}

function compare(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}
