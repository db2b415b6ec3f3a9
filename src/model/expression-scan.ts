/**
 * Gate 1 of the expression check (expression-check.ts): a character scan of our own, which refuses
 * every construct outside the allowed list with the character where it starts, and caps length and
 * parenthesis depth before the (recursive) mathjs parser sees the text. It also lists the function
 * calls it met, in order, for the tree walk to match.
 */
import { suggestion } from '../presentation/nearest-names.js';
import { FUNCTION_NAMES } from './functions/registry.js';
import { LIMITS } from './limits.js';

/** Letters, digits and `_`, starting with a letter (model-format.md, Names). */
export const NAME_PATTERN = /^[A-Za-z][A-Za-z0-9_]*$/;

/** Words the expression parser reads as operators or constants; none is allowed in our expressions. */
export const PARSER_WORDS: ReadonlySet<string> = new Set([
  'mod', 'to', 'in', 'and', 'or', 'xor', 'not', 'true', 'false', 'null', 'undefined', 'NaN',
  'Infinity', 'end',
]);

/** The registry's function names, as a set. */
export const ALLOWED_FUNCTIONS: ReadonlySet<string> = new Set(FUNCTION_NAMES);

export interface Issue {
  /** 0-based index in the text, when known. */
  index?: number;
  what: string;
  fix: string;
}

export interface Call {
  name: string;
  index: number;
}

type Prev = 'start' | 'operand' | 'operator' | 'open' | 'comma' | 'callname';

