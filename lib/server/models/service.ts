import 'server-only';
import type { Knex } from 'knex';
import { writeTransaction } from '@/db/knex';
import { recordAudit } from '@/db/audit';
import { getFirm } from '@/db/firms';
import {
  getLatestVersion,
  getLatestVersionSummary,
  getModel,
  getVersionById,
  getVersionByNumber,
  insertModel,
  insertVersion,
  listVersions,
  recordCheck,
  updateModelMeta,
} from '@/db/models';
import { getLiveWidgetForModel, getWidget, insertWidget, unpublishWidget as dbUnpublish, updateWidget as dbUpdateWidget } from '@/db/widgets';
import { listModels, type ModelListRow } from '@/db/models';
import { listWidgets } from '@/db/widgets';
import { EXAMPLE_MODELS } from '@/lib/core/engine/examples';
import { validateModel, type CheckedModel } from '@/lib/core/engine/schema';
import { AppError, conflict, forbidden, notFound } from '@/lib/server/http/errors';
import type { Member } from '@/lib/server/auth/guard';
import { assertAuthoringAllowed } from '@/lib/server/billing';
import { blankModel } from '@/lib/server/models/blank';
import { headlineIds } from '@/lib/core/models/widget-options';
import { utcStamp } from '@/lib/core/models/templates';
import { notifyCheckDecided, notifyCheckRequested, notifyWidgetPublished } from '@/lib/server/notifications/queue';
import type { CheckInput, CreateModelInput, PublishInput, SaveVersionInput, WidgetPatchInput } from '@/lib/server/models/schemas';
import type { ModelRecord, VersionRecord, VersionSummary, WidgetRecord } from '@/lib/core/models/types';
import type { ModelDetail } from '@/lib/core/api-types';
import { queueFirstFigures } from '@/lib/server/embed/first-figures';

// The studio's rules: versions are immutable and numbered without gaps, a later save never silently overwrites,
// checkers never check their own work, and only checked versions reach clients unless the firm says otherwise.
// While billing makes the firm read-only, every change is refused except taking a widget down.

/** Who may act on what, sent to the browser so it shows only the actions the server will accept. */
export interface ModelAbilities {
  edit: boolean;
  check: boolean;
  publish: boolean;
}

export type { ModelDetail };

async function mustGetModel(firmId: string, id: string, trx?: Knex.Transaction): Promise<ModelRecord> {
  const m = await getModel(firmId, id, trx);
  if (!m) throw notFound('That model');
  return m;
}

function assertNotArchived(m: ModelRecord, doing: string): void {
  if (m.archivedAt) throw conflict(`“${m.title}” is archived. Restore it from the models list before you ${doing}.`);
}

export async function modelDetail(member: Member, id: string): Promise<ModelDetail> {
  const model = await mustGetModel(member.firmId, id);
  const [versions, latest, widget, firm] = await Promise.all([
    listVersions(member.firmId, id),
    getLatestVersion(member.firmId, id),
    getLiveWidgetForModel(member.firmId, id),
    getFirm(member.firmId),
  ]);
  return { model, versions, latest, widget, requireCheck: firm?.requireCheck ?? true };
}

export async function createModel(member: Member, input: CreateModelInput): Promise<ModelRecord> {
  const firm = await getFirm(member.firmId);
  let start: CheckedModel;
  if (input.model) start = { ...input.model, title: input.title };
  else {
    const raw = input.start === 'example' ? { ...structuredClone(EXAMPLE_MODELS[input.template]), title: input.title } : blankModel(input.template, input.title, { unit: firm?.unitsDefault ?? 'mm', currency: firm?.currencyDefault ?? 'EUR' });
    const r = validateModel(raw);
    // The examples and blanks are the engine's and ours; a failure here is a bug, not the user's input.
    if (!r.ok) throw new Error(`Starting model for ${input.template} does not validate: ${r.issues.map((i) => i.message).join('; ')}`);
    start = r.model;
  }
  return writeTransaction(async (trx) => {
    await assertAuthoringAllowed(member.firmId, trx);
    const id = await insertModel({ firmId: member.firmId, title: input.title, template: input.template, draft: start, userId: member.userId }, trx);
    await recordAudit(
      { firmId: member.firmId, actorUserId: member.userId, action: 'model.created', targetType: 'model', targetId: id, detail: { title: input.title, template: input.template, start: input.start } },
      trx,
    );
    return (await getModel(member.firmId, id, trx))!;
  });
}

