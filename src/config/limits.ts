/**
 * The resource limits of the config loader in one place. A config file is untrusted input (it
 * may come from a pull request), so every way it can make the loader do unbounded work has a cap
 * here, and the loader reports hitting a cap as a diagnostic.
 */

/** More layers than this after expanding `repeat` blocks is refused. */
export const MAX_EXPANDED_LAYERS = 10000;

/** Alias dereferences allowed while reading the model (defuses "billion laughs" documents). */
export const MAX_ALIAS_EXPANSIONS = 100;

/** Documents larger than this (UTF-8 bytes) are refused before parsing. */
export const MAX_DOCUMENT_BYTES = 4 * 1024 * 1024;

/** Nesting deeper than this inside the model is refused (no real architecture comes close). */
export const MAX_NESTING_DEPTH = 100;
