/**
 * JUnit XML is read by CI systems with strict XML parsers, and one stray control character or
 * unescaped ampersand makes the whole report unreadable. So every output here goes through a small
 * hand-written XML reader that rejects what a conforming parser would reject, and the assertions
 * are made on what it reads back, not on substrings.
 */
import { describe, expect, it } from 'vitest';
import { NO_SPAN, type Diagnostic } from '../../src/diagnostic.js';
import type { PolicyResult, RequirementResult, RequirementVerdict } from '../../src/policy/evaluate.js';
import type { Policy, Requirement } from '../../src/policy/policy.js';
import type { Fix } from '../../src/policy/fix-search.js';
import { log2Big } from '../../src/cut/types.js';
import { junitXml, xmlText } from '../../src/report/junit.js';

// ---------------------------------------------------------------------------------------------
// A minimal XML 1.0 reader: elements, attributes, character data and the five predefined entities
// plus character references; no DTDs, comments or CDATA, since the writer never emits them.

interface XmlElement {
  readonly name: string;
  readonly attrs: Record<string, string>;
  readonly children: XmlElement[];
  text: string;
}

const PREDEFINED: Record<string, string> = { amp: '&', lt: '<', gt: '>', quot: '"', apos: "'" };

function isXmlChar(cp: number): boolean {
  return (
    cp === 0x9 || cp === 0xa || cp === 0xd || (cp >= 0x20 && cp <= 0xd7ff) || (cp >= 0xe000 && cp <= 0xfffd) || (cp >= 0x10000 && cp <= 0x10ffff)
  );
}

function isNameStart(c: string): boolean {
  return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || c === '_' || c === ':';
}

function isNameChar(c: string): boolean {
  return isNameStart(c) || (c >= '0' && c <= '9') || c === '-' || c === '.';
}

function isSpace(c: string | undefined): boolean {
  return c === ' ' || c === '\t' || c === '\n' || c === '\r';
}

function parseXml(doc: string): XmlElement {
  for (const ch of doc) {
    const cp = ch.codePointAt(0)!;
    if (!isXmlChar(cp) || (cp >= 0xd800 && cp <= 0xdfff)) throw new Error(`character U+${cp.toString(16)} is not allowed in XML 1.0`);
  }
  let i = 0;
  const fail = (why: string): never => {
    throw new Error(`${why} at offset ${i}: ${JSON.stringify(doc.slice(i, i + 30))}`);
  };
  const skipSpace = (): void => {
    while (isSpace(doc[i])) i++;
  };
  const name = (): string => {
    const start = i;
    if (!isNameStart(doc[i] ?? '')) fail('expected a name');
    while (isNameChar(doc[i] ?? '')) i++;
    return doc.slice(start, i);
  };
  // Character data or an attribute value up to `stop`, with references resolved.
  const chars = (stop: string, inAttribute: boolean): string => {
    let out = '';
    while (i < doc.length && doc[i] !== stop) {
      const c = doc[i]!;
      if (c === '<') fail('raw < in character data');
      if (c === '&') {
        const end = doc.indexOf(';', i);
        if (end < 0) fail('unterminated reference');
        const ref = doc.slice(i + 1, end);
        if (ref.startsWith('#x')) out += String.fromCodePoint(checkedRef(parseInt(ref.slice(2), 16), ref));
        else if (ref.startsWith('#')) out += String.fromCodePoint(checkedRef(parseInt(ref.slice(1), 10), ref));
        else if (ref in PREDEFINED) out += PREDEFINED[ref]!;
        else fail(`unknown entity &${ref};`);
        i = end + 1;
        continue;
      }
      // Attribute-value normalisation: literal whitespace becomes a space.
      out += inAttribute && (c === '\t' || c === '\n' || c === '\r') ? ' ' : c;
      i++;
    }
    return out;
  };
  const checkedRef = (cp: number, ref: string): number => {
    if (!Number.isInteger(cp) || !isXmlChar(cp)) fail(`reference &${ref}; is not an XML character`);
    return cp;
  };

  if (doc.startsWith('<?xml')) {
    const end = doc.indexOf('?>');
    if (end < 0) fail('unterminated XML declaration');
    i = end + 2;
  }
  skipSpace();
  const stack: XmlElement[] = [];
  let root: XmlElement | null = null;
  while (i < doc.length) {
    if (doc[i] !== '<') {
      const t = chars('<', false);
      const top = stack[stack.length - 1];
      if (top) top.text += t;
      else if (t.trim() !== '') fail('text outside the root element');
      continue;
    }
    i++;
    if (doc[i] === '/') {
      i++;
      const n = name();
      skipSpace();
      if (doc[i] !== '>') fail('expected > after end tag name');
      i++;
      const open = stack.pop();
      if (!open || open.name !== n) fail(`end tag </${n}> does not match <${open?.name ?? ''}>`);
      continue;
    }
    const el: XmlElement = { name: name(), attrs: {}, children: [], text: '' };
    for (;;) {
      const hadSpace = isSpace(doc[i]);
      skipSpace();
      if (doc[i] === '/' || doc[i] === '>') break;
      if (!hadSpace) fail('attributes must be separated by whitespace');
      const a = name();
      skipSpace();
      if (doc[i] !== '=') fail('expected =');
      i++;
      skipSpace();
      const q = doc[i];
      if (q !== '"' && q !== "'") fail('expected a quoted attribute value');
      i++;
      const v = chars(q!, true);
      if (doc[i] !== q) fail('unterminated attribute value');
      i++;
      if (Object.hasOwn(el.attrs, a)) fail(`duplicate attribute ${a}`);
      el.attrs[a] = v;
    }
    const parent = stack[stack.length - 1];
    if (parent) parent.children.push(el);
    else if (root) fail('a second root element');
    else root = el;
    if (doc[i] === '/') {
      i++;
      if (doc[i] !== '>') fail('expected /> ');
      i++;
    } else {
      i++;
      stack.push(el);
    }
  }
  if (stack.length > 0) throw new Error(`unclosed <${stack[stack.length - 1]!.name}>`);
  if (!root) throw new Error('no root element');
  return root;
}

