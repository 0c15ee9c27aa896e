import { describe, expect, it } from 'vitest';
import { compileFormula, FormulaError } from '@/lib/core/engine/formula';
import { evaluateScalar, parseFormula } from '@/lib/core/engine/formula-parse';
import { runModelSync } from '@/lib/core/engine/simulate';

const scope = { columns: ['a', 'b', 'flow'], scalars: ['k'] };
const ev = (text: string, values: Record<string, number> = {}) => evaluateScalar(text, values);

describe('formula semantics', () => {
  it('follows the usual precedence, with ^ as a right-associative power above unary minus', () => {
    expect(ev('1 + 2 * 3')).toBe(7);
    expect(ev('(1 + 2) * 3')).toBe(9);
    expect(ev('2 ^ 3 ^ 2')).toBe(512);
    expect(ev('2 ** 3')).toBe(8);
    expect(ev('-x ^ 2', { x: 3 })).toBe(-9);
    expect(ev('(-x) ^ 2', { x: 3 })).toBe(9);
    expect(ev('2 ^ -1')).toBe(0.5);
    expect(ev('-2 ^ 2 * 3')).toBe(-12);
    expect(ev('10 - -3')).toBe(13);
    expect(ev('8 / 2 / 2')).toBe(2);
  });

  it('has comparisons, logic and conditionals that yield 1 or 0', () => {
    expect(ev('if(x > 2, 10, 20)', { x: 3 })).toBe(10);
    expect(ev('if(x > 2, 10, 20)', { x: 2 })).toBe(20);
    expect(ev('x >= 2 && x < 5', { x: 2 })).toBe(1);
    expect(ev('x == 2 || x != 2', { x: 7 })).toBe(1);
    expect(ev('!(x < 0)', { x: 7 })).toBe(1);
    expect(ev('x > 1 ? 4 : 5', { x: 0 })).toBe(5);
  });

  it('provides the whitelisted functions and constants', () => {
    expect(ev('min(3, 1, 2) + max(3, 9)')).toBe(10);
    expect(ev('sum(1, 2, 3) + mean(2, 4)')).toBe(9);
    expect(ev('abs(-2) + sqrt(16) + pow(2, 5)')).toBe(38);
    expect(ev('ln(e) + log(e) + log10(1000)')).toBeCloseTo(5, 15);
    expect(ev('exp(0) + floor(2.7) + ceil(2.1) + round(2.5)')).toBe(9);
    expect(ev('sin(pi / 2) + cos(0) + atan2(1, 1) * 4 / pi')).toBeCloseTo(3, 15);
    expect(ev('hypot(3, 4)')).toBe(5);
  });

  it('propagates NaN through comparisons instead of hiding it', () => {
    expect(ev('if(x > 0, 1, 2)', { x: NaN })).toBeNaN();
    expect(ev('x < 1', { x: NaN })).toBeNaN();
  });

  it('evaluates column-wise over Float64Arrays, in blocks, with scalars folded', () => {
    const n = 10_000;
    const a = Float64Array.from({ length: n }, (_, i) => i);
    const b = Float64Array.from({ length: n }, (_, i) => n - i);
    const { ast } = parseFormula('a * k + max(a, b) - 2 ^ 2', scope);
    const f = compileFormula(ast, { column: (x) => ({ a, b })[x as 'a' | 'b'] ?? null, scalar: (x) => (x === 'k' ? 3 : null) });
    const out = new Float64Array(n);
    f.evaluate(out, 0, 5000);
    f.evaluate(out, 5000, 5000);
    for (const i of [0, 4095, 4096, 5000, 9999]) expect(out[i]).toBe(a[i] * 3 + Math.max(a[i], b[i]) - 4);
  });
});

describe('sum and mean of many arguments', () => {
  it('add left to right, exactly as one addition at a time, with columns and scalars mixed', () => {
    const n = 5000;
    const names = Array.from({ length: 11 }, (_, i) => `c${i}`);
    // Values of very different sizes, so a different order of the additions would round differently.
    const cols: Record<string, Float64Array> = Object.fromEntries(names.map((id, j) => [id, Float64Array.from({ length: n }, (_, i) => Math.sin(i * (j + 1)) * 10 ** ((j % 5) * 4 - 8))]));
    const env = { column: (x: string) => cols[x] ?? null, scalar: (x: string) => (x === 'k' ? 0.1 : null) };
    const orders = [names, [...names.slice(0, 3), 'k', ...names.slice(3)], ['k', ...names.slice(0, 9), 'k', 'c9']];
    for (const args of orders) {
      for (const fn of ['sum', 'mean']) {
        const { ast } = parseFormula(`${fn}(${args.join(', ')})`, { columns: names, scalars: ['k'] });
        const out = new Float64Array(n);
        compileFormula(ast, env).evaluate(out, 0, n);
        let same = 0;
        for (let i = 0; i < n; i++) {
          let v = 0;
          args.forEach((a, j) => (v = j === 0 ? (a === 'k' ? 0.1 : cols[a][i]) : v + (a === 'k' ? 0.1 : cols[a][i])));
          if (Object.is(out[i], fn === 'mean' ? v / args.length : v)) same++;
        }
        expect(same, `${fn}(${args.join(', ')})`).toBe(n);
      }
    }
  });
});

