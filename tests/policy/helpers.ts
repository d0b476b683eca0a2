/**
 * Shared helpers for the policy loader tests: a throw-away repository in the system's temporary
 * directory, and compact `code@line:column` strings so that each test states exact codes and
 * positions of the diagnostics it expects.
 */
import { mkdirSync, mkdtempSync, realpathSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { expect } from 'vitest';
import type { Diagnostic, Span } from '../../src/diagnostic.js';
import { loadPolicyText, type PolicyLoadResult } from '../../src/policy/load-policy.js';
import type { Policy } from '../../src/policy/policy.js';

export interface TempRepo {
  /** Absolute, with symbolic links resolved (macOS puts the temporary directory behind one). */
  readonly root: string;
  /** Writes a file below the root (directories created) and returns its absolute path. */
  write(relative: string, text: string): string;
  path(relative: string): string;
  remove(): void;
}

export function tempRepo(prefix = 'rankfloor-policy-'): TempRepo {
  const root = realpathSync(mkdtempSync(join(tmpdir(), prefix)));
  return {
    root,
    write(relative, text) {
      const path = join(root, relative);
      mkdirSync(dirname(path), { recursive: true });
      writeFileSync(path, text);
      return path;
    },
    path: (relative) => join(root, relative),
    remove: () => rmSync(root, { recursive: true, force: true }),
  };
}

/** Loads text that must be a valid policy; `readFile` defaults to the file system. */
export function policyOf(text: string, options: { repoRoot?: string; file?: string; readFile?: (p: string) => string } = {}): Policy {
  const r = loadPolicyText(text, options.file ?? 'policy.yaml', { repoRoot: options.repoRoot ?? process.cwd() }, options.readFile);
  if (!r.ok) throw new Error(`expected the policy to load, got:\n${r.diagnostics.map(where).join('\n')}`);
  return r.policy;
}

/** `code@line:column` of each diagnostic of text that must fail; every diagnostic is an error. */
export function codesOf(text: string, options: { repoRoot?: string; file?: string; readFile?: (p: string) => string } = {}): string[] {
  const file = options.file ?? 'policy.yaml';
  const r = loadPolicyText(text, file, { repoRoot: options.repoRoot ?? process.cwd() }, options.readFile);
  return failed(r).map(where);
}

export function failed(r: PolicyLoadResult): Diagnostic[] {
  if (r.ok) throw new Error(`expected diagnostics, but the policy '${r.policy.id}' loaded`);
  for (const d of r.diagnostics) expect(d.severity).toBe('error');
  return r.diagnostics;
}

export function where(d: Diagnostic): string {
  return d.span ? `${d.code}@${d.span.line}:${d.span.column}` : d.code;
}

/** `line:column-endLine:endColumn`, to state a span exactly without its offsets. */
export function range(span: Span): string {
  return `${span.line}:${span.column}-${span.endLine}:${span.endColumn}`;
}

/** A minimal valid policy head; append fields after it. */
export const HEAD = 'id: p\ndescription: A test policy.\n';
