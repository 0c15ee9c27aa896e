import type Database from 'better-sqlite3';
import { randomUUID } from 'node:crypto';
import type { MatrixRow } from './types';
import { validateModel } from '@/lib/core/engine/schema';
import { exampleLinearStack } from '@/lib/core/engine/examples';
import { mintPassToken } from '@/lib/server/embed/tokens';

// Clients, passes and the embed API. Dashboard personas act on fresh records written straight into the test
// database. The embed API knows no sessions: a dashboard cookie opens nothing there (401 without a bearer),
// and the pass exchange is public because the signed pass in its body is the credential.

const now = () => new Date().toISOString();
export const STACK_MODEL = (() => {
  const r = validateModel(exampleLinearStack);
  if (!r.ok) throw new Error('example model does not validate');
  return r.model;
})();

export function insertEmbedWidget(db: Database.Database, firmId: string, title = 'Shaft float'): string {
  const modelId = randomUUID();
  const versionId = randomUUID();
  const widgetId = randomUUID();
  db.prepare('insert into models (id, firm_id, title, template, draft_json, created_at, updated_at) values (?,?,?,?,?,?,?)').run(modelId, firmId, title, 'linear-stack', JSON.stringify(STACK_MODEL), now(), now());
  db.prepare("insert into model_versions (id, model_id, firm_id, number, model_json, created_at, check_state, checked_at) values (?,?,?,?,?,?,'signed_off',?)").run(
    versionId,
    modelId,
    firmId,
    1,
    JSON.stringify(STACK_MODEL),
    now(),
    now(),
  );
  db.prepare(
    'insert into widgets (id, firm_id, model_id, version_id, title, panels, headline, dial_ids, brand_color, show_logo, published_at, updated_at) values (?,?,?,?,?,?,?,?,?,?,?,?)',
  ).run(widgetId, firmId, modelId, versionId, title, '["headline","spread","cumulative","drivers"]', 'mean', '["spacer_length","float_max"]', '#1f887b', 1, now(), now());
  return widgetId;
}

export function insertClientRow(db: Database.Database, firmId: string, origins = ['http://localhost:4200']): string {
  const id = randomUUID();
  db.prepare(
    'insert into clients (id, firm_id, name, allowed_origins, allowed_email_domains, key_version, not_before, created_at, updated_at) values (?,?,?,?,?,?,?,?,?)',
  ).run(id, firmId, `Matrix client ${id.slice(0, 8)}`, JSON.stringify(origins), '["client.example"]', 1, new Date(Date.now() - 60_000).toISOString(), now(), now());
  return id;
}

/** A live pass with one token; returns the pass id and the signed token (minted with the stack's development secret). */
export async function insertPassRow(db: Database.Database, firmId: string, opts: { clientId?: string; widgetId?: string } = {}): Promise<{ passId: string; token: string; clientId: string; widgetId: string }> {
  const clientId = opts.clientId ?? insertClientRow(db, firmId);
  const widgetId = opts.widgetId ?? insertEmbedWidget(db, firmId);
  const passId = randomUUID();
  const jti = randomUUID();
  const issuedAt = now();
  const expiresAt = new Date(Date.now() + 90 * 86_400_000).toISOString();
  db.prepare('insert into passes (id, firm_id, client_id, widget_id, created_at, expires_at) values (?,?,?,?,?,?)').run(passId, firmId, clientId, widgetId, issuedAt, expiresAt);
  db.prepare('insert into pass_tokens (jti, pass_id, firm_id, key_version, issued_at, expires_at) values (?,?,?,?,?,?)').run(jti, passId, firmId, 1, issuedAt, expiresAt);
  const token = await mintPassToken({ passId, clientId, keyVersion: 1, jti, issuedAt, expiresAt });
  return { passId, token, clientId, widgetId };
}

const read = { anonymous: 401, owner: 200, author: 200, checker: 200, outsider: 404 };
const manage = { anonymous: 401, owner: 200, author: 200, checker: 403, outsider: 404 };
const listing = { anonymous: 401, owner: 200, author: 200, checker: 200, outsider: 200 };
const everyone = (status: number) => ({ anonymous: status, owner: status, author: status, checker: status, outsider: status });
const origins = ['https://portal.matrix-client.example'];

