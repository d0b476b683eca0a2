/**
 * A seeded generator of hostile configs and policies. It starts from well-formed documents built
 * from the layer vocabulary (`LAYER_FIELDS` with each field's aliases, and every spelling of every
 * kind in `KIND_SPELLINGS`: kinds added later are covered without touching this file) and mutates them:
 * wrong types, sizes at and beyond every limit, deep nesting, anchors and aliases, tags, YAML 1.1
 * forms, encodings (byte-order mark, CRLF, tabs, control characters) and text damage.
 *
 * The tree holds raw YAML scalar text, so a mutation can write exactly what a hostile file would.
 */
import { LAYER_FIELDS } from '../../src/config/layer-vocabulary.js';
import { KIND_SPELLINGS } from '../../src/config/kind-names.js';

/** Every kind the reader knows, and every spelling a config may use for one. */
const LAYER_KINDS = [...LAYER_FIELDS.keys()];
const SPELLINGS = KIND_SPELLINGS.flat();

/** mulberry32: a small, fast, seedable generator (same seed, same documents on every machine). */
export function rng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export type Node = { t: 'map'; entries: [string, Node][] } | { t: 'seq'; items: Node[] } | { t: 'raw'; text: string };

const raw = (text: string): Node => ({ t: 'raw', text });
const map = (entries: [string, Node][]): Node => ({ t: 'map', entries });
const seq = (items: Node[]): Node => ({ t: 'seq', items });

export class Gen {
  constructor(readonly random: () => number) {}

  int(lo: number, hi: number): number {
    return lo + Math.floor(this.random() * (hi - lo + 1));
  }
  chance(p: number): boolean {
    return this.random() < p;
  }
  pick<T>(list: readonly T[]): T {
    return list[Math.floor(this.random() * list.length)]!;
  }

  /** A size that is usually valid and small; else a hostile number or another type. */
  size(): Node {
    if (this.chance(0.94)) return raw(String(this.pick([1, 1, 2, 2, 2, 3, 4, 4, 8, 16])));
    return this.hostileScalar();
  }

  hostileScalar(): Node {
    return raw(
      this.pick([
        '0', '-1', '-0', '1.5', '2147483647', '2147483648', '4294967296', '9007199254740993', '1e308', '1e400', '-.inf', '.nan',
        '99999999999999999999999999', '10000000', '017', '0o17', '0x10', '0b11', '1_000', '1:30', '1e3', 'yes', 'no', 'on', 'off', 'y',
        'true', 'null', '~', '""', "'x'", '"\\u0000"', '"2"', '!!str 4', '!!int 4', '!!float 4', '!!binary aGVsbG8=', '!custom 4',
        '[]', '{}', '[1, [2, [3]]]', '{a: 1}', 'conv', '"\u202eevil"', '"\\ud800"', 'x'.repeat(300),
      ]),
    );
  }

  shape(dims: number): Node {
    // Small sides, or one far beyond every cap: never a legal but slow four-million-position grid.
    const side = (): Node => (this.chance(0.97) ? raw(String(this.pick([2, 4, 4, 8, 8, 16, 6, 12]))) : this.hostileScalar());
    return seq(Array.from({ length: dims }, side));
  }

  /** A layer of a kind from the vocabulary, with its canonical fields or their aliases. */
  layer(depth: number): Node {
    const kind = this.chance(0.9) ? this.pick(LAYER_KINDS) : this.chance(0.9) ? this.pick(SPELLINGS) : this.pick(['Conv3d', 'lstm_cell', '']);
    if (kind === 'repeat' && depth < 3) {
      const inner = Array.from({ length: this.int(1, 3) }, () => this.layer(depth + 1));
      const body: [string, Node][] = [['times', this.chance(0.9) ? raw(String(this.int(1, 3))) : this.hostileScalar()], ['layers', seq(inner)]];
      return map([['repeat', map(body)]]);
    }
    const specs = LAYER_FIELDS.get(kind as never) ?? [{ name: 'channels' }, { name: 'units' }];
    const body: [string, Node][] = [];
    for (const spec of specs) {
      const f = spec.name;
      if (f === 'layers' || f === 'times' || f === 'paths') continue;
      if (!this.chance(spec === specs[0] ? 0.9 : 0.3)) continue;
      const aliases = 'aliases' in spec ? (spec.aliases ?? []) : [];
      const key = aliases.length > 0 && this.chance(0.3) ? this.pick(aliases) : f;
      body.push([key, this.fieldValue(f)]);
    }
    if (this.chance(0.02)) body.push([this.pick(['kernal', 'chanels', 'bogus', '__proto__', 'constructor']), this.size()]);
    return map([[kind, map(body)]]);
  }

