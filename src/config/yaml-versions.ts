/**
 * Plain scalars that YAML 1.1 and YAML 1.2 read differently. rankfloor reads YAML 1.2 (core
 * schema); training code often loads the same file with a YAML 1.1 loader, so `channels: 017`
 * would be 17 here and 15 in training, and `weight_sharing: no` a string here and false there.
 * Such a value is an error in any file rankfloor reads, with both readings in the message.
 *
 * The YAML 1.1 readings follow the 1.1 type repository (yaml.org/type: bool, int, float, null),
 * with the float form that requires a digit before an exponent sign, as 1.1 loaders implement it.
 */
import type { Scalar } from 'yaml';

export type Reading = string | number | boolean | null;

const BOOL_TRUE = /^(?:y|Y|yes|Yes|YES|true|True|TRUE|on|On|ON)$/;
const BOOL_FALSE = /^(?:n|N|no|No|NO|false|False|FALSE|off|Off|OFF)$/;
const NULL = /^(?:~|null|Null|NULL|)$/;
const INT_BINARY = /^([-+]?)0b([01_]+)$/;
const INT_OCTAL = /^([-+]?)0([0-7_]+)$/;
const INT_DECIMAL = /^[-+]?(?:0|[1-9][0-9_]*)$/;
const INT_HEX = /^([-+]?)0x([0-9a-fA-F_]+)$/;
const SEXAGESIMAL = /^([-+]?)([0-9][0-9_]*(?::[0-5]?[0-9])+)(\.[0-9_]*)?$/;
const FLOAT = /^[-+]?(?:[0-9][0-9_]*\.[0-9_]*|\.[0-9][0-9_]*)(?:[eE][-+][0-9]+)?$/;
const INF = /^([-+]?)\.(?:inf|Inf|INF)$/;
const NAN = /^\.(?:nan|NaN|NAN)$/;

/** How a YAML 1.1 loader reads a plain scalar written as `source`. */
export function yaml11Reading(source: string): Reading {
  if (BOOL_TRUE.test(source)) return true;
  if (BOOL_FALSE.test(source)) return false;
  if (NULL.test(source)) return null;
  let m = INT_BINARY.exec(source);
  if (m) return sign(m[1]!) * parseInt(m[2]!.replace(/_/g, ''), 2);
  m = INT_HEX.exec(source);
  if (m) return sign(m[1]!) * parseInt(m[2]!.replace(/_/g, ''), 16);
  m = INT_OCTAL.exec(source);
  if (m) return sign(m[1]!) * parseInt(m[2]!.replace(/_/g, ''), 8);
  if (INT_DECIMAL.test(source)) return Number(source.replace(/_/g, ''));
  m = SEXAGESIMAL.exec(source);
  if (m && (m[3] !== undefined || /^[1-9]/.test(m[2]!))) {
    let value = 0;
    for (const part of m[2]!.replace(/_/g, '').split(':')) value = value * 60 + Number(part);
    if (m[3] !== undefined) value += Number(`0${m[3].replace(/_/g, '')}`);
    return sign(m[1]!) * value;
  }
  if (FLOAT.test(source)) return Number(source.replace(/_/g, ''));
  m = INF.exec(source);
  if (m) return sign(m[1]!) * Infinity;
  if (NAN.test(source)) return NaN;
  return source;
}

function sign(s: string): number {
  return s === '-' ? -1 : 1;
}

/**
 * The message for a plain scalar that the two versions read differently, or undefined when they
 * agree. Quoted scalars are strings in both; a scalar with an explicit tag is read by its tag, not
 * by the implicit rules compared here, and is left to the schema.
 */
export function yamlVersionProblem(node: Scalar, read12: Reading): string | undefined {
  if (node.type !== 'PLAIN' || typeof node.source !== 'string') return undefined;
  if (node.tag !== undefined) return undefined;
  const read11 = yaml11Reading(node.source);
  if (same(read11, read12)) return undefined;
  const written = node.source.length > 40 ? `${node.source.slice(0, 40)}…` : node.source;
  return (
    `'${written}' reads differently in YAML 1.2 (rankfloor: ${describe(read12)}) and YAML 1.1 ` +
    `(loaders common in training code: ${describe(read11)}); write it so both agree: ${advice(read11, read12)}`
  );
}

function same(a: Reading, b: Reading): boolean {
  if (typeof a === 'number' && typeof b === 'number') return Object.is(a, b) || a === b || (Number.isNaN(a) && Number.isNaN(b));
  return a === b;
}

function describe(v: Reading): string {
  if (v === null) return 'null';
  if (typeof v === 'boolean') return `the boolean ${v}`;
  if (typeof v === 'number') return Number.isInteger(v) ? `the integer ${v}` : `the number ${v}`;
  return `the string ${JSON.stringify(v)}`;
}

function advice(read11: Reading, read12: Reading): string {
  if (typeof read11 === 'boolean') return `true or false for a boolean, or quotes for the text ("${String(read12)}")`;
  const numbers = [read11, read12].filter((v): v is number => typeof v === 'number' && Number.isFinite(v));
  if (numbers.length > 0) return `the number you mean in plain decimal (${[...new Set(numbers)].join(' or ')}), or quotes for the text`;
  return 'quotes for the text, or a plain decimal number';
}
