/** Where the repository is (see files/repo-root.ts, shared with the config loader). */
export { findRepoRoot, toRootRelative } from '../files/repo-root.js';