  fieldValue(field: string): Node {
    switch (field) {
      case 'name':
        return raw(this.pick(['stem', 'a', 'b', '""', '"with space"', '"multi\\n\\nline"', '"<b>html</b>"', '7']));
      case 'padding':
        return raw(this.pick(['same', 'valid', 'same', 'valid', 'full']));
      case 'global':
        return raw(this.pick(['true', 'false', 'true', 'yes']));
      default:
        return this.chance(0.15) ? seq([this.size(), this.size()]) : this.size();
    }
  }

  /**
   * A plausible layered model (widths, windows that tile, a head after the last pool), so that
   * a good share of inputs reach the engine; then layers of any kind from the vocabulary.
   */
  config(): Node {
    if (this.chance(0.1)) return this.explicitConfig();
    const dims = this.chance(0.5) ? 1 : 2;
    const initial = dims === 1 ? this.pick([4, 8, 16, 64]) : this.pick([2, 4, 8]);
    let side = initial;
    const layers: Node[] = [];
    const conv = (): Node => {
      const body: [string, Node][] = [[this.chance(0.2) ? this.pick(['out_channels', 'filters']) : 'channels', this.size()]];
      if (this.chance(0.4)) body.push(['kernel', raw(String(this.pick([1, 2, 3])))]);
      if (this.chance(0.2)) body.push(['padding', raw(this.pick(['same', 'valid']))]);
      if (this.chance(0.2)) body.push(['name', raw(this.pick(['stem', 'mid', 'top', '"with space"', '"multi\\n\\nline"']))]);
      return map([['conv', map(body)]]);
    };
    for (let i = this.int(1, 3); i > 0; i--) {
      layers.push(this.chance(0.2) ? map([['repeat', map([['times', raw(String(this.int(1, 3)))], ['layers', seq([conv()])]])]]) : conv());
      if (side % 2 === 0 && this.chance(0.6)) {
        layers.push(map([['pool', map([['window', raw('2')]])]]));
        side /= 2;
      }
    }
    if (dims === 1 && this.chance(0.3)) layers.push(map([['recurrent', map([['hidden', this.size()], ['depth', raw(String(this.int(1, 3)))]])]]));
    else if (this.chance(0.5)) layers.push(map([['pool', map([['global', raw('true')]])]]));
    if (this.chance(0.3)) layers.push(map([['dense', map([['units', this.size()]])]]));
    for (let i = this.chance(0.3) ? this.int(1, 2) : 0; i > 0; i--) layers.splice(this.int(0, layers.length), 0, this.layer(0));
    const shape = this.chance(0.96) ? seq(Array.from({ length: dims }, () => raw(String(initial)))) : this.shape(dims);
    const model: [string, Node][] = [
      ['input', map([['shape', shape], ['features', this.size()]])],
      ['layers', seq(layers)],
    ];
    if (this.chance(0.3)) model.push(['weight_sharing', raw(this.chance(0.95) ? this.pick(['true', 'false']) : this.pick(['no', '0']))]);
    return map([['model', map(model)]]);
  }

