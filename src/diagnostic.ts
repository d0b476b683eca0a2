/**
 * Problems found in a user's file are values, not exceptions: a code, a message that says what
 * is wrong and how to fix it, and the source position it points at. Every stage (config, network,
 * policy) reports through this one type so that the CLI can print them alike and exit 2.
 */

/** A position in a source file. Lines and columns are 1-based; offsets are 0-based. */
export interface Span {
  readonly offset: number;
  readonly endOffset: number;
  readonly line: number;
  readonly column: number;
  readonly endLine: number;
  readonly endColumn: number;
}

export interface Diagnostic {
  /** Stable identifier such as `config/unknown-field`; tests check codes, not message text. */
  readonly code: string;
  readonly message: string;
  readonly file: string;
  /** Absent only when the problem has no position (for example an unreadable file). */
  readonly span?: Span;
  readonly severity: 'error' | 'warning';
}

/** Thrown only at the boundary (CLI, library entry) to carry diagnostics to the exit code 2 path. */
export class InputError extends Error {
  override readonly name = 'InputError';
  constructor(readonly diagnostics: readonly Diagnostic[]) {
    super(diagnostics.map(formatDiagnosticLine).join('\n'));
  }
}

/** `file:line:col: message` — the one-line form used on stderr and in tests. */
export function formatDiagnosticLine(d: Diagnostic): string {
  const where = d.span ? `${d.file}:${d.span.line}:${d.span.column}` : d.file;
  return `${where}: ${d.severity}: ${d.message} [${d.code}]`;
}

export const NO_SPAN: Span = { offset: 0, endOffset: 0, line: 1, column: 1, endLine: 1, endColumn: 1 };

/**
 * The same problem reached twice (a shared parent policy, a config governed by two policies) is
 * reported once; the first occurrence keeps its place.
 */
export function dedupeDiagnostics(diagnostics: readonly Diagnostic[]): Diagnostic[] {
  const seen = new Set<string>();
  return diagnostics.filter((d) => {
    const key = `${d.file}\u0000${d.span?.offset ?? -1}\u0000${d.code}\u0000${d.message}`;
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
}
