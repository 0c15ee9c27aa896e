import { describe, expect, it } from 'vitest';
import { columnError, readColumn, readCsv, readCsvText } from '@/lib/core/datasets/csv';
import { importModelJson } from '@/lib/core/models/json-io';
import { validateModel } from '@/lib/core/engine/schema';
import { exampleLinearStack } from '@/lib/core/engine/examples';
import { parseDialInput } from '@/lib/core/widget/dial-values';
import { parseNumberList } from '@/components/editor/numbers';
import { simulateRequestSchema } from '@/lib/server/simulate/run';
import { snapshotRequestSchema } from '@/lib/server/snapshots/schemas';

// 1e309 is a well-formed number that does not fit a double: it reads as Infinity, which JSON stores as null
// and a reader turns into 0. Every place a number enters refuses it and names where it was.

describe('non-finite numbers are refused where they enter', () => {
  it('a CSV cell of 1e309 is refused by row, like a cell that is not a number, and may be dropped explicitly', () => {
    const r = readCsv(new TextEncoder().encode('length\n1e309\n1\n2\n3\n'), 'overflow.csv');
    if (!r.ok) throw new Error(r.message);
    const col = readColumn(r.table, 0);
    expect(col.values).toEqual([1, 2, 3]);
    expect(col.problems).toEqual([{ row: 2, text: '1e309', reason: expect.stringMatching(/too large/) }]);
    expect(columnError('overflow.csv', 'length', col)).toMatch(/overflow\.csv, column "length": 1 row\(s\) .*row 2 \(too large: beyond ±1\.8e308, the range of a double: "1e309"\)/);
    const dropped = readColumn(r.table, 0, [2]);
    expect(dropped.problems).toEqual([]);
    expect(dropped.dropped).toEqual([2]);
    expect(columnError('overflow.csv', 'length', dropped)).toBeNull();
  });

  it('a negative overflow with a decimal comma (semicolon file) is refused too, naming its row', () => {
    const r = readCsvText('gap;batch\n4,5;1\n-2,5e400;2\n7,25;3\n', 'Pasted column');
    if (!r.ok) throw new Error(r.message);
    const col = readColumn(r.table, 0);
    expect(col.values).toEqual([4.5, 7.25]);
    expect(col.problems.map((p) => p.row)).toEqual([3]);
  });

  it('model JSON with 1e309 in a field is refused with the field path, line and column', () => {
    const text = JSON.stringify(exampleLinearStack, null, 2).replace('"nominal": 62', '"nominal": 1e309');
    const r = importModelJson(text);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.errors).toContainEqual(expect.objectContaining({ path: 'contributors.0.nominal', message: expect.stringMatching(/finite number/), line: expect.any(Number) }));
  });

  it('the schema refuses Infinity and NaN in every number field it is given', () => {
    for (const bad of [Infinity, -Infinity, NaN]) {
      const m = structuredClone(exampleLinearStack) as unknown as { contributors: { plusTol: number }[]; limits: { upper: number }; dials: { max: number }[] };
      m.contributors[1]!.plusTol = bad;
      m.limits.upper = bad;
      m.dials[0]!.max = bad;
      const r = validateModel(m);
      expect(r.ok).toBe(false);
      const paths = r.issues.map((i) => i.path.join('.'));
      expect(paths).toEqual(expect.arrayContaining(['contributors.1.plusTol', 'limits.upper', 'dials.0.max']));
    }
  });

  it('a typed dial value or pasted list of 1e309 is refused with a message', () => {
    const d = { id: 'spacer_length', label: 'Spacer', unit: 'mm', min: 24.05, max: 24.25, step: 0.01, default: 24.15 };
    const r = parseDialInput('1e309', d);
    expect(r.ok).toBe(false);
    expect(!r.ok && r.message).toMatch(/Enter a number from 24\.05 to 24\.25 mm/);
    expect(parseNumberList('1 2 1e309 4').bad).toEqual([{ token: '1e309', position: 3 }]);
  });

  it('API inputs refuse 1e309 in dial values (a JSON body parses it as Infinity)', () => {
    const body = JSON.parse('{"email":"a@client.example","dialValues":{"spacer_length":1e309}}');
    const s = snapshotRequestSchema.safeParse(body);
    expect(s.success).toBe(false);
    expect(s.error!.issues[0]!.path.join('.')).toBe('dialValues.spacer_length');
    const sim = simulateRequestSchema.safeParse({ model: exampleLinearStack, dialValues: { spacer_length: Number.POSITIVE_INFINITY } });
    expect(sim.success).toBe(false);
    expect(sim.error!.issues.map((i) => i.path.join('.'))).toContain('dialValues.spacer_length');
  });
});
