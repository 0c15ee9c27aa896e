import { describe, expect, it } from 'vitest';
import { columnError, MAX_UPLOAD_BYTES, readColumn, readCsv } from '@/lib/core/datasets/csv';
import { datasetCsv, neutraliseCell } from '@/lib/server/datasets/export';

const bytes = (s: string) => new TextEncoder().encode(s);
const table = (s: string) => {
  const r = readCsv(bytes(s), 'lengths.csv');
  if (!r.ok) throw new Error(r.message);
  return r.table;
};

describe('reading an uploaded CSV', () => {
  it('reads a header and numbered rows', () => {
    const t = table('part,length\nA,12.01\nB,11.98\n\nC,12.03\n');
    expect(t.headers).toEqual(['part', 'length']);
    expect(t.rows.map((r) => r.row)).toEqual([2, 3, 5]);
    const col = readColumn(t, 1);
    expect(col.values).toEqual([12.01, 11.98, 12.03]);
    expect(columnError('lengths.csv', 'length', col)).toBeNull();
  });

  it('names columns when the first row is data', () => {
    const t = table('1.5\n2.5\n-3e-1\n');
    expect(t.hasHeader).toBe(false);
    expect(t.headers).toEqual(['Column 1']);
    expect(readColumn(t, 0).values).toEqual([1.5, 2.5, -0.3]);
  });

  it('refuses an empty file, naming it', () => {
    const r = readCsv(new Uint8Array(0), 'empty.csv');
    expect(r.ok).toBe(false);
    expect(!r.ok && r.message).toMatch(/^empty\.csv is empty/);
    const blank = readCsv(bytes('\n\n  \n'), 'blank.csv');
    expect(!blank.ok && blank.message).toMatch(/blank\.csv is empty/);
  });

  it('refuses a file over 5 MB', () => {
    const r = readCsv(new Uint8Array(MAX_UPLOAD_BYTES + 1).fill(0x31), 'big.csv');
    expect(!r.ok && r.message).toMatch(/big\.csv is 5\.0 MB; the limit is 5 MB/);
  });

  it('refuses a file that is not text (a PNG renamed .csv)', () => {
    const png = new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52]);
    const r = readCsv(png, 'photo.csv');
    expect(!r.ok && r.message).toMatch(/photo\.csv is not a CSV text file/);
    const latin1 = readCsv(new Uint8Array([0x31, 0x2e, 0x35, 0x0a, 0xe9, 0xff]), 'odd.csv');
    expect(latin1.ok).toBe(false);
  });

  it('reads a sheet saved as "Unicode text": UTF-16 with a byte-order mark, tab-separated, decimal commas', () => {
    const text = 'Part\tLength, mm\tNote\r\nA\t12,01\tµ-check\r\nB\t11,98\t\r\nC\t12,03\tok\r\n';
    const le = new Uint8Array(2 + text.length * 2);
    le.set([0xff, 0xfe]);
    const be = new Uint8Array(2 + text.length * 2);
    be.set([0xfe, 0xff]);
    for (let i = 0; i < text.length; i++) {
      const c = text.charCodeAt(i);
      le[2 + 2 * i] = c & 0xff;
      le[3 + 2 * i] = c >> 8;
      be[2 + 2 * i] = c >> 8;
      be[3 + 2 * i] = c & 0xff;
    }
    for (const [name, b] of [['sheet-le.txt', le], ['sheet-be.txt', be]] as const) {
      const r = readCsv(b, name);
      if (!r.ok) throw new Error(`${name}: ${r.message}`);
      expect(r.table.headers).toEqual(['Part', 'Length, mm', 'Note']);
      const col = readColumn(r.table, 1);
      expect(col.values).toEqual([12.01, 11.98, 12.03]);
      expect(col.decimalComma).toBe(true);
      expect(r.table.rows[0]!.cells[2]).toBe('µ-check');
    }
    // Without a byte-order mark, plain ASCII UTF-16LE is still recognised by its zero high bytes.
    const ascii = 'x\n1.5\n2.5\n';
    const bare = new Uint8Array(ascii.length * 2);
    for (let i = 0; i < ascii.length; i++) bare[2 * i] = ascii.charCodeAt(i);
    const r = readCsv(bare, 'bare.txt');
    expect(r.ok && readColumn(r.table, 0).values).toEqual([1.5, 2.5]);
    // An odd number of bytes after a UTF-16 mark is not text.
    expect(readCsv(new Uint8Array([0xff, 0xfe, 0x31, 0x00, 0x0a]), 'cut.txt').ok).toBe(false);
  });

  it('refuses a formula-injection cell anywhere in the file, naming row and column', () => {
    for (const [cell, ch] of [['=HYPERLINK("http://x")', '='], ['+cmd|x', '+'], ['-2+3', '-'], ['@SUM(A1)', '@']] as const) {
      const r = readCsv(bytes(`note,length\nok,12.0\n"${cell.replace(/"/g, '""')}",12.1\n`), 'inj.csv');
      expect(r.ok).toBe(false);
      expect(!r.ok && r.message).toContain('inj.csv, row 3, column 1');
      expect(!r.ok && r.message).toContain(`begins with "${ch}"`);
    }
    // A negative number is a number, not a formula.
    expect(readCsv(bytes('x\n-0.25\n+1.5\n'), 'neg.csv').ok).toBe(true);
  });

  it('lists rows that are not numbers, and keeps them out only when dropped explicitly', () => {
    const t = table('length\n12.0\nn/a\n12.2\n\n12.1\nbroken gauge\n');
    const col = readColumn(t, 0);
    expect(col.problems.map((p) => p.row)).toEqual([3, 7]);
    expect(columnError('f.csv', 'length', col)).toMatch(/2 row\(s\) are not numbers: row 3 \(not a number: "n\/a"\), row 7/);
    const dropped = readColumn(t, 0, [3, 7]);
    expect(dropped.problems).toEqual([]);
    expect(dropped.dropped).toEqual([3, 7]);
    expect(dropped.values).toEqual([12, 12.2, 12.1]);
    // Dropping a row that is a number does nothing.
    expect(readColumn(t, 0, [2, 3, 7]).values).toEqual([12, 12.2, 12.1]);
  });

  it('refuses mixed decimal separators, naming a row of each', () => {
    const t = table('length;batch\n12,01;1\n11.98;1\n12,03;2\n');
    const col = readColumn(t, 0);
    expect(col.mixedSeparators).toEqual({ pointRow: 3, commaRow: 2 });
    expect(columnError('mixed.csv', 'length', col)).toMatch(/mixed decimal separators \(row 3 uses a point, row 2 a comma\)/);
  });

  it('accepts decimal commas used throughout', () => {
    const t = table('length;batch\n12,01;1\n11,98;1\n');
    const col = readColumn(t, 0);
    expect(col.decimalComma).toBe(true);
    expect(col.values).toEqual([12.01, 11.98]);
  });
});

describe('exporting a dataset as CSV', () => {
  it('neutralises cells that begin with =, +, -, @ (OWASP CSV injection)', () => {
    expect(neutraliseCell('=1+1')).toBe("'=1+1");
    expect(neutraliseCell('+1')).toBe("'+1");
    expect(neutraliseCell('-0.2')).toBe("'-0.2");
    expect(neutraliseCell('@x')).toBe("'@x");
    expect(neutraliseCell('12.5')).toBe('12.5');
    const csv = datasetCsv('=cost growth', 'ratio', [1.05, -0.02]);
    expect(csv.split('\r\n')).toEqual(["'=cost growth (ratio)", '1.05', "'-0.02", '']);
    expect(datasetCsv('a, "b"', '', [1])).toBe('"a, ""b"""\r\n1\r\n');
  });
});
