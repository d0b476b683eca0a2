/**
 * Layer names and the `from:` references that use them, checked on the templates (once per YAML
 * entry, before anything is expanded): names are unique in the model; a reference names a layer
 * that comes before it; and inside a `repeat`, a name defined in the same repeat body means the
 * copy of the same iteration, while from outside that repeat one copy must be named (`down[2]`).
 * The result tells the expansion how to turn each reference into a label.
 */
import type { Span } from '../diagnostic.js';
import { closest } from '../text/suggest.js';
import type { DiagnosticSink } from './diagnostic-sink.js';
import type { NameDef, NameRef, Template } from './layer-templates.js';

/** `input`, or a label: `base` + the current iterations of the `shared` outer repeats + `copies`. */
export type RefResolution = { readonly input: true } | { readonly input: false; readonly shared: number };

interface Frame {
  readonly times: number;
  readonly span: Span;
}

interface Def {
  readonly span: Span;
  readonly chain: readonly Frame[];
}

/** The reference's resolution, or undefined (with diagnostics) when a name is wrong. */
export function checkNames(templates: readonly Template[], sink: DiagnosticSink): Map<NameRef, RefResolution> | undefined {
  const all = new Map<string, Span>();
  collect(templates, all);
  const defs = new Map<string, Def>();
  const out = new Map<NameRef, RefResolution>();
  let ok = true;

  const define = (name: NameDef | undefined, chain: readonly Frame[]): void => {
    if (!name) return;
    const earlier = defs.get(name.text);
    if (earlier) {
      sink.error(
        'config/duplicate-name',
        `the layer name '${name.text}' is already used on line ${earlier.span.line}; names must be unique in the model (the copies a repeat makes are numbered ${name.text}[1], ${name.text}[2], … by themselves)`,
        name.span,
      );
      ok = false;
      return;
    }
    defs.set(name.text, { span: name.span, chain });
  };

  const check = (ref: NameRef, chain: readonly Frame[]): void => {
    if (ref.base === 'input') {
      if (ref.copies.length > 0) {
        sink.error('config/invalid-copy', `${ref.where}: 'input' is the model input, which has no copies; write 'input'`, ref.span);
        ok = false;
      } else out.set(ref, { input: true });
      return;
    }
    const def = defs.get(ref.base);
    if (!def) {
      ok = false;
      const later = all.get(ref.base);
      if (later) {
        sink.error('config/forward-reference', `${ref.where} names '${ref.base}', which is defined later (line ${later.line}); a merge reads only layers that come before it`, ref.span);
        return;
      }
      const guess = closest(ref.base, [...defs.keys(), 'input']);
      sink.error('config/unknown-name', `${ref.where}: no layer before this one is named '${ref.base}'${guess ? ` (did you mean '${guess}'?)` : ''}; give the layer a 'name' to merge with it`, ref.span);
      return;
    }
    let shared = 0;
    while (shared < def.chain.length && shared < chain.length && def.chain[shared] === chain[shared]) shared++;
    const outside = def.chain.slice(shared);
    if (ref.copies.length === 0 && outside.length > 0) {
      const example = `${ref.base}${outside.map((f) => `[${f.times}]`).join('')}`;
      const count = outside.reduce((a, f) => a * f.times, 1);
      sink.error(
        'config/ambiguous-name',
        `${ref.where}: '${ref.base}' is inside a repeat (line ${outside[0]!.span.line}) that this merge is outside of, so it names ${count} copies; name one, e.g. '${example}'`,
        ref.span,
      );
      ok = false;
      return;
    }
    if (ref.copies.length !== outside.length) {
      const why =
        outside.length === 0
          ? def.chain.length === 0
            ? `'${ref.base}' is not inside a repeat`
            : `inside the repeat that copies it, '${ref.base}' already means the copy of the same iteration`
          : `'${ref.base}' is inside ${outside.length} repeats that this merge is outside of; give one copy number for each`;
      sink.error('config/invalid-copy', `${ref.where} is '${ref.text}', but ${why}`, ref.span);
      ok = false;
      return;
    }
    const over = ref.copies.findIndex((c, i) => c > outside[i]!.times);
    if (over >= 0) {
      sink.error('config/invalid-copy', `${ref.where} is '${ref.text}', but the repeat on line ${outside[over]!.span.line} makes ${outside[over]!.times} copies`, ref.span);
      ok = false;
      return;
    }
    out.set(ref, { input: false, shared });
  };

  const walk = (list: readonly Template[], chain: readonly Frame[]): void => {
    for (const t of list) {
      switch (t.t) {
        case 'chain':
          break;
        case 'repeat':
          walk(t.body, [...chain, { times: t.times, span: t.timesSpan }]);
          break;
        case 'sequence':
          walk(t.body, chain);
          break;
        case 'merge':
          for (const p of t.paths) walk(p, chain);
          for (const r of t.refs) check(r, chain);
          break;
      }
      define(t.name, chain);
    }
  };
  walk(templates, []);
  return ok ? out : undefined;
}

function collect(list: readonly Template[], into: Map<string, Span>): void {
  for (const t of list) {
    if (t.t === 'repeat' || t.t === 'sequence') collect(t.body, into);
    if (t.t === 'merge') for (const p of t.paths) collect(p, into);
    if (t.name && !into.has(t.name.text)) into.set(t.name.text, t.name.span);
  }
}
