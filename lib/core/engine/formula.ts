/**
 * The formula language: a small, safe expression language parsed by jsep (never eval or
 * new Function; formula-parse.ts, loaded only where formulas are read: the schema, the
 * studio, formula models in the embed), checked against a whitelist, and compiled here into
 * column-wise evaluation over Float64Arrays.
 *
 * Allowed: numbers, input / dial / earlier output names, pi, e; + - * / ^ (power, also
 * **), unary minus, parentheses; comparisons < <= > >= == != (1 or 0), && || !;
 * cond ? a : b and if(cond, a, b); functions FORMULA_FUNCTIONS. -x^2 means -(x^2) and
 * powers associate to the right (2^3^2 = 2^9).
 */
import * as detMath from './det-math';
import { formulaMathPart } from './optional-parts';

// Bound once: module interop in some runtimes turns each imported call into a getter call.
const { asin, cos, exp, ln, pow, sin } = detMath;

export type BinaryOp = '+' | '-' | '*' | '/' | '^' | '<' | '<=' | '>' | '>=' | '==' | '!=' | '&&' | '||';

export type FormulaNode =
  | { kind: 'num'; value: number }
  | { kind: 'name'; name: string }
  | { kind: 'neg'; arg: FormulaNode }
  | { kind: 'not'; arg: FormulaNode }
  | { kind: 'bin'; op: BinaryOp; left: FormulaNode; right: FormulaNode }
  | { kind: 'call'; fn: FormulaFunction; args: FormulaNode[] }
  | { kind: 'cond'; test: FormulaNode; then: FormulaNode; else: FormulaNode }
  /** Internal (templates): constant + sum of coef * column, in one pass. */
  | { kind: 'lin'; terms: { name: string; coef: number }[]; constant: number };

/** Function name -> [minimum, maximum] argument count. */
export const FORMULA_FUNCTIONS = {
  min: [1, Infinity],
  max: [1, Infinity],
  sum: [1, Infinity],
  mean: [1, Infinity],
  abs: [1, 1],
  sqrt: [1, 1],
  exp: [1, 1],
  ln: [1, 1],
  log: [1, 1],
  log10: [1, 1],
  pow: [2, 2],
  if: [3, 3],
  floor: [1, 1],
  ceil: [1, 1],
  round: [1, 1],
  sin: [1, 1],
  cos: [1, 1],
  tan: [1, 1],
  asin: [1, 1],
  acos: [1, 1],
  atan: [1, 1],
  atan2: [2, 2],
  hypot: [1, Infinity],
} as const satisfies Record<string, readonly [number, number]>;

export type FormulaFunction = keyof typeof FORMULA_FUNCTIONS;

export const FORMULA_CONSTANTS: Record<string, number> = { pi: Math.PI, e: Math.E };

const own = (obj: object, key: string) => Object.prototype.hasOwnProperty.call(obj, key);

/** Names an input, dial or output may not take. */
export const RESERVED_NAMES = new Set<string>([
  ...Object.keys(FORMULA_FUNCTIONS),
  ...Object.keys(FORMULA_CONSTANTS),
  'true',
  'false',
  'null',
  'this',
  'undefined',
  'NaN',
  'Infinity',
  // Names that would collide with JavaScript object internals when used as keys.
  'constructor',
  'prototype',
  '__proto__',
  'hasOwnProperty',
  'toString',
  'valueOf',
]);

export interface FormulaScope {
  /** Names that hold a sampled column (inputs and earlier outputs). */
  columns: string[];
  /** Names that hold one number per run (dial variables). */
  scalars: string[];
}

export class FormulaError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'FormulaError';
  }
}

// ---- Column-wise compilation ------------------------------------------------------------

/** Trials evaluated per pass (buffers stay in cache). */
export const FORMULA_BLOCK = 4096;

type Vector = { scalar: false; run: (start: number, count: number) => Float64Array };
type Compiled = { scalar: true; value: number } | Vector;

