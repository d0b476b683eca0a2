/**
 * Where each side of a check reads the architecture definitions its configs name (see
 * DEVELOPERS.md, "Architecture definitions"):
 * - the base side, from the base revision's tree, always: a base version is what it was;
 * - the head side, from the head (the working tree without links, or the index), because a
 *   definition is part of what is judged — it is the architecture the head's configs will have
 *   once merged —, while the parameter declarations, which judge a config's values, come through
 *   `JudgingFiles` (the base revision's version when it has the file). Reading that version is
 *   also how a head change to a definition becomes a notice, like a changed policy.
 * Texts read on the head side are kept for diagnostic excerpts.
 */
import type { DefinitionSource } from '../config/definition-source.js';
import { definitionReference } from '../config/architecture-reference.js';
import type { RevisionFiles } from '../git/revision-files.js';
import type { Policy } from '../policy/policy.js';
import type { HeadFiles } from './head-files.js';
import type { JudgingFiles } from './judging-files.js';

export class CheckDefinitions {
  /** Root-relative paths of the definitions the head side read. */
  readonly read = new Set<string>();
  readonly head: DefinitionSource;

  constructor(
    private readonly headFiles: HeadFiles,
    private readonly baseFiles: RevisionFiles | undefined,
    judging: JudgingFiles,
    display: (rel: string) => string,
    sources: Map<string, string>,
  ) {
    this.head = {
      read: (rel) => {
        this.read.add(rel);
        const r = headFiles.read(rel);
        if (r.kind === 'file') sources.set(display(rel), r.text);
        return r;
      },
      judging: (rel) => judging.read(rel).read,
      display,
    };
  }

  /** The definitions named by the given configs on each side, read in one batch per side. */
  prefetch(refs: Iterable<string>): void {
    const paths = [...new Set(refs)];
    if (paths.length === 0) return;
    this.baseFiles?.prefetch(paths);
  }

  /** The base revision's text of the definition at `rel`, as the batch of base evaluations takes it. */
  baseTexts(rel: string | undefined): Readonly<Record<string, string>> | undefined {
    if (rel === undefined || !this.baseFiles) return undefined;
    const r = this.baseFiles.read(rel);
    return r.kind === 'file' ? { [rel]: r.text } : undefined;
  }

  /** Whether the definition at `rel` reads differently at the base revision and in the head. */
  differs(rel: string): boolean {
    const b = this.baseFiles?.read(rel);
    const h = this.headFiles.read(rel);
    return b?.kind !== h.kind || (b.kind === 'file' && h.kind === 'file' && b.text !== h.text);
  }
}

/** The definition a config names under a policy's model path, if it names one. */
export function definitionOf(text: string, configPath: string, policy: Policy): string | undefined {
  return definitionReference(text, configPath, policy.modelPath ?? '/model');
}
