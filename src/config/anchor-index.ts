/**
 * Resolves YAML aliases through an index of anchors built once per document. The parser's own
 * `Alias.resolve` searches the whole document on every call, which makes a large file with a
 * hundred aliases take tens of seconds; here each resolution is a lookup.
 */
import { isAlias, isCollection, isScalar, visit, type Alias, type Document, type Node } from 'yaml';

export class AnchorIndex {
  private byName: Map<string, { offset: number; node: Node }[]> | undefined;

  constructor(private readonly doc: Document) {}

  /** The node of the last `&name` anchor before the alias, as YAML defines it. */
  resolve(alias: Alias): Node | undefined {
    const candidates = this.index().get(alias.source);
    const at = alias.range?.[0];
    if (!candidates || at === undefined) return undefined;
    let found: Node | undefined;
    for (const c of candidates) {
      if (c.offset < at) found = c.node;
      else break;
    }
    return found;
  }

  private index(): Map<string, { offset: number; node: Node }[]> {
    if (this.byName) return this.byName;
    const byName = new Map<string, { offset: number; node: Node }[]>();
    visit(this.doc, (_key, node) => {
      if ((isScalar(node) || isCollection(node)) && !isAlias(node) && node.anchor && node.range) {
        const list = byName.get(node.anchor) ?? [];
        list.push({ offset: node.range[0], node });
        byName.set(node.anchor, list);
      }
    });
    for (const list of byName.values()) list.sort((a, b) => a.offset - b.offset);
    this.byName = byName;
    return byName;
  }
}