export interface FormulaEnvironment {
  column(name: string): Float64Array | null;
  scalar(name: string): number | null;
}

function scalarBinary(op: BinaryOp, a: number, b: number): number {
  switch (op) {
    case '+':
      return a + b;
    case '-':
      return a - b;
    case '*':
      return a * b;
    case '/':
      return a / b;
    case '^':
      return b === 2 ? a * a : pow(a, b);
    case '<':
      return a !== a || b !== b ? NaN : a < b ? 1 : 0;
    case '<=':
      return a !== a || b !== b ? NaN : a <= b ? 1 : 0;
    case '>':
      return a !== a || b !== b ? NaN : a > b ? 1 : 0;
    case '>=':
      return a !== a || b !== b ? NaN : a >= b ? 1 : 0;
    case '==':
      return a !== a || b !== b ? NaN : a === b ? 1 : 0;
    case '!=':
      return a !== a || b !== b ? NaN : a !== b ? 1 : 0;
    case '&&':
      return a !== a || b !== b ? NaN : a !== 0 && b !== 0 ? 1 : 0;
    case '||':
      return a !== a || b !== b ? NaN : a !== 0 || b !== 0 ? 1 : 0;
  }
}

const UNARY_FNS: Partial<Record<FormulaFunction, (x: number) => number>> = {
  abs: Math.abs,
  sqrt: Math.sqrt,
  exp: exp,
  ln: ln,
  log: ln,
  floor: Math.floor,
  ceil: Math.ceil,
  round: Math.round,
  sin: sin,
  cos: cos,
  asin: asin,
};
/** Unary functions from det-math-extra.ts (optional-parts.ts): looked up when a formula is compiled. */
const EXTRA_UNARY = new Set<FormulaFunction>(['log10', 'tan', 'acos', 'atan']);

function vec(run: (start: number, count: number) => Float64Array): Compiled {
  return { scalar: false, run };
}

function compileNode(node: FormulaNode, env: FormulaEnvironment): Compiled {
  switch (node.kind) {
    case 'num':
      return { scalar: true, value: node.value };
    case 'name': {
      const s = env.scalar(node.name);
      if (s !== null) return { scalar: true, value: s };
      const col = env.column(node.name);
      if (!col) throw new FormulaError(`No values for '${node.name}'.`);
      return vec((start, count) => col.subarray(start, start + count));
    }
    case 'neg': {
      const a = compileNode(node.arg, env);
      if (a.scalar) return { scalar: true, value: -a.value };
      const buf = new Float64Array(FORMULA_BLOCK);
      return vec((s, c) => {
        const x = a.run(s, c);
        for (let k = 0; k < c; k++) buf[k] = -x[k];
        return buf;
      });
    }
    case 'not': {
      const a = compileNode(node.arg, env);
      const f = (v: number) => (v !== v ? NaN : v === 0 ? 1 : 0);
      if (a.scalar) return { scalar: true, value: f(a.value) };
      const buf = new Float64Array(FORMULA_BLOCK);
      return vec((s, c) => {
        const x = a.run(s, c);
        for (let k = 0; k < c; k++) buf[k] = f(x[k]);
        return buf;
      });
    }
    case 'bin':
      return compileBinary(node.op, compileNode(node.left, env), compileNode(node.right, env));
    case 'cond': {
      const t = compileNode(node.test, env);
      const a = compileNode(node.then, env);
      const b = compileNode(node.else, env);
      if (t.scalar) {
        if (t.value !== t.value) return { scalar: true, value: NaN };
        return t.value !== 0 ? a : b;
      }
      const buf = new Float64Array(FORMULA_BLOCK);
      return vec((s, c) => {
        const tv = t.run(s, c);
        const av = a.scalar ? null : a.run(s, c);
        const bv = b.scalar ? null : b.run(s, c);
        const as = a.scalar ? a.value : 0;
        const bs = b.scalar ? b.value : 0;
        for (let k = 0; k < c; k++) {
          const x = tv[k];
          buf[k] = x !== x ? NaN : x !== 0 ? (av ? av[k] : as) : bv ? bv[k] : bs;
        }
        return buf;
      });
    }
    case 'call':
      return compileCall(node.fn, node.args.map((a) => compileNode(a, env)));
    case 'lin': {
      const cols = node.terms.map((t) => {
        const col = env.column(t.name);
        if (!col) throw new FormulaError(`No values for '${t.name}'.`);
        return col;
      });
      const coefs = node.terms.map((t) => t.coef);
      const c0 = node.constant;
      if (cols.length === 0) return { scalar: true, value: c0 };
      const buf = new Float64Array(FORMULA_BLOCK);
      const unit = coefs.every((w) => w === 1 || w === -1);
      return vec((s, c) => {
        buf.fill(c0, 0, c);
        let i = 0;
        if (unit) {
          // Four +-1 terms per pass over the buffer, added one after another in term order,
          // so the sum rounds exactly as the one-term-at-a-time loop.
          for (; i + 3 < cols.length; i += 4) {
            const a = cols[i];
            const b = cols[i + 1];
            const d = cols[i + 2];
            const e = cols[i + 3];
            const wa = coefs[i];
            const wb = coefs[i + 1];
            const wd = coefs[i + 2];
            const we = coefs[i + 3];
            for (let k = 0; k < c; k++) buf[k] = buf[k] + wa * a[s + k] + wb * b[s + k] + wd * d[s + k] + we * e[s + k];
          }
        }
        for (; i < cols.length; i++) {
          const col = cols[i];
          const w = coefs[i];
          if (w === 1) for (let k = 0; k < c; k++) buf[k] += col[s + k];
          else if (w === -1) for (let k = 0; k < c; k++) buf[k] -= col[s + k];
          else for (let k = 0; k < c; k++) buf[k] += w * col[s + k];
        }
        return buf;
      });
    }
  }
}