function children(el: XmlElement, name: string): XmlElement[] {
  return el.children.filter((c) => c.name === name);
}

function only(el: XmlElement, name: string): XmlElement {
  const found = children(el, name);
  expect(found, `exactly one <${name}> in <${el.name}>`).toHaveLength(1);
  return found[0]!;
}

// ---------------------------------------------------------------------------------------------
// Hand-built results.

function policy(id: string, over: Partial<Policy> = {}): Policy {
  return {
    id,
    description: `policy ${id}`,
    file: `policies/${id}.yaml`,
    surrogate: 'tree',
    appliesTo: ['configs/**'],
    partitions: new Map(),
    requirements: [],
    unproven: 'warn',
    removal: 'warn',
    chain: [`policies/${id}.yaml`],
    span: NO_SPAN,
    ...over,
  };
}

interface ReqOptions {
  readonly verdict: RequirementVerdict;
  readonly failing?: boolean;
  readonly min?: bigint;
  readonly upper?: bigint;
  readonly lower?: bigint | null;
  readonly fixes?: Fix[];
}

function requirement(partition: string, o: ReqOptions): RequirementResult {
  const min = o.min ?? 1n << 20n;
  const upper = o.upper ?? (o.verdict === 'fail' ? 1n << 12n : 1n << 30n);
  const lower = o.lower === undefined ? (o.verdict === 'pass' ? 1n << 24n : 1n << 8n) : o.lower;
  const req: Requirement = {
    partition,
    minRank: min,
    written: `min_bits: ${log2Big(min)}`,
    unproven: o.failing && o.verdict === 'unproven' ? 'fail' : 'warn',
    file: 'policies/team.yaml',
    span: { ...NO_SPAN, line: 7 },
  };
  return {
    requirement: req,
    partition: { label: partition, kind: 'left-right', side: new Uint8Array([1, 1, 0, 0]), description: 'positions 0–1 against 2–3' },
    bounds: {
      partition,
      upper: { rank: upper, log2: log2Big(upper), method: 'min-cut', cut: [{ layer: 2, line: 9, dim: 8, count: 4 }] },
      lower: lower === null ? null : { rank: lower, log2: log2Big(lower), method: 'degree', cut: [] },
      status: lower === upper ? 'exact' : lower === null ? 'upper-only' : 'bounded',
    },
    verdict: o.verdict,
    failing: o.failing ?? o.verdict === 'fail',
    fixes: o.fixes ?? [],
  };
}

function result(file: string, p: Policy, requirements: RequirementResult[]): PolicyResult {
  return {
    file,
    policy: p,
    surrogate: p.surrogate,
    verdict: requirements.some((r) => r.failing) ? 'fail' : 'pass',
    requirements,
    notes: [],
  };
}

function diagnostic(over: Partial<Diagnostic> = {}): Diagnostic {
  return {
    code: 'config/unknown-field',
    message: 'unknown field `chanels`; did you mean `channels`?',
    file: 'configs/broken.yaml',
    span: { ...NO_SPAN, line: 4, column: 7 },
    severity: 'error',
    ...over,
  };
}

