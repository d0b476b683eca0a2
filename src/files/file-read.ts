/**
 * What reading one file of the repository can give, whichever side it comes from (the working
 * tree, a commit, the index): its text, the fact that it is not there, or a refusal that says why
 * the file cannot be read as a document — a symbolic link (never followed), a directory, a
 * submodule, an oversized file, an unresolved conflict, an object missing from the store.
 * Refusals become input errors naming the file; "absent" is a normal answer.
 */
export type FileRead = { readonly kind: 'file'; readonly text: string } | { readonly kind: 'absent' } | Refusal;

export interface Refusal {
  readonly kind: 'refused';
  readonly code: RefusalCode;
  readonly message: string;
}

export type RefusalCode = 'symlink' | 'directory' | 'special' | 'submodule' | 'too-large' | 'conflict' | 'missing-object' | 'unreadable';

export function refused(code: RefusalCode, message: string): Refusal {
  return { kind: 'refused', code, message };
}
