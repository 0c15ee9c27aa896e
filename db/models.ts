import 'server-only';
import type { Knex } from 'knex';
import { getDb } from '@/db/knex';
import { newId, nowIso } from '@/db/ids';
import type { CheckedModel } from '@/lib/core/engine/checked-model';

// Models and their immutable versions. Every query is scoped by firm; model JSON is stored as text and parsed here.

export type { TemplateId, CheckState, CheckComment, ModelRecord, VersionSummary, VersionRecord, ModelListRow } from '@/lib/core/models/types';
import type { TemplateId, CheckState, CheckComment, ModelRecord, VersionSummary, VersionRecord, ModelListRow } from '@/lib/core/models/types';

type Db = Knex | Knex.Transaction;

/**
 * Model JSON read back as stored. Only checked models are written (insertModel and insertVersion take a CheckedModel,
 * made by the schema at the API, the import or the editor) and versions are immutable, so what comes back is one.
 */
export const storedModel = (json: string): CheckedModel => JSON.parse(json) as CheckedModel;
const db = (trx?: Knex.Transaction): Db => trx ?? getDb();

const MODEL_COLUMNS = [
  'm.id',
  'm.firm_id',
  'm.title',
  'm.template',
  'm.draft_json',
  'm.created_by',
  'm.created_at',
  'm.updated_by',
  'm.updated_at',
  'm.archived_at',
  'cu.name as created_by_name',
  'uu.name as updated_by_name',
];

function toModel(r: Record<string, unknown>): ModelRecord {
  return {
    id: r.id as string,
    firmId: r.firm_id as string,
    title: r.title as string,
    template: r.template as TemplateId,
    draft: storedModel(r.draft_json as string),
    createdBy: (r.created_by as string | null) ?? null,
    createdByName: (r.created_by_name as string | null) ?? null,
    createdAt: r.created_at as string,
    updatedBy: (r.updated_by as string | null) ?? null,
    updatedByName: (r.updated_by_name as string | null) ?? null,
    updatedAt: r.updated_at as string,
    archivedAt: (r.archived_at as string | null) ?? null,
  };
}

export async function getModel(firmId: string, id: string, trx?: Knex.Transaction): Promise<ModelRecord | null> {
  const r = await db(trx)('models as m')
    .leftJoin('users as cu', 'cu.id', 'm.created_by')
    .leftJoin('users as uu', 'uu.id', 'm.updated_by')
    .where({ 'm.firm_id': firmId, 'm.id': id })
    .select(MODEL_COLUMNS)
    .first();
  return r ? toModel(r) : null;
}

/** The firm's models with their latest version and live widget, newest edit first. */
export async function listModels(firmId: string, opts: { includeArchived?: boolean } = {}): Promise<ModelListRow[]> {
  const q = getDb()('models as m')
    .leftJoin('users as cu', 'cu.id', 'm.created_by')
    .leftJoin('users as uu', 'uu.id', 'm.updated_by')
    .where('m.firm_id', firmId)
    .select('m.id', 'm.title', 'm.template', 'm.created_at', 'm.updated_at', 'm.archived_at', 'cu.name as created_by_name', 'uu.name as updated_by_name')
    .orderBy('m.updated_at', 'desc');
  if (!opts.includeArchived) q.whereNull('m.archived_at');
  const models = await q;
  if (!models.length) return [];
  const ids = models.map((m) => m.id as string);

  // Latest version per model: the row whose number is the model's maximum.
  const latest = await getDb()('model_versions as v')
    .leftJoin('users as a', 'a.id', 'v.author_id')
    .where('v.firm_id', firmId)
    .whereIn('v.model_id', ids)
    .whereRaw('v.number = (select max(v2.number) from model_versions v2 where v2.model_id = v.model_id)')
    .select('v.model_id', 'v.number', 'v.check_state', 'v.created_at', 'a.name as author_name');
  const byModel = new Map(latest.map((v) => [v.model_id as string, v]));

  const live = await getDb()('widgets as w')
    .join('model_versions as v', 'v.id', 'w.version_id')
    .where('w.firm_id', firmId)
    .whereNull('w.unpublished_at')
    .whereIn('w.model_id', ids)
    .select('w.id', 'w.model_id', 'w.published_at', 'v.number');
  const widgetByModel = new Map(live.map((w) => [w.model_id as string, w]));

  return models.map((m) => {
    const v = byModel.get(m.id);
    const w = widgetByModel.get(m.id);
    return {
      id: m.id,
      title: m.title,
      template: m.template,
      createdAt: m.created_at,
      createdByName: m.created_by_name ?? null,
      updatedAt: m.updated_at,
      updatedByName: m.updated_by_name ?? null,
      archivedAt: m.archived_at ?? null,
      latestVersion: v ? { number: v.number, checkState: v.check_state, createdAt: v.created_at, authorName: v.author_name ?? null } : null,
      published: w ? { widgetId: w.id, versionNumber: w.number, publishedAt: w.published_at } : null,
    };
  });
}