  explicitConfig(): Node {
    const n = this.int(1, 4);
    const tensors = Array.from({ length: n }, (_, i) =>
      map([
        ['name', raw(`t${i}`)],
        ['legs', seq([map([['position', raw(String(this.chance(0.97) ? i : this.int(-1, 9)))], ['dim', this.size()]])])],
      ]),
    );
    const bonds = n > 1 ? [map([['between', seq([raw('t0'), raw(`t${n - 1}`)])], ['dim', this.size()]])] : [];
    return map([['model', map([['network', map([['shape', this.shape(1)], ['tensors', seq(tensors)], ['bonds', seq(bonds)]])]])]]);
  }

  policy(dims: number): Node {
    const kinds = dims === 1 ? ['start-end', 'interleaved', 'block:0-2', '"positions:0,1"'] : ['left-right', 'top-bottom', 'checkerboard', '"block:0-1,0-2"'];
    const entries: [string, Node][] = [
      ['id', raw(this.chance(0.98) ? 'fuzz' : this.pick(['Fuzz', '""', '1.5']))],
      ['description', raw('A generated policy.')],
    ];
    if (this.chance(0.4)) entries.push(['surrogate', raw(this.chance(0.95) ? this.pick(['tree', 'overlap']) : 'dense')]);
    if (this.chance(0.3)) entries.push(['unproven', raw(this.chance(0.95) ? this.pick(['warn', 'fail']) : 'no')]);
    if (this.chance(0.2)) entries.push(['max_drop_bits', raw(this.chance(0.9) ? this.pick(['0', '1', '0.5', '2']) : this.pick(['-1', '1e400']))]);
    if (this.chance(0.05)) entries.push(['extends', raw(this.pick(['./missing.yaml', '../../etc/passwd', '/abs.yaml', './policy.yaml']))]);
    if (this.chance(0.05)) entries.push(['model_path', raw(this.pick(['/model', '/nope', 'model', '"/model/layers/0"']))]);
    entries.push(['applies_to', seq([raw(this.chance(0.97) ? '"**/*.yaml"' : this.pick(['"/abs"', `"${'a'.repeat(70_000)}"`, '"[z-a]"']))])]);
    const named: [string, Node][] = [];
    if (this.chance(0.3)) {
      const body: [string, Node][] = dims === 1 ? [['kind', raw('block')], ['range', seq([raw('0'), raw(String(this.int(0, 9)))])]] : [['kind', raw('block')], ['rows', seq([raw('0'), raw('1')])], ['cols', seq([raw('0'), raw(String(this.int(0, 9)))])]];
      named.push(['mine', map(body)]);
      entries.push(['partitions', map(named)]);
    }
    const partitions = [...kinds, ...(named.length > 0 ? ['mine'] : [])];
    const requirements = Array.from({ length: this.int(1, 2) }, (_, i) => {
      const r: [string, Node][] = [['partition', raw(this.chance(0.97) ? partitions[(i + this.int(0, 9)) % partitions.length]! : this.pick(partitions))]];
      if (this.chance(0.6)) r.push(['min_rank', raw(this.chance(0.9) ? this.pick(['1', '2', '4', '16', '64', '2^10', '3^5']) : this.pick(['2^1000001', '0', '"2 ^ 3"', '1e30', '1_024']))]);
      else r.push(['min_bits', raw(this.chance(0.9) ? this.pick(['1', '2', '3', '2.5', '8', '0.000001']) : this.pick(['65536.5', '1000000', '-1', '1e3', '0x10']))]);
      if (this.chance(0.2)) r.push(['unproven', raw(this.chance(0.95) ? this.pick(['warn', 'fail']) : 'off')]);
      return map(r);
    });
    entries.push(['require', seq(requirements)]);
    return map(entries);
  }

  /** Structural mutations of the tree before it is written out. */
  mutate(node: Node, depth = 0): Node {
    if (this.chance(0.005)) return this.hostileScalar();
    if (this.chance(0.002)) return this.deep(this.int(50, 300));
    if (node.t === 'raw') return this.chance(0.01) ? this.hostileScalar() : node;
    if (node.t === 'seq') {
      const items = node.items.map((n) => this.mutate(n, depth + 1));
      if (this.chance(0.01)) items.push(...items);
      if (this.chance(0.005)) items.length = 0;
      return seq(items);
    }
    const entries = node.entries.map(([k, v]): [string, Node] => [this.chance(0.003) ? this.pick(['', '? complex', '"quoted key"', k + k]) : k, this.mutate(v, depth + 1)]);
    if (this.chance(0.003) && entries.length > 0) entries.push(entries[0]!);
    if (this.chance(0.005) && entries.length > 0) entries.splice(this.int(0, entries.length - 1), 1);
    return map(entries);
  }