export const rows: MatrixRow[] = [
  { method: 'GET', route: '/api/clients', prepare: () => ({ path: '/api/clients' }), expect: listing, note: 'outsider sees its own firm’s clients' },
  {
    method: 'POST',
    route: '/api/clients',
    prepare: (_c, p) => ({ path: '/api/clients', body: { name: `Matrix ${p} ${randomUUID().slice(0, 8)}`, allowedOrigins: origins, allowedEmailDomains: ['matrix-client.example'] } }),
    expect: { anonymous: 401, owner: 201, author: 201, checker: 403, outsider: 201 },
    note: 'outsider creates a client in its own firm',
  },
  { method: 'GET', route: '/api/clients/[id]', prepare: (c) => ({ path: `/api/clients/${insertClientRow(c.db, c.firmId)}` }), expect: read },
  { method: 'PATCH', route: '/api/clients/[id]', prepare: (c) => ({ path: `/api/clients/${insertClientRow(c.db, c.firmId)}`, body: { allowedOrigins: origins } }), expect: manage },
  { method: 'POST', route: '/api/clients/[id]/rotate-key', prepare: (c) => ({ path: `/api/clients/${insertClientRow(c.db, c.firmId)}/rotate-key` }), expect: manage },
  { method: 'GET', route: '/api/passes', prepare: () => ({ path: '/api/passes' }), expect: listing },
  {
    method: 'POST',
    route: '/api/passes',
    prepare: (c) => ({ path: '/api/passes', body: { clientId: insertClientRow(c.db, c.firmId), widgetId: insertEmbedWidget(c.db, c.firmId) } }),
    expect: { anonymous: 401, owner: 201, author: 201, checker: 403, outsider: 422 },
    note: 'outsider: the client is not one of its firm’s (field error, nothing stored)',
  },
  { method: 'GET', route: '/api/passes/[id]', prepare: async (c) => ({ path: `/api/passes/${(await insertPassRow(c.db, c.firmId)).passId}` }), expect: read },
  { method: 'POST', route: '/api/passes/[id]/renew', prepare: async (c) => ({ path: `/api/passes/${(await insertPassRow(c.db, c.firmId)).passId}/renew`, body: { days: 30 } }), expect: manage },
  { method: 'POST', route: '/api/passes/[id]/revoke', prepare: async (c) => ({ path: `/api/passes/${(await insertPassRow(c.db, c.firmId)).passId}/revoke` }), expect: manage },
  {
    method: 'POST',
    route: '/api/embed/session',
    prepare: async (c) => {
      const p = await insertPassRow(c.db, c.firmId);
      return { path: '/api/embed/session', body: { passId: p.passId, pass: p.token } };
    },
    expect: everyone(200),
    note: 'public: the signed pass is the credential; sessions play no part',
  },
  {
    method: 'POST',
    route: '/api/embed/session',
    prepare: async (c) => {
      const p = await insertPassRow(c.db, c.firmId);
      return { path: '/api/embed/session', body: { passId: p.passId, pass: p.token, widget: true } };
    },
    expect: everyone(200),
    note: 'with the widget (the embed page’s first request): the same pass check; a dashboard session adds nothing',
  },
  {
    method: 'GET',
    route: '/api/embed/passes/[id]/widget',
    prepare: async (c) => ({ path: `/api/embed/passes/${(await insertPassRow(c.db, c.firmId)).passId}/widget` }),
    expect: everyone(401),
    note: 'bearer token only: a dashboard session opens nothing here',
  },
  {
    method: 'POST',
    route: '/api/embed/passes/[id]/events',
    prepare: async (c) => ({ path: `/api/embed/passes/${(await insertPassRow(c.db, c.firmId)).passId}/events`, body: { kind: 'dial', dialId: 'spacer_length', value: 24.1 } }),
    expect: everyone(401),
    note: 'bearer token only',
  },
];
