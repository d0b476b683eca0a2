/**
 * A small architecture definition and an in-memory repository to read definitions from, shared
 * by the tests of loading, attribution and fixes. Every value of the model below is derived here.
 */
import type { DefinitionSource } from '../../src/config/definition-source.js';
import { loadConfigText, type LoadResult } from '../../src/config/load-config.js';
import type { LayeredModel } from '../../src/config/model.js';

export const NET = `name: tiny-net
description: A small residual-free image net for tests.
parameters:
  width:
    type: number
    default: 1
    min: 0.25
    max: 4
    step: 0.25
    description: channel multiplier
  blocks:
    type: list
    default: [1, 2]
    min: 1
    max: 4
    description: convolutions per stage
  size: {type: int, default: 16, min: 8, max: 64, description: image side}
model:
  input: {shape: ["=size", "=size"], channels: 3}
  layers:
    - conv: {channels: "=ceil(8 * width)", kernel: 3, name: stem}
    - repeat:
        times: "=blocks[0]"
        layers:
          - conv: {channels: "=ceil(8 * width)", kernel: 3, name: a}
    - pool: {window: 2}
    - repeat:
        times: "=blocks[1]"
        layers:
          - conv: {channels: "=ceil(16 * width)", kernel: 3, name: b}
    - pool: {global: true}
    - dense: {units: 4}
`;

/** An in-memory repository: root-relative path → text. */
export function memorySource(files: Record<string, string>, judging?: Record<string, string>): DefinitionSource {
  return {
    read: (rel) => (rel in files ? { kind: 'file', text: files[rel]! } : { kind: 'absent' }),
    ...(judging ? { judging: (rel: string) => (rel in judging ? { kind: 'file' as const, text: judging[rel]! } : { kind: 'absent' as const }) } : {}),
    display: (rel) => rel,
  };
}

/** Loads a config at configs/run.yaml against the files given (default: the definition above at arch/net.yaml). */
export function loadRun(config: string, files: Record<string, string> = { 'arch/net.yaml': NET }, judging?: Record<string, string>): LoadResult {
  return loadConfigText(config, 'configs/run.yaml', { definitions: memorySource(files, judging), configPath: 'configs/run.yaml' });
}

export function runModel(config: string, files?: Record<string, string>): LayeredModel {
  const r = loadRun(config, files);
  if (!r.ok) throw new Error(r.diagnostics.map((d) => `${d.file}:${d.span?.line}:${d.span?.column} ${d.message}`).join('\n'));
  return r.model as LayeredModel;
}

/** A config at configs/run.yaml that names arch/net.yaml with the given parameter lines. */
export function runConfig(...lines: string[]): string {
  return ['run: {epochs: 3}', 'model:', '  architecture: ../arch/net.yaml', ...lines.map((l) => `  ${l}`), ''].join('\n');
}
