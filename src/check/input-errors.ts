/**
 * A file that cannot be read as a document becomes one input error naming it: the refusal's own
 * words, under a code that says whose file it was (`config/symlink`, `policy/too-large`) or, for
 * problems of the git store itself, `git/...`.
 */
import type { Diagnostic } from '../diagnostic.js';
import type { Refusal } from '../files/file-read.js';

export function refusalDiagnostic(refusal: Refusal, file: string, owner: 'config' | 'policy'): Diagnostic {
  const code =
    refusal.code === 'missing-object' || refusal.code === 'conflict'
      ? `git/${refusal.code}`
      : refusal.code === 'symlink' || refusal.code === 'too-large'
        ? `${owner}/${refusal.code}`
        : `${owner}/unreadable`;
  return { code, message: refusal.message, file, severity: 'error' };
}
