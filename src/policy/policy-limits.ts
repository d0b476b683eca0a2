/**
 * The resource limits of the policy loader. A policy file is untrusted input in the same way as a
 * config (a pull request may change it), so every way it can make the loader allocate or loop
 * without bound has a cap here; hitting a cap is a diagnostic. File size and YAML alias caps are
 * the config loader's own (`config/limits.ts`), shared on purpose.
 */

/** A minimum above 2^MAX_MINIMUM_BITS is refused (such a number alone would take 125 kB). */
export const MAX_MINIMUM_BITS = 1_000_000;

/**
 * A decimal with more digits than this is at least 10^MAX_MINIMUM_DIGITS > 2^MAX_MINIMUM_BITS, so
 * it is refused before it is converted (converting millions of digits is itself slow).
 */
export const MAX_MINIMUM_DIGITS = Math.ceil(MAX_MINIMUM_BITS * Math.log10(2));

/** Decimal places allowed in a min_bits that is not a whole number. */
export const MAX_MIN_BITS_DECIMALS = 6;

/**
 * The largest min_bits that is not a whole number. Its exact rank needs arithmetic on numbers of
 * about that many bits, a fraction of a second here; whole numbers of bits are free up to
 * MAX_MINIMUM_BITS.
 */
export const MAX_FRACTIONAL_MIN_BITS = 65_536;

/** Longest `extends` chain; no organisation layers policies that deep, and a cap bounds the work. */
export const MAX_EXTENDS_DEPTH = 32;

/** Longest `applies_to` pattern; real globs are short, and the glob compiler refuses 64 KiB. */
export const MAX_PATTERN_LENGTH = 1024;
