/**
 * The SARIF 2.1.0 form of `rankfloor check`, for code-scanning views that show a finding on the
 * line it points at and track it across pushes. It renders the same findings as every other
 * output; nothing is computed here. The log is a pure function of the findings and the tool
 * version: no timestamps, no generated ids, no absolute paths, so two runs on the same tree give
 * byte-identical files and a diff of two logs shows only what changed. Every result has a
 * location (the file alone when no line is known), since a code-scanning upload rejects a log
 * with a result that has none; a matrix job names its run's category, so that the analyses of
 * its jobs do not replace one another.
 */
import type { Finding, FindingRule } from './finding.js';

export const SARIF_SCHEMA_URI = 'https://docs.oasis-open.org/sarif/sarif/v2.1.0/os/schemas/sarif-schema-2.1.0.json';

/** The key under which a result carries `Finding.fingerprint`; bump the suffix if its recipe changes. */
export const FINGERPRINT_KEY = 'rankfloorFinding/v1';

/** Paths are relative to the repository root; a consumer maps this symbol to its checkout. */
export const SRCROOT = '%SRCROOT%';

type SarifLevel = 'error' | 'warning' | 'note';

interface RuleText {
  readonly rule: FindingRule;
  readonly name: string;
  readonly short: string;
  readonly full: string;
  readonly help: string;
  readonly level: SarifLevel;
}

// Every rule is listed in every log, in this order, so that a rule's index never depends on which
// findings a run happened to have and consumers see the full rule set even on a clean run.
const RULES: readonly RuleText[] = [
  {
    rule: 'requirement-failed',
    name: 'RequirementFailed',
    short: 'A capacity requirement of a policy is not met.',
    full:
      'The separation rank that the architecture can reach across the partition is provably below the minimum the ' +
      'policy requires, or it is not proven to reach it and the policy counts unproven requirements as failing.',
    help:
      'Widen a layer on the bottleneck cut named in the message (the smallest single-field fixes are listed there), ' +
      'or change the policy minimum if the requirement is no longer wanted.',
    level: 'error',
  },
  {
    rule: 'requirement-unproven',
    name: 'RequirementUnproven',
    short: 'A capacity requirement is neither proven nor refuted.',
    full:
      'The upper bound on the separation rank reaches the minimum but no lower bound does, so the requirement may or ' +
      'may not hold. The policy counts this as a warning.',
    help:
      'Nothing is known to be wrong. To turn the warning into a pass, add width on the bottleneck cut until the lower ' +
      'bound reaches the minimum, or set the policy to treat unproven requirements as failures if certainty matters.',
    level: 'warning',
  },
  {
    rule: 'capacity-drop',
    name: 'CapacityDrop',
    short: 'Capacity dropped against the base revision by more than the policy allows.',
    full:
      "Compared with the base revision, the head's upper bound on the separation rank for this partition is below the " +
      "base's proven lower bound by more bits than the policy's max_drop_bits permits: the capacity certainly fell.",
    help: 'Restore the width that was removed on the bottleneck cut, or raise max_drop_bits in the policy if the drop is intended.',
    level: 'error',
  },
  {
    rule: 'policy-changed',
    name: 'PolicyChanged',
    short: 'This change edits a policy; the base revision of the policy was used.',
    full:
      'The head revision edits a policy file. The check applied the policy as it is on the base revision, so a ' +
      'change is not judged by rules it brings itself; the edited policy applies once it is merged.',
    help: 'No action is needed for this change; have the policy edit reviewed on its own.',
    level: 'note',
  },
  {
    rule: 'input-error',
    name: 'InputError',
    short: 'A config or policy file could not be read.',
    full: 'The file is not valid YAML, does not match its schema, or refers to something that does not exist; nothing in it was checked.',
    help: 'Fix the file at the position given in the message; the message says what is wrong and, where it can, what was meant.',
    level: 'error',
  },
  {
    rule: 'config-removed',
    name: 'ConfigRemoved',
    short: 'A config a policy governed at the base revision is no longer checked by it.',
    full:
      'The change deletes the config, or renames it to a path the policy does not check (outside its applies_to, another ' +
      "extension, a symbolic link). The policy's removal setting makes this a warning (default) or a failure.",
    help: 'If the config is meant to stay governed, keep it where the policy looks; otherwise have the removal reviewed on its own.',
    level: 'warning',
  },
  // Rules are only appended, so that the ones before keep their index.
  {
    rule: 'definition-changed',
    name: 'DefinitionChanged',
    short: 'This change edits an architecture definition that checked configs name.',
    full:
      'The head revision edits an architecture definition. The configs that name it were built with the edited ' +
      "version on the head side and with the base revision's on the base side, so what the edit does to their " +
      "capacity is in their results; the ranges of its parameters were judged with the base revision's version.",
    help: 'No action is needed for this notice; a requirement the edit breaks is reported at the changed line of the definition.',
    level: 'note',
  },
  {
    rule: 'capacity-may-have-dropped',
    name: 'CapacityMayHaveDropped',
    short: 'Only the upper bound dropped against the base revision by more than the policy allows.',
    full:
      'Compared with the base revision, the upper bound on the separation rank for this partition fell by more bits than ' +
      "the policy's max_drop_bits permits, but no lower bound of the base proves that the capacity itself fell: it may " +
      "have dropped, or only a loose ceiling moved. The requirement's unproven setting makes this a warning or an error.",
    help:
      'Check the change on the bottleneck cut named in the message; a fix is listed only when it proves that the capacity ' +
      'held. Raise max_drop_bits, or count unproven drops as warnings, if the ceiling alone is not a concern.',
    level: 'warning',
  },
];

