/**
 * The size expressions of architecture definitions: `=ceil(64 * width)`, `=stages[2]`,
 * `=max(8, floor(hidden / 4))`. A small language of our own, read by a hand-written parser and
 * evaluated over exact rationals: numbers (integers and decimals), parameter names, `+ - * /`
 * (also `−`, `×`, `÷`), `^` with an integer exponent, `ceil`, `floor`, `min`, `max`, indexing a
 * list parameter (`stages[0]`, from 0) and parentheses. There is nothing else: no strings, no
 * other names, no calls but the four, so an expression cannot run anything or reach a file.
 *
 * Every problem is an `ExpressionError` with the offsets of the characters at fault in the
 * expression text, so the loader can point at the operator or name in the definition file:
 * syntax, an unknown name (with "did you mean"), division by zero, a number past 2^63, an index
 * outside its list. An expression longer than MAX_EXPRESSION_LENGTH characters or nested deeper
 * than MAX_EXPRESSION_DEPTH is refused before it is evaluated.
 */
import { closest } from '../text/suggest.js';
import {
  add,
  ceil,
  compare,
  div,
  floor,
  formatExact,
  isInteger,
  isZero,
  mul,
  neg,
  OverflowError,
  parseDecimal,
  pow,
  sub,
  type Exact,
} from './exact-number.js';

/** Characters of one expression, the leading `=` included. */
export const MAX_EXPRESSION_LENGTH = 500;
/** Nesting of parentheses, calls, indices, signs and powers. */
export const MAX_EXPRESSION_DEPTH = 32;
/** |k| in `x ^ k`. */
export const MAX_EXPONENT = 64;

export type ExpressionCode =
  | 'definition/expression-syntax'
  | 'definition/expression-limit'
  | 'definition/unknown-parameter'
  | 'definition/expression-type'
  | 'definition/division-by-zero'
  | 'definition/overflow'
  | 'definition/index';

/** A problem at characters [start, end) of the expression text. */
export interface ExpressionError {
  readonly code: ExpressionCode;
  readonly message: string;
  readonly start: number;
  readonly end: number;
}

/** What a name stands for while evaluating: a number, or a list of numbers. */
export type ParameterValue = Exact | readonly Exact[];

export type Expr =
  | { readonly t: 'num'; readonly value: Exact; readonly start: number; readonly end: number }
  | { readonly t: 'name'; readonly name: string; readonly start: number; readonly end: number }
  | { readonly t: 'index'; readonly list: { readonly name: string; readonly start: number; readonly end: number }; readonly index: Expr; readonly start: number; readonly end: number }
  | { readonly t: 'neg'; readonly operand: Expr; readonly start: number; readonly end: number }
  | { readonly t: 'bin'; readonly op: '+' | '-' | '*' | '/' | '^'; readonly left: Expr; readonly right: Expr; readonly opStart: number; readonly start: number; readonly end: number }
  | { readonly t: 'call'; readonly fn: Fn; readonly args: readonly Expr[]; readonly start: number; readonly end: number };

type Fn = 'ceil' | 'floor' | 'min' | 'max';
const FUNCTIONS: ReadonlyMap<string, { readonly min: number; readonly max: number }> = new Map([
  ['ceil', { min: 1, max: 1 }],
  ['floor', { min: 1, max: 1 }],
  ['min', { min: 2, max: 16 }],
  ['max', { min: 2, max: 16 }],
]);

/** Whether a YAML string is an expression (it starts with `=`). */
export function isExpressionText(value: unknown): value is string {
  return typeof value === 'string' && value.startsWith('=');
}

type Token =
  | { readonly k: 'num'; readonly text: string; readonly start: number; readonly end: number }
  | { readonly k: 'name'; readonly text: string; readonly start: number; readonly end: number }
  | { readonly k: 'op'; readonly text: string; readonly start: number; readonly end: number }
  | { readonly k: 'end'; readonly text: ''; readonly start: number; readonly end: number };

const OPERATORS: Readonly<Record<string, string>> = { '+': '+', '-': '-', '−': '-', '*': '*', '×': '*', '/': '/', '÷': '/', '^': '^', '(': '(', ')': ')', '[': '[', ']': ']', ',': ',' };

class Fail extends Error {
  constructor(readonly problem: ExpressionError) {
    super(problem.message);
  }
}

