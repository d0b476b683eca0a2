/**
 * Diagnostics for people: `file:line:col: error: message`, then the offending source line with a
 * caret under the column, the way a careful parser reports. Pure: the caller passes the source.
 * A long line (a whole model in one flow mapping) is shown as a window around the column, so an
 * excerpt stays one screen line however large the file.
 */
import type { Diagnostic } from '../diagnostic.js';
import { formatDiagnosticLine } from '../diagnostic.js';

/** Characters of a source line shown before and after the column. */
const EXCERPT_BEFORE = 40;
const EXCERPT_AFTER = 80;

/** The source as text, or already split into lines (callers rendering many diagnostics split once). */
export function renderDiagnostic(d: Diagnostic, source?: string | readonly string[]): string {
  const head = formatDiagnosticLine(d);
  if (!d.span || source === undefined) return head;
  const lines = typeof source === 'string' ? splitLines(source) : source;
  const full = lines[d.span.line - 1];
  if (full === undefined) return head;
  const start = Math.max(0, d.span.column - 1 - EXCERPT_BEFORE);
  const end = Math.min(full.length, d.span.column - 1 + EXCERPT_AFTER);
  const text = (start > 0 ? '…' : '') + full.slice(start, end) + (end < full.length ? '…' : '');
  const column = d.span.column - start + (start > 0 ? 1 : 0);
  const gutter = String(d.span.line);
  const width = d.span.endLine === d.span.line ? Math.max(1, d.span.endColumn - d.span.column) : 1;
  const caret = ' '.repeat(Math.max(0, column - 1)) + '^'.repeat(Math.min(width, Math.max(1, text.length - column + 1)));
  return `${head}\n ${gutter} | ${text}\n ${' '.repeat(gutter.length)} | ${caret}`;
}

export function splitLines(source: string): string[] {
  return source.split(/\r?\n/);
}
