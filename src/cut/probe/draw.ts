/**
 * The probe's numbers: every weight and every probe input is a pure function of the seed, a name
 * and an index, so that a certificate can be re-checked by anyone who recomputes the few numbers
 * it needs, in any order, without replaying a random stream. DEVELOPERS.md ("Certified probe")
 * gives the names; the function is
 *
 *   value(seed, name, i) = mix(mix(seed XOR fnv(name)) + (i + 1)·0x9E3779B9 mod 2^32) mod p
 *
 * with fnv the 32-bit FNV-1a hash of the name's UTF-16 code units (all names are ASCII) and mix
 * the 32-bit finaliser x ← (x XOR x>>16)·0x85EBCA6B, x ← (x XOR x>>13)·0xC2B2AE35, x ← x XOR x>>16
 * (products mod 2^32). Soundness never rests on these numbers being random: any integers whose
 * minor is non-zero prove the rank; randomness only makes a non-zero minor likely.
 */
import { PROBE_PRIME } from './modular.js';

export function fnv1a(name: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < name.length; i++) h = Math.imul(h ^ name.charCodeAt(i), 0x01000193) >>> 0;
  return h;
}

function mix(x: number): number {
  x = Math.imul(x ^ (x >>> 16), 0x85ebca6b) >>> 0;
  x = Math.imul(x ^ (x >>> 13), 0xc2b2ae35) >>> 0;
  return (x ^ (x >>> 16)) >>> 0;
}

/** The `length` numbers named `name` under `seed`, as residues mod p. */
export function drawValues(seed: number, name: string, length: number): Float64Array {
  const base = mix((seed ^ fnv1a(name)) >>> 0);
  const out = new Float64Array(length);
  for (let i = 0; i < length; i++) out[i] = valueAt(base, i);
  return out;
}

/** Number i named `name` under `seed`: drawValues(seed, name, i + 1)[i]. */
export function drawValue(seed: number, name: string, i: number): number {
  return valueAt(mix((seed ^ fnv1a(name)) >>> 0), i);
}

function valueAt(base: number, i: number): number {
  return mix((base + Math.imul(i + 1, 0x9e3779b9)) >>> 0) % PROBE_PRIME;
}
