/**
 * Diagnostics for people: `file:line:col: error: message`, then the offending source line with a
 * caret under the column, the way a careful parser reports. Pure: the caller passes the source.
 */
import type { Diagnostic } from '../diagnostic.js';
import { formatDiagnosticLine } from '../diagnostic.js';

export function renderDiagnostic(d: Diagnostic, source?: string): string {
  const head = formatDiagnosticLine(d);
  if (!d.span || source === undefined) return head;
  const lines = source.split(/\r?\n/);
  const text = lines[d.span.line - 1];
  if (text === undefined) return head;
  const gutter = String(d.span.line);
  const width = d.span.endLine === d.span.line ? Math.max(1, d.span.endColumn - d.span.column) : 1;
  const caret = ' '.repeat(Math.max(0, d.span.column - 1)) + '^'.repeat(Math.min(width, Math.max(1, text.length - d.span.column + 1)));
  return `${head}\n ${gutter} | ${text}\n ${' '.repeat(gutter.length)} | ${caret}`;
}