export async function duplicateModel(member: Member, id: string, title?: string): Promise<ModelRecord> {
  return writeTransaction(async (trx) => {
    await assertAuthoringAllowed(member.firmId, trx);
    const source = await mustGetModel(member.firmId, id, trx);
    const latest = await getLatestVersion(member.firmId, id, trx);
    const newTitle = title ?? `${source.title} (copy)`.slice(0, 120);
    const draft = { ...(latest?.model ?? source.draft), title: newTitle };
    const newId = await insertModel({ firmId: member.firmId, title: newTitle, template: source.template, draft, userId: member.userId }, trx);
    await recordAudit(
      {
        firmId: member.firmId,
        actorUserId: member.userId,
        action: 'model.duplicated',
        targetType: 'model',
        targetId: newId,
        detail: { from: id, fromVersion: latest?.number ?? null, title: newTitle },
      },
      trx,
    );
    return (await getModel(member.firmId, newId, trx))!;
  });
}

export async function setArchived(member: Member, id: string, archived: boolean): Promise<ModelRecord> {
  return writeTransaction(async (trx) => {
    await assertAuthoringAllowed(member.firmId, trx);
    const m = await mustGetModel(member.firmId, id, trx);
    if (Boolean(m.archivedAt) === archived) return m;
    if (archived) {
      const live = await getLiveWidgetForModel(member.firmId, id, trx);
      if (live) throw conflict(`“${m.title}” is published as the widget “${live.title}”. Take the widget down first, so no client loses it without a decision.`);
    }
    await updateModelMeta(member.firmId, id, { archived, userId: member.userId }, trx);
    await recordAudit({ firmId: member.firmId, actorUserId: member.userId, action: archived ? 'model.archived' : 'model.restored', targetType: 'model', targetId: id, detail: { title: m.title } }, trx);
    return (await getModel(member.firmId, id, trx))!;
  });
}

/**
 * Saves a new immutable version. `baseVersion` is the latest version the author's edit started from: if someone
 * saved a newer one in the meantime the save is refused (409), never merged or overwritten.
 */
export async function saveVersion(member: Member, modelId: string, input: SaveVersionInput): Promise<VersionRecord> {
  return writeTransaction(async (trx) => {
    await assertAuthoringAllowed(member.firmId, trx);
    const m = await mustGetModel(member.firmId, modelId, trx);
    assertNotArchived(m, 'save a version');
    if (input.model.template !== m.template) {
      throw new AppError('validation_failed', 'The template cannot change.', {
        fields: { 'model.template': [`This model is a ${m.template} model; a version cannot turn it into a ${input.model.template} model. Duplicate it or create a new model instead.`] },
      });
    }
    const latest = await getLatestVersionSummary(member.firmId, modelId, trx);
    const current = latest?.number ?? 0;
    const base = input.baseVersion ?? 0;
    if (base !== current) {
      if (latest && base < current) {
        throw conflict(`Version ${current} was saved by ${latest.authorName ?? 'a former member'} at ${utcStamp(latest.createdAt)}; reload to see it. Your changes are still in the editor.`);
      }
      throw conflict(`Your edit starts from version ${base}, but the latest version is ${current}. Reload to see it.`);
    }
    const number = current + 1;
    const id = await insertVersion({ firmId: member.firmId, modelId, number, model: input.model, authorId: member.userId, note: input.note || null }, trx);
    const titleChanged = input.model.title !== m.title;
    await trx('models')
      .where({ firm_id: member.firmId, id: modelId })
      .update({ title: input.model.title, updated_by: member.userId, updated_at: new Date().toISOString() });
    await recordAudit(
      {
        firmId: member.firmId,
        actorUserId: member.userId,
        action: 'version.saved',
        targetType: 'version',
        targetId: id,
        detail: { modelId, number, note: input.note || null, ...(titleChanged ? { title: input.model.title } : {}) },
      },
      trx,
    );
    await notifyCheckRequested(
      { firmId: member.firmId, versionId: id, modelId, modelTitle: input.model.title, number, authorId: member.userId, authorName: member.name, note: input.note || null },
      trx,
    );
    return (await getVersionById(member.firmId, id, trx))!;
  });
}

export async function getVersion(member: Member, modelId: string, number: number): Promise<VersionRecord> {
  const v = await getVersionByNumber(member.firmId, modelId, number);
  if (!v) throw notFound(`Version ${number} of that model`);
  return v;
}

