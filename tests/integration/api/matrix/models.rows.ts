import type Database from 'better-sqlite3';
import { randomUUID } from 'node:crypto';
import type { MatrixRow } from './types';
import { validateModel } from '@/lib/core/engine/schema';
import { exampleFormula } from '@/lib/core/engine/examples';

// Studio routes. Targets are written straight into the test database so every persona acts on a fresh record.

const now = () => new Date().toISOString();
const MODEL = (() => {
  const r = validateModel(exampleFormula);
  if (!r.ok) throw new Error('example model does not validate');
  return r.model;
})();

/** A user of the firm who wrote the version, so that no persona is its author. */
function directAuthor(db: Database.Database, firmId: string): string {
  const userId = randomUUID();
  db.prepare('insert into users (id, email, name, created_at) values (?,?,?,?)').run(userId, `matrix-author-${userId}@test-firm.example`, 'Matrix Author', now());
  db.prepare('insert into memberships (id, firm_id, user_id, role, status, created_at, updated_at) values (?,?,?,?,?,?,?)').run(randomUUID(), firmId, userId, 'author', 'active', now(), now());
  return userId;
}

export function insertModelWithVersion(
  db: Database.Database,
  firmId: string,
  opts: { checkState?: 'unchecked' | 'signed_off'; authorId?: string } = {},
): { modelId: string; versionId: string } {
  const modelId = randomUUID();
  const versionId = randomUUID();
  const author = opts.authorId ?? directAuthor(db, firmId);
  db.prepare('insert into models (id, firm_id, title, template, draft_json, created_by, created_at, updated_by, updated_at) values (?,?,?,?,?,?,?,?,?)').run(
    modelId,
    firmId,
    'Matrix model',
    'formula',
    JSON.stringify(MODEL),
    author,
    now(),
    author,
    now(),
  );
  db.prepare('insert into model_versions (id, model_id, firm_id, number, model_json, author_id, created_at) values (?,?,?,?,?,?,?)').run(versionId, modelId, firmId, 1, JSON.stringify(MODEL), author, now());
  if (opts.checkState === 'signed_off') {
    db.prepare("update model_versions set check_state = 'signed_off', checker_id = ?, checked_at = ?, check_note = 'ok' where id = ?").run(directAuthor(db, firmId), now(), versionId);
  }
  return { modelId, versionId };
}

export function insertWidget(db: Database.Database, firmId: string): string {
  const { modelId, versionId } = insertModelWithVersion(db, firmId, { checkState: 'signed_off' });
  const id = randomUUID();
  db.prepare(
    'insert into widgets (id, firm_id, model_id, version_id, title, panels, headline, dial_ids, brand_color, show_logo, published_at, updated_at) values (?,?,?,?,?,?,?,?,?,?,?,?)',
  ).run(id, firmId, modelId, versionId, 'Matrix widget', '["headline"]', 'mean', '[]', '#1f887b', 1, now(), now());
  return id;
}

const readAll = { anonymous: 401, owner: 200, author: 200, checker: 200, outsider: 404 };
const authorOnly = { anonymous: 401, owner: 403, author: 200, checker: 403, outsider: 403 };
const publishers = { anonymous: 401, owner: 200, author: 200, checker: 403, outsider: 404 };

export const rows: MatrixRow[] = [
  { method: 'GET', route: '/api/models', prepare: () => ({ path: '/api/models' }), expect: { ...readAll, outsider: 200 }, note: 'outsider sees its own firm’s list' },
  {
    method: 'POST',
    route: '/api/models',
    prepare: () => ({ path: '/api/models', body: { title: 'Matrix new model', template: 'formula', start: 'blank' } }),
    expect: { ...authorOnly, author: 201 },
  },
  { method: 'GET', route: '/api/models/[id]', prepare: (c) => ({ path: `/api/models/${insertModelWithVersion(c.db, c.firmId).modelId}` }), expect: readAll },
  {
    method: 'PATCH',
    route: '/api/models/[id]',
    prepare: (c) => ({ path: `/api/models/${insertModelWithVersion(c.db, c.firmId).modelId}`, body: { archived: true } }),
    expect: authorOnly,
  },
  {
    method: 'POST',
    route: '/api/models/[id]/duplicate',
    prepare: (c) => ({ path: `/api/models/${insertModelWithVersion(c.db, c.firmId).modelId}/duplicate`, body: {} }),
    expect: { ...authorOnly, author: 201 },
  },
  { method: 'GET', route: '/api/models/[id]/versions', prepare: (c) => ({ path: `/api/models/${insertModelWithVersion(c.db, c.firmId).modelId}/versions` }), expect: readAll },
  {
    method: 'POST',
    route: '/api/models/[id]/versions',
    prepare: (c) => ({ path: `/api/models/${insertModelWithVersion(c.db, c.firmId).modelId}/versions`, body: { baseVersion: 1, note: 'matrix', model: MODEL } }),
    expect: { ...authorOnly, author: 201 },
  },
  { method: 'GET', route: '/api/models/[id]/versions/[n]', prepare: (c) => ({ path: `/api/models/${insertModelWithVersion(c.db, c.firmId).modelId}/versions/1` }), expect: readAll },
  {
    method: 'POST',
    route: '/api/versions/[id]/check',
    prepare: (c) => ({ path: `/api/versions/${insertModelWithVersion(c.db, c.firmId).versionId}/check`, body: { decision: 'sign_off', note: 'Checked in the matrix.' } }),
    expect: { anonymous: 401, owner: 403, author: 403, checker: 200, outsider: 403 },
    note: 'the version’s author is another member, so the checker may sign it off',
  },
  { method: 'GET', route: '/api/widgets', prepare: () => ({ path: '/api/widgets' }), expect: { ...readAll, outsider: 200 }, note: 'outsider sees its own firm’s widgets' },
  {
    method: 'POST',
    route: '/api/widgets',
    prepare: (c) => {
      const { modelId, versionId } = insertModelWithVersion(c.db, c.firmId, { checkState: 'signed_off' });
      return { path: '/api/widgets', body: { modelId, versionId, title: 'Matrix widget', panels: ['headline', 'spread'], headline: 'mean', dialIds: ['service_factor'] } };
    },
    expect: { ...publishers, owner: 201, author: 201 },
    note: 'outsider (an owner elsewhere) may publish, but not this firm’s model',
  },
  { method: 'GET', route: '/api/widgets/[id]', prepare: (c) => ({ path: `/api/widgets/${insertWidget(c.db, c.firmId)}` }), expect: readAll },
  { method: 'PATCH', route: '/api/widgets/[id]', prepare: (c) => ({ path: `/api/widgets/${insertWidget(c.db, c.firmId)}`, body: { title: 'Renamed in the matrix' } }), expect: publishers },
  { method: 'DELETE', route: '/api/widgets/[id]', prepare: (c) => ({ path: `/api/widgets/${insertWidget(c.db, c.firmId)}` }), expect: { ...publishers, owner: 204, author: 204 } },
];