function compileBinary(op: BinaryOp, a: Compiled, b: Compiled): Compiled {
  if (a.scalar && b.scalar) return { scalar: true, value: scalarBinary(op, a.value, b.value) };
  const buf = new Float64Array(FORMULA_BLOCK);
  // Fast loops for the arithmetic operators; the rest go through scalarBinary.
  if (!a.scalar && !b.scalar) {
    const ra = a.run;
    const rb = b.run;
    switch (op) {
      case '+':
        return vec((s, c) => {
          const x = ra(s, c);
          const y = rb(s, c);
          for (let k = 0; k < c; k++) buf[k] = x[k] + y[k];
          return buf;
        });
      case '-':
        return vec((s, c) => {
          const x = ra(s, c);
          const y = rb(s, c);
          for (let k = 0; k < c; k++) buf[k] = x[k] - y[k];
          return buf;
        });
      case '*':
        return vec((s, c) => {
          const x = ra(s, c);
          const y = rb(s, c);
          for (let k = 0; k < c; k++) buf[k] = x[k] * y[k];
          return buf;
        });
      case '/':
        return vec((s, c) => {
          const x = ra(s, c);
          const y = rb(s, c);
          for (let k = 0; k < c; k++) buf[k] = x[k] / y[k];
          return buf;
        });
      default:
        return vec((s, c) => {
          const x = ra(s, c);
          const y = rb(s, c);
          for (let k = 0; k < c; k++) buf[k] = scalarBinary(op, x[k], y[k]);
          return buf;
        });
    }
  }
  if (a.scalar) {
    const av = a.value;
    const rb = (b as { run: (s: number, c: number) => Float64Array }).run;
    switch (op) {
      case '+':
        return vec((s, c) => {
          const y = rb(s, c);
          for (let k = 0; k < c; k++) buf[k] = av + y[k];
          return buf;
        });
      case '-':
        return vec((s, c) => {
          const y = rb(s, c);
          for (let k = 0; k < c; k++) buf[k] = av - y[k];
          return buf;
        });
      case '*':
        return vec((s, c) => {
          const y = rb(s, c);
          for (let k = 0; k < c; k++) buf[k] = av * y[k];
          return buf;
        });
      default:
        return vec((s, c) => {
          const y = rb(s, c);
          for (let k = 0; k < c; k++) buf[k] = scalarBinary(op, av, y[k]);
          return buf;
        });
    }
  }
  const bv = (b as { value: number }).value;
  const ra = (a as { run: (s: number, c: number) => Float64Array }).run;
  switch (op) {
    case '+':
      return vec((s, c) => {
        const x = ra(s, c);
        for (let k = 0; k < c; k++) buf[k] = x[k] + bv;
        return buf;
      });
    case '-':
      return vec((s, c) => {
        const x = ra(s, c);
        for (let k = 0; k < c; k++) buf[k] = x[k] - bv;
        return buf;
      });
    case '*':
      return vec((s, c) => {
        const x = ra(s, c);
        for (let k = 0; k < c; k++) buf[k] = x[k] * bv;
        return buf;
      });
    case '/':
      return vec((s, c) => {
        const x = ra(s, c);
        for (let k = 0; k < c; k++) buf[k] = x[k] / bv;
        return buf;
      });
    case '^':
      if (bv === 2) {
        return vec((s, c) => {
          const x = ra(s, c);
          for (let k = 0; k < c; k++) buf[k] = x[k] * x[k];
          return buf;
        });
      }
      return vec((s, c) => {
        const x = ra(s, c);
        for (let k = 0; k < c; k++) buf[k] = pow(x[k], bv);
        return buf;
      });
    default:
      return vec((s, c) => {
        const x = ra(s, c);
        for (let k = 0; k < c; k++) buf[k] = scalarBinary(op, x[k], bv);
        return buf;
      });
  }
}

