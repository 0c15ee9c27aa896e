// CSV export of result tables (RFC 4180: comma separated, CRLF line ends, double quotes doubled).
// Text cells that a spreadsheet would read as a formula are neutralised with a leading apostrophe,
// following the OWASP "CSV Injection" guidance: cells starting with =, +, -, @, tab or carriage return.
// Numbers the engine computed are written as numbers (a negative number is not a formula).

export type CsvValue = string | number | boolean | null | undefined;

const FORMULA_START = /^[=+\-@\t\r]/;

/** Prefixes an apostrophe when a text cell could start a spreadsheet formula. */
export function neutraliseCell(text: string): string {
  return FORMULA_START.test(text) ? `'${text}` : text;
}

/** One cell: numbers in full precision, text neutralised and quoted when needed, empty for missing or non-finite values. */
export function csvCell(value: CsvValue): string {
  if (value === null || value === undefined) return '';
  if (typeof value === 'number') return Number.isFinite(value) ? String(value) : '';
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  const safe = neutraliseCell(value);
  return /[",\r\n]/.test(safe) || safe !== safe.trim() ? `"${safe.replace(/"/g, '""')}"` : safe;
}

export function toCsv(rows: readonly (readonly CsvValue[])[]): string {
  return rows.map((r) => r.map(csvCell).join(',')).join('\r\n') + '\r\n';
}

/** A titled table: the unit of the results export. */
export interface CsvTable {
  title: string;
  columns: string[];
  rows: CsvValue[][];
}

/** Several tables in one file: each starts with its title row and header, separated by a blank line. */
export function tablesToCsv(tables: readonly CsvTable[], opts: { bom?: boolean } = {}): string {
  const parts = tables.map((t) => toCsv([[t.title], t.columns, ...t.rows]));
  // A byte-order mark makes spreadsheet programs read UTF-8 (€, −, µ) correctly.
  return (opts.bom ? '\ufeff' : '') + parts.join('\r\n');
}
