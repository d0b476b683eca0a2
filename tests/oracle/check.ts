/**
 * The comparison harness: runs the product's `computeBounds` on a generated case, measures the
 * oracle rank of every partition, and records violations of lower ≤ oracle ≤ upper (and of
 * `exact` ⇒ equality) together with tightness counts. Kept apart from the oracle modules so that
 * those never see the product's bound code; only this file calls it.
 */
import { computeBounds } from '../../src/cut/bounds.js';
import { formatDiagnosticLine } from '../../src/diagnostic.js';
import type { PartitionBounds } from '../../src/cut/types.js';
import { Rng } from './field.js';
import { compile, probeRankAdaptive, probeRankWith, RefusedModel, WeightStore, type Evaluator } from './surrogate.js';
import { explicitRank } from './contract.js';
import type { ExplicitCase, LayeredCase } from './families.js';
import { describeModel } from './models.js';

export interface FamilyStats {
  readonly family: string;
  models: number;
  cases: number;
  skipped: number;
  upperTight: number;
  lowerPresent: number;
  lowerTight: number;
  /** Lower bounds equal to the oracle when the certified probe is off (the other rules alone). */
  lowerTightRules: number;
  exact: number;
  /** Cases where a claimed lower bound exceeded the first reading and the oracle re-drew. */
  redraws: number;
  /** Cases by oracle rank: 1, 2–3, 4–15, 16–63, ≥ 64. */
  readonly buckets: number[];
  readonly failures: string[];
  /** How often each rule gave the upper / the lower bound, and how often that bound was attained. */
  readonly methods: Map<string, { used: number; tight: number }>;
  /** Failures matched by a documented, reported product bug: id → count and first example. */
  readonly known: Map<string, { count: number; example: string }>;
  ms: number;
  /** The largest log2(upper / oracle) among judged cases, and where. */
  gap: { bits: number; where: string };
}

/**
 * A product bug that has been reported and is awaiting a fix. Its failures are counted and
 * printed, not failed on, so that the property tests keep guarding everything else; each entry
 * has a regression test marked as expected to fail, which turns red once the fix lands.
 */
export interface KnownBug {
  readonly id: string;
  readonly matches: (c: LayeredCase | ExplicitCase, failure: string) => boolean;
}

export function newStats(family: string, knownBugs: readonly KnownBug[] = []): FamilyStats & { knownBugs: readonly KnownBug[] } {
  return {
    family,
    models: 0,
    cases: 0,
    skipped: 0,
    upperTight: 0,
    lowerPresent: 0,
    lowerTight: 0,
    lowerTightRules: 0,
    exact: 0,
    redraws: 0,
    buckets: [0, 0, 0, 0, 0],
    failures: [],
    known: new Map(),
    methods: new Map(),
    ms: 0,
    gap: { bits: 0, where: '' },
    knownBugs,
  };
}

type Stats = ReturnType<typeof newStats>;

function record(stats: Stats, c: LayeredCase | ExplicitCase, failure: string): void {
  const bug = stats.knownBugs.find((b) => b.matches(c, failure));
  if (!bug) {
    stats.failures.push(failure);
    return;
  }
  const entry = stats.known.get(bug.id);
  if (entry) entry.count++;
  else stats.known.set(bug.id, { count: 1, example: failure });
}

/** Oracle readings per case: the first draw, then up to this many fresh draws on disagreement. */
const REDRAWS = 2;

/**
 * Judges one partition's bounds against the oracle. `rules`: the same partition's bounds with the
 * certified probe turned off, judged as well and counted for the "rules only" column.
 */
