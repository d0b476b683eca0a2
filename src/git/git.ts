/**
 * Reading configs and policies out of git: the base branch of a pull request, the index before a
 * commit, and the list of files that changed. Everything runs git without a shell and validates
 * revisions and paths first, because both can come from untrusted pull requests.
 */
export { GitError } from './git-error.js';
export { openRepo, resolveCommit, isShallow, mergeBase, type Repo } from './repo.js';
export { ensureCommit, type EnsureResult } from './ensure-commit.js';
export { readAtRevision, readStaged } from './read-file.js';
export { changedFiles, changesSince, stagedChanges, stagedFiles, type Changes, type ChangedFile, type ChangedAgainst } from './changed-files.js';
export { RevisionFiles, type TreeEntry } from './revision-files.js';
export { MAX_FILE_BYTES } from './run-git.js';
