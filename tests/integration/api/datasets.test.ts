import { describe, it, expect, inject, beforeAll, afterAll } from 'vitest';
import type Database from 'better-sqlite3';
import sharp from 'sharp';
import { newFirm, addMember } from '../../support/firms';
import { firmIdOf, openTestDb } from '../../support/db-direct';
import type { Client } from '../../support/http-client';
import { insertBareModel } from './matrix/datasets.rows';

// Dataset library and firm logo end to end: uploads, every bad file, fits, provenance, export and delete warnings.
const appUrl = inject('appUrl');
const mailboxUrl = inject('mailboxUrl');

interface ErrBody {
  error: { code: string; message: string; fields?: Record<string, string[]> };
}

let owner: Client;
let author: Client;
let ownerEmail: string;
let db: Database.Database;
let firmId: string;

const cookie = (c: Client) => (c as unknown as { cookieHeader(): string }).cookieHeader();

async function send(c: Client, method: string, path: string, form: FormData): Promise<{ status: number; body: Record<string, unknown> }> {
  const res = await fetch(appUrl + path, { method, body: form, headers: { cookie: cookie(c), origin: appUrl } });
  const text = await res.text();
  return { status: res.status, body: text ? JSON.parse(text) : {} };
}

function csvForm(fields: Record<string, string>, file?: { name: string; bytes: Uint8Array | string }): FormData {
  const f = new FormData();
  for (const [k, v] of Object.entries(fields)) f.set(k, v);
  if (file) f.set('file', new Blob([file.bytes as BlobPart], { type: 'text/csv' }), file.name);
  return f;
}

const count = () => (db.prepare('select count(*) as n from datasets where firm_id = ?').get(firmId) as { n: number }).n;

// 60 invented spacer lengths (mm): a seeded LCG, so the file is the same every run.
function lengths(): number[] {
  let s = 12345;
  const u = () => ((s = (s * 1103515245 + 12345) % 2147483648) + 0.5) / 2147483648;
  return Array.from({ length: 60 }, () => {
    const z = Math.sqrt(-2 * Math.log(u())) * Math.cos(2 * Math.PI * u());
    return +(12 + 0.02 * z).toFixed(4);
  });
}

beforeAll(async () => {
  const firm = await newFirm(appUrl, 'datasets');
  owner = firm.owner;
  ownerEmail = firm.email;
  author = (await addMember(appUrl, mailboxUrl, owner, 'author')).client;
  db = openTestDb(inject('dataDir'));
  firmId = firmIdOf(db, ownerEmail);
});
afterAll(() => db?.close());

describe('uploading a dataset', () => {
  let id: string;

  it('stores 60 measured lengths with hash, size and uploader, and fits and ranks the laws', async () => {
    const text = 'part,length\n' + lengths().map((v, i) => `S${i + 1},${v}`).join('\n') + '\n';
    const up = await send(author, 'POST', '/api/datasets', csvForm({ name: 'Spacer lengths', unit: 'mm', column: '1' }, { name: 'spacers.csv', bytes: text }));
    expect(up.status).toBe(201);
    id = up.body.id as string;
    const row = db.prepare('select hash, size_bytes, row_count, column_name, uploaded_by from datasets where id = ?').get(id) as Record<string, unknown>;
    const { createHash } = await import('node:crypto');
    expect(row.hash).toBe(createHash('sha256').update(text).digest('hex'));
    expect(row.size_bytes).toBe(Buffer.byteLength(text));
    expect(row.row_count).toBe(60);
    expect(row.column_name).toBe('length');
    expect(row.uploaded_by).toBeTruthy();

    const detail = await author.json<{ summary: { count: number; mean: number }; fits: { law: string; ok: boolean; rank?: number }[]; criticalValueNote: string }>('GET', `/api/datasets/${id}`);
    expect(detail.status).toBe(200);
    expect(detail.body.summary.count).toBe(60);
    expect(detail.body.summary.mean).toBeCloseTo(12, 1);
    expect(detail.body.fits.filter((f) => f.ok).length).toBe(6);
    expect(detail.body.fits[0].rank).toBe(1);
    expect(detail.body.criticalValueNote).toMatch(/do not hold/);
  });

  it('lists the dataset with its use count, and warns before deleting one in use', async () => {
    const modelId = insertBareModel(db, firmId);
    const use = await author.json<{ hash: string }>('POST', `/api/datasets/${id}/uses`, { modelId, method: 'normal' });
    expect(use.status).toBe(201);
    expect(use.body.hash).toMatch(/^[0-9a-f]{64}$/);
    const list = await author.json<{ datasets: { id: string; useCount: number }[] }>('GET', '/api/datasets');
    expect(list.body.datasets.find((d) => d.id === id)!.useCount).toBe(1);
    const del = await author.json<ErrBody>('DELETE', `/api/datasets/${id}`);
    expect(del.status).toBe(409);
    expect(del.body.error.message).toMatch(/"Spacer lengths" is used by 1 model\(s\): Matrix model/);
    expect((await author.request('DELETE', `/api/datasets/${id}?confirm=1`)).status).toBe(204);
    expect((await author.request('GET', `/api/datasets/${id}`)).status).toBe(404);
    // Provenance stays: the use row still names the hash the model copied.
    expect((db.prepare('select hash from dataset_uses where dataset_id = ?').get(id) as { hash: string }).hash).toBe(use.body.hash);
  });

  it('accepts a pasted column and refuses fitting below 10 numbers with a message', async () => {
    const up = await send(author, 'POST', '/api/datasets', csvForm({ name: 'Few', unit: '', column: '0', text: '1.2\n1.4\n1.3\n' }));
    expect(up.status).toBe(201);
    const d = await author.json<{ fits: null; fitRefused: string }>('GET', `/api/datasets/${up.body.id}`);
    expect(d.body.fits).toBeNull();
    expect(d.body.fitRefused).toMatch(/at least 10 numbers; this column has 3/);
  });

  it('lists rows that are not numbers, and stores only when they are dropped explicitly', async () => {
    const file = { name: 'gauge.csv', bytes: 'length\n12.01\nn/a\n12.03\nbroken\n12.00\n' };
    const before = count();
    const bad = await send(author, 'POST', '/api/datasets', csvForm({ name: 'Gauge', column: '0' }, file));
    expect(bad.status).toBe(422);
    expect((bad.body as unknown as ErrBody).error.fields!.drop[0]).toMatch(/gauge\.csv, column "length": 2 row\(s\) are not numbers: row 3 .*row 5/);
    expect(count()).toBe(before);
    const ok = await send(author, 'POST', '/api/datasets', csvForm({ name: 'Gauge', column: '0', drop: '3, 5' }, file));
    expect(ok.status).toBe(201);
    expect(JSON.parse((db.prepare('select dropped_rows from datasets where id = ?').get(ok.body.id) as { dropped_rows: string }).dropped_rows)).toEqual([3, 5]);
  });

  it('refuses each bad file with a message naming it, and stores nothing', async () => {
    const png = await sharp({ create: { width: 4, height: 4, channels: 3, background: '#000' } }).png().toBuffer();
    const cases: [string, Uint8Array | string, RegExp][] = [
      ['empty.csv', '', /empty\.csv is empty/],
      ['big.csv', new Uint8Array(5 * 1024 * 1024 + 10).fill(0x31), /5\.0 MB; the limit is 5 MB|limit is 5 MB/],
      ['photo.csv', new Uint8Array(png), /photo\.csv is not a CSV text file/],
      ['inject.csv', 'length\n12.0\n=HYPERLINK("http://example.invalid")\n', /inject\.csv, row 3, column 1: .*begins with "="/],
      ['mixed.csv', 'length;batch\n12,01;1\n11.98;1\n', /mixed\.csv, column "length": mixed decimal separators/],
    ];
    for (const [name, bytes, re] of cases) {
      const before = count();
      const r = await send(author, 'POST', '/api/datasets', csvForm({ name: 'Bad', column: '0' }, { name, bytes }));
      expect(r.status, name).toBe(422);
      expect((r.body as unknown as ErrBody).error.message + JSON.stringify((r.body as unknown as ErrBody).error.fields), name).toMatch(re);
      expect(count(), name).toBe(before);
    }
  });

  it('exports CSV with formula-like cells neutralised', async () => {
    const up = await send(author, 'POST', '/api/datasets', csvForm({ name: '@growth', unit: 'ratio', column: '0', text: '-0.05\n0.12\n' }));
    const res = await author.request('GET', `/api/datasets/${up.body.id}/csv`);
    expect(res.headers.get('content-type')).toMatch(/text\/csv/);
    expect(res.headers.get('x-content-type-options')).toBe('nosniff');
    expect((await res.text()).split('\r\n')).toEqual(["'@growth (ratio)", "'-0.05", '0.12', '']);
  });
});