  deep(levels: number): Node {
    let n: Node = raw('1');
    for (let i = 0; i < levels; i++) n = this.chance(0.5) ? seq([n]) : map([['a', n]]);
    return n;
  }
}

/** Writes the tree as YAML: block style near the top, flow style below, with anchors and aliases. */
export function emit(g: Gen, root: Node): string {
  const anchors: string[] = [];
  let counter = 0;
  const prefix = (): string => {
    if (!g.chance(0.03)) return '';
    const name = `a${counter++}`;
    anchors.push(name);
    return `&${name} `;
  };
  const alias = (): string | undefined => (anchors.length > 0 && g.chance(0.01) ? `*${g.pick(anchors)}` : undefined);
  const flow = (n: Node): string => {
    const a = alias();
    if (a) return a;
    if (n.t === 'raw') return n.text.includes('\n') ? JSON.stringify(n.text) : n.text;
    if (n.t === 'seq') return `${prefix()}[${n.items.map(flow).join(', ')}]`;
    return `${prefix()}{${n.entries.map(([k, v]) => `${k}: ${flow(v)}`).join(', ')}}`;
  };
  const block = (n: Node, indent: string, depth: number): string => {
    if (n.t === 'raw' || depth > 3 || g.chance(0.3) || (n.t === 'map' && n.entries.length === 0) || (n.t === 'seq' && n.items.length === 0)) {
      return ` ${flow(n)}\n`;
    }
    if (n.t === 'seq') return `\n${n.items.map((item) => `${indent}-${block(item, indent + '  ', depth + 1)}`).join('')}`;
    return `\n${n.entries.map(([k, v]) => `${indent}${k}:${block(v, indent + '  ', depth + 1)}`).join('')}`;
  };
  if (root.t !== 'map') return flow(root) + '\n';
  return root.entries.map(([k, v]) => `${k}:${block(v, '  ', 1)}`).join('');
}

/** Damage at the level of text and encoding. */
export function damage(g: Gen, text: string): string {
  let out = text;
  if (g.chance(0.03)) out = '\ufeff' + out;
  if (g.chance(0.03)) out = out.replace(/\n/g, '\r\n');
  if (g.chance(0.02)) out = out.replace(/^ {2}/m, '\t');
  if (g.chance(0.02)) out = '%YAML 1.1\n---\n' + out;
  if (g.chance(0.02)) out = out + '---\nsecond: document\n';
  if (g.chance(0.03)) out = out.slice(0, g.int(0, out.length));
  if (g.chance(0.02)) {
    const at = g.int(0, out.length);
    out = out.slice(0, at) + g.pick(['\u0000', '\u0007', '\ufffd', '{', ']', ':', '"', '&', '*', '!', '|', '>', '%', '@', '`']) + out.slice(at);
  }
  return out;
}

export interface FuzzCase {
  readonly index: number;
  readonly config: string;
  /** A policy for the config, or undefined for a `bounds` run. */
  readonly policy?: string;
  readonly surrogate: 'tree' | 'overlap';
}

export function fuzzCase(seed: number, index: number): FuzzCase {
  const g = new Gen(rng(seed * 1_000_003 + index));
  const configTree = g.mutate(g.config());
  const config = damage(g, emit(g, configTree));
  const surrogate = g.chance(0.25) ? 'overlap' : 'tree';
  if (!g.chance(0.4)) return { index, config, surrogate };
  const dims = /shape:\s*\[[^\],]*,/.test(config) ? 2 : 1;
  const policy = damage(g, emit(g, g.mutate(g.policy(dims))));
  return { index, config, policy, surrogate };
}