/** A checker signs off or sends back a version written by someone else, once. */
export async function checkVersion(member: Member, versionId: string, input: CheckInput): Promise<VersionSummary> {
  return writeTransaction(async (trx) => {
    await assertAuthoringAllowed(member.firmId, trx);
    const v = await getVersionById(member.firmId, versionId, trx);
    if (!v) throw notFound('That version');
    if (v.authorId === member.userId) {
      throw forbidden(`You wrote version ${v.number}, so you cannot check it. Another checker in your firm must sign it off or send it back.`);
    }
    if (v.checkState !== 'unchecked') {
      const what = v.checkState === 'signed_off' ? 'signed off' : 'sent back';
      throw conflict(`Version ${v.number} was already ${what} by ${v.checkerName ?? 'a former member'} at ${utcStamp(v.checkedAt!)}. A decision cannot be changed; the author saves a new version instead.`);
    }
    // Checking an older version is allowed (it may be the one a client sees); the log records which was latest.
    const latest = await getLatestVersionSummary(member.firmId, v.modelId, trx);
    const state = input.decision === 'sign_off' ? 'signed_off' : 'sent_back';
    const ok = await recordCheck(member.firmId, versionId, { state, checkerId: member.userId, note: input.note, comments: input.comments }, trx);
    if (!ok) throw conflict(`Version ${v.number} was checked by someone else a moment ago. Reload to see their decision.`);
    await recordAudit(
      {
        firmId: member.firmId,
        actorUserId: member.userId,
        action: state === 'signed_off' ? 'version.signed_off' : 'version.sent_back',
        targetType: 'version',
        targetId: versionId,
        detail: { modelId: v.modelId, number: v.number, note: input.note || null, comments: input.comments.length, latest: latest?.number ?? v.number },
      },
      trx,
    );
    // A signed-off version may be published next: its first figures are computed ahead.
    if (state === 'signed_off') await queueFirstFigures(member.firmId, versionId, trx);
    const model = await getModel(member.firmId, v.modelId, trx);
    await notifyCheckDecided(
      {
        firmId: member.firmId,
        versionId,
        modelId: v.modelId,
        modelTitle: model?.title ?? 'a model',
        number: v.number,
        authorId: v.authorId,
        authorName: v.authorName,
        note: v.note,
        decision: state,
        checkerName: member.name,
        checkNote: input.note || null,
        comments: input.comments.length,
      },
      trx,
    );
    return (await getVersionById(member.firmId, versionId, trx))!;
  });
}

/** Dial ids and headline must exist in the version being published. */
function assertPresentation(model: CheckedModel, headline: string | undefined, dialIds: string[] | undefined): void {
  const fields: Record<string, string[]> = {};
  if (headline !== undefined && !headlineIds(model.template).includes(headline)) {
    fields.headline = [`'${headline}' is not a headline figure of a ${model.template} model; choose one of ${headlineIds(model.template).join(', ')}.`];
  }
  if (dialIds) {
    const known = new Set((model.dials ?? []).map((d) => d.id));
    dialIds.forEach((id, i) => {
      if (!known.has(id)) fields[`dialIds.${i}`] = [`This version has no dial '${id}'. Add the dial in the editor and save a version first.`];
    });
  }
  if (Object.keys(fields).length) throw new AppError('validation_failed', 'Some fields need attention.', { fields });
}

async function assertPublishable(member: Member, v: VersionRecord, trx: Knex.Transaction): Promise<void> {
  if (v.checkState === 'sent_back') {
    throw conflict(`Version ${v.number} was sent back by ${v.checkerName ?? 'its checker'}; it cannot be published. Save a corrected version and have it checked.`);
  }
  if (v.checkState === 'unchecked') {
    const firm = await getFirm(member.firmId, trx);
    if (firm?.requireCheck !== false) {
      throw conflict(`Version ${v.number} has not been signed off by a checker yet. Your firm publishes only checked versions (the account owner can change this rule in Settings).`);
    }
  }
}

export async function publish(member: Member, input: PublishInput): Promise<WidgetRecord> {
  return writeTransaction(async (trx) => {
    await assertAuthoringAllowed(member.firmId, trx);
    const m = await mustGetModel(member.firmId, input.modelId, trx);
    assertNotArchived(m, 'publish it');
    const v = await getVersionById(member.firmId, input.versionId, trx);
    if (!v || v.modelId !== m.id) throw new AppError('validation_failed', 'Some fields need attention.', { fields: { versionId: ['That version does not belong to this model.'] } });
    await assertPublishable(member, v, trx);
    assertPresentation(v.model, input.headline, input.dialIds);
    const live = await getLiveWidgetForModel(member.firmId, m.id, trx);
    if (live) throw conflict(`“${m.title}” is already published as “${live.title}” (version ${live.versionNumber}). Change that widget to publish another version.`);
    const firm = await getFirm(member.firmId, trx);
    const id = await insertWidget(
      {
        firmId: member.firmId,
        modelId: m.id,
        versionId: v.id,
        title: input.title,
        panels: input.panels,
        headline: input.headline,
        dialIds: input.dialIds,
        brandColor: input.brandColor ?? firm?.brandColor ?? '#1f887b',
        showLogo: input.showLogo,
        userId: member.userId,
      },
      trx,
    );
    await recordAudit(
      {
        firmId: member.firmId,
        actorUserId: member.userId,
        action: 'widget.published',
        targetType: 'widget',
        targetId: id,
        detail: { modelId: m.id, versionId: v.id, number: v.number, checkState: v.checkState, title: input.title },
      },
      trx,
    );
    await queueFirstFigures(member.firmId, v.id, trx);
    await notifyWidgetPublished(
      { firmId: member.firmId, widgetId: id, widgetTitle: input.title, modelId: m.id, modelTitle: m.title, number: v.number, checkState: v.checkState, actorId: member.userId, actorName: member.name, republished: false },
      trx,
    );
    return (await getWidget(member.firmId, id, trx))!;
  });
}