const RULE_INDEX: ReadonlyMap<FindingRule, number> = new Map(RULES.map((r, i) => [r.rule, i]));

export function ruleId(rule: FindingRule): string {
  return `rankfloor/${rule}`;
}

export interface SarifLog {
  readonly $schema: string;
  readonly version: '2.1.0';
  readonly runs: readonly object[];
}

export interface SarifOptions {
  readonly version: string;
  /**
   * The run's category, for several analyses of one commit (a matrix job): written as
   * `automationDetails.id` = `<category>/`. In SARIF 2.1.0 that id is a hierarchical string whose
   * last component names the run instance and whose leading components name its category; a
   * trailing '/' leaves the instance empty, so the id states the category alone.
   */
  readonly category?: string;
}

/** Why a string cannot be a run category, or undefined when it can. */
export function sarifCategoryProblem(category: string): string | undefined {
  if (category.trim() === '') return 'the category is empty';
  if (/[\u0000-\u001f\u007f]/.test(category)) return 'the category contains control characters';
  if (category.length > 200) return 'the category is longer than 200 characters';
  return undefined;
}

export function sarifLog(findings: readonly Finding[], tool: SarifOptions): SarifLog {
  const rules = RULES.map((r) => ({
    id: ruleId(r.rule),
    name: r.name,
    shortDescription: { text: r.short },
    fullDescription: { text: r.full },
    help: { text: r.help },
    defaultConfiguration: { level: r.level },
  }));
  const results = [...findings].sort(compareFindings).map(result);
  return {
    $schema: SARIF_SCHEMA_URI,
    version: '2.1.0',
    runs: [
      {
        tool: { driver: { name: 'rankfloor', version: tool.version, rules } },
        ...(tool.category ? { automationDetails: { id: `${tool.category.replace(/\/+$/, '')}/` } } : {}),
        // Columns come from offsets into JavaScript strings, which count UTF-16 code units.
        columnKind: 'utf16CodeUnits',
        results,
      },
    ],
  };
}

export function sarifText(findings: readonly Finding[], tool: SarifOptions): string {
  return JSON.stringify(sarifLog(findings, tool), null, 2) + '\n';
}

function result(f: Finding): object {
  const index = RULE_INDEX.get(f.rule);
  if (index === undefined) throw new Error(`no SARIF rule for finding rule '${String(f.rule)}'`);
  const out: Record<string, unknown> = {
    ruleId: ruleId(f.rule),
    ruleIndex: index,
    level: sarifLevel(f.level),
    message: { text: messageText(f) },
  };
  out['locations'] = [{ physicalLocation: physicalLocation(f) }];
  out['partialFingerprints'] = { [FINGERPRINT_KEY]: f.fingerprint };
  return out;
}

function sarifLevel(level: Finding['level']): SarifLevel {
  return level === 'notice' ? 'note' : level;
}

function messageText(f: Finding): string {
  const title = f.title.trim();
  const body = f.message.trim();
  if (body === '' || body === title) return title;
  if (title === '') return body;
  return `${title}\n\n${body}`;
}

function physicalLocation(f: Finding): object {
  // A finding always names a file; should one not, it is placed at the repository root.
  const uri = relativeUri(f.file) || '.';
  // The schema requires positive lines and columns; a finding without a position still names its file.
  const region: Record<string, number> = {};
  if (f.line !== undefined && Number.isInteger(f.line) && f.line >= 1) {
    region['startLine'] = f.line;
    if (f.column !== undefined && Number.isInteger(f.column) && f.column >= 1) region['startColumn'] = f.column;
  }
  const location: Record<string, unknown> = { artifactLocation: { uri, uriBaseId: SRCROOT } };
  if (Object.keys(region).length > 0) location['region'] = region;
  return location;
}

/**
 * A root-relative path as a relative URI reference: each segment percent-encoded, '/' kept.
 * encodeURIComponent also encodes ':', which matters: an unencoded colon in the first segment
 * would make `a:b.yaml` read as a URI with scheme `a`.
 */
export function relativeUri(file: string): string {
  let path = file.replace(/\\/g, '/');
  while (path.startsWith('./')) path = path.slice(2);
  return path
    .split('/')
    .map((segment) => encodeURIComponent(segment))
    .join('/');
}

// Plain code-unit comparison: localeCompare would make the order depend on the machine's locale.
function cmp(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}

function compareFindings(a: Finding, b: Finding): number {
  return (
    cmp(a.file, b.file) ||
    (a.line ?? 0) - (b.line ?? 0) ||
    (a.column ?? 0) - (b.column ?? 0) ||
    cmp(ruleId(a.rule), ruleId(b.rule)) ||
    cmp(a.fingerprint, b.fingerprint) ||
    cmp(a.title, b.title) ||
    cmp(a.message, b.message)
  );
}