function fail(code: ExpressionCode, message: string, start: number, end: number): never {
  throw new Fail({ code, message, start, end: Math.max(end, start + 1) });
}

function tokenize(text: string): Token[] {
  const out: Token[] = [];
  let i = 1; // after '='
  while (i < text.length) {
    const c = text[i]!;
    if (/\s/.test(c)) {
      i++;
      continue;
    }
    const num = /^(?:[0-9]+(?:\.[0-9]+)?|\.[0-9]+)/.exec(text.slice(i));
    if (num) {
      const after = text[i + num[0].length];
      if (after !== undefined && /[A-Za-z_.0-9]/.test(after)) fail('definition/expression-syntax', `'${text.slice(i, i + num[0].length + 1)}' is not a number; write decimals as 0.5`, i, i + num[0].length + 1);
      out.push({ k: 'num', text: num[0], start: i, end: i + num[0].length });
      i += num[0].length;
      continue;
    }
    const name = /^[A-Za-z_][A-Za-z0-9_]*/.exec(text.slice(i));
    if (name) {
      out.push({ k: 'name', text: name[0], start: i, end: i + name[0].length });
      i += name[0].length;
      continue;
    }
    const op = OPERATORS[c];
    if (op !== undefined) {
      out.push({ k: 'op', text: op, start: i, end: i + 1 });
      i++;
      continue;
    }
    fail('definition/expression-syntax', `'${c}' has no meaning in an expression; it reads numbers, parameter names, + - * / ^, ( ), [ ] and ceil, floor, min, max`, i, i + 1);
  }
  out.push({ k: 'end', text: '', start: text.length, end: text.length });
  return out;
}

class Parser {
  private at = 0;
  private depth = 0;

  constructor(
    private readonly text: string,
    private readonly tokens: readonly Token[],
  ) {}

  parse(): Expr {
    if (this.peek().k === 'end') fail('definition/expression-syntax', "the expression is empty; write a value after '=', e.g. '=ceil(64 * width)'", 0, this.text.length);
    const e = this.additive();
    const t = this.peek();
    if (t.k !== 'end') fail('definition/expression-syntax', `unexpected '${t.text}' after a complete expression`, t.start, t.end);
    return e;
  }

  private peek(): Token {
    return this.tokens[this.at]!;
  }

  private next(): Token {
    return this.tokens[this.at++]!;
  }

  private isOp(text: string): boolean {
    const t = this.peek();
    return t.k === 'op' && t.text === text;
  }

  private expect(text: string, what: string): Token {
    const t = this.peek();
    if (t.k === 'op' && t.text === text) return this.next();
    const got = t.k === 'end' ? 'the end of the expression' : `'${t.text}'`;
    return fail('definition/expression-syntax', `expected '${text}' ${what}, got ${got}`, t.start, t.end);
  }

  private deeper<T>(start: number, f: () => T): T {
    if (++this.depth > MAX_EXPRESSION_DEPTH) {
      fail('definition/expression-limit', `the expression is nested more than ${MAX_EXPRESSION_DEPTH} levels deep here; split it or simplify it`, start, start + 1);
    }
    try {
      return f();
    } finally {
      this.depth--;
    }
  }

  private additive(): Expr {
    let left = this.multiplicative();
    while (this.isOp('+') || this.isOp('-')) {
      const op = this.next();
      const right = this.multiplicative();
      left = { t: 'bin', op: op.text as '+' | '-', left, right, opStart: op.start, start: left.start, end: right.end };
    }
    return left;
  }

  private multiplicative(): Expr {
    let left = this.unary();
    while (this.isOp('*') || this.isOp('/')) {
      const op = this.next();
      const right = this.unary();
      left = { t: 'bin', op: op.text as '*' | '/', left, right, opStart: op.start, start: left.start, end: right.end };
    }
    return left;
  }

  private unary(): Expr {
    const t = this.peek();
    if (t.k === 'op' && (t.text === '-' || t.text === '+')) {
      this.next();
      const operand = this.deeper(t.start, () => this.unary());
      return t.text === '-' ? { t: 'neg', operand, start: t.start, end: operand.end } : operand;
    }
    return this.power();
  }

  private power(): Expr {
    const base = this.primary();
    if (!this.isOp('^')) return base;
    const op = this.next();
    const exponent = this.deeper(op.start, () => this.unary());
    return { t: 'bin', op: '^', left: base, right: exponent, opStart: op.start, start: base.start, end: exponent.end };
  }

