/** CSV export of a dataset; cells that begin with =, +, -, @ (or tab/CR) are neutralised with a leading apostrophe. */

export function neutraliseCell(cell: string): string {
  return /^[=+\-@\t\r]/.test(cell) ? `'${cell}` : cell;
}

function quote(cell: string): string {
  return /[",\r\n]/.test(cell) ? `"${cell.replace(/"/g, '""')}"` : cell;
}

/**
 * Header and one value per row. Negative numbers are neutralised too (a text cell "'-0.2"): the rule is applied to
 * every cell so that no cell can start a formula; say so where the export is offered.
 */
export function datasetCsv(name: string, unit: string, values: readonly number[]): string {
  const header = unit ? `${name} (${unit})` : name;
  const lines = [quote(neutraliseCell(header)), ...values.map((v) => quote(neutraliseCell(String(v))))];
  return lines.join('\r\n') + '\r\n';
}