const FIX: Fix = { layer: 2, field: 'channels', line: 9, column: 15, from: 8, to: 1024, addedParameters: 123456n, verdict: 'pass' };

const TEAM = policy('team');
const STRICT = policy('strict', { unproven: 'fail' });

const RESULTS: PolicyResult[] = [
  result('configs/vision/resnet.yaml', TEAM, [
    requirement('left-right', { verdict: 'pass' }),
    requirement('top-bottom', { verdict: 'fail', fixes: [FIX] }),
    requirement('checkerboard', { verdict: 'unproven' }),
  ]),
  result('configs/vision/resnet.yaml', STRICT, [requirement('left-right', { verdict: 'unproven', failing: true })]),
  result('configs/audio.yaml', TEAM, [requirement('start-end', { verdict: 'pass' })]),
];

const ERRORS: Diagnostic[] = [
  diagnostic(),
  diagnostic({ code: 'io/unreadable', message: 'cannot read the file', file: 'configs/gone.yaml', span: undefined }),
  diagnostic({ severity: 'warning', message: 'kernel ignored', code: 'config/kernel-ignored' }),
];

// ---------------------------------------------------------------------------------------------

describe('the XML reader used by these tests', () => {
  it('rejects what a conforming parser rejects', () => {
    expect(() => parseXml('<a><b></a></b>')).toThrow(/does not match/);
    expect(() => parseXml('<a x="1 & 2"/>')).toThrow(/unknown entity|unterminated/);
    expect(() => parseXml('<a>\u0001</a>')).toThrow(/not allowed/);
    expect(() => parseXml('<a>&#1;</a>')).toThrow(/not an XML character/);
    expect(() => parseXml('<a x="1" x="2"/>')).toThrow(/duplicate/);
    expect(() => parseXml('<a/><b/>')).toThrow(/second root/);
    expect(() => parseXml('<a>')).toThrow(/unclosed/);
    expect(() => parseXml('<a x="<"/>')).toThrow(/raw </);
  });

  it('reads what it should', () => {
    const el = parseXml('<?xml version="1.0"?>\n<a x="&lt;&#10;&apos;">t &amp; <b/>u</a>\n');
    expect(el.attrs['x']).toBe("<\n'");
    expect(el.text).toBe('t & u');
    expect(el.children.map((c) => c.name)).toEqual(['b']);
  });
});

