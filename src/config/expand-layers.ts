/**
 * Templates → the layers of the model, in topological order: a chain reads the layer before it,
 * a block's paths each read the block's input and meet in a merge layer, a skip merges the
 * current grid with the named layer, and `repeat` copies its body. Copies of named layers are
 * labelled `name[i]` (1-based, outermost repeat first: `name[2][1]`), so every layer has one
 * label. The size is computed before anything is expanded, so `repeat: {times: 1000000000}`
 * costs nothing and is refused at the `times` that caused it.
 */
import type { Span } from '../diagnostic.js';
import { INPUT, type FieldParameters, type Layer, type ParameterUse } from './model.js';
import type { DiagnosticSink } from './diagnostic-sink.js';
import { MAX_EXPANDED_LAYERS } from './limits.js';
import { countOne, expandedCount, type MadeLayer, type NameRef, type Pending, type Template } from './layer-templates.js';
import type { RefResolution } from './layer-names.js';

type RepeatTemplate = Extract<Template, { t: 'repeat' }>;

/** The layers, and what is left to resolve once shapes are known (by layer index). */
export interface Expanded {
  readonly layers: Layer[];
  readonly pending: ReadonlyMap<number, Pending>;
}

export function expandTemplates(
  templates: readonly Template[],
  refs: ReadonlyMap<NameRef, RefResolution>,
  listPath: string,
  listSpan: Span,
  sink: DiagnosticSink,
): Expanded | undefined {
  const total = expandedCount(templates);
  if (total > MAX_EXPANDED_LAYERS) {
    const amount = Number.isSafeInteger(total) ? `${total} layers` : `more than ${Number.MAX_SAFE_INTEGER} layers`;
    const culprit = biggestRepeat(templates);
    if (culprit) {
      sink.error(
        'config/too-many-layers',
        `${culprit.timesPath} is ${culprit.times}, which makes the model expand to ${amount}; at most ${MAX_EXPANDED_LAYERS} layers are allowed after expanding repeat blocks`,
        culprit.timesSpan,
      );
    } else {
      sink.error('config/too-many-layers', `${listPath} has ${amount}; at most ${MAX_EXPANDED_LAYERS} are allowed`, listSpan);
    }
    return undefined;
  }
  return new Expansion(refs).run(templates);
}

/** The outermost repeat that contributes most layers (looking through blocks, not into repeats). */
function biggestRepeat(templates: readonly Template[]): RepeatTemplate | undefined {
  let best: { count: number; t: RepeatTemplate } | undefined;
  const visit = (list: readonly Template[]): void => {
    for (const t of list) {
      if (t.t === 'repeat') {
        const count = countOne(t);
        if (!best || count > best.count) best = { count, t };
      } else if (t.t === 'sequence') visit(t.body);
      else if (t.t === 'merge') for (const p of t.paths) visit(p);
    }
  };
  visit(templates);
  return best?.t;
}

class Expansion {
  private readonly out: Layer[] = [];
  private readonly pending = new Map<number, Pending>();
  /** Label → the output layer of the entry that carries it. */
  private readonly labels = new Map<string, number>();
  /** Iterations (1-based) of the enclosing repeats, outermost first. */
  private readonly iterations: number[] = [];
  /** The parameters of the enclosing repeats' counts (in a definition), outermost first. */
  private readonly counts: (readonly ParameterUse[])[] = [];

  constructor(private readonly refs: ReadonlyMap<NameRef, RefResolution>) {}

  run(templates: readonly Template[]): Expanded {
    this.list(templates, INPUT);
    return { layers: this.out, pending: this.pending };
  }

  private list(templates: readonly Template[], input: number): number {
    let cur = input;
    for (const t of templates) cur = this.one(t, cur);
    return cur;
  }

  private label(text: string): string {
    return text + this.iterations.map((i) => `[${i}]`).join('');
  }

  private make(m: MadeLayer, inputs: readonly number[], name: string | undefined): number {
    const index = this.out.length;
    const depth = this.iterations.length;
    const fieldParams = withCounts(m.site.fieldParams, this.counts);
    const layer = {
      ...m.body,
      index,
      inputs,
      path: m.site.path,
      span: m.site.span,
      fieldSpans: m.site.fieldSpans,
      ...(name !== undefined && m.labelled ? { name } : {}),
      ...(depth > 0 ? { repeatIteration: this.iterations[depth - 1]! - 1 } : {}),
      ...(fieldParams ? { fieldParams } : {}),
    } as Layer;
    this.out.push(layer);
    if (m.declared || m.unitsPerWidth || m.vocabulary) {
      this.pending.set(index, { ...(m.declared ? { declared: m.declared } : {}), ...(m.unitsPerWidth ? { unitsPerWidth: m.unitsPerWidth } : {}), ...(m.vocabulary ? { vocabulary: m.vocabulary } : {}) });
    }
    return index;
  }

  private chain(layers: readonly MadeLayer[], input: number, name: string | undefined): number {
    let cur = input;
    for (const m of layers) cur = this.make(m, [cur], name);
    return cur;
  }

  /** Records the entry's label; a block's output layer takes it when it has no label of its own. */
  private register(text: string | undefined, output: number, adopt: boolean): void {
    if (text === undefined) return;
    const label = this.label(text);
    this.labels.set(label, output);
    const layer = this.out[output];
    if (adopt && layer && layer.name === undefined) this.out[output] = { ...layer, name: label };
  }

  private one(t: Template, input: number): number {
    const name = t.name ? this.label(t.name.text) : undefined;
    switch (t.t) {
      case 'chain': {
        const out = this.chain(t.layers, input, name);
        this.register(t.name?.text, out, false);
        return out;
      }
      case 'repeat': {
        let cur = input;
        this.counts.push(t.timesParams ?? []);
        for (let i = 1; i <= t.times; i++) {
          this.iterations.push(i);
          cur = this.list(t.body, cur);
          this.iterations.pop();
        }
        this.counts.pop();
        this.register(t.name?.text, cur, true);
        return cur;
      }
      case 'sequence': {
        const out = this.list(t.body, input);
        this.register(t.name?.text, out, true);
        return out;
      }
      case 'merge': {
        const ins = t.paths.map((p) => this.list(p, input));
        for (const r of t.refs) ins.push(this.resolve(r));
        const merged = this.make(t.merge, ins, name);
        const out = this.chain(t.after, merged, undefined);
        this.register(t.name?.text, out, false);
        return out;
      }
    }
  }

  private resolve(ref: NameRef): number {
    const how = this.refs.get(ref);
    if (!how) throw new Error(`layer expansion: the reference '${ref.text}' was not checked (a loader bug)`);
    if (how.input) return INPUT;
    const label = ref.base + this.iterations.slice(0, how.shared).map((i) => `[${i}]`).join('') + ref.copies.map((c) => `[${c}]`).join('');
    const at = this.labels.get(label);
    if (at === undefined) throw new Error(`layer expansion: '${label}' has no layer (a loader bug)`);
    return at;
  }
}

/** A layer's field parameters, with the parameters of the repeat counts around it under `layer`. */
function withCounts(own: FieldParameters | undefined, counts: readonly (readonly ParameterUse[])[]): FieldParameters | undefined {
  const around: ParameterUse[] = [];
  for (const list of counts) for (const p of list) if (!around.some((q) => q.name === p.name)) around.push(p);
  if (around.length === 0) return own;
  return { ...own, layer: around };
}
