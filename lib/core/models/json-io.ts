// Import and export of a model as JSON in Stochos's own versioned schema ('stochos.model/1').
// Export writes pretty JSON with the schema tag first. Import parses, checks the tag and version, and
// validates with the engine's schema; it returns either the model or every problem with its path and, where
// the file shows it, the line and column. Pure: runs in the browser and on the server.

import { SCHEMA_ID, validateModel, type CheckedModel } from '@/lib/core/engine/schema';

export const MODEL_FILE_SUFFIX = '.stochos.json';
/** Larger files are refused before parsing (a model with 100,000 measured values is about 1.5 MB). */
export const MAX_IMPORT_BYTES = 5 * 1024 * 1024;

export interface ImportIssue {
  /** Dotted path in the model ("contributors.2.plusTol"), "_" for the file as a whole. */
  path: string;
  message: string;
  /** 1-based position in the file, when it can be located. */
  line?: number;
  column?: number;
}

export type ImportResult = { ok: true; model: CheckedModel } | { ok: false; errors: ImportIssue[] };

// ---- Export ------------------------------------------------------------------------------------------------

/**
 * Pretty JSON (2 spaces), schema tag first, then template and title, then the rest in the model's order. Takes a
 * checked model or, from the editor, the draft as typed.
 */
export function exportModelJson(model: { schema?: unknown; template: string; title?: unknown }): string {
  const { schema: _schema, template, title, ...rest } = model;
  void _schema;
  return JSON.stringify({ schema: SCHEMA_ID, template, title, ...rest }, null, 2) + '\n';
}

