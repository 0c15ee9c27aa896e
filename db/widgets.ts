import 'server-only';
import type { Knex } from 'knex';
import { getDb } from '@/db/knex';
import { prepared } from '@/db/prepared';
import { newId, nowIso } from '@/db/ids';
import { storedModel } from '@/db/models';
import type { CheckState, TemplateId } from '@/lib/core/models/types';

// Published widgets: a checked version of a model plus how a client sees it. Scoped by firm.

export type { WidgetRecord, PublishedWidget } from '@/lib/core/models/types';
import type { WidgetRecord, PublishedWidget } from '@/lib/core/models/types';

const COLUMNS = [
  'w.id',
  'w.firm_id',
  'w.model_id',
  'w.version_id',
  'w.title',
  'w.panels',
  'w.headline',
  'w.dial_ids',
  'w.brand_color',
  'w.show_logo',
  'w.published_by',
  'w.published_at',
  'w.updated_at',
  'w.unpublished_at',
  'm.title as model_title',
  'm.template',
  'v.number as version_number',
  'v.check_state as version_check_state',
  'pu.name as published_by_name',
];

function base(trx?: Knex.Transaction) {
  return (trx ?? getDb())('widgets as w')
    .join('models as m', 'm.id', 'w.model_id')
    .join('model_versions as v', 'v.id', 'w.version_id')
    .leftJoin('users as pu', 'pu.id', 'w.published_by');
}

function toWidget(r: Record<string, unknown>): WidgetRecord {
  return {
    id: r.id as string,
    firmId: r.firm_id as string,
    modelId: r.model_id as string,
    modelTitle: r.model_title as string,
    template: r.template as TemplateId,
    versionId: r.version_id as string,
    versionNumber: Number(r.version_number),
    versionCheckState: r.version_check_state as CheckState,
    title: r.title as string,
    panels: JSON.parse(r.panels as string) as string[],
    headline: r.headline as string,
    dialIds: JSON.parse(r.dial_ids as string) as string[],
    brandColor: r.brand_color as string,
    showLogo: Boolean(r.show_logo),
    publishedBy: (r.published_by as string | null) ?? null,
    publishedByName: (r.published_by_name as string | null) ?? null,
    publishedAt: r.published_at as string,
    updatedAt: r.updated_at as string,
    unpublishedAt: (r.unpublished_at as string | null) ?? null,
  };
}

export async function listWidgets(firmId: string, opts: { includeUnpublished?: boolean; modelId?: string } = {}): Promise<WidgetRecord[]> {
  const q = base().where('w.firm_id', firmId).select(COLUMNS).orderBy('w.published_at', 'desc');
  if (!opts.includeUnpublished) q.whereNull('w.unpublished_at');
  if (opts.modelId) q.where('w.model_id', opts.modelId);
  return (await q).map(toWidget);
}

export async function getWidget(firmId: string, id: string, trx?: Knex.Transaction): Promise<WidgetRecord | null> {
  const r = await base(trx).where({ 'w.firm_id': firmId, 'w.id': id }).select(COLUMNS).first();
  return r ? toWidget(r) : null;
}

export async function getLiveWidgetForModel(firmId: string, modelId: string, trx?: Knex.Transaction): Promise<WidgetRecord | null> {
  const r = await base(trx).where({ 'w.firm_id': firmId, 'w.model_id': modelId }).whereNull('w.unpublished_at').select(COLUMNS).first();
  return r ? toWidget(r) : null;
}

function publishedQuery(firmId: string, id: string, trx?: Knex.Transaction) {
  return base(trx)
    .join('firms as f', 'f.id', 'w.firm_id')
    .leftJoin('users as au', 'au.id', 'v.author_id')
    .leftJoin('users as cu', 'cu.id', 'v.checker_id')
    .where({ 'w.firm_id': firmId, 'w.id': id })
    .whereNull('w.unpublished_at')
    .whereNull('m.archived_at');
}

const PUBLISHED_COLUMNS = [...COLUMNS, 'v.created_at as version_created_at', 'au.name as author_name', 'cu.name as checker_name', 'v.checked_at', 'f.name as firm_name'];