const NUMBER_AT = /(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?/y;
const NAME_AT = /[A-Za-z_$][A-Za-z0-9_$]*/y;

/** Refuses every construct outside the allowed list, with the index where it starts. */
export function scan(text: string): { issue?: Issue; calls: Call[] } {
  const s = new Scanner(text);
  while (s.i < text.length) {
    const c = text[s.i];
    if (isSpace(c)) {
      s.i++;
      continue;
    }
    const issue = isDigit(c) || (c === '.' && isDigit(text[s.i + 1])) ? s.number() : /[A-Za-z_$]/.test(c) ? s.name() : s.symbol(c);
    if (issue) return { issue, calls: s.calls };
  }
  if (s.stack.length) return { issue: { index: s.stack[s.stack.length - 1].index, what: 'this "(" is never closed', fix: 'add the missing ")"' }, calls: s.calls };
  return { calls: s.calls };
}

/** The scan's position and what it has seen: the kind of the last token, open parentheses and conditionals, calls. */
class Scanner {
  i = 0;
  prev: Prev = 'start';
  readonly calls: Call[] = [];
  readonly stack: { kind: 'call' | 'group'; index: number }[] = [];
  private openQuestions = 0;

  constructor(private readonly text: string) {}

  private implicit(index: number, left: string, right: string): Issue {
    return { index, what: `implicit multiplication ("${left}" directly followed by "${right}") is not allowed`, fix: `write the product with *, e.g. ${left}*${right}` };
  }

  number(): Issue | undefined {
    const { text, i } = this;
    NUMBER_AT.lastIndex = i;
    const num = NUMBER_AT.exec(text)![0];
    const after = i + num.length;
    if (this.prev === 'operand') return this.implicit(i, lastWord(text, i), num);
    const next = text[after];
    if (next !== undefined && /[A-Za-z_$]/.test(next)) {
      if (num === '0' && /[xXbBoO]/.test(next)) return { index: i, what: 'hexadecimal, binary and octal numbers are not allowed', fix: 'write the number in decimal' };
      NAME_AT.lastIndex = after;
      const name = NAME_AT.exec(text)![0];
      if (/^[eE]$/.test(name) && /[+-]/.test(text[after + 1] ?? '')) {
        return { index: i, what: `the number "${num}${name}${text[after + 1]}" has no exponent digits`, fix: 'write e.g. 1e-3' };
      }
      return this.implicit(after, num, name);
    }
    if (!Number.isFinite(Number(num))) return { index: i, what: `the number ${num} is too large (not a finite double)`, fix: 'write a number below 1.7e308 in size' };
    this.prev = 'operand';
    this.i = after;
    return undefined;
  }

  name(): Issue | undefined {
    const { text, i } = this;
    NAME_AT.lastIndex = i;
    const name = NAME_AT.exec(text)![0];
    if (this.prev === 'operand') return this.implicit(i, lastWord(text, i), name);
    const word = wordIssue(name);
    if (word) return { index: i, ...word };
    let j = i + name.length;
    while (isSpace(text[j])) j++;
    if (text[j] === '(') {
      if (!ALLOWED_FUNCTIONS.has(name)) {
        return { index: i, what: `"${name}(" calls a function "${name}", which is not allowed`, fix: `${suggestion(name, [...ALLOWED_FUNCTIONS], 'functions')} For a product write ${name}*(...)` };
      }
      this.calls.push({ name, index: i });
      this.prev = 'callname';
    } else {
      if (ALLOWED_FUNCTIONS.has(name)) return { index: i, what: `"${name}" is a function`, fix: `call it with an argument: ${name}(x)` };
      this.prev = 'operand';
    }
    this.i += name.length;
    return undefined;
  }

  /** Parentheses, commas and operators advance; every other character is refused with its reason. */
  symbol(c: string): Issue | undefined {
    const { text, i } = this;
    const two = text.slice(i, i + 2);
    const at = (what: string, fix: string): Issue => ({ index: i, what, fix });
    const step = (prev: Prev, length = 1): undefined => {
      this.prev = prev;
      this.i += length;
      return undefined;
    };
    switch (c) {
      case '(':
        if (this.prev === 'operand') return this.implicit(i, lastWord(text, i), '(');
        this.stack.push({ kind: this.prev === 'callname' ? 'call' : 'group', index: i });
        if (this.stack.length > LIMITS.parenDepth) return at(`parentheses are nested more than ${LIMITS.parenDepth} deep`, 'split the expression into named quantities under `define`');
        return step('open');
      case ')':
        if (!this.stack.length) return at('there is a ")" without a matching "("', 'remove it or add the missing "("');
        this.stack.pop();
        return step('operand');
      case ',':
        if (!this.stack.length || this.stack[this.stack.length - 1].kind !== 'call') return at('a comma is only allowed between the arguments of a function', 'remove the comma (lists are not allowed)');
        return step('comma');
      case '+':
      case '-':
      case '/':
      case '^':
        return step('operator');
      case '*':
        return two === '**' ? at('the power operator is ^, not **', 'write x^2') : step('operator');
      case '<':
      case '>':
        if (two === '<<' || two === '>>') return at(`the bit shift "${two}" is not allowed`, 'use arithmetic: x*2^n');
        return step('operator', text[i + 1] === '=' ? 2 : 1);
      case '=':
        return two !== '==' ? at('assignment "=" is not allowed in an expression', 'to compare, write ==; to name a quantity, use `define`') : step('operator', 2);
      case '!':
        return two !== '!=' ? at('"!" (factorial or "not") is not allowed', 'to compare, write !=; otherwise use a conditional c ? a : b') : step('operator', 2);
      case '?':
        this.openQuestions++;
        return step('operator');
      case ':':
        if (this.openQuestions === 0) return at('a range ":" is not allowed', 'the only ":" allowed is in a conditional: c ? a : b');
        this.openQuestions--;
        return step('operator');
      case '.':
        if ('*/^'.includes(text[i + 1] ?? '')) return at(`the element-wise operator "${two}" is not allowed`, `write ${two[1]}`);
        return at('property access "." is not allowed', 'use only declared names, numbers, operators and the allowed functions');
      default:
        return at(...refusedCharacter(c));
    }
  }
}

/** Why a character that starts no token of ours is refused, and how to mend it. */
function refusedCharacter(c: string): [what: string, fix: string] {
  switch (c) {
    case '"':
    case '`':
      return ['strings are not allowed in an expression', 'use only declared names, numbers, operators and the allowed functions'];
    case "'":
      return ['quotes (strings or transposition) are not allowed in an expression', 'remove the quote'];
    case '[':
    case ']':
      return ['square brackets (indexing, arrays or matrices) are not allowed', 'use ( ) for grouping; every quantity is a scalar'];
    case '{':
    case '}':
      return ['braces (objects) are not allowed in an expression', 'use ( ) for grouping'];
    case ';':
      return ['several statements (";") are not allowed', 'write a single expression; name parts under `define`'];
    case '%':
      return ['modulus and percent ("%") are not allowed', 'write the arithmetic out, e.g. x/100'];
    case '&':
    case '|':
    case '~':
      return [`the logical or bitwise operator "${c}" is not allowed`, 'use comparisons and conditionals: c ? a : b'];
    case '#':
      return ['comments ("#") are not allowed inside an expression', 'put the comment after the value, outside any quotes'];
    default:
      return [`the character "${c}" is not allowed in an expression`, 'use letters, digits, _, spaces, + - * / ^ ( ) , < > = ! ? : and .'];
  }
}

function isSpace(c: string | undefined): boolean {
  return c === ' ' || c === '\t' || c === '\n' || c === '\r';
}

function isDigit(c: string | undefined): boolean {
  return c !== undefined && c >= '0' && c <= '9';
}

/**
 * The token that ends just before `index` (for messages about implicit multiplication): a scan back
 * over spaces and then the word, linear in its length (an unanchored pattern such as
 * /([A-Za-z0-9_.$]+|\))\s*$/ retries from every start and is quadratic on a long word).
 */
function lastWord(text: string, index: number): string {
  let end = index;
  while (end > 0 && isSpace(text[end - 1])) end--;
  if (text[end - 1] === ')') return ')';
  let start = end;
  while (start > 0 && /[A-Za-z0-9_.$]/.test(text[start - 1])) start--;
  return start < end ? text.slice(start, end) : text.slice(Math.max(0, index - 1), index);
}

/** Why a name-like word cannot appear in an expression, or undefined when it may. */
function wordIssue(name: string): { what: string; fix: string } | undefined {
  if (PARSER_WORDS.has(name)) {
    const fixes: Record<string, string> = {
      and: 'use nested conditionals: a ? (b ? x : y) : y',
      or: 'use nested conditionals: a ? x : (b ? x : y)',
      xor: 'use nested conditionals',
      not: 'invert the comparison (< becomes >=)',
      mod: 'write the arithmetic out',
      to: 'values are in the declared units; unit conversion is not written in expressions',
      in: 'values are in the declared units; unit conversion is not written in expressions',
      true: 'write 1',
      false: 'write 0',
    };
    return { what: `"${name}" is not allowed in an expression`, fix: fixes[name] ?? 'use only finite numbers, declared names and the allowed functions' };
  }
  if (!NAME_PATTERN.test(name)) {
    return { what: `"${name}" is not a valid name`, fix: 'names use letters, digits and _, starting with a letter' };
  }
  if (name in Object.prototype || name === 'prototype') {
    return { what: `"${name}" is not allowed in an expression`, fix: 'use only declared names' };
  }
  return undefined;
}
