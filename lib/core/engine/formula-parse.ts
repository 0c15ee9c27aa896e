/**
 * Reading formulas: jsep parses the text (never eval or new Function), then every node is
 * checked against the language's whitelist (formula.ts) with plain-English messages. Kept
 * apart from the evaluator so that pages running published non-formula models (the embed)
 * load no parser: compile.ts reaches parseFormula through optional-parts.ts, and this
 * module registers itself there when it loads.
 */
import jsep from 'jsep';
import { compileFormula, FORMULA_CONSTANTS, FORMULA_FUNCTIONS, FormulaError, type BinaryOp, type FormulaFunction, type FormulaNode, type FormulaScope } from './formula';
import { provideParser } from './optional-parts';
// The functions formulas may call come with the parser (a formula is parsed before it is compiled).
import './det-math-extra';

const own = (obj: object, key: string) => Object.prototype.hasOwnProperty.call(obj, key);

// ---- jsep set-up: unary minus binds looser than power, only while this module parses ----
let parsing = false;
interface Scope {
  index: number;
  readonly expr: string;
  readonly code: number;
  gobbleSpaces(): void;
  gobbleToken(): jsep.Expression | undefined | false;
  throwError(message: string): never;
}

function powerRhs(p: Scope): jsep.Expression {
  const base = p.gobbleToken();
  if (!base) p.throwError('Expected an expression after ^');
  p.gobbleSpaces();
  if (p.expr.startsWith('**', p.index) && p.expr[p.index + 2] !== '*') {
    p.index += 2;
    return { type: 'BinaryExpression', operator: '**', left: base as jsep.Expression, right: powerRhs(p) };
  }
  return base as jsep.Expression;
}

jsep.hooks.add('gobble-token', function (this: unknown, env: { node?: jsep.Expression }) {
  if (!parsing) return;
  const p = this as Scope;
  const code = p.code;
  if (code !== 45 && code !== 43) return; // '-' or '+'
  const op = code === 45 ? '-' : '+';
  p.index++;
  const operand = p.gobbleToken();
  if (!operand) p.throwError(`Expected an expression after unary ${op}`);
  let arg = operand as jsep.Expression;
  p.gobbleSpaces();
  if (p.expr.startsWith('**', p.index) && p.expr[p.index + 2] !== '*') {
    p.index += 2;
    arg = { type: 'BinaryExpression', operator: '**', left: arg, right: powerRhs(p) };
  }
  env.node = { type: 'UnaryExpression', operator: op, argument: arg, prefix: true };
});

const BINARY_OPS: Record<string, BinaryOp> = {
  '+': '+',
  '-': '-',
  '*': '*',
  '/': '/',
  '**': '^',
  '<': '<',
  '<=': '<=',
  '>': '>',
  '>=': '>=',
  '==': '==',
  '===': '==',
  '!=': '!=',
  '!==': '!=',
  '&&': '&&',
  '||': '||',
};

function describe(node: jsep.Expression): string {
  switch (node.type) {
    case 'Identifier':
      return String(node.name);
    case 'MemberExpression':
      return `${describe(node.object as jsep.Expression)}${node.computed ? '[…]' : `.${describe(node.property as jsep.Expression)}`}`;
    case 'Literal':
      return String(node.raw);
    default:
      return node.type;
  }
}

/** Edit distance counting a swap of neighbouring letters as one edit (optimal string alignment). */
function editDistance(a: string, b: string): number {
  const A = a.toLowerCase();
  const B = b.toLowerCase();
  const d = Array.from({ length: A.length + 1 }, (_, i) => [i, ...new Array<number>(B.length).fill(0)]);
  for (let j = 1; j <= B.length; j++) d[0][j] = j;
  for (let i = 1; i <= A.length; i++)
    for (let j = 1; j <= B.length; j++) {
      d[i][j] = Math.min(d[i - 1][j] + 1, d[i][j - 1] + 1, d[i - 1][j - 1] + (A[i - 1] === B[j - 1] ? 0 : 1));
      if (i > 1 && j > 1 && A[i - 1] === B[j - 2] && A[i - 2] === B[j - 1]) d[i][j] = Math.min(d[i][j], d[i - 2][j - 2] + 1);
    }
  return d[A.length][B.length];
}

function suggestion(name: string, known: string[]): string {
  let best: string | null = null;
  let bestD = Infinity;
  for (const k of known) {
    const dd = editDistance(name, k);
    if (dd < bestD) {
      bestD = dd;
      best = k;
    }
  }
  return best !== null && bestD <= Math.max(1, Math.floor(name.length / 3)) ? ` Did you mean '${best}'?` : '';
}

