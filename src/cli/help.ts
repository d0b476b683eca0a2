/**
 * The help texts: one overview and one page per command listing every option on one line. The
 * option tables are also what the commands hand to the argument parser (`parseOptions`), so an
 * option cannot exist without its line of help.
 */
import type { ParseArgsConfig } from 'node:util';

export interface OptionHelp {
  readonly name: string;
  readonly type: 'string' | 'boolean';
  readonly short?: string;
  readonly multiple?: boolean;
  /** What follows the option in the synopsis, e.g. `FILE|DIR`. */
  readonly value?: string;
  readonly help: string;
}

export interface CommandHelp {
  readonly name: string;
  readonly synopsis: string;
  readonly summary: string;
  readonly options: readonly OptionHelp[];
  readonly notes: readonly string[];
}

const HELP_OPTION: OptionHelp = { name: 'help', short: 'h', type: 'boolean', help: 'print this help and exit' };

export const BOUNDS_HELP: CommandHelp = {
  name: 'bounds',
  synopsis: 'rankfloor bounds CONFIG [options]',
  summary: 'Bounds on the separation rank of one config, per partition of its inputs.',
  options: [
    { name: 'partition', short: 'p', type: 'string', multiple: true, value: 'P', help: 'a partition to bound (repeatable); default: every built-in one that fits the input' },
    { name: 'model-path', type: 'string', value: 'PTR', help: 'JSON Pointer of the architecture inside the file (default /model)' },
    { name: 'surrogate', type: 'string', value: 'tree|overlap', help: 'the arithmetic surrogate to analyse (default tree)' },
    { name: 'format', type: 'string', value: 'text|json', help: 'output format (default text)' },
    { name: 'picture', type: 'string', value: 'FILE', help: 'also write the picture report: one self-contained HTML file (network, cut, partition, bars)' },
    HELP_OPTION,
  ],
  notes: [
    'partitions: start-end, interleaved (1D); left-right, top-bottom, checkerboard (2D);',
    '            positions:0,2,5; block:r0-r1,c0-c1 (2D) or block:a-b (1D), half-open ranges',
  ],
};

export const CHECK_HELP: CommandHelp = {
  name: 'check',
  synopsis: 'rankfloor check --policy FILE|DIR [CONFIG...] [options]',
  summary: 'Checks configs against capacity policies; with no CONFIG, every config the policies apply to.',
  options: [
    { name: 'policy', type: 'string', value: 'FILE|DIR', help: 'a policy file, or a directory of them (required)' },
    { name: 'model-path', type: 'string', value: 'PTR', help: "JSON Pointer of the architecture in every config (overrides the policies' model_path)" },
    { name: 'format', type: 'string', value: 'text|json', help: 'output format (default text)' },
    { name: 'quiet', type: 'boolean', help: 'print failing requirements only' },
    { name: 'root', type: 'string', value: 'DIR', help: 'repository root for applies_to globs (default: the git work tree)' },
    { name: 'base', type: 'string', value: 'REV', help: 'compare with this git revision; a drop beyond max_drop_bits fails' },
    { name: 'changed', type: 'boolean', help: 'with --base: only configs that changed, and those of changed policies' },
    { name: 'staged', type: 'boolean', help: 'check the staged version of each staged config against HEAD (for a pre-commit hook)' },
    { name: 'policy-from', type: 'string', value: 'base|head', help: 'with --base: read policies from the base revision (default) or the working tree' },
    { name: 'sarif', type: 'string', value: 'FILE', help: 'also write a SARIF 2.1.0 log' },
    { name: 'sarif-category', type: 'string', value: 'NAME', help: 'with --sarif: the run category (matrix jobs uploading several logs)' },
    { name: 'junit', type: 'string', value: 'FILE', help: 'also write a JUnit XML report' },
    { name: 'picture', type: 'string', value: 'FILE', help: 'also write the picture report: one self-contained HTML file (network, cut, partition, bars)' },
    HELP_OPTION,
  ],
  notes: [],
};

