import { describe, expect, it } from 'vitest';
import { SCHEMA_ID, validateModel, type StochosModel } from '@/lib/core/engine/schema';
import {
  MAX_IMPORT_BYTES,
  exportModelJson,
  findJsonSyntaxError,
  importModelFile,
  importModelJson,
  lineColumn,
  modelFileName,
  valuePositions,
} from '@/lib/core/models/json-io';

// An invented two-part stack: a housing bore and a shaft collar (no real part or firm).
const stack = {
  schema: SCHEMA_ID,
  template: 'linear-stack',
  title: 'Collar gap / housing',
  unit: 'mm',
  settings: { trials: 20000, seed: 'gap-7', design: 'latin-hypercube' },
  dials: [],
  contributors: [
    { id: 'housing', name: 'Housing depth', nominal: 42, plusTol: 0.1, minusTol: 0.1, direction: 1, distribution: { type: 'normal', k: 3 }, meanShift: 0 },
    { id: 'collar', name: 'Collar width', nominal: 41.5, plusTol: 0.05, minusTol: 0.08, direction: -1, distribution: { type: 'uniform' }, meanShift: 0.01 },
  ],
  limits: { lower: 0.2, upper: 0.8 },
};

function parsed(model: unknown): StochosModel {
  const r = validateModel(model);
  if (!r.ok) throw new Error(JSON.stringify(r.issues));
  return r.model;
}

describe('export', () => {
  it('writes pretty JSON with the schema tag first and a trailing newline', () => {
    const text = exportModelJson(parsed(stack));
    expect(text.startsWith(`{\n  "schema": "${SCHEMA_ID}",\n  "template": "linear-stack",\n  "title": "Collar gap / housing",`)).toBe(true);
    expect(text.endsWith('}\n')).toBe(true);
  });

  it('names the file after the title, replacing characters file systems refuse', () => {
    expect(modelFileName('Collar gap / housing')).toBe('Collar gap - housing.stochos.json');
    expect(modelFileName('  a:b*c?  ')).toBe('a-b-c.stochos.json');
    expect(modelFileName('Gearbox shaft: float')).toBe('Gearbox shaft - float.stochos.json');
    expect(modelFileName('')).toBe('model.stochos.json');
    expect(modelFileName('...')).toBe('model.stochos.json');
  });
});

describe('round trip', () => {
  it('export then import gives the same model', () => {
    const model = parsed(stack);
    const back = importModelJson(exportModelJson(model));
    expect(back.ok).toBe(true);
    if (back.ok) expect(back.model).toEqual(model);
  });

  it('tolerates a byte-order mark and Windows line ends', () => {
    const text = '\ufeff' + exportModelJson(parsed(stack)).replace(/\n/g, '\r\n');
    expect(importModelJson(text).ok).toBe(true);
  });

  it('reads a File-like blob', async () => {
    const blob = new Blob([exportModelJson(parsed(stack))], { type: 'application/json' });
    const r = await importModelFile(blob);
    expect(r.ok).toBe(true);
  });
});

describe('schema tag', () => {
  it('refuses a file without a tag, naming what is expected', () => {
    const { schema: _s, ...rest } = stack;
    void _s;
    const r = importModelJson(JSON.stringify(rest));
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.errors).toHaveLength(1);
      expect(r.errors[0].path).toBe('schema');
      expect(r.errors[0].message).toContain(SCHEMA_ID);
    }
  });

  it('refuses a newer version with its number, and a foreign tag', () => {
    const newer = importModelJson(JSON.stringify({ ...stack, schema: 'stochos.model/2' }, null, 2));
    expect(newer.ok).toBe(false);
    if (!newer.ok) {
      expect(newer.errors[0].message).toMatch(/version 2 .*newer/);
      expect(newer.errors[0]).toMatchObject({ path: 'schema', line: 2, column: 13 });
    }
    const foreign = importModelJson(JSON.stringify({ ...stack, schema: 'somebody.else/1' }));
    expect(foreign.ok).toBe(false);
    if (!foreign.ok) expect(foreign.errors[0].message).toContain('not a Stochos model format');
  });

  it('refuses a document that is not an object', () => {
    for (const text of ['[]', '42', '"model"', 'null']) {
      const r = importModelJson(text);
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.errors[0].path).toBe('_');
    }
  });
});

