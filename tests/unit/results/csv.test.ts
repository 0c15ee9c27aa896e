import { describe, expect, it } from 'vitest';
import { csvCell, neutraliseCell, tablesToCsv, toCsv } from '@/lib/core/results/csv';
import { resultTables } from '@/lib/core/results/tables';
import { exampleCostRange, exampleLinearStack, runModelSync } from '@/lib/core/engine';

/** A small RFC 4180 reader, to check that what we write reads back to the same cells. */
function parseCsv(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let cell = '';
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const c = text[i];
    if (quoted) {
      if (c === '"' && text[i + 1] === '"') {
        cell += '"';
        i++;
      } else if (c === '"') quoted = false;
      else cell += c;
    } else if (c === '"') quoted = true;
    else if (c === ',') {
      row.push(cell);
      cell = '';
    } else if (c === '\r' && text[i + 1] === '\n') {
      row.push(cell);
      rows.push(row);
      row = [];
      cell = '';
      i++;
    } else cell += c;
  }
  if (cell || row.length) rows.push([...row, cell]);
  return rows;
}

describe('CSV neutralisation (OWASP CSV injection guidance)', () => {
  it.each([
    ['=1+2', "'=1+2"],
    ['+SUM(A1:A2)', "'+SUM(A1:A2)"],
    ['-2+3', "'-2+3"],
    ['@cmd', "'@cmd"],
    ['\tx', "'\tx"],
    ['\rx', "'\rx"],
    ['Spacer sleeve', 'Spacer sleeve'],
    ['a=b', 'a=b'],
    ['', ''],
  ])('%j → %j', (input, want) => {
    expect(neutraliseCell(input)).toBe(want);
  });

  it('quotes cells with commas, quotes and line breaks, and neutralises before quoting', () => {
    expect(csvCell('Housing, bore')).toBe('"Housing, bore"');
    expect(csvCell('the "float"')).toBe('"the ""float"""');
    expect(csvCell('=HYPERLINK("http://x","y")')).toBe(`"'=HYPERLINK(""http://x"",""y"")"`);
    expect(csvCell('two\nlines')).toBe('"two\nlines"');
    expect(csvCell(' padded ')).toBe('" padded "');
  });

  it('writes numbers as numbers, including negative ones, and blanks for missing values', () => {
    expect(csvCell(-0.07)).toBe('-0.07');
    expect(csvCell(0.1 + 0.2)).toBe('0.30000000000000004');
    expect(csvCell(1e-7)).toBe('1e-7');
    expect(csvCell(NaN)).toBe('');
    expect(csvCell(Infinity)).toBe('');
    expect(csvCell(null)).toBe('');
    expect(csvCell(undefined)).toBe('');
    expect(csvCell(true)).toBe('yes');
  });

  it('round-trips through an RFC 4180 reader, with CRLF line ends', () => {
    const rows = [
      ['Name', 'Value'],
      ['=evil()', -3.5],
      ['comma, "quote"', 12],
    ];
    const text = toCsv(rows);
    expect(text.endsWith('\r\n')).toBe(true);
    expect(text.split('\r\n')).toHaveLength(4);
    expect(parseCsv(text)).toEqual([
      ['Name', 'Value'],
      ["'=evil()", '-3.5'],
      ['comma, "quote"', '12'],
    ]);
  });

  it('joins titled tables with a blank line and an optional byte-order mark', () => {
    const text = tablesToCsv(
      [
        { title: 'A', columns: ['x'], rows: [[1]] },
        { title: 'B', columns: ['y'], rows: [['@b']] },
      ],
      { bom: true },
    );
    expect(text.startsWith('\ufeffA\r\nx\r\n1\r\n\r\nB\r\ny\r\n')).toBe(true);
    expect(parseCsv(text.slice(1))).toEqual([['A'], ['x'], ['1'], [''], ['B'], ['y'], ["'@b"]]);
  });
});

describe('result tables', () => {
  it('export a linear stack with worst case, RSS and Monte Carlo side by side', () => {
    const model = { ...exampleLinearStack, settings: { ...exampleLinearStack.settings, trials: 2000 } };
    const r = runModelSync(model);
    const tables = resultTables(r);
    const titles = tables.map((t) => t.title);
    expect(titles).toEqual(['Run', 'Stack-up: worst case, RSS and Monte Carlo', 'Stack-up: contributors', 'Gap: summary', 'Gap: percentiles (Hyndman–Fan type 6)', expect.stringMatching(/^Gap: drivers/)]);
    const methods = tables[1].rows;
    expect(methods[0][0]).toBe('Worst case');
    expect(methods[0][1]).toBeCloseTo(r.stack!.analytic.worstCase.min, 12);
    expect(methods[1][3]).toBeCloseTo(r.stack!.analytic.rss.mean, 12);
    expect(methods[2][6]).toBe(r.stack!.monteCarlo.ppmObserved);
    // A contributor named with a leading '-' or '=' would be neutralised in the file.
    const csv = tablesToCsv(tables);
    expect(parseCsv(csv).some((row) => row[0] === 'Seed' && row[1] === 'gearbox-float-demo')).toBe(true);
    const contributors = tables[2].rows;
    expect(contributors.map((c) => c[0])).toEqual(r.stack!.contributors.map((c) => c.id));
  });

  it('export a cost range with contingency, budget and the sum of most likely', () => {
    const model = { ...exampleCostRange, settings: { ...exampleCostRange.settings, trials: 2000 }, items: exampleCostRange.items.map((i, k) => (k === 0 ? { ...i, name: '=cmd|" /C calc"!A0' } : i)) };
    const r = runModelSync(model);
    const tables = resultTables(r);
    const figures = tables.find((t) => t.title === 'Cost range: figures')!;
    const get = (name: string) => figures.rows.find((row) => row[0] === name)?.[1];
    expect(get('P80')).toBe(r.cost!.p80);
    expect(get('Contingency to P80 over the base estimate')).toBeCloseTo(r.cost!.p80 - 522, 9);
    expect(get('Sum of most-likely values')).toBe(522);
    expect(get('Chance of exceeding the budget')).toBe(r.cost!.exceedBudget!.p);
    const csv = parseCsv(tablesToCsv(tables));
    const item = csv.find((row) => row[0] === 'site_setup')!;
    expect(item[1]).toBe(`'=cmd|" /C calc"!A0`);
  });
});
