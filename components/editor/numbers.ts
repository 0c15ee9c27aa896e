// Pure parsing and formatting of the numbers typed into the editor (no React).

/** Text typed in a number box → value: empty is undefined (the schema says "required" where it is), junk is NaN. */
export function parseNumberText(text: string, scale = 1): number | undefined {
  // Spaces and underscores group digits ("2 000 000"); the unicode minus is a minus. Commas are refused: they could
  // be decimal commas.
  const t = text.replace(/\u2212/g, '-').replace(/[\s_]/g, '');
  if (t === '') return undefined;
  if (!/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(t)) return Number.NaN;
  const v = Number(t);
  return scale === 1 ? v : +(v / scale).toPrecision(15);
}

/** Value → text for a number box; `scale` shows a 0–1 value as a percentage (scale 100). */
export function formatNumberText(value: unknown, scale = 1): string {
  if (typeof value !== 'number') return '';
  if (Number.isNaN(value)) return '';
  const v = scale === 1 ? value : value * scale;
  return String(+v.toPrecision(12));
}

/** Same number (NaN equals NaN, undefined equals undefined). */
export function sameNumber(a: unknown, b: unknown): boolean {
  return Object.is(a, b) || (a === undefined && b === undefined);
}

export interface ParsedList {
  values: number[];
  /** Tokens that are not numbers, with their 1-based position in the list. */
  bad: { token: string; position: number }[];
}

/**
 * A pasted list of numbers: separated by spaces, tabs, new lines, commas or semicolons (so a column copied from
 * a spreadsheet works). Decimal commas are not supported; they would be read as separators.
 */
export function parseNumberList(text: string): ParsedList {
  const tokens = text.split(/[\s,;]+/).filter((t) => t !== '');
  const values: number[] = [];
  const bad: ParsedList['bad'] = [];
  tokens.forEach((token, k) => {
    const v = parseNumberText(token);
    if (v === undefined || !Number.isFinite(v)) bad.push({ token, position: k + 1 });
    else values.push(v);
  });
  return { values, bad };
}

/** The message for a list with bad tokens, naming the first few. */
export function listProblem(parsed: ParsedList): string | null {
  if (parsed.bad.length === 0) return null;
  const shown = parsed.bad
    .slice(0, 3)
    .map((b) => `'${b.token.length > 20 ? b.token.slice(0, 20) + '…' : b.token}' (item ${b.position})`)
    .join(', ');
  const more = parsed.bad.length > 3 ? ` and ${parsed.bad.length - 3} more` : '';
  return `Not a number: ${shown}${more}. Separate values with spaces, commas or new lines; use a point for decimals.`;
}

/** Seed box: a whole number is stored as a number, anything else as text (both are valid seeds). */
export function parseSeedText(text: string): string | number | undefined {
  const t = text.trim();
  if (t === '') return undefined;
  if (/^-?(0|[1-9]\d{0,15})$/.test(t)) {
    const n = Number(t);
    if (Number.isSafeInteger(n)) return n;
  }
  return t;
}

/** Short display of a number in messages and diffs: up to 4 significant decimals, no trailing zeros. */
export function shortNumber(v: number, digits = 4): string {
  if (!Number.isFinite(v)) return String(v);
  return v.toFixed(digits).replace(/\.?0+$/, '').replace(/^-0$/, '0');
}