export async function changeWidget(member: Member, id: string, patch: WidgetPatchInput): Promise<WidgetRecord> {
  return writeTransaction(async (trx) => {
    await assertAuthoringAllowed(member.firmId, trx);
    const w = await getWidget(member.firmId, id, trx);
    if (!w) throw notFound('That widget');
    if (w.unpublishedAt) throw conflict('This widget was taken down. Publish the model again to create a new widget.');
    const m = await mustGetModel(member.firmId, w.modelId, trx);
    let target: VersionRecord | null = null;
    if (patch.versionId && patch.versionId !== w.versionId) {
      assertNotArchived(m, 'publish another version');
      target = await getVersionById(member.firmId, patch.versionId, trx);
      if (!target || target.modelId !== w.modelId) throw new AppError('validation_failed', 'Some fields need attention.', { fields: { versionId: ['That version does not belong to this model.'] } });
      await assertPublishable(member, target, trx);
    }
    const version = target ?? (await getVersionById(member.firmId, w.versionId, trx))!;
    assertPresentation(version.model, patch.headline, patch.dialIds ?? (target ? w.dialIds : undefined));
    await dbUpdateWidget(member.firmId, id, { ...patch, versionId: target?.id, userId: member.userId }, trx);
    const presentation = { ...patch, versionId: undefined };
    if (target) {
      await queueFirstFigures(member.firmId, target.id, trx);
      await recordAudit(
        {
          firmId: member.firmId,
          actorUserId: member.userId,
          action: 'widget.republished',
          targetType: 'widget',
          targetId: id,
          detail: { modelId: w.modelId, fromNumber: w.versionNumber, toNumber: target.number, checkState: target.checkState },
        },
        trx,
      );
      await notifyWidgetPublished(
        {
          firmId: member.firmId,
          widgetId: id,
          widgetTitle: patch.title ?? w.title,
          modelId: w.modelId,
          modelTitle: m.title,
          number: target.number,
          checkState: target.checkState,
          actorId: member.userId,
          actorName: member.name,
          republished: true,
        },
        trx,
      );
    }
    if (Object.values(presentation).some((x) => x !== undefined)) {
      await recordAudit({ firmId: member.firmId, actorUserId: member.userId, action: 'widget.changed', targetType: 'widget', targetId: id, detail: presentation }, trx);
    }
    return (await getWidget(member.firmId, id, trx))!;
  });
}

export async function takeDown(member: Member, id: string): Promise<void> {
  await writeTransaction(async (trx) => {
    const w = await getWidget(member.firmId, id, trx);
    if (!w) throw notFound('That widget');
    if (!(await dbUnpublish(member.firmId, id, member.userId, trx))) throw conflict('This widget was already taken down.');
    await recordAudit({ firmId: member.firmId, actorUserId: member.userId, action: 'widget.unpublished', targetType: 'widget', targetId: id, detail: { modelId: w.modelId, title: w.title } }, trx);
  });
}

// Reads behind the lists and pages: firm-scoped, nothing written.

export const modelList = (member: Member, opts: { includeArchived?: boolean } = {}): Promise<ModelListRow[]> => listModels(member.firmId, opts);

export async function versionList(member: Member, modelId: string): Promise<VersionSummary[]> {
  await mustGetModel(member.firmId, modelId);
  return listVersions(member.firmId, modelId);
}

export const modelExists = async (member: Member, id: string): Promise<boolean> => (await getModel(member.firmId, id)) !== null;

export const versionExists = async (member: Member, modelId: string, number: number): Promise<boolean> => (await getVersionByNumber(member.firmId, modelId, number)) !== null;

export const widgetList = (member: Member, opts: { includeUnpublished?: boolean } = {}): Promise<WidgetRecord[]> => listWidgets(member.firmId, opts);

export async function widgetDetail(member: Member, id: string): Promise<WidgetRecord> {
  const w = await getWidget(member.firmId, id);
  if (!w) throw notFound('That widget');
  return w;
}