describe('junitXml', () => {
  const xml = junitXml(RESULTS, ERRORS);
  const root = parseXml(xml);

  it('is a well-formed document with an XML declaration', () => {
    expect(xml.startsWith('<?xml version="1.0" encoding="UTF-8"?>\n<testsuites')).toBe(true);
    expect(xml.endsWith('</testsuites>\n')).toBe(true);
    expect(root.name).toBe('testsuites');
  });

  it('counts tests, failures, errors and skipped tests on the root and on each suite', () => {
    // 5 requirements + 2 input errors (the warning is not one); failing: top-bottom, strict left-right;
    // skipped: the unproven checkerboard counted as a warning.
    expect(root.attrs).toEqual({ name: 'rankfloor', tests: '7', failures: '2', errors: '2', skipped: '1' });
    const suites = children(root, 'testsuite');
    expect(suites.map((s) => [s.attrs['name'], s.attrs['tests'], s.attrs['failures'], s.attrs['errors'], s.attrs['skipped']])).toEqual([
      ['configs/audio.yaml: team', '1', '0', '0', '0'],
      ['configs/vision/resnet.yaml: strict', '1', '1', '0', '0'],
      ['configs/vision/resnet.yaml: team', '3', '1', '0', '1'],
      ['input errors', '2', '0', '2', '0'],
    ]);
    for (const s of suites) expect(children(s, 'testcase')).toHaveLength(Number(s.attrs['tests']));
    const cases = suites.flatMap((s) => children(s, 'testcase'));
    expect(cases.flatMap((c) => children(c, 'failure'))).toHaveLength(2);
    expect(cases.flatMap((c) => children(c, 'error'))).toHaveLength(2);
  });

  it('names test cases by policy and partition, with the config path as dotted class name', () => {
    const team = children(root, 'testsuite').find((s) => s.attrs['name'] === 'configs/vision/resnet.yaml: team')!;
    expect(children(team, 'testcase').map((c) => [c.attrs['classname'], c.attrs['name']])).toEqual([
      ['configs.vision.resnet.yaml', 'team: left-right'],
      ['configs.vision.resnet.yaml', 'team: top-bottom'],
      ['configs.vision.resnet.yaml', 'team: checkerboard'],
    ]);
  });

  it('gives a failing requirement a failure with its explanation', () => {
    const team = children(root, 'testsuite').find((s) => s.attrs['name'] === 'configs/vision/resnet.yaml: team')!;
    const [pass, fail] = children(team, 'testcase');
    expect(pass!.children).toEqual([]);
    const failure = only(fail!, 'failure');
    expect(failure.attrs['type']).toBe('requirement-failed');
    expect(failure.attrs['message']).toBe('top-bottom: needs rank ≥ 1048576 (20.00 bits); the config allows between 256 (8.00 bits) and 4096 (12.00 bits)');
    expect(failure.text).toContain('provably short by 8.00 bits');
    expect(failure.text).toContain('bottleneck (min-cut): 4 bonds of dimension 8 from layer 2 (line 9)');
    expect(failure.text).toContain('line 9:15  layer 2 channels: 8 → 1024  (+123,456 parameters; then proven)');
    expect(failure.text).toContain('[min_bits: 20, policies/team.yaml:7]');
  });

  it('reports an unproven requirement counted as a warning as a skipped test, not as a failure', () => {
    const team = children(root, 'testsuite').find((s) => s.attrs['name'] === 'configs/vision/resnet.yaml: team')!;
    const unproven = children(team, 'testcase')[2]!;
    expect(children(unproven, 'failure')).toEqual([]);
    expect(only(unproven, 'skipped').attrs['message']).toMatch(/^checkerboard: needs rank ≥ 1048576 .*not proven to reach the minimum/);
  });

  it('gives a removed config a test case: failed when the policy says so, else skipped', () => {
    const doc = parseXml(
      junitXml([], [], [
        { file: 'configs/gone.yaml', policy: 'team', message: 'configs/gone.yaml was governed by policy team at the base and this change deletes it', failing: true },
        { file: 'configs/moved.yaml', policy: 'team', message: 'renamed to configs/moved.txt', failing: false },
      ]),
    );
    expect(doc.attrs).toEqual({ name: 'rankfloor', tests: '2', failures: '1', errors: '0', skipped: '1' });
    const [gone, moved] = children(doc, 'testsuite').map((s) => only(s, 'testcase'));
    expect(gone!.attrs['name']).toBe('team: governed config removed');
    expect(only(gone!, 'failure').attrs['type']).toBe('config-removed');
    expect(only(moved!, 'skipped').attrs['message']).toBe('renamed to configs/moved.txt');
  });

  it('fails an unproven requirement when the policy counts it as failing', () => {
    const strict = children(root, 'testsuite').find((s) => s.attrs['name'] === 'configs/vision/resnet.yaml: strict')!;
    const failure = only(only(strict, 'testcase'), 'failure');
    expect(failure.text).toContain('not proven to reach the minimum, and this policy counts unproven as failing');
  });

  it('puts input errors into their own suite as errors, without warnings', () => {
    const errors = children(root, 'testsuite').find((s) => s.attrs['name'] === 'input errors')!;
    const cases = children(errors, 'testcase');
    expect(cases.map((c) => [c.attrs['classname'], c.attrs['name']])).toEqual([
      ['configs.broken.yaml', 'configs/broken.yaml:4:7 config/unknown-field'],
      ['configs.gone.yaml', 'configs/gone.yaml io/unreadable'],
    ]);
    const [withSpan, without] = cases.map((c) => only(c, 'error'));
    expect(withSpan!.attrs).toEqual({ message: 'configs/broken.yaml:4:7: unknown field `chanels`; did you mean `channels`?', type: 'config/unknown-field' });
    expect(without!.attrs['message']).toBe('configs/gone.yaml: cannot read the file');
    expect(withSpan!.text).toContain('configs/broken.yaml:4:7: error:');
  });

  it('leaves the input-errors suite out when there are none', () => {
    const doc = parseXml(junitXml(RESULTS, [diagnostic({ severity: 'warning' })]));
    expect(children(doc, 'testsuite').map((s) => s.attrs['name'])).not.toContain('input errors');
    expect(doc.attrs['errors']).toBe('0');
  });

  it('writes an empty report for no results', () => {
    const doc = parseXml(junitXml([], []));
    expect(doc.attrs).toEqual({ name: 'rankfloor', tests: '0', failures: '0', errors: '0', skipped: '0' });
    expect(doc.children).toEqual([]);
  });
});

