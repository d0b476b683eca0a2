/**
 * The whole `rankfloor measure` job as data: open the sample, list the partitions (built-in and
 * the policy's), measure, apply the recommendation rule, and (when asked) write the minimums into
 * the policy. Bad input comes back as diagnostics, with nothing written.
 */
import type { Shape } from '../config/model.js';
import type { Diagnostic } from '../diagnostic.js';
import { findRepoRoot } from '../check/repo-files.js';
import type { DataSource, LabelColumn } from './data-source.js';
import type { ValueRange } from './feature-batch.js';
import { measureSource, type Measurement, type MeasureOptions } from './measure.js';
import { openData } from './open-data.js';
import { partitionList } from './partition-list.js';
import { idFromFile, openPolicyTarget, writePolicy, type PolicyWrite } from './policy-target.js';
import type { Minimum } from './policy-update.js';
import { recommend, SPREADS, type Recommendation } from './recommend.js';
import { resolve } from 'node:path';

export interface MeasureRequest extends MeasureOptions {
  readonly data: string;
  readonly shape?: Shape;
  readonly range?: ValueRange;
  readonly labelsFile?: string;
  readonly labelColumn?: string;
  /** Measure without label weights; a label column is then only skipped. */
  readonly unlabelled?: boolean;
  readonly length?: number;
  readonly partitions?: readonly string[];
  readonly policy?: string;
  readonly write: boolean;
  readonly cwd: string;
  readonly root?: string;
}

export interface DataSummary {
  readonly file: string;
  readonly format: DataSource['format'];
  readonly count: number;
  readonly shape: Shape;
  readonly kind: DataSource['kind'];
  readonly channels: number;
  readonly range?: ValueRange;
  readonly vocabulary?: number;
  /** UTC date of the newest data file, YYYY-MM-DD. */
  readonly modified: string;
  readonly classes?: number;
}

export interface MeasureOutcome {
  readonly data: DataSummary;
  readonly measurement: Measurement;
  readonly recommendations: readonly Recommendation[];
  readonly policy?: PolicyWrite;
}

export type MeasureJobResult = { ok: true; outcome: MeasureOutcome } | { ok: false; diagnostics: Diagnostic[] } | { ok: false; usage: string };

export function runMeasure(req: MeasureRequest): MeasureJobResult {
  if (req.write && req.policy === undefined) return { ok: false, usage: '--write needs --policy FILE (the policy to create or update)' };
  const root = req.root ? resolve(req.cwd, req.root) : findRepoRoot(req.cwd);
  const target = req.policy === undefined ? undefined : openPolicyTarget(req.policy, root, req.write);
  if (target && !target.ok) return target;
  const opened = openData(req.data, {
    ...(req.shape ? { shape: req.shape } : {}),
    ...(req.range ? { range: req.range } : {}),
    ...(req.labelsFile !== undefined ? { labelsFile: req.labelsFile } : {}),
    ...(req.labelColumn !== undefined ? { labelColumn: req.labelColumn } : {}),
    ...(req.length !== undefined ? { length: req.length } : {}),
  });
  if (!opened.ok) return opened;
  const source = opened.source;
  try {
    const list = partitionList(source.shape, req.partitions, target?.target.policy, 'the data');
    if (!list.ok) return list;
    const partitions = list.partitions.map((p) => p.partition);
    const labels = req.unlabelled ? undefined : opened.labels;
    const measured = measureSource(source, partitions, labels, req);
    if (!measured.ok) return measured;
    const measurement = measured.measurement;
    const recommendations = measurement.partitions.map(recommend);
    const data = summary(source, labels);
    let policy: PolicyWrite | undefined;
    if (req.write && target?.ok) {
      const minimums: Minimum[] = [];
      measurement.partitions.forEach((m, i) => {
        const r = recommendations[i]!;
        if (r.minRank !== null) minimums.push({ partition: m.partition, minRank: r.minRank, evidence: evidence(data, measurement, i) });
      });
      policy = writePolicy(
        target.target,
        {
          id: idFromFile(target.target.file),
          description: `Minimums measured from ${data.file}.`,
          header: [
            `Minimums from evidence, written by 'rankfloor measure' from ${data.file}.`,
            'Review every minimum before committing it: a measured dependency is a property of the sample, and a minimum is a necessary condition only.',
            'Add applies_to (the configs this policy governs), or extend an organisation policy.',
          ],
        },
        minimums,
        root,
      );
    }
    return { ok: true, outcome: { data, measurement, recommendations, ...(policy ? { policy } : {}) } };
  } finally {
    source.close();
  }
}

function summary(source: DataSource, labels: LabelColumn | undefined): DataSummary {
  return {
    file: source.file,
    format: source.format,
    count: source.count,
    shape: source.shape,
    kind: source.kind,
    channels: source.channels,
    ...(source.range ? { range: source.range } : {}),
    ...(source.vocabulary !== undefined ? { vocabulary: source.vocabulary } : {}),
    modified: source.modified.toISOString().slice(0, 10),
    ...(labels ? { classes: labels.classes.length } : {}),
  };
}

/** The comment written above a measured minimum. */
function evidence(data: DataSummary, m: Measurement, i: number): string[] {
  const p = m.partitions[i]!;
  const [lo, hi] = m.batchSizes;
  const sizes = lo === hi ? `${lo}` : `${lo}-${hi}`;
  const weighting = m.weighting === 'none' ? '' : m.weighting === 'two-class' ? ', label-weighted (two classes, ±1)' : `, label-weighted (${m.classes} classes, each against the rest; the largest)`;
  return [
    `Measured ${p.bits.toFixed(2)} ± ${p.spread!.toFixed(2)} bits (mean ± bootstrap standard error over ${m.batches} batches of ${sizes}) on ${m.samples} samples of ${data.file} (dated ${data.modified}):`,
    `entanglement entropy of the empirical data tensor${weighting}, ${featureMapText(data)};`,
    `minimum = ⌈2^(bits + ${SPREADS} × spread)⌉. Written by 'rankfloor measure'; review before committing.`,
  ];
}

export function featureMapText(data: DataSummary): string {
  if (data.kind === 'tokens') return `indicator features (vocabulary ${data.vocabulary})`;
  return data.channels === 1 ? 'cos/sin feature map (M = 2)' : `cos/sin feature map per channel (M = 2^${data.channels})`;
}
