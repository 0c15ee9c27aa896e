/**
 * CSV reading for dataset uploads (papaparse), with the checks that must refuse a file before anything is
 * stored: empty, too large, binary, formula-injection cells; and per-column number parsing that lists the
 * rows that are not numbers and refuses mixed decimal separators.
 */
import Papa from 'papaparse';

export const MAX_UPLOAD_BYTES = 5 * 1024 * 1024;

export interface CsvTable {
  /** Column names: the first row when it holds any text, otherwise "Column 1", "Column 2", … */
  headers: string[];
  hasHeader: boolean;
  /** Data rows with their row number in the file (1-based, counting a header row). */
  rows: { row: number; cells: string[] }[];
}

export type CsvRead = { ok: true; table: CsvTable } | { ok: false; message: string };

const NUMBER = /^[+-]?(?:\d+(?:[.,]\d*)?|[.,]\d+)(?:[eE][+-]?\d+)?$/;
/** Cells a spreadsheet would run as a formula (OWASP CSV injection: =, +, -, @, tab, carriage return). */
const FORMULA_START = /^[=+\-@\t\r]/;

export function looksNumeric(cell: string): boolean {
  return NUMBER.test(cell.trim());
}

export function readCsv(bytes: Uint8Array, fileName: string): CsvRead {
  if (bytes.length === 0) return { ok: false, message: `${fileName} is empty: choose a CSV file with at least one column of numbers.` };
  if (bytes.length > MAX_UPLOAD_BYTES) {
    return { ok: false, message: `${fileName} is ${(bytes.length / 1024 / 1024).toFixed(1)} MB; the limit is 5 MB. Upload only the column you need.` };
  }
  const text = decodeText(bytes);
  if (text === null) {
    return { ok: false, message: `${fileName} is not a CSV text file (it holds binary data). Export the sheet as CSV (or as Unicode text) and upload that.` };
  }
  return readCsvText(text, fileName);
}

/**
 * The text of an upload: UTF-8 (with or without a byte-order mark), or UTF-16 as spreadsheets write it when a
 * sheet is saved as "Unicode text" (little- or big-endian, told apart by the byte-order mark, or without a mark
 * when every other byte of an ASCII-range text is zero). Null for anything else: a NUL byte in UTF-8 or bytes
 * that do not decode mean binary data.
 */
export function decodeText(bytes: Uint8Array): string | null {
  const utf16 = (label: 'utf-16le' | 'utf-16be', from: number) => {
    if ((bytes.length - from) % 2 !== 0) return null;
    try {
      const t = new TextDecoder(label, { fatal: true }).decode(bytes.subarray(from));
      return t.includes('\u0000') ? null : t;
    } catch {
      return null;
    }
  };
  if (bytes[0] === 0xff && bytes[1] === 0xfe) return utf16('utf-16le', 2);
  if (bytes[0] === 0xfe && bytes[1] === 0xff) return utf16('utf-16be', 2);
  if (bytes.length >= 4 && bytes.length % 2 === 0) {
    const head = bytes.subarray(0, Math.min(bytes.length, 512));
    const zeroAt = (parity: number) => head.every((b, i) => (i % 2 === parity) === (b === 0));
    if (zeroAt(1)) return utf16('utf-16le', 0);
    if (zeroAt(0)) return utf16('utf-16be', 0);
  }
  if (bytes.includes(0)) return null;
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(bytes).replace(/^\uFEFF/, '');
  } catch {
    return null;
  }
}

/**
 * Semicolon and tab files often carry decimal commas, which defeat papaparse's own guess; the first line decides
 * when it holds a semicolon or tab and no comma. Otherwise papaparse guesses ('' = auto).
 */
function guessDelimiter(text: string): string {
  const first = text.split(/\r?\n/).find((l) => l.trim() !== '') ?? '';
  const count = (c: string) => first.split(c).length - 1;
  // "Unicode text" exports separate by tabs; a comma in a tab-separated header ("Length, mm") must not win.
  if (count('\t') > 0 && count('\t') >= count(',')) return '\t';
  if (first.includes(',')) return '';
  if (first.includes(';')) return ';';
  if (first.includes('\t')) return '\t';
  return '';
}