describe('firm logo', () => {
  const logoForm = (bytes: Uint8Array, name: string) => {
    const f = new FormData();
    f.set('file', new Blob([bytes as BlobPart], { type: 'image/png' }), name);
    return f;
  };

  it('the owner uploads a JPEG; it is stored re-encoded as PNG and served publicly with nosniff and an ETag', async () => {
    const jpeg = await sharp({ create: { width: 120, height: 40, channels: 3, background: '#1f887b' } })
      .withMetadata({ exif: { IFD0: { Artist: 'Invented Person' } } })
      .jpeg()
      .toBuffer();
    const r = await send(owner, 'PUT', '/api/branding/logo', logoForm(new Uint8Array(jpeg), 'brand.jpg'));
    expect(r.status).toBe(200);
    expect(r.body.contentType).toBe('image/png');
    const pub = await fetch(`${appUrl}/api/branding/logo/${firmId}`);
    expect(pub.status).toBe(200);
    expect(pub.headers.get('content-type')).toBe('image/png');
    expect(pub.headers.get('x-content-type-options')).toBe('nosniff');
    expect(pub.headers.get('cache-control')).toMatch(/public/);
    const bytes = Buffer.from(await pub.arrayBuffer());
    expect(bytes.subarray(0, 4).toString('hex')).toBe('89504e47');
    expect((await sharp(bytes).metadata()).exif).toBeUndefined();
    const again = await fetch(`${appUrl}/api/branding/logo/${firmId}`, { headers: { 'if-none-match': pub.headers.get('etag')! } });
    expect(again.status).toBe(304);
  });

  it('refuses an image that lies about its type and an SVG, keeping the stored logo', async () => {
    const before = (db.prepare('select hash from firm_logos where firm_id = ?').get(firmId) as { hash: string }).hash;
    for (const [name, content, re] of [
      ['logo.png', 'GIF89a pretending', /logo\.png is not a PNG, JPEG or WebP image/],
      ['logo.svg', '<svg xmlns="http://www.w3.org/2000/svg"/>', /SVG logos are refused/],
    ] as const) {
      const r = await send(owner, 'PUT', '/api/branding/logo', logoForm(new TextEncoder().encode(content), name));
      expect(r.status).toBe(422);
      expect((r.body as unknown as ErrBody).error.message).toMatch(re);
    }
    expect((db.prepare('select hash from firm_logos where firm_id = ?').get(firmId) as { hash: string }).hash).toBe(before);
    const authorTry = await send(author, 'PUT', '/api/branding/logo', logoForm(new Uint8Array([1]), 'x.png'));
    expect(authorTry.status).toBe(403);
  });
});
