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

/**
 * Input positions above this are refused before anything is allocated for them (partition masks,
 * network nodes): every position is a node of the tensor network, so this equals the network
 * builder's node limit (`NODE_LIMIT`, checked equal by a test).
 */
export const MAX_INPUT_POSITIONS = 4_000_000;

/**
 * The largest integer a model may hold (a width, a size, a count): 2^31 − 1. The engine keeps
 * dimensions in 32-bit integer arrays, and no architecture comes near it.
 */
export const MAX_MODEL_INTEGER = 2 ** 31 - 1;

/**
 * Problems listed per file; the rest are summed up in one "and N more" diagnostic. A file with
 * ten thousand bad layers would otherwise print each of them, with its source line.
 */
export const MAX_DIAGNOSTICS_PER_FILE = 50;