function compileCall(fn: FormulaFunction, args: Compiled[]): Compiled {
  const unary = own(UNARY_FNS, fn) ? UNARY_FNS[fn] : EXTRA_UNARY.has(fn) ? formulaMathPart()[fn as 'log10' | 'tan' | 'acos' | 'atan'] : undefined;
  if (unary) {
    const a = args[0];
    if (a.scalar) return { scalar: true, value: unary(a.value) };
    const buf = new Float64Array(FORMULA_BLOCK);
    return vec((s, c) => {
      const x = a.run(s, c);
      for (let k = 0; k < c; k++) buf[k] = unary(x[k]);
      return buf;
    });
  }
  if (fn === 'pow') return compileBinary('^', args[0], args[1]);
  const fold = (f: (x: number, y: number) => number, finish?: (x: number) => number): Compiled => {
    if (args.every((a) => a.scalar)) {
      let v = (args[0] as { value: number }).value;
      for (let i = 1; i < args.length; i++) v = f(v, (args[i] as { value: number }).value);
      return { scalar: true, value: finish ? finish(v) : v };
    }
    const buf = new Float64Array(FORMULA_BLOCK);
    return vec((s, c) => {
      const first = args[0];
      if (first.scalar) buf.fill(first.value, 0, c);
      else buf.set(first.run(s, c).subarray(0, c));
      for (let i = 1; i < args.length; i++) {
        const a = args[i];
        if (a.scalar) {
          const v = a.value;
          for (let k = 0; k < c; k++) buf[k] = f(buf[k], v);
        } else {
          const x = a.run(s, c);
          for (let k = 0; k < c; k++) buf[k] = f(buf[k], x[k]);
        }
      }
      if (finish) for (let k = 0; k < c; k++) buf[k] = finish(buf[k]);
      return buf;
    });
  };
  switch (fn) {
    case 'min':
      return fold(Math.min);
    case 'max':
      return fold(Math.max);
    case 'sum':
    case 'mean': {
      const n = args.length;
      if (args.every((a) => a.scalar)) {
        let v = 0;
        for (const a of args) v += (a as { value: number }).value;
        return { scalar: true, value: fn === 'mean' ? v / n : v };
      }
      // Left-to-right sum with plain additions (the commonest formula: worth its own loop).
      const buf = new Float64Array(FORMULA_BLOCK);
      return vec((s, c) => {
        const first = args[0];
        if (first.scalar) buf.fill(first.value, 0, c);
        else buf.set(first.run(s, c).subarray(0, c));
        let i = 1;
        // Four column arguments per pass, added one after another: the same roundings as one per pass.
        while (i + 3 < args.length && !args[i].scalar && !args[i + 1].scalar && !args[i + 2].scalar && !args[i + 3].scalar) {
          const x0 = (args[i] as Vector).run(s, c);
          const x1 = (args[i + 1] as Vector).run(s, c);
          const x2 = (args[i + 2] as Vector).run(s, c);
          const x3 = (args[i + 3] as Vector).run(s, c);
          for (let k = 0; k < c; k++) buf[k] = buf[k] + x0[k] + x1[k] + x2[k] + x3[k];
          i += 4;
        }
        for (; i < args.length; i++) {
          const a = args[i];
          if (a.scalar) {
            const v = a.value;
            for (let k = 0; k < c; k++) buf[k] += v;
          } else {
            const x = a.run(s, c);
            for (let k = 0; k < c; k++) buf[k] += x[k];
          }
        }
        if (fn === 'mean') for (let k = 0; k < c; k++) buf[k] /= n;
        return buf;
      });
    }
    case 'hypot': {
      if (args.length === 1) return compileCall('abs', args);
      const { hypotN } = formulaMathPart();
      if (args.every((a) => a.scalar)) return { scalar: true, value: hypotN(...args.map((a) => (a as { value: number }).value)) };
      const buf = new Float64Array(FORMULA_BLOCK);
      const vals = new Array<number>(args.length);
      return vec((s, c) => {
        const cols = args.map((a) => (a.scalar ? null : a.run(s, c)));
        for (let k = 0; k < c; k++) {
          for (let i = 0; i < args.length; i++) {
            const col = cols[i];
            vals[i] = col ? col[k] : (args[i] as { value: number }).value;
          }
          buf[k] = hypotN(...vals);
        }
        return buf;
      });
    }
    case 'atan2': {
      const { atan2 } = formulaMathPart();
      const [y, x] = args;
      if (y.scalar && x.scalar) return { scalar: true, value: atan2(y.value, x.value) };
      const buf = new Float64Array(FORMULA_BLOCK);
      return vec((s, c) => {
        const yv = y.scalar ? null : y.run(s, c);
        const xv = x.scalar ? null : x.run(s, c);
        const ys = y.scalar ? y.value : 0;
        const xs = x.scalar ? x.value : 0;
        for (let k = 0; k < c; k++) buf[k] = atan2(yv ? yv[k] : ys, xv ? xv[k] : xs);
        return buf;
      });
    }
    default:
      throw new FormulaError(`Function '${fn}' cannot be compiled.`);
  }
}

export interface CompiledFormula {
  /** Write the formula's value for trials [start, start + count) into out at the same positions. */
  evaluate(out: Float64Array, start: number, count: number): void;
  /** True when the formula is a constant for the run. */
  readonly constant: boolean;
}

/** Compile a parsed formula against the run's columns and dial values. */
export function compileFormula(ast: FormulaNode, env: FormulaEnvironment): CompiledFormula {
  const root = compileNode(ast, env);
  return {
    constant: root.scalar,
    evaluate(out, start, count) {
      for (let s = start; s < start + count; s += FORMULA_BLOCK) {
        const c = Math.min(FORMULA_BLOCK, start + count - s);
        if (root.scalar) out.fill(root.value, s, s + c);
        else out.set(root.run(s, c).subarray(0, c), s);
      }
    },
  };
}