function toPublished(r: Record<string, unknown>): Omit<PublishedWidget, 'model'> {
  return {
    ...toWidget(r),
    versionCreatedAt: r.version_created_at as string,
    authorName: (r.author_name as string | null) ?? null,
    checkerName: (r.checker_name as string | null) ?? null,
    checkedAt: (r.checked_at as string | null) ?? null,
    firmName: r.firm_name as string,
  };
}

/**
 * For the client-facing side (embed pages, snapshots): a live widget of a live (not archived) model, with the
 * published version's model JSON and sign-off. Null when the widget was taken down or belongs to another firm.
 */
export async function getPublishedWidget(firmId: string, id: string, trx?: Knex.Transaction): Promise<PublishedWidget | null> {
  const r = await publishedQuery(firmId, id, trx).select([...PUBLISHED_COLUMNS, 'v.model_json']).first();
  return r ? { ...toPublished(r), model: storedModel(r.model_json as string) } : null;
}

/**
 * The same without the model JSON (the embed read path takes it from a cache by version id: versions never
 * change), plus the hash of the firm's logo, if any, for the logo's address.
 */
const metaQuery = prepared<'firmId' | 'id'>((_db, param) =>
  publishedQuery(param('firmId'), param('id')).leftJoin('firm_logos as fl', 'fl.firm_id', 'w.firm_id').select([...PUBLISHED_COLUMNS, 'fl.hash as logo_hash']).limit(1),
);

export async function getPublishedWidgetMeta(firmId: string, id: string): Promise<(Omit<PublishedWidget, 'model'> & { logoHash: string | null }) | null> {
  const r = (await metaQuery({ firmId, id }))[0];
  return r ? { ...toPublished(r), logoHash: (r.logo_hash as string | null) ?? null } : null;
}

/** A version's model JSON as stored (versions are immutable once created). */
export async function getVersionModelJson(firmId: string, versionId: string): Promise<string | null> {
  const r = await getDb()('model_versions').where({ firm_id: firmId, id: versionId }).first('model_json');
  return r ? (r.model_json as string) : null;
}

export interface WidgetFields {
  title: string;
  panels: string[];
  headline: string;
  dialIds: string[];
  brandColor: string;
  showLogo: boolean;
}

export async function insertWidget(
  w: WidgetFields & { firmId: string; modelId: string; versionId: string; userId: string },
  trx: Knex.Transaction,
): Promise<string> {
  const id = newId();
  const now = nowIso();
  await trx('widgets').insert({
    id,
    firm_id: w.firmId,
    model_id: w.modelId,
    version_id: w.versionId,
    title: w.title,
    panels: JSON.stringify(w.panels),
    headline: w.headline,
    dial_ids: JSON.stringify(w.dialIds),
    brand_color: w.brandColor,
    show_logo: w.showLogo,
    published_by: w.userId,
    published_at: now,
    updated_by: w.userId,
    updated_at: now,
  });
  return id;
}

/** Changes presentation and/or moves the widget to another version (an explicit republish). */
export async function updateWidget(
  firmId: string,
  id: string,
  patch: Partial<WidgetFields> & { versionId?: string; userId: string },
  trx: Knex.Transaction,
): Promise<void> {
  const now = nowIso();
  const row: Record<string, unknown> = { updated_by: patch.userId, updated_at: now };
  if (patch.title !== undefined) row.title = patch.title;
  if (patch.panels !== undefined) row.panels = JSON.stringify(patch.panels);
  if (patch.headline !== undefined) row.headline = patch.headline;
  if (patch.dialIds !== undefined) row.dial_ids = JSON.stringify(patch.dialIds);
  if (patch.brandColor !== undefined) row.brand_color = patch.brandColor;
  if (patch.showLogo !== undefined) row.show_logo = patch.showLogo;
  if (patch.versionId !== undefined) {
    row.version_id = patch.versionId;
    row.published_by = patch.userId;
    row.published_at = now;
  }
  await trx('widgets').where({ firm_id: firmId, id }).whereNull('unpublished_at').update(row);
}

export async function unpublishWidget(firmId: string, id: string, userId: string, trx: Knex.Transaction): Promise<boolean> {
  const now = nowIso();
  const n = await trx('widgets').where({ firm_id: firmId, id }).whereNull('unpublished_at').update({ unpublished_at: now, unpublished_by: userId, updated_by: userId, updated_at: now });
  return n === 1;
}