function convert(node: jsep.Expression, scope: FormulaScope, used: Set<string>): FormulaNode {
  switch (node.type) {
    case 'Literal': {
      const v = node.value;
      if (typeof v === 'number' && Number.isFinite(v)) return { kind: 'num', value: v };
      throw new FormulaError(`Only numbers are allowed as values; found ${String(node.raw)}.`);
    }
    case 'Identifier': {
      const name = String(node.name);
      if (own(FORMULA_CONSTANTS, name) && !scope.columns.includes(name) && !scope.scalars.includes(name)) {
        return { kind: 'num', value: FORMULA_CONSTANTS[name] };
      }
      if (scope.columns.includes(name) || scope.scalars.includes(name)) {
        used.add(name);
        return { kind: 'name', name };
      }
      if (own(FORMULA_FUNCTIONS, name)) throw new FormulaError(`'${name}' is a function: call it with arguments, e.g. ${name}(x).`);
      const known = [...scope.columns, ...scope.scalars];
      throw new FormulaError(
        `Unknown name '${name}'.${suggestion(name, known)} Known names: ${known.length ? known.join(', ') : '(none)'}, pi, e.`,
      );
    }
    case 'UnaryExpression': {
      const arg = convert(node.argument as jsep.Expression, scope, used);
      if (node.operator === '-') return { kind: 'neg', arg };
      if (node.operator === '+') return arg;
      if (node.operator === '!') return { kind: 'not', arg };
      throw new FormulaError(`The operator '${String(node.operator)}' is not allowed.`);
    }
    case 'BinaryExpression': {
      const op = BINARY_OPS[String(node.operator)];
      if (!op) {
        throw new FormulaError(
          `The operator '${String(node.operator)}' is not allowed. Use + - * / ^, comparisons (< <= > >= == !=), && || and !.`,
        );
      }
      return { kind: 'bin', op, left: convert(node.left as jsep.Expression, scope, used), right: convert(node.right as jsep.Expression, scope, used) };
    }
    case 'ConditionalExpression':
      return {
        kind: 'cond',
        test: convert(node.test as jsep.Expression, scope, used),
        then: convert(node.consequent as jsep.Expression, scope, used),
        else: convert(node.alternate as jsep.Expression, scope, used),
      };
    case 'CallExpression': {
      const callee = node.callee as jsep.Expression;
      if (callee.type !== 'Identifier') {
        throw new FormulaError(`Only the built-in functions can be called; '${describe(callee)}(…)' is not allowed.`);
      }
      const fn = String(callee.name);
      if (!own(FORMULA_FUNCTIONS, fn)) {
        throw new FormulaError(
          `Unknown function '${fn}'.${suggestion(fn, Object.keys(FORMULA_FUNCTIONS))} Available: ${Object.keys(FORMULA_FUNCTIONS).join(', ')}.`,
        );
      }
      const [lo, hi] = FORMULA_FUNCTIONS[fn as FormulaFunction];
      const args = (node.arguments as jsep.Expression[]).map((a) => convert(a, scope, used));
      if (args.length < lo || args.length > hi) {
        const want = lo === hi ? `${lo}` : hi === Infinity ? `at least ${lo}` : `${lo} to ${hi}`;
        throw new FormulaError(`${fn}() takes ${want} argument${lo === 1 && hi === 1 ? '' : 's'}; found ${args.length}.`);
      }
      if (fn === 'if') return { kind: 'cond', test: args[0], then: args[1], else: args[2] };
      return { kind: 'call', fn: fn as FormulaFunction, args };
    }
    case 'MemberExpression':
      throw new FormulaError(`Member access ('${describe(node)}') is not allowed; use plain names.`);
    case 'Compound':
    case 'SequenceExpression':
      throw new FormulaError('A formula is one expression; remove the extra "," or ";".');
    case 'ArrayExpression':
      throw new FormulaError('Lists in [ ] are not allowed; pass values to a function instead, e.g. max(a, b).');
    case 'ThisExpression':
      throw new FormulaError("'this' is not allowed.");
    default:
      throw new FormulaError(`Unsupported syntax (${node.type}).`);
  }
}

export interface ParsedFormula {
  ast: FormulaNode;
  /** Column and scalar names the formula uses. */
  names: string[];
}

/** Parse and check a formula; throws FormulaError with a plain-English message. */
export function parseFormula(text: string, scope: FormulaScope): ParsedFormula {
  if (typeof text !== 'string' || text.trim() === '') throw new FormulaError('The formula is empty.');
  if (text.length > 5000) throw new FormulaError('The formula is longer than 5,000 characters.');
  const assign = /(^|[^=!<>])=(?!=)/.exec(text);
  if (assign) {
    const at = assign.index + assign[1].length;
    throw new FormulaError(`Assignment ('=') is not allowed (character ${at + 1}); use '==' to compare.`);
  }
  // '^' is power in formulas; jsep reads '**' as power with the right associativity.
  const shifts: number[] = [];
  let src = '';
  for (let i = 0; i < text.length; i++) {
    if (text[i] === '^') {
      shifts.push(src.length);
      src += '**';
    } else src += text[i];
  }
  let tree: jsep.Expression;
  parsing = true;
  try {
    tree = jsep(src);
  } catch (err) {
    const e = err as { description?: string; index?: number; message?: string };
    const idx = typeof e.index === 'number' ? e.index - shifts.filter((s) => s < (e.index as number)).length : null;
    throw new FormulaError(`Syntax error: ${e.description ?? e.message ?? 'could not read the formula'}${idx !== null ? ` at character ${idx + 1}` : ''}.`);
  } finally {
    parsing = false;
  }
  const used = new Set<string>();
  const ast = convert(tree, scope, used);
  return { ast, names: [...used] };
}

/** Check a formula; returns null when valid, else the message. */
export function checkFormula(text: string, scope: FormulaScope): string | null {
  try {
    parseFormula(text, scope);
    return null;
  } catch (err) {
    if (err instanceof FormulaError) return err.message;
    throw err;
  }
}

/** Evaluate a formula once with scalar values (used by tests and analytic checks). */
export function evaluateScalar(text: string, values: Record<string, number>): number {
  const names = Object.keys(values);
  const { ast } = parseFormula(text, { columns: [], scalars: names });
  const c = compileFormula(ast, { column: () => null, scalar: (n) => (own(values, n) ? values[n] : null) });
  if (!c.constant) throw new FormulaError('Formula did not reduce to a number.');
  const out = new Float64Array(1);
  c.evaluate(out, 0, 1);
  return out[0];
}

provideParser({ parseFormula });