function judge(
  stats: Stats,
  c: LayeredCase | ExplicitCase,
  where: string,
  pb: PartitionBounds,
  read: (attempt: number) => number,
  rules: PartitionBounds = pb,
): void {
  const upper = pb.upper.rank;
  const lower = pb.lower ? pb.lower.rank : null;
  const rulesLower = rules.lower ? rules.lower.rank : null;
  const claimed = lower !== null && rulesLower !== null && rulesLower > lower ? rulesLower : (lower ?? rulesLower);
  let r = read(0);
  for (let attempt = 1; attempt <= REDRAWS && claimed !== null && claimed > BigInt(r); attempt++) {
    stats.redraws++;
    r = Math.max(r, read(attempt));
  }
  const oracle = BigInt(r);
  stats.cases++;
  const bucket = r <= 1 ? 0 : r < 4 ? 1 : r < 16 ? 2 : r < 64 ? 3 : 4;
  stats.buckets[bucket]!++;
  const fail = (what: string): void => {
    record(stats, c, `${where} partition=${pb.partition}: ${what} (oracle ${r}, upper ${upper} [${pb.upper.method}], lower ${lower ?? '-'}${pb.lower ? ` [${pb.lower.method}]` : ''}, status ${pb.status})`);
  };
  if (oracle > upper) fail('UPPER BOUND VIOLATED: the certified oracle rank exceeds it');
  if (lower !== null && lower > oracle) fail('LOWER BOUND ABOVE THE ORACLE');
  if (rulesLower !== null && rulesLower > oracle) fail(`LOWER BOUND ABOVE THE ORACLE with the probe off (${rulesLower} [${rules.lower!.method}])`);
  if (rules.upper.rank !== upper) fail(`the probe changed the upper bound (${rules.upper.rank} without it)`);
  if (pb.status === 'exact' && (lower !== upper || oracle !== upper)) fail('status exact but lower/upper/oracle differ');
  if (pb.status === 'bounded' && (lower === null || lower >= upper)) fail('status bounded inconsistent with the bounds');
  if (pb.status === 'upper-only' && lower !== null) fail('status upper-only with a lower bound');
  const count = (key: string, tight: boolean): void => {
    const m = stats.methods.get(key) ?? { used: 0, tight: 0 };
    m.used++;
    if (tight) m.tight++;
    stats.methods.set(key, m);
  };
  count(`upper ${pb.upper.method}`, oracle === upper);
  if (pb.lower) count(`lower ${pb.lower.method}`, oracle === lower);
  if (oracle === upper) stats.upperTight++;
  else {
    // ORACLE_LOOSE=1 lists every upper bound above the oracle (for finding the next rule).
    if (process.env['ORACLE_LOOSE']) console.log(`LOOSE ${where} partition=${pb.partition} oracle=${r} upper=${upper} [${pb.upper.method}] lower=${lower ?? '-'}`);
    const bits = pb.upper.log2 - Math.log2(Math.max(1, r));
    if (bits > stats.gap.bits) stats.gap = { bits, where: `${where} partition=${pb.partition} (oracle ${r}, upper ${upper})` };
  }
  if (lower !== null) {
    stats.lowerPresent++;
    if (lower === oracle) stats.lowerTight++;
  }
  if (rulesLower === oracle) stats.lowerTightRules++;
  if (pb.status === 'exact') stats.exact++;
}

/** Runs the product; an exception is recorded as a failure of the case (with its seed). */
function guarded<T>(run: () => T): T | string {
  try {
    return run();
  } catch (e) {
    return `computeBounds threw: ${e instanceof Error ? e.message : String(e)}`;
  }
}

/**
 * Checks one layered case. `cap`: partitions whose upper bound exceeds it are skipped, and the
 * probe uses K = upper + 8. `adaptive`: the probe grows K from 16 until its reading falls below K
 * (`probeRankAdaptive`), at most min(upper, cap) + 8; a partition is skipped only when the
 * reading reaches that limit while the upper bound is beyond it (the rank is then out of reach).
 * The cost follows the rank instead of the bound, so loose bounds of deep models are checked too.
 */