  private primary(): Expr {
    const t = this.next();
    if (t.k === 'num') {
      let value: Exact | undefined;
      try {
        value = parseDecimal(t.text);
      } catch (e) {
        if (e instanceof OverflowError) fail('definition/overflow', `${t.text} is beyond 2^63; numbers in expressions must stay below it`, t.start, t.end);
        throw e;
      }
      if (!value) fail('definition/expression-syntax', `'${t.text}' is not a number`, t.start, t.end);
      return { t: 'num', value, start: t.start, end: t.end };
    }
    if (t.k === 'name') {
      if (this.isOp('(')) return this.deeper(t.start, () => this.call(t));
      if (this.isOp('[')) {
        return this.deeper(t.start, () => {
          this.next();
          const index = this.additive();
          const close = this.expect(']', 'to close the index');
          return { t: 'index', list: { name: t.text, start: t.start, end: t.end }, index, start: t.start, end: close.end };
        });
      }
      if (FUNCTIONS.has(t.text)) fail('definition/expression-syntax', `${t.text} is a function; call it with its arguments in parentheses, e.g. ${t.text}(…)`, t.start, t.end);
      return { t: 'name', name: t.text, start: t.start, end: t.end };
    }
    if (t.k === 'op' && t.text === '(') {
      return this.deeper(t.start, () => {
        const inner = this.additive();
        const close = this.expect(')', 'to close the parenthesis');
        return { ...inner, start: t.start, end: close.end };
      });
    }
    const got = t.k === 'end' ? 'the end of the expression' : `'${t.text}'`;
    return fail('definition/expression-syntax', `expected a number, a parameter name or '(', got ${got}`, t.start, t.end);
  }

  private call(name: Token): Expr {
    const spec = FUNCTIONS.get(name.text);
    if (!spec) {
      const guess = closest(name.text, [...FUNCTIONS.keys()]);
      fail('definition/expression-syntax', `'${name.text}' is not a function${guess ? ` (did you mean '${guess}'?)` : ''}; the functions are ceil, floor, min and max`, name.start, name.end);
    }
    this.next(); // (
    const args: Expr[] = [];
    if (!this.isOp(')')) {
      args.push(this.additive());
      while (this.isOp(',')) {
        this.next();
        args.push(this.additive());
      }
    }
    const close = this.expect(')', `to close ${name.text}(`);
    if (args.length < spec.min || args.length > spec.max) {
      const wanted = spec.min === spec.max ? `${spec.min} argument` : `${spec.min} to ${spec.max} arguments`;
      fail('definition/expression-syntax', `${name.text} takes ${wanted}, got ${args.length}`, name.start, close.end);
    }
    return { t: 'call', fn: name.text as Fn, args, start: name.start, end: close.end };
  }
}

export type Parsed = { readonly ok: true; readonly expr: Expr } | { readonly ok: false; readonly error: ExpressionError };

/** Parses `=…` text (the leading `=` included; offsets count it). */
export function parseExpression(text: string): Parsed {
  if (text.length > MAX_EXPRESSION_LENGTH) {
    return { ok: false, error: { code: 'definition/expression-limit', message: `the expression is ${text.length} characters long; at most ${MAX_EXPRESSION_LENGTH} are read`, start: 0, end: text.length } };
  }
  try {
    return { ok: true, expr: new Parser(text, tokenize(text)).parse() };
  } catch (e) {
    if (e instanceof Fail) return { ok: false, error: e.problem };
    throw e;
  }
}

export type Evaluated = { readonly ok: true; readonly value: Exact; readonly used: readonly string[] } | { readonly ok: false; readonly error: ExpressionError };

/**
 * The value of a parsed expression with the given parameters, and the parameters it read (in
 * the order first read). Names are looked up in `values` only.
 */