export const MEASURE_HELP: CommandHelp = {
  name: 'measure',
  synopsis: 'rankfloor measure DATA [options]',
  summary: "The dependency a data sample carries across each partition (its data tensor's entanglement), and minimums for a policy.",
  options: [
    { name: 'shape', type: 'string', value: 'H,W', help: 'the grid of one sample (CSV rows, JSON Lines; read from .npy and images)' },
    { name: 'range', type: 'string', value: 'LO,HI', help: 'the value range scaled into the feature map (default: the sample minimum and maximum)' },
    { name: 'labels', type: 'string', value: 'FILE', help: 'labels, one per sample, for the label-weighted tensor' },
    { name: 'label-column', type: 'string', value: 'C', help: 'the CSV column that holds the labels' },
    { name: 'unlabelled', type: 'boolean', help: 'ignore a label column' },
    { name: 'length', type: 'string', value: 'N', help: 'token sequences: pad or cut every sequence to N tokens' },
    { name: 'partition', short: 'p', type: 'string', multiple: true, value: 'P', help: "a partition to measure (repeatable); default: the built-in ones that fit, then the policy's" },
    { name: 'policy', type: 'string', value: 'FILE', help: 'a policy whose named partitions are measured, and which --write creates or updates' },
    { name: 'write', type: 'boolean', help: 'write the recommended minimums into --policy' },
    { name: 'root', type: 'string', value: 'DIR', help: 'repository root (default: the git work tree)' },
    { name: 'batch', type: 'string', value: 'N', help: 'samples per batch (default 256); the spread is taken over batches' },
    { name: 'samples', type: 'string', value: 'N', help: 'read at most N samples' },
    { name: 'epsilon', type: 'string', value: 'E', help: 'the ε of the ε-rank (default 0.05)' },
    { name: 'format', type: 'string', value: 'text|json', help: 'output format (default text)' },
    HELP_OPTION,
  ],
  notes: ['data: a .csv, .npy or .jsonl file, or a folder of PNG images'],
};

export const RATCHET_HELP: CommandHelp = {
  name: 'ratchet',
  synopsis: 'rankfloor ratchet CONFIG [options]',
  summary: "Minimums from a blessed config's proven capacities less a margin, so no later change loses them.",
  options: [
    { name: 'margin', type: 'string', value: 'BITS', help: 'bits below each proven lower bound (default 0)' },
    { name: 'partition', short: 'p', type: 'string', multiple: true, value: 'P', help: 'a partition to ratchet (repeatable); default: every built-in one that fits' },
    { name: 'policy', type: 'string', value: 'FILE', help: 'the policy to print, or with --write to create or update' },
    { name: 'write', type: 'boolean', help: 'write the minimums into --policy' },
    { name: 'root', type: 'string', value: 'DIR', help: 'repository root (default: the git work tree)' },
    { name: 'model-path', type: 'string', value: 'PTR', help: 'JSON Pointer of the architecture inside the file (default /model)' },
    { name: 'surrogate', type: 'string', value: 'tree|overlap', help: "the surrogate (default: the policy's, else tree)" },
    { name: 'format', type: 'string', value: 'text|json', help: 'output format (default text)' },
    HELP_OPTION,
  ],
  notes: [],
};

export const COMMANDS: readonly CommandHelp[] = [BOUNDS_HELP, CHECK_HELP, MEASURE_HELP, RATCHET_HELP];

const EXIT_CODES = 'exit codes: 0 nothing fails, 1 a requirement fails, 2 usage or input error (also when output cannot be written)';

export function overview(version: string): string {
  const lines = [`rankfloor ${version}: sound bounds on the separation rank of architecture configs, and policies over them`, '', 'usage:'];
  for (const c of COMMANDS) lines.push(`  ${c.synopsis}`, `      ${c.summary}`);
  lines.push('  rankfloor help COMMAND', '      Every option of a command, one line each (or: rankfloor COMMAND --help).');
  lines.push('  rankfloor --version', '      The version.');
  lines.push('', EXIT_CODES, '');
  return lines.join('\n');
}

export function commandHelp(c: CommandHelp): string {
  const lines = [`usage: ${c.synopsis}`, '', c.summary, '', 'options:'];
  const left = (o: OptionHelp) => `${o.short ? `-${o.short}, ` : '    '}--${o.name}${o.value ? ` ${o.value}` : ''}`;
  const width = Math.max(...c.options.map((o) => left(o).length));
  for (const o of c.options) lines.push(`  ${left(o).padEnd(width)}  ${o.help}`);
  if (c.notes.length > 0) lines.push('', ...c.notes);
  lines.push('', EXIT_CODES, '');
  return lines.join('\n');
}

/** The command's options in the form `parseArgs` takes. */
export function parseOptions(c: CommandHelp): NonNullable<ParseArgsConfig['options']> {
  const out: NonNullable<ParseArgsConfig['options']> = {};
  for (const o of c.options) out[o.name] = { type: o.type, ...(o.short ? { short: o.short } : {}), ...(o.multiple ? { multiple: true } : {}) };
  return out;
}