describe('formula rejections (never eval: every name and call is checked)', () => {
  const reject = (text: string, pattern: RegExp) => {
    expect(() => parseFormula(text, scope)).toThrowError(FormulaError);
    expect(() => parseFormula(text, scope)).toThrowError(pattern);
  };
  it('unknown names, with a suggestion', () => {
    reject('flwo * 2', /Unknown name 'flwo'\. Did you mean 'flow'\?/);
    reject('zeta + 1', /Unknown name 'zeta'.*Known names: a, b, flow, k, pi, e/);
  });
  it('unknown functions', () => reject('foo(a)', /Unknown function 'foo'/));
  it('wrong argument counts', () => {
    reject('sqrt(a, b)', /sqrt\(\) takes 1 argument; found 2/);
    reject('if(a, b)', /if\(\) takes 3 arguments; found 2/);
  });
  it('syntax errors with the position', () => {
    reject('a + * b', /Syntax error: .* at character \d+/);
    reject('(a + b', /Syntax error/);
    reject('', /empty/);
  });
  it('assignment', () => reject('a = 3', /Assignment \('='\) is not allowed/));
  it('member access and calls on anything but a whitelisted name', () => {
    reject('Math.sqrt(a)', /Only the built-in functions can be called; 'Math\.sqrt\(…\)'/);
    reject('a.constructor', /Member access \('a\.constructor'\) is not allowed/);
    reject('a["x"]', /Member access/);
    reject('constructor(a)', /Unknown function 'constructor'/);
    reject('a(1)', /Unknown function 'a'/);
  });
  it('strings, arrays, this, sequences and bitwise operators', () => {
    reject('"abc"', /Only numbers are allowed/);
    reject('[a, b]', /Lists in \[ \] are not allowed/);
    reject('this', /'this' is not allowed/);
    reject('a, b', /one expression/);
    reject('a | b', /operator '\|' is not allowed/);
    reject('a % b', /operator '%' is not allowed/);
    reject('true', /Only numbers are allowed/);
  });
  it('a function name used as a value', () => reject('sqrt + 1', /'sqrt' is a function/));
});

describe('invalid trials are counted, not hidden', () => {
  it('division by zero and NaN are reported per output and excluded from the statistics', () => {
    const model = {
      schema: 'stochos.model/1',
      template: 'formula',
      title: 'Ratio',
      settings: { trials: 10_000, seed: 'nan-check' },
      inputs: [
        { id: 'x', name: 'X', distribution: { type: 'discrete', values: [0, 1, 2], probabilities: [0.25, 0.5, 0.25] } },
        { id: 'y', name: 'Y', distribution: { type: 'uniform', min: -1, max: 1 } },
      ],
      outputs: [
        { id: 'ratio', name: 'Ratio', formula: '1 / x' },
        { id: 'root', name: 'Root', formula: 'sqrt(y)' },
      ],
    };
    const r = runModelSync(model, { samples: 'all' });
    const x = r.samples!.inputs.x;
    const zeros = x.reduce((s, v) => s + (v === 0 ? 1 : 0), 0);
    expect(r.outputs[0].invalid).toEqual({ nan: 0, positiveInfinity: zeros, negativeInfinity: 0, total: zeros });
    expect(r.outputs[0].valid).toBe(10_000 - zeros);
    expect(r.outputs[0].max).toBe(1);
    const negatives = r.samples!.inputs.y.reduce((s, v) => s + (v < 0 ? 1 : 0), 0);
    expect(r.outputs[1].invalid.nan).toBe(negatives);
    expect(Number.isFinite(r.outputs[1].mean as number)).toBe(true);
    expect(r.outputs[1].convergence.reasons.join(' ')).toMatch(new RegExp(`${negatives.toLocaleString('en-US')} trials gave no number`));
    expect(r.warnings.join(' ')).toMatch(/Root.*NaN or an infinite value/);
  });
});