describe('malformed JSON', () => {
  it('reports the line and column of a missing comma', () => {
    const text = '{\n  "schema": "stochos.model/1"\n  "template": "formula"\n}';
    const r = importModelJson(text);
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.errors).toHaveLength(1);
      expect(r.errors[0]).toMatchObject({ path: '_', line: 3, column: 3 });
      expect(r.errors[0].message).toContain("Expected ',' or '}' after the value");
      expect(r.errors[0].message).toContain('line 3, column 3');
    }
  });

  it('finds trailing commas, single quotes, bare words, unclosed strings and truncation', () => {
    expect(findJsonSyntaxError('{"a": [1, 2,]}')).toMatchObject({ line: 1, column: 13, message: expect.stringContaining('trailing comma') });
    expect(findJsonSyntaxError("{'a': 1}")).toMatchObject({ column: 2, message: expect.stringContaining('double quotes') });
    expect(findJsonSyntaxError('{"a": NaN}')).toMatchObject({ column: 7, message: expect.stringContaining("'NaN' is not a JSON value") });
    expect(findJsonSyntaxError('{"a": "open}')).toMatchObject({ column: 7, message: expect.stringContaining('never closed') });
    expect(findJsonSyntaxError('{"a": {"b": 1}')).toMatchObject({ column: 15, message: expect.stringContaining('the end of the file') });
    expect(findJsonSyntaxError('')).toMatchObject({ message: 'The file is empty.' });
    expect(findJsonSyntaxError('{} {}')).toMatchObject({ column: 4 });
    expect(findJsonSyntaxError('{"a": 01}')).toMatchObject({ column: 8 });
  });

  it('agrees with JSON.parse on which texts are valid', () => {
    const samples = [
      '{"a": 1e5, "b": -0.5E-3, "c": [true, false, null], "d": "\\u00e9\\n"}',
      '[]',
      ' 3 ',
      '{"a": "\\x"}',
      '{"a": 1.}',
      '{"a": -}',
      '{"a": "tab\there"}',
      '[1,,2]',
    ];
    for (const s of samples) {
      let ok = true;
      try {
        JSON.parse(s);
      } catch {
        ok = false;
      }
      expect(findJsonSyntaxError(s) === null, s).toBe(ok);
    }
  });

  it('counts lines across \\n, \\r\\n and \\r', () => {
    expect(lineColumn('a\nb\r\nc\rd', 7)).toEqual({ line: 4, column: 1 });
    expect(lineColumn('abc', 2)).toEqual({ line: 1, column: 3 });
  });
});

describe('invalid fields', () => {
  it('lists every invalid field with its dotted path, line and column', () => {
    const bad = structuredClone(stack) as typeof stack;
    bad.contributors[0].plusTol = -0.1; // tolerance below zero
    (bad.contributors[1] as Record<string, unknown>).direction = 2;
    bad.limits = { lower: 0.8, upper: 0.2 }; // limits out of order
    const text = JSON.stringify(bad, null, 2);
    const r = importModelJson(text);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    const byPath = Object.fromEntries(r.errors.map((e) => [e.path, e]));
    expect(Object.keys(byPath).sort()).toEqual(['contributors.0.plusTol', 'contributors.1.direction', 'limits.lower']);
    expect(byPath['contributors.0.plusTol'].message).toContain('0 or more');
    expect(byPath['limits.lower'].message).toMatch(/lower limit \(0\.8\) is above the upper limit \(0\.2\)/);
    // Positions point at the offending value in the file.
    const lines = text.split('\n');
    for (const e of r.errors) {
      expect(e.line).toBeTypeOf('number');
      const lineText = lines[(e.line as number) - 1];
      const key = e.path.split('.').pop() as string;
      expect(lineText).toContain(`"${key}": `);
      expect(lineText.indexOf(`"${key}": `) + key.length + 5).toBe(e.column);
    }
  });

  it('places a missing field at the object that lacks it', () => {
    const bad = structuredClone(stack) as Record<string, unknown>;
    const contributors = bad.contributors as Record<string, unknown>[];
    delete contributors[1].nominal;
    const text = JSON.stringify(bad, null, 2);
    const r = importModelJson(text);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.errors).toHaveLength(1);
    expect(r.errors[0].path).toBe('contributors.1.nominal');
    expect(r.errors[0].message).toBe('The nominal is required.');
    const objStart = valuePositions(text).get('contributors.1')!;
    expect(r.errors[0]).toMatchObject(lineColumn(text, objStart));
  });

  it('reports whole-model problems (unknown formula names) at their field', () => {
    const formula = {
      schema: SCHEMA_ID,
      template: 'formula',
      title: 'Beam deflection',
      settings: { trials: 10000, seed: 1 },
      inputs: [{ id: 'load', name: 'Load', distribution: { type: 'normal', mean: 10, sd: 1 } }],
      outputs: [{ id: 'defl', name: 'Deflection', formula: 'load * lenght' }],
    };
    const r = importModelJson(JSON.stringify(formula));
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.errors.map((e) => e.path)).toEqual(['outputs.0.formula']);
      expect(r.errors[0].message).toContain("Unknown name 'lenght'");
    }
  });

  it('refuses an oversized text before parsing it', () => {
    const r = importModelJson(' '.repeat(MAX_IMPORT_BYTES + 1));
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors[0].message).toContain('larger than');
  });
});