export function evaluateExpression(expr: Expr, values: ReadonlyMap<string, ParameterValue>): Evaluated {
  const used: string[] = [];
  const lookup = (name: string, start: number, end: number): ParameterValue => {
    const v = values.get(name);
    if (v === undefined) {
      const guess = closest(name, [...values.keys()]);
      const known = values.size > 0 ? `; the parameters are ${[...values.keys()].join(', ')}` : '; the definition declares no parameters';
      fail('definition/unknown-parameter', `'${name}' is not a parameter of this definition${guess ? ` (did you mean '${guess}'?)` : ''}${known}`, start, end);
    }
    if (!used.includes(name)) used.push(name);
    return v;
  };
  const guarded = (f: () => Exact, start: number, end: number, what: string): Exact => {
    try {
      return f();
    } catch (e) {
      if (e instanceof OverflowError) fail('definition/overflow', `${what} overflows: ${e.message}; values in expressions must stay below 2^63 (numerator and denominator)`, start, end);
      throw e;
    }
  };
  const value = (e: Expr): Exact => {
    switch (e.t) {
      case 'num':
        return e.value;
      case 'name': {
        const v = lookup(e.name, e.start, e.end);
        if (isList(v)) fail('definition/expression-type', `'${e.name}' is a list; pick one entry, e.g. ${e.name}[0]`, e.start, e.end);
        return v;
      }
      case 'index': {
        const list = lookup(e.list.name, e.list.start, e.list.end);
        if (!isList(list)) fail('definition/expression-type', `'${e.list.name}' is a number, not a list; it cannot be indexed`, e.list.start, e.list.end);
        const i = value(e.index);
        if (!isInteger(i) || i.n < 0n || i.n >= BigInt(list.length)) {
          fail('definition/index', `index ${formatExact(i)} is outside ${e.list.name}, which has ${list.length} entr${list.length === 1 ? 'y' : 'ies'} (indices 0 to ${list.length - 1})`, e.index.start, e.index.end);
        }
        return list[Number(i.n)]!;
      }
      case 'neg':
        return neg(value(e.operand));
      case 'call':
        return callOf(e.fn, e.args.map(value));
      case 'bin': {
        const l = value(e.left);
        const r = value(e.right);
        switch (e.op) {
          case '+':
            return guarded(() => add(l, r), e.start, e.end, 'this sum');
          case '-':
            return guarded(() => sub(l, r), e.start, e.end, 'this difference');
          case '*':
            return guarded(() => mul(l, r), e.start, e.end, 'this product');
          case '/':
            if (isZero(r)) fail('definition/division-by-zero', `division by zero: ${describe(e.right)} is 0 here`, e.right.start, e.right.end);
            return guarded(() => div(l, r), e.start, e.end, 'this quotient');
          case '^': {
            if (!isInteger(r) || r.n > BigInt(MAX_EXPONENT) || r.n < -BigInt(MAX_EXPONENT)) {
              fail('definition/expression-type', `the exponent is ${formatExact(r)}; it must be an integer from -${MAX_EXPONENT} to ${MAX_EXPONENT}`, e.right.start, e.right.end);
            }
            if (isZero(l) && r.n < 0n) fail('definition/division-by-zero', 'division by zero: 0 to a negative power', e.start, e.end);
            return guarded(() => pow(l, Number(r.n)), e.start, e.end, 'this power');
          }
        }
      }
    }
  };
  try {
    return { ok: true, value: value(expr), used };
  } catch (err) {
    if (err instanceof Fail) return { ok: false, error: err.problem };
    throw err;
  }
}

function callOf(fn: Fn, args: readonly Exact[]): Exact {
  switch (fn) {
    case 'ceil':
      return ceil(args[0]!);
    case 'floor':
      return floor(args[0]!);
    case 'min':
      return args.reduce((a, b) => (compare(b, a) < 0 ? b : a));
    case 'max':
      return args.reduce((a, b) => (compare(b, a) > 0 ? b : a));
  }
}

function isList(v: ParameterValue): v is readonly Exact[] {
  return Array.isArray(v);
}

function describe(e: Expr): string {
  switch (e.t) {
    case 'num':
      return formatExact(e.value);
    case 'name':
      return e.name;
    default:
      return 'the divisor';
  }
}

/** The parameter names an expression mentions, in the order written. */
export function namesOf(expr: Expr): string[] {
  const out: string[] = [];
  const visit = (e: Expr): void => {
    switch (e.t) {
      case 'num':
        return;
      case 'name':
        if (!out.includes(e.name)) out.push(e.name);
        return;
      case 'index':
        if (!out.includes(e.list.name)) out.push(e.list.name);
        visit(e.index);
        return;
      case 'neg':
        visit(e.operand);
        return;
      case 'bin':
        visit(e.left);
        visit(e.right);
        return;
      case 'call':
        e.args.forEach(visit);
        return;
    }
  };
  visit(expr);
  return out;
}
