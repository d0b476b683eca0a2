/**
 * Shared helpers for the config loader tests: load text and get the model or a compact list of
 * `code@line:column` strings, so that each test states exact codes and positions.
 */
import { expect } from 'vitest';
import type { Diagnostic } from '../../src/diagnostic.js';
import type { ExplicitModel, Layer, LayeredModel, Model } from '../../src/config/model.js';
import { loadConfigText, type LoadOptions } from '../../src/config/load-config.js';

export function load(text: string, options?: LoadOptions): Model {
  const r = loadConfigText(text, 'test.yaml', options);
  if (!r.ok) throw new Error(`expected the config to load, got:\n${r.diagnostics.map((d) => `${where(d)} ${d.message}`).join('\n')}`);
  return r.model;
}

export function loadLayered(text: string, options?: LoadOptions): LayeredModel {
  const m = load(text, options);
  expect(m.kind).toBe('layered');
  return m as LayeredModel;
}

export function loadExplicit(text: string, options?: LoadOptions): ExplicitModel {
  const m = load(text, options);
  expect(m.kind).toBe('explicit');
  return m as ExplicitModel;
}

export function diagnostics(text: string, options?: LoadOptions): Diagnostic[] {
  const r = loadConfigText(text, 'test.yaml', options);
  if (r.ok) throw new Error('expected diagnostics, but the config loaded');
  for (const d of r.diagnostics) {
    expect(d.file).toBe('test.yaml');
    expect(d.severity).toBe('error');
  }
  return r.diagnostics;
}

/** `code@line:column` of each diagnostic, in the loader's order. */
export function codesAt(text: string, options?: LoadOptions): string[] {
  return diagnostics(text, options).map(where);
}

export function where(d: Diagnostic): string {
  return d.span ? `${d.code}@${d.span.line}:${d.span.column}` : d.code;
}

/** A layered model around the given layer lines (each already indented by 4 spaces). */
export function layered(layerLines: string, shape = '[32, 32]'): string {
  return `model:\n  input:\n    shape: ${shape}\n    features: 3\n  layers:\n${layerLines}`;
}

/**
 * A model whose first layer is `- conv: {channels: 4}` (so M defaults to 4) followed by the given
 * entries (each a YAML list item without the dash); returns the layers after the first.
 */
export function afterConv(entries: readonly string[], shape = '[8, 8]'): Layer[] {
  return loadLayered(withConv(entries, shape)).layers.slice(1);
}

export function withConv(entries: readonly string[], shape = '[8, 8]'): string {
  return layered(['    - conv: {channels: 4}', ...entries.map((e) => `    - ${e}`)].join('\n') + '\n', shape);
}

/** The layer without its position in the file (index, inputs, path, spans). */
export function bodyOf(layer: Layer): Record<string, unknown> {
  const { index: _i, inputs: _n, path: _p, span: _s, fieldSpans: _f, ...rest } = layer;
  return rest;
}
