/**
 * The single error type of the git layer. Callers (the CLI, the check command) catch it to turn a
 * failed git call into a readable message; `stderr` keeps git's own words for `--verbose` output
 * and bug reports, while `message` is written to be shown to a user as is.
 */
export class GitError extends Error {
  override readonly name = 'GitError';
  constructor(
    message: string,
    readonly stderr: string,
  ) {
    super(message);
  }
}
