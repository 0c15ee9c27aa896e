import type Database from 'better-sqlite3';
import { randomUUID } from 'node:crypto';
import type { MatrixRow } from './types';

// Dataset library and firm logo routes. Targets are written straight into the test database.

const now = () => new Date().toISOString();
const BOUNDARY = 'matrixdatasetboundary';

export function multipart(fields: Record<string, string>, file?: { name: string; type: string; content: string }): { body: string; headers: Record<string, string> } {
  let body = '';
  for (const [k, v] of Object.entries(fields)) body += `--${BOUNDARY}\r\nContent-Disposition: form-data; name="${k}"\r\n\r\n${v}\r\n`;
  if (file) body += `--${BOUNDARY}\r\nContent-Disposition: form-data; name="file"; filename="${file.name}"\r\nContent-Type: ${file.type}\r\n\r\n${file.content}\r\n`;
  body += `--${BOUNDARY}--\r\n`;
  return { body, headers: { 'content-type': `multipart/form-data; boundary=${BOUNDARY}` } };
}

export function insertDataset(db: Database.Database, firmId: string, values: number[] = [1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11]): string {
  const id = randomUUID();
  db.prepare(
    'insert into datasets (id, firm_id, name, unit, column_name, file_name, values_json, hash, size_bytes, row_count, dropped_rows, created_at) values (?,?,?,?,?,?,?,?,?,?,?,?)',
  ).run(id, firmId, 'Matrix dataset', 'mm', 'length', 'matrix.csv', JSON.stringify(values), 'a'.repeat(64), 40, values.length, '[]', now());
  return id;
}

/** A bare model row (no extra member: the matrix firm's seats are limited). */
export function insertBareModel(db: Database.Database, firmId: string): string {
  const id = randomUUID();
  db.prepare('insert into models (id, firm_id, title, template, draft_json, created_at, updated_at) values (?,?,?,?,?,?,?)').run(id, firmId, 'Matrix model', 'formula', '{}', now(), now());
  return id;
}

// A 1 × 1 PNG (re-encoded bytes are what the table holds).
const PNG_1PX = Buffer.from('iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAIAAACQd1PeAAAADElEQVR4nGP4//8/AAX+Av4N70a4AAAAAElFTkSuQmCC', 'base64');

export function insertLogo(db: Database.Database, firmId: string): void {
  // ON CONFLICT … DO UPDATE: the upsert both SQLite and PostgreSQL understand.
  db.prepare(
    'insert into firm_logos (firm_id, bytes, content_type, hash, width, height, updated_at) values (?,?,?,?,?,?,?) ' +
      'on conflict (firm_id) do update set bytes = excluded.bytes, content_type = excluded.content_type, hash = excluded.hash, width = excluded.width, height = excluded.height, updated_at = excluded.updated_at',
  ).run(firmId, PNG_1PX, 'image/png', 'b'.repeat(64), 1, 1, now());
}

const readAll = { anonymous: 401, owner: 200, author: 200, checker: 200, outsider: 404 };
const authorOnly = { anonymous: 401, owner: 403, author: 200, checker: 403, outsider: 403 };
const ownerOnly = { anonymous: 401, owner: 200, author: 403, checker: 403, outsider: 200 };

export const rows: MatrixRow[] = [
  { method: 'GET', route: '/api/datasets', prepare: () => ({ path: '/api/datasets' }), expect: { ...readAll, outsider: 200 }, note: 'outsider sees its own firm’s library' },
  {
    method: 'POST',
    route: '/api/datasets',
    prepare: () => ({ path: '/api/datasets', ...multipart({ name: 'Matrix upload', unit: 'mm', column: '0' }, { name: 'm.csv', type: 'text/csv', content: 'length\n1\n2\n3\n' }) }),
    expect: { ...authorOnly, author: 201 },
  },
  { method: 'GET', route: '/api/datasets/[id]', prepare: (c) => ({ path: `/api/datasets/${insertDataset(c.db, c.firmId)}` }), expect: readAll },
  { method: 'DELETE', route: '/api/datasets/[id]', prepare: (c) => ({ path: `/api/datasets/${insertDataset(c.db, c.firmId)}` }), expect: { ...authorOnly, author: 204 } },
  { method: 'GET', route: '/api/datasets/[id]/csv', prepare: (c) => ({ path: `/api/datasets/${insertDataset(c.db, c.firmId)}/csv` }), expect: readAll },
  {
    method: 'POST',
    route: '/api/datasets/[id]/uses',
    prepare: (c) => ({ path: `/api/datasets/${insertDataset(c.db, c.firmId)}/uses`, body: { modelId: insertBareModel(c.db, c.firmId), method: 'empirical' } }),
    expect: { ...authorOnly, author: 201 },
  },
  {
    method: 'GET',
    route: '/api/branding/logo',
    prepare: (c) => {
      insertLogo(c.db, c.firmId);
      return { path: '/api/branding/logo' };
    },
    expect: readAll,
    note: 'outsider’s own firm has no logo',
  },
  {
    method: 'PUT',
    route: '/api/branding/logo',
    prepare: () => ({ path: '/api/branding/logo', ...multipart({}, { name: 'logo.png', type: 'image/png', content: 'not really a png' }) }),
    expect: { ...ownerOnly, owner: 422, outsider: 422 },
    note: 'the matrix client sends text bodies, so an owner reaches the image check (422); real images are in datasets-logo tests',
  },
  {
    method: 'DELETE',
    route: '/api/branding/logo',
    prepare: (c) => {
      insertLogo(c.db, c.firmId);
      return { path: '/api/branding/logo' };
    },
    expect: { ...ownerOnly, owner: 204, outsider: 404 },
  },
  {
    method: 'GET',
    route: '/api/branding/logo/[firmId]',
    prepare: (c) => {
      insertLogo(c.db, c.firmId);
      return { path: `/api/branding/logo/${c.firmId}` };
    },
    expect: { anonymous: 200, owner: 200, author: 200, checker: 200, outsider: 200 },
    note: 'public: widgets, embeds and PDFs',
  },
];