describe('unique test names', () => {
  it('numbers repeated partitions in order, and never collides with a name that looks numbered', () => {
    const p = policy('dup');
    const doc = parseXml(
      junitXml(
        [
          result('a.yaml', p, [
            requirement('left-right', { verdict: 'pass' }),
            requirement('left-right', { verdict: 'fail' }),
            requirement('left-right #2', { verdict: 'pass' }),
            requirement('left-right', { verdict: 'pass' }),
          ]),
        ],
        [diagnostic(), diagnostic()],
      ),
    );
    const [suite, errors] = children(doc, 'testsuite');
    const names = children(suite!, 'testcase').map((c) => c.attrs['name']);
    expect(names).toEqual(['dup: left-right', 'dup: left-right #2', 'dup: left-right #2 #2', 'dup: left-right #3']);
    expect(new Set(children(errors!, 'testcase').map((c) => c.attrs['name'])).size).toBe(2);
  });

  it('merges results of the same config and policy into one suite with unique names', () => {
    const p = policy('dup');
    const doc = parseXml(
      junitXml([result('a.yaml', p, [requirement('left-right', { verdict: 'pass' })]), result('a.yaml', p, [requirement('left-right', { verdict: 'pass' })])], []),
    );
    const suites = children(doc, 'testsuite');
    expect(suites).toHaveLength(1);
    expect(children(suites[0]!, 'testcase').map((c) => c.attrs['name'])).toEqual(['dup: left-right', 'dup: left-right #2']);
  });
});

describe('escaping', () => {
  const nasty = `a<b&"c'd>`;

  it('escapes the five special characters and drops characters XML 1.0 forbids', () => {
    expect(xmlText(nasty)).toBe('a&lt;b&amp;&quot;c&apos;d&gt;');
    expect(xmlText('x\u0000\u0001\u0008\u000b\u000c\u001f\uffff\ufffey')).toBe('xy');
    expect(xmlText('tab\tlf\ncr\r')).toBe('tab\tlf\ncr\r');
    expect(xmlText('lone \ud800 high, pair \ud83d\ude00 kept')).toBe('lone  high, pair \ud83d\ude00 kept');
  });

  it('reads back names, messages and paths exactly, less the control characters', () => {
    const p = policy(nasty);
    const doc = parseXml(
      junitXml(
        [result(`configs/R&D's "<odd>".yaml`, p, [requirement(`block:0-4,0-8\u0001\u001b[31m`, { verdict: 'fail' })])],
        [diagnostic({ message: `bad value "<&>"\u0007\nsecond line`, file: 'configs/x&y.yaml' })],
      ),
    );
    const [suite, errors] = children(doc, 'testsuite');
    expect(suite!.attrs['name']).toBe(`configs/R&D's "<odd>".yaml: ${nasty}`);
    const tc = only(suite!, 'testcase');
    expect(tc.attrs['classname']).toBe(`configs.R&D's "<odd>".yaml`);
    expect(tc.attrs['name']).toBe(`${nasty}: block:0-4,0-8[31m`);
    expect(only(tc, 'failure').attrs['message']).toContain('block:0-4,0-8[31m: needs');
    // A newline inside an attribute survives as a character reference.
    const err = only(only(errors!, 'testcase'), 'error');
    expect(err.attrs['message']).toBe('configs/x&y.yaml:4:7: bad value "<&>"\nsecond line');
    expect(err.text).toContain('bad value "<&>"\nsecond line');
  });

  it('never writes a forbidden character into the document', () => {
    const xml = junitXml(
      [result('c.yaml', policy('p\u0002'), [requirement('x\u0003', { verdict: 'unproven' })])],
      [diagnostic({ message: '\u0004' })],
    );
    expect([...xml].every((ch) => isXmlChar(ch.codePointAt(0)!))).toBe(true);
    expect(() => parseXml(xml)).not.toThrow();
  });
});

describe('determinism', () => {
  it('gives the same document whatever the order of the results', () => {
    const expected = junitXml(RESULTS, ERRORS);
    expect(junitXml([...RESULTS].reverse(), ERRORS)).toBe(expected);
    expect(junitXml([RESULTS[1]!, RESULTS[2]!, RESULTS[0]!], ERRORS)).toBe(expected);
  });

  it('has no times, dates or host names', () => {
    const xml = junitXml(RESULTS, ERRORS);
    expect(xml).not.toMatch(/\btime=|timestamp=|hostname=/);
    expect(xml).not.toMatch(/\d{4}-\d{2}-\d{2}T/);
  });
});