export function checkLayered(stats: Stats, seed: number, c: LayeredCase, cap: number, adaptive = false): void {
  const where = `${stats.family} seed=${seed} surrogate=${c.surrogate} ${describeModel(c.model)}`;
  stats.models++;
  // The rules alone first (cheap), then the probe on the partitions the oracle reads: a probe of
  // a partition whose upper bound is above the cap would never be judged.
  const out = guarded(() => computeBounds(c.model, c.partitions, { surrogate: c.surrogate, probeBudget: 0 }));
  if (typeof out === 'string') {
    // Say what the oracle reads, so the report shows which side of the claim is wrong.
    const ev = compile(c.model, c.surrogate, new WeightStore(new Rng(seed ^ 0x2545f491)));
    const probe = new Rng(seed ^ 0x68e31da4);
    const readings = c.partitions.map((p) => `${p.label}=${probeRankWith(ev, p.side, 24, probe)}`);
    record(stats, c, `${where}: ${out} (oracle ranks, K=24: ${readings.join(', ')})`);
    return;
  }
  if (!out.ok) {
    // Two refusals the text prescribes: a model it refuses too, and an output that is zero for
    // every weight (the oracle then reads rank 0 everywhere).
    let refused = false;
    try {
      const ev = compile(c.model, c.surrogate, new WeightStore(new Rng(seed ^ 0x2545f491)));
      const zero = out.diagnostics.every((d) => d.code === 'network/zero-output');
      refused = zero && c.partitions.every((p) => probeRankWith(ev, p.side, 4, new Rng(seed)) === 0);
    } catch (e) {
      refused = e instanceof RefusedModel;
    }
    if (refused) {
      stats.skipped += c.partitions.length;
      return;
    }
    record(stats, c, `${where}: computeBounds rejected a valid model: ${out.diagnostics.map(formatDiagnosticLine).join('; ')}`);
    return;
  }
  const judged = c.partitions.filter((p, i) => {
    const pb = out.result.partitions[i];
    return pb !== undefined && pb.partition === p.label && (adaptive || pb.upper.rank <= BigInt(cap));
  });
  const probed = guarded(() => computeBounds(c.model, judged, { surrogate: c.surrogate }));
  if (typeof probed === 'string' || !probed.ok) {
    record(stats, c, `${where}: with the probe: ${typeof probed === 'string' ? probed : probed.diagnostics.map(formatDiagnosticLine).join('; ')}`);
    return;
  }
  const evals = [compile(c.model, c.surrogate, new WeightStore(new Rng(seed ^ 0x2545f491)))];
  const probeRng = new Rng(seed ^ 0x68e31da4);
  c.partitions.forEach((p, i) => {
    const rules = out.result.partitions[i];
    if (!rules || rules.partition !== p.label) {
      record(stats, c, `${where}: result ${i} is for '${rules?.partition}', expected '${p.label}'`);
      return;
    }
    const ev = (attempt: number): Evaluator => {
      while (evals.length <= attempt) evals.push(compile(c.model, c.surrogate, new WeightStore(new Rng(seed + 7919 * evals.length))));
      return evals[attempt]!;
    };
    if (adaptive) {
      const pb = probed.result.partitions[judged.indexOf(p)]!;
      const beyond = rules.upper.rank > BigInt(cap);
      const maxK = (beyond ? cap : Number(rules.upper.rank)) + 8;
      const first = probeRankAdaptive(ev(0), p.side, maxK, probeRng);
      if (beyond && first >= maxK) {
        stats.skipped++;
        return;
      }
      judge(stats, c, where, pb, (attempt) => (attempt === 0 ? first : probeRankAdaptive(ev(attempt), p.side, maxK, probeRng)), rules);
      return;
    }
    if (rules.upper.rank > BigInt(cap)) {
      stats.skipped++;
      return;
    }
    const pb = probed.result.partitions[judged.indexOf(p)]!;
    const k = Number(pb.upper.rank) + 8;
    judge(stats, c, where, pb, (attempt) => probeRankWith(ev(attempt), p.side, k, probeRng), rules);
  });
}

/** Checks one explicit-network case (full contraction: no cap needed, sizes are bounded). */
export function checkExplicit(stats: Stats, seed: number, c: ExplicitCase): void {
  const where = `${stats.family} seed=${seed} ${describeModel(c.model)}`;
  stats.models++;
  const out = guarded(() => computeBounds(c.model, c.partitions, { surrogate: 'tree' }));
  if (typeof out === 'string') {
    record(stats, c, `${where}: ${out}`);
    return;
  }
  if (!out.ok) {
    record(stats, c, `${where}: computeBounds rejected a valid model: ${out.diagnostics.map(formatDiagnosticLine).join('; ')}`);
    return;
  }
  c.partitions.forEach((p, i) => {
    const pb = out.result.partitions[i];
    if (!pb || pb.partition !== p.label) {
      record(stats, c, `${where}: result ${i} is for '${pb?.partition}', expected '${p.label}'`);
      return;
    }
    judge(stats, c, where, pb, (attempt) => explicitRank(c.model, p.side, new Rng(seed + 104729 * (attempt + 1) + i)));
  });
}

