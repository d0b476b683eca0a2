/**
 * A file with thousands of problems: the loader lists the first MAX_DIAGNOSTICS_PER_FILE and one
 * "and N more" diagnostic at the first one left out, and an excerpt of a very long line is a
 * window around the column, so the printed report stays small whatever the file holds.
 */
import { describe, expect, test } from 'vitest';
import { loadConfigText } from '../../src/config/load-config.js';
import { MAX_DIAGNOSTICS_PER_FILE } from '../../src/config/limits.js';
import { renderDiagnostic } from '../../src/report/diagnostics.js';

function badLayers(count: number, oneLine: boolean): string {
  const layer = '{conv: {channels: -1, kernal: 3}}';
  if (oneLine) return `model: {input: {shape: [16], features: 2}, layers: [${Array.from({ length: count }, () => layer).join(', ')}]}\n`;
  return `model:\n  input: {shape: [16], features: 2}\n  layers:\n${Array.from({ length: count }, () => `    - ${layer}\n`).join('')}`;
}

describe('diagnostic flood', () => {
  test('10,000 bad layers give 50 diagnostics and one "and N more" at the 51st place', () => {
    const r = loadConfigText(badLayers(10_000, false), 'flood.yaml');
    if (r.ok) throw new Error('expected diagnostics');
    expect(MAX_DIAGNOSTICS_PER_FILE).toBe(50);
    expect(r.diagnostics).toHaveLength(51);
    const last = r.diagnostics[50]!;
    expect(last.code).toBe('input/more-problems');
    // two problems per layer (the width and the misspelt field): the 51st is layer 25's width
    expect(last.span).toMatchObject({ line: 4 + 25, column: 25 });
    expect(last.message).toContain('and 19,950 more problems');
  });

  test('on one 70 KB line, every printed excerpt stays within 130 characters', () => {
    const text = badLayers(2_000, true);
    expect(text.length).toBeGreaterThan(70_000);
    const r = loadConfigText(text, 'flood.yaml');
    if (r.ok) throw new Error('expected diagnostics');
    const printed = r.diagnostics.map((d) => renderDiagnostic(d, text));
    expect(printed.join('\n').length).toBeLessThan(51 * 400);
    const mid = r.diagnostics[30]!;
    const [, excerpt, caret] = renderDiagnostic(mid, text).split('\n');
    expect(excerpt!.length).toBeLessThan(130);
    // the caret still points at the offending text
    const at = caret!.indexOf('^');
    expect(excerpt!.slice(at, at + 2)).toBe(text.slice(mid.span!.offset, mid.span!.offset + 2));
  });
});