export async function insertModel(
  m: { firmId: string; title: string; template: TemplateId; draft: CheckedModel; userId: string },
  trx: Knex.Transaction,
): Promise<string> {
  const id = newId();
  const now = nowIso();
  await trx('models').insert({
    id,
    firm_id: m.firmId,
    title: m.title,
    template: m.template,
    draft_json: JSON.stringify(m.draft),
    created_by: m.userId,
    created_at: now,
    updated_by: m.userId,
    updated_at: now,
  });
  return id;
}

export async function updateModelMeta(
  firmId: string,
  id: string,
  patch: { title?: string; archived?: boolean; userId: string },
  trx: Knex.Transaction,
): Promise<void> {
  const row: Record<string, unknown> = { updated_by: patch.userId, updated_at: nowIso() };
  if (patch.title !== undefined) row.title = patch.title;
  if (patch.archived !== undefined) row.archived_at = patch.archived ? nowIso() : null;
  await trx('models').where({ firm_id: firmId, id }).update(row);
}

const VERSION_COLUMNS = [
  'v.id',
  'v.model_id',
  'v.number',
  'v.author_id',
  'v.created_at',
  'v.note',
  'v.check_state',
  'v.checker_id',
  'v.checked_at',
  'v.check_note',
  'v.check_comments',
  'a.name as author_name',
  'c.name as checker_name',
];

function toVersionSummary(r: Record<string, unknown>): VersionSummary {
  return {
    id: r.id as string,
    modelId: r.model_id as string,
    number: Number(r.number),
    authorId: (r.author_id as string | null) ?? null,
    authorName: (r.author_name as string | null) ?? null,
    createdAt: r.created_at as string,
    note: (r.note as string | null) ?? null,
    checkState: r.check_state as CheckState,
    checkerId: (r.checker_id as string | null) ?? null,
    checkerName: (r.checker_name as string | null) ?? null,
    checkedAt: (r.checked_at as string | null) ?? null,
    checkNote: (r.check_note as string | null) ?? null,
    comments: r.check_comments ? (JSON.parse(r.check_comments as string) as CheckComment[]) : [],
  };
}

function versionQuery(trx?: Knex.Transaction) {
  return db(trx)('model_versions as v').leftJoin('users as a', 'a.id', 'v.author_id').leftJoin('users as c', 'c.id', 'v.checker_id');
}

export async function listVersions(firmId: string, modelId: string, trx?: Knex.Transaction): Promise<VersionSummary[]> {
  const rows = await versionQuery(trx).where({ 'v.firm_id': firmId, 'v.model_id': modelId }).select(VERSION_COLUMNS).orderBy('v.number', 'desc');
  return rows.map(toVersionSummary);
}

async function oneVersion(where: Record<string, unknown>, trx?: Knex.Transaction): Promise<VersionRecord | null> {
  const r = await versionQuery(trx)
    .where(where)
    .select([...VERSION_COLUMNS, 'v.model_json'])
    .first();
  return r ? { ...toVersionSummary(r), model: storedModel(r.model_json as string) } : null;
}

export function getVersionByNumber(firmId: string, modelId: string, number: number, trx?: Knex.Transaction): Promise<VersionRecord | null> {
  return oneVersion({ 'v.firm_id': firmId, 'v.model_id': modelId, 'v.number': number }, trx);
}

export function getVersionById(firmId: string, id: string, trx?: Knex.Transaction): Promise<VersionRecord | null> {
  return oneVersion({ 'v.firm_id': firmId, 'v.id': id }, trx);
}

export async function getLatestVersionSummary(firmId: string, modelId: string, trx?: Knex.Transaction): Promise<VersionSummary | null> {
  const r = await versionQuery(trx).where({ 'v.firm_id': firmId, 'v.model_id': modelId }).select(VERSION_COLUMNS).orderBy('v.number', 'desc').first();
  return r ? toVersionSummary(r) : null;
}

export async function getLatestVersion(firmId: string, modelId: string, trx?: Knex.Transaction): Promise<VersionRecord | null> {
  const latest = await getLatestVersionSummary(firmId, modelId, trx);
  return latest ? getVersionById(firmId, latest.id, trx) : null;
}

export async function insertVersion(
  v: { firmId: string; modelId: string; number: number; model: CheckedModel; authorId: string; note: string | null },
  trx: Knex.Transaction,
): Promise<string> {
  const id = newId();
  await trx('model_versions').insert({
    id,
    model_id: v.modelId,
    firm_id: v.firmId,
    number: v.number,
    model_json: JSON.stringify(v.model),
    author_id: v.authorId,
    created_at: nowIso(),
    note: v.note,
  });
  return id;
}

/** Writes the checker's decision once; returns false when the version was already decided. */
export async function recordCheck(
  firmId: string,
  versionId: string,
  c: { state: 'signed_off' | 'sent_back'; checkerId: string; note: string; comments: CheckComment[] },
  trx: Knex.Transaction,
): Promise<boolean> {
  const n = await trx('model_versions')
    .where({ firm_id: firmId, id: versionId, check_state: 'unchecked' })
    .update({
      check_state: c.state,
      checker_id: c.checkerId,
      checked_at: nowIso(),
      check_note: c.note,
      check_comments: c.comments.length ? JSON.stringify(c.comments) : null,
    });
  return n === 1;
}