function pct(x: number, of: number): string {
  return of === 0 ? '   -' : `${((100 * x) / of).toFixed(0).padStart(3)}%`;
}

/** A fixed-width tightness table. */
/** The largest gap of an upper bound above the oracle over the given families. */
export function largestGap(all: readonly FamilyStats[]): string {
  const worst = all.reduce((a, b) => (b.gap.bits > a.gap.bits ? b : a), all[0]!);
  return worst && worst.gap.bits > 0 ? `${worst.gap.bits.toFixed(2)} bits: ${worst.gap.where}` : 'none: every judged upper bound equals the oracle';
}

export function tightnessTable(all: readonly FamilyStats[]): string {
  const head = ['family', 'models', 'cases', 'skipped', 'upper=oracle', 'lower given', 'lower=oracle', 'without probe', 'exact', 'redraws', 'failures', 'known bug', 'seconds', 'oracle rank 1|2-3|4-15|16-63|64+'];
  const rows = [...all, ...totals(all)].map((s) => [
    s.family,
    String(s.models),
    String(s.cases),
    String(s.skipped),
    `${s.upperTight} ${pct(s.upperTight, s.cases)}`,
    `${s.lowerPresent} ${pct(s.lowerPresent, s.cases)}`,
    `${s.lowerTight} ${pct(s.lowerTight, s.cases)}`,
    `${s.lowerTightRules} ${pct(s.lowerTightRules, s.cases)}`,
    `${s.exact} ${pct(s.exact, s.cases)}`,
    String(s.redraws),
    String(s.failures.length),
    String([...s.known.values()].reduce((a, k) => a + k.count, 0)),
    (s.ms / 1000).toFixed(1),
    s.buckets.join('|'),
  ]);
  const widths = head.map((h, i) => Math.max(h.length, ...rows.map((r) => (r[i] as string).length)));
  const line = (r: string[]): string => r.map((c, i) => (i === 0 ? c.padEnd(widths[i]!) : c.padStart(widths[i]!))).join('  ');
  return [line(head), ...rows.map(line)].join('\n');
}

/** Summary rows: every family, the `overlap` ones, the recurrent ones. */
function totals(all: readonly FamilyStats[]): FamilyStats[] {
  const sum = (family: string, of: readonly FamilyStats[]): FamilyStats => {
    const s = newStats(family);
    for (const f of of) {
      for (const key of ['models', 'cases', 'skipped', 'upperTight', 'lowerPresent', 'lowerTight', 'lowerTightRules', 'exact', 'redraws', 'ms'] as const) s[key] += f[key];
      f.buckets.forEach((b, i) => (s.buckets[i]! += b));
      s.failures.push(...f.failures);
    }
    return s;
  };
  if (all.length < 2) return [];
  return [sum('(all)', all), sum('(overlap)', all.filter((f) => f.family.includes('overlap'))), sum('(recurrent)', all.filter((f) => f.family.startsWith('recurrent')))];
}

/** Runs `count` seeded cases of one family; `ORACLE_SEED` reruns a single printed seed. */
export function runFamily(stats: FamilyStats, masterSeed: number, count: number, one: (seed: number) => void): void {
  const t0 = performance.now();
  const only = process.env['ORACLE_SEED'];
  if (only !== undefined) {
    one(Number(only));
  } else {
    const master = new Rng(masterSeed);
    for (let i = 0; i < count; i++) one(master.fork());
  }
  stats.ms += performance.now() - t0;
}

/** The known-bug lines for the report: id, count, first example. */
export function knownReport(all: readonly FamilyStats[]): string {
  const lines: string[] = [];
  for (const s of all) for (const [id, k] of s.known) lines.push(`${s.family}: known bug ${id}: ${k.count} case(s), e.g. ${k.example}`);
  return lines.join('\n');
}

/** Per family: which rule gave each bound, how often, and how often it equalled the oracle. */
export function methodReport(all: readonly FamilyStats[]): string {
  return all
    .map((s) => {
      const parts = [...s.methods.entries()]
        .sort((a, b) => a[0].localeCompare(b[0]))
        .map(([k, m]) => `${k}: ${m.tight}/${m.used} attained`);
      return `${s.family.padEnd(18)} ${parts.join('; ')}`;
    })
    .join('\n');
}