/** `<title>.stochos.json`, with characters that file systems refuse replaced. */
export function modelFileName(title: string): string {
  const base = (title ?? '')
    // "Shaft: bearing" → "Shaft - bearing", "a/b" → "a-b"
    .replace(/(\s*)[\u0000-\u001f\u007f/\\:*?"<>|]+(\s*)/g, (_m, before: string, after: string) => (before || after ? ' - ' : '-'))
    .replace(/\s+/g, ' ')
    .replace(/^[\s.-]+|[\s.-]+$/g, '')
    .slice(0, 100)
    .trim();
  return `${base || 'model'}${MODEL_FILE_SUFFIX}`;
}

// ---- JSON syntax with positions ----------------------------------------------------------------------------
// Each browser words and positions JSON.parse errors differently, so a small recursive-descent scan of
// RFC 8259 finds the first fault the same way everywhere; on a valid file it also records where each value
// starts, so field problems can name their line.

export interface JsonSyntaxError {
  offset: number;
  line: number;
  column: number;
  message: string;
}

class Fault extends Error {
  constructor(
    readonly offset: number,
    message: string,
  ) {
    super(message);
  }
}

const MAX_DEPTH = 512;

function describeChar(ch: string | undefined): string {
  if (ch === undefined) return 'the end of the file';
  if (ch === '\n' || ch === '\r') return 'a line break';
  if (ch === '\t') return 'a tab';
  return `'${ch}'`;
}

/** Scans `text`; throws Fault at the first syntax error. With `where`, records each value's start by dotted path. */
function scan(text: string, where?: Map<string, number>): void {
  let i = 0;
  const ws = () => {
    while (i < text.length) {
      const c = text[i];
      if (c === ' ' || c === '\t' || c === '\n' || c === '\r') i++;
      else break;
    }
  };
  const expect = (what: string): never => {
    throw new Fault(i, `Expected ${what} but found ${describeChar(text[i])}.`);
  };

  const string = (): number => {
    const start = i;
    i++;
    while (i < text.length) {
      const c = text[i];
      if (c === '"') {
        i++;
        return start;
      }
      if (c === '\\') {
        const e = text[i + 1];
        if (e === undefined) break;
        if ('"\\/bfnrt'.includes(e)) {
          i += 2;
          continue;
        }
        if (e === 'u') {
          if (!/^[0-9a-fA-F]{4}$/.test(text.slice(i + 2, i + 6))) throw new Fault(i, 'A \\u escape needs four hexadecimal digits.');
          i += 6;
          continue;
        }
        throw new Fault(i, `'\\${e}' is not a valid escape in a JSON string.`);
      }
      if (c.charCodeAt(0) < 0x20) throw new Fault(i, `A string cannot contain ${describeChar(c)}; write it as an escape such as \\n.`);
      i++;
    }
    throw new Fault(start, 'This string is never closed (a closing " is missing).');
  };

  const number = () => {
    const m = /^-?(0|[1-9]\d*)(\.\d+)?([eE][+-]?\d+)?/.exec(text.slice(i, i + 400));
    if (!m) throw new Fault(i, `Expected a number but found ${describeChar(text[i])}.`);
    i += m[0].length;
    const next = text[i];
    if (next !== undefined && /[0-9.eE+\-A-Za-z_]/.test(next)) throw new Fault(i, `This number is malformed at ${describeChar(next)}.`);
  };

  const value = (path: string[], depth: number) => {
    if (depth > MAX_DEPTH) throw new Fault(i, `The file nests deeper than ${MAX_DEPTH} levels.`);
    ws();
    where?.set(path.join('.') || '_', i);
    const c = text[i];
    if (c === '{') return object(path, depth + 1);
    if (c === '[') return array(path, depth + 1);
    if (c === '"') return void string();
    if (c === '-' || (c !== undefined && c >= '0' && c <= '9')) return number();
    for (const word of ['true', 'false', 'null']) {
      if (text.startsWith(word, i)) {
        i += word.length;
        return;
      }
    }
    if (c === "'") throw new Fault(i, 'JSON strings use double quotes, not single quotes.');
    if (c !== undefined && /[A-Za-z_]/.test(c)) {
      const word = /^[A-Za-z_][A-Za-z0-9_]*/.exec(text.slice(i, i + 40))?.[0] ?? c;
      throw new Fault(i, `'${word}' is not a JSON value (text needs double quotes; NaN and Infinity are not allowed).`);
    }
    expect('a value');
  };

  const object = (path: string[], depth: number) => {
    i++;
    ws();
    if (text[i] === '}') {
      i++;
      return;
    }
    for (;;) {
      ws();
      if (text[i] === '}') throw new Fault(i, 'A trailing comma before } is not allowed in JSON.');
      if (text[i] !== '"') {
        if (text[i] === "'") throw new Fault(i, 'Property names need double quotes, not single quotes.');
        expect('a property name in double quotes');
      }
      const start = string();
      let key = '';
      if (where) {
        try {
          key = JSON.parse(text.slice(start, i)) as string;
        } catch {
          key = text.slice(start + 1, i - 1);
        }
      }
      ws();
      if (text[i] !== ':') expect("':' after the property name");
      i++;
      value(where ? [...path, key] : path, depth);
      ws();
      if (text[i] === ',') {
        i++;
        continue;
      }
      if (text[i] === '}') {
        i++;
        return;
      }
      expect("',' or '}' after the value");
    }
  };

  const array = (path: string[], depth: number) => {
    i++;
    ws();
    if (text[i] === ']') {
      i++;
      return;
    }
    for (let k = 0; ; k++) {
      ws();
      if (text[i] === ']') throw new Fault(i, 'A trailing comma before ] is not allowed in JSON.');
      value(where ? [...path, String(k)] : path, depth);
      ws();
      if (text[i] === ',') {
        i++;
        continue;
      }
      if (text[i] === ']') {
        i++;
        return;
      }
      expect("',' or ']' after the value");
    }
  };

  ws();
  if (i >= text.length) throw new Fault(i, 'The file is empty.');
  value([], 0);
  ws();
  if (i < text.length) throw new Fault(i, `Unexpected ${describeChar(text[i])} after the end of the JSON value.`);
}

/** 1-based line and column of a 0-based offset (\n, \r\n and \r each end a line). */
export function lineColumn(text: string, offset: number): { line: number; column: number } {
  let line = 1;
  let lineStart = 0;
  for (let k = 0; k < offset && k < text.length; k++) {
    const c = text[k];
    if (c === '\n' || (c === '\r' && text[k + 1] !== '\n')) {
      line++;
      lineStart = k + 1;
    }
  }
  return { line, column: offset - lineStart + 1 };
}

/** The first syntax fault in `text`, or null when it is well-formed JSON. */
export function findJsonSyntaxError(text: string): JsonSyntaxError | null {
  try {
    scan(text);
    return null;
  } catch (err) {
    if (!(err instanceof Fault)) throw err;
    return { offset: err.offset, ...lineColumn(text, err.offset), message: err.message };
  }
}

/** Start offset of each value in well-formed JSON, by dotted path ("_" is the whole document). */
export function valuePositions(text: string): Map<string, number> {
  const where = new Map<string, number>();
  scan(text, where);
  return where;
}

// ---- Import ------------------------------------------------------------------------------------------------

const TAG = /^stochos\.model\/(\d+)$/;
const CURRENT_VERSION = Number(TAG.exec(SCHEMA_ID)?.[1]);

/** Checks the schema tag; null when it is the one this build reads. */
function tagProblem(doc: Record<string, unknown>): string | null {
  const tag = doc.schema;
  if (tag === undefined) {
    return `This file has no schema tag. A Stochos model file names its format first, as "schema": "${SCHEMA_ID}".`;
  }
  if (typeof tag !== 'string') return `The schema tag must be the text "${SCHEMA_ID}".`;
  const m = TAG.exec(tag);
  if (!m) return `"${tag.slice(0, 80)}" is not a Stochos model format; this file cannot be imported (expected "${SCHEMA_ID}").`;
  const version = Number(m[1]);
  if (version > CURRENT_VERSION) {
    return `This file uses version ${version} of the Stochos model format, newer than this Stochos reads (version ${CURRENT_VERSION}). Export it again from a matching Stochos, or update.`;
  }
  if (version !== CURRENT_VERSION) return `Version ${version} of the Stochos model format is not supported; this Stochos reads version ${CURRENT_VERSION}.`;
  return null;
}

/** Where a problem at `path` shows in the file: the value itself, else the nearest enclosing value. */
function locate(positions: Map<string, number>, path: string): number | undefined {
  const parts = path === '_' ? [] : path.split('.');
  for (let n = parts.length; n >= 0; n--) {
    const at = positions.get(n === 0 ? '_' : parts.slice(0, n).join('.'));
    if (at !== undefined) return at;
  }
  return undefined;
}

/**
 * Reads a model file. Returns the validated model, or every problem: a syntax fault with its line and column,
 * a wrong or missing schema tag, or each invalid field with its dotted path (and line and column).
 */
export function importModelJson(text: string): ImportResult {
  if (typeof text !== 'string') return { ok: false, errors: [{ path: '_', message: 'The file could not be read as text.' }] };
  if (text.length > MAX_IMPORT_BYTES) {
    return { ok: false, errors: [{ path: '_', message: `The file is larger than ${MAX_IMPORT_BYTES / (1024 * 1024)} MB; a model file is far smaller.` }] };
  }
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text; // a byte-order mark is not JSON
  const syntax = findJsonSyntaxError(body);
  if (syntax) {
    return {
      ok: false,
      errors: [{ path: '_', message: `The file is not valid JSON: ${syntax.message} (line ${syntax.line}, column ${syntax.column})`, line: syntax.line, column: syntax.column }],
    };
  }
  const doc: unknown = JSON.parse(body);
  if (!doc || typeof doc !== 'object' || Array.isArray(doc)) {
    return { ok: false, errors: [{ path: '_', message: 'The file must hold one model: a JSON object starting with "schema", "template" and "title".' }] };
  }
  const positions = valuePositions(body);
  const at = (path: string) => {
    const offset = locate(positions, path);
    return offset === undefined ? {} : lineColumn(body, offset);
  };
  const tag = tagProblem(doc as Record<string, unknown>);
  if (tag) return { ok: false, errors: [{ path: 'schema', message: tag, ...at('schema') }] };

  const result = validateModel(doc);
  if (result.ok) return { ok: true, model: result.model };
  const seen = new Set<string>();
  const errors: ImportIssue[] = [];
  for (const issue of result.issues) {
    const path = issue.path.length ? issue.path.map(String).join('.') : '_';
    const key = `${path}\u0000${issue.message}`;
    if (seen.has(key)) continue;
    seen.add(key);
    errors.push({ path, message: issue.message, ...at(path) });
  }
  return { ok: false, errors };
}

/** Reads a File (browser) and imports it; a file that is too large is refused before it is read. */
export async function importModelFile(file: Blob & { name?: string }): Promise<ImportResult> {
  if (file.size > MAX_IMPORT_BYTES) {
    return { ok: false, errors: [{ path: '_', message: `The file is larger than ${MAX_IMPORT_BYTES / (1024 * 1024)} MB; a model file is far smaller.` }] };
  }
  let text: string;
  try {
    text = await file.text();
  } catch {
    return { ok: false, errors: [{ path: '_', message: 'The file could not be read.' }] };
  }
  return importModelJson(text);
}