export function readCsvText(text: string, fileName: string): CsvRead {
  if (text.trim() === '') return { ok: false, message: `${fileName} is empty: choose a CSV file with at least one column of numbers.` };
  const parsed = Papa.parse<string[]>(text, { skipEmptyLines: false, delimiter: guessDelimiter(text) });
  const records = parsed.data.map((cells, i) => ({ row: i + 1, cells: cells.map((c) => String(c)) })).filter((r) => r.cells.some((c) => c.trim() !== ''));
  if (records.length === 0) return { ok: false, message: `${fileName} is empty: choose a CSV file with at least one column of numbers.` };
  for (const r of records) {
    for (let c = 0; c < r.cells.length; c++) {
      const cell = r.cells[c];
      if (FORMULA_START.test(cell) && !looksNumeric(cell)) {
        return {
          ok: false,
          message: `${fileName}, row ${r.row}, column ${c + 1}: the cell "${cell.slice(0, 40)}" begins with "${JSON.stringify(cell[0]).slice(1, -1)}" and a spreadsheet could run it as a formula. Remove or fix that cell and upload again; nothing was stored.`,
        };
      }
    }
  }
  const first = records[0];
  const hasHeader = first.cells.some((c) => c.trim() !== '' && !looksNumeric(c));
  const width = Math.max(...records.map((r) => r.cells.length));
  const headers = Array.from({ length: width }, (_, i) => (hasHeader ? first.cells[i]?.trim() || `Column ${i + 1}` : `Column ${i + 1}`));
  const rows = hasHeader ? records.slice(1) : records;
  if (rows.length === 0) return { ok: false, message: `${fileName} has a header row but no data rows.` };
  return { ok: true, table: { headers, hasHeader, rows } };
}

export interface ColumnProblem {
  row: number;
  text: string;
  reason: string;
}

export interface ColumnRead {
  values: number[];
  /** Rows that are not numbers and were not dropped. */
  problems: ColumnProblem[];
  /** Rows the uploader chose to drop (only ones that were problems). */
  dropped: number[];
  /** Set when the column mixes decimal points and decimal commas: the upload is refused. */
  mixedSeparators: { pointRow: number; commaRow: number } | null;
  decimalComma: boolean;
}

/** Reads one column as numbers; rows in `drop` are left out (only rows that are not numbers may be dropped). */
export function readColumn(table: CsvTable, column: number, drop: readonly number[] = []): ColumnRead {
  const dropSet = new Set(drop);
  const problems: ColumnProblem[] = [];
  const dropped: number[] = [];
  const cells: { row: number; text: string }[] = [];
  let pointRow = 0;
  let commaRow = 0;
  for (const r of table.rows) {
    const text = (r.cells[column] ?? '').trim();
    if (!looksNumeric(text)) {
      if (dropSet.has(r.row)) dropped.push(r.row);
      else problems.push({ row: r.row, text: text.slice(0, 60), reason: text === '' ? 'empty cell' : 'not a number' });
      continue;
    }
    if (text.includes(',') && !commaRow) commaRow = r.row;
    if (text.includes('.') && !pointRow) pointRow = r.row;
    cells.push({ row: r.row, text });
  }
  const mixed = pointRow && commaRow ? { pointRow, commaRow } : null;
  const decimalComma = !mixed && commaRow > 0;
  const values: number[] = [];
  if (!mixed) {
    for (const c of cells) {
      const v = Number(decimalComma ? c.text.replace(',', '.') : c.text);
      // "1e309" reads as a number but is Infinity in a double: refused by row like any other bad cell.
      if (Number.isFinite(v)) values.push(v);
      else if (dropSet.has(c.row)) dropped.push(c.row);
      else problems.push({ row: c.row, text: c.text.slice(0, 60), reason: 'too large: beyond ±1.8e308, the range of a double' });
    }
    problems.sort((a, b) => a.row - b.row);
    dropped.sort((a, b) => a - b);
  }
  return { values, problems, dropped, mixedSeparators: mixed, decimalComma };
}

/** The one message for a column that cannot be stored as it stands, or null when it can. */
export function columnError(fileName: string, header: string, col: ColumnRead): string | null {
  if (col.mixedSeparators) {
    return `${fileName}, column "${header}": mixed decimal separators (row ${col.mixedSeparators.pointRow} uses a point, row ${col.mixedSeparators.commaRow} a comma). Use one separator throughout and upload again.`;
  }
  if (col.problems.length) {
    const list = col.problems.slice(0, 10).map((p) => `row ${p.row} (${p.reason}${p.text ? `: "${p.text}"` : ''})`).join(', ');
    const more = col.problems.length > 10 ? ` and ${col.problems.length - 10} more` : '';
    return `${fileName}, column "${header}": ${col.problems.length} row(s) are not numbers: ${list}${more}. Drop them explicitly or fix the file.`;
  }
  if (col.values.length < 2) return `${fileName}, column "${header}" holds ${col.values.length} number(s); a dataset needs at least 2.`;
  return null;
}
