import 'server-only';
import type { z } from 'zod';
import { writeTransaction } from '@/db/knex';
import { listAudit, recordAudit, type AuditRow } from '@/db/audit';
import { insertApiKey, listApiKeys, revokeApiKey, type ApiKeyRow } from '@/db/api-keys';
import { getFirm, updateFirmSettings, type Firm } from '@/db/firms';
import { deleteLogo, getLogo, putLogo, type FirmLogo } from '@/db/logos';
import { AppError, notFound } from '@/lib/server/http/errors';
import type { Member } from '@/lib/server/auth/guard';
import type { settingsSchema } from '@/lib/core/auth/schemas';
import { processLogo } from '@/lib/server/datasets/logo';

// The firm's own settings, branding, API keys and audit log: each change and its audit row in one transaction.

export type FirmSettingsView = Pick<Firm, 'name' | 'unitsDefault' | 'currencyDefault' | 'brandColor' | 'requireCheck' | 'paperSize'>;

const settingsView = (f: Firm): FirmSettingsView => ({ name: f.name, unitsDefault: f.unitsDefault, currencyDefault: f.currencyDefault, brandColor: f.brandColor, requireCheck: f.requireCheck, paperSize: f.paperSize });

export async function firmSettings(m: Member): Promise<FirmSettingsView> {
  const firm = await getFirm(m.firmId);
  if (!firm) throw notFound('Your firm');
  return settingsView(firm);
}

/** The brand colour pages paint with, or null when the firm row is gone. */
export async function firmBrandColor(m: Member): Promise<string | null> {
  return (await getFirm(m.firmId))?.brandColor ?? null;
}

export async function changeFirmSettings(m: Member, patch: z.infer<typeof settingsSchema>): Promise<FirmSettingsView> {
  const firm = await writeTransaction(async (trx) => {
    await updateFirmSettings(m.firmId, patch, trx);
    await recordAudit({ firmId: m.firmId, actorUserId: m.userId, action: 'settings.changed', targetType: 'firm', targetId: m.firmId, detail: patch }, trx);
    return getFirm(m.firmId, trx);
  });
  return settingsView(firm!);
}

/** A logo upload's field error, shown beside the file input. */
export const logoFieldError = (message: string) => new AppError('validation_failed', message, { fields: { file: [message] } });

/** Public: any firm's logo by its id (widgets, embeds and PDFs show it). */
export async function publicLogo(firmId: string): Promise<FirmLogo> {
  const logo = await getLogo(firmId);
  if (!logo) throw notFound('That logo');
  return logo;
}

export async function ownLogo(m: Member): Promise<FirmLogo> {
  const logo = await getLogo(m.firmId);
  if (!logo) throw notFound('A logo for your firm');
  return logo;
}

export interface LogoView {
  hash: string;
  width: number;
  height: number;
  contentType: string;
  url: string;
}

/** PNG, JPEG or WebP by magic bytes, ≤ 512 KB and 2000 × 2000 px; stored re-encoded as PNG. */
export async function replaceLogo(m: Member, bytes: Uint8Array, fileName: string): Promise<LogoView> {
  const r = await processLogo(bytes, fileName);
  if (!r.ok) throw logoFieldError(r.message);
  await writeTransaction(async (trx) => {
    await putLogo(m.firmId, m.userId, r, trx);
    await recordAudit({ firmId: m.firmId, actorUserId: m.userId, action: 'branding.logo_changed', targetType: 'firm', targetId: m.firmId, detail: { hash: r.hash, width: r.width, height: r.height, from: r.source } }, trx);
  });
  return { hash: r.hash, width: r.width, height: r.height, contentType: r.contentType, url: `/api/branding/logo/${m.firmId}` };
}

export async function removeLogo(m: Member): Promise<void> {
  await writeTransaction(async (trx) => {
    if (!(await deleteLogo(m.firmId, trx))) throw notFound('A logo for your firm');
    await recordAudit({ firmId: m.firmId, actorUserId: m.userId, action: 'branding.logo_removed', targetType: 'firm', targetId: m.firmId }, trx);
  });
}

export const apiKeyList = (m: Member): Promise<ApiKeyRow[]> => listApiKeys(m.firmId);

/** A new key; its secret is shown this once and stored only as a hash. */
export async function createApiKey(m: Member, name: string): Promise<{ id: string; name: string; prefix: string; secret: string }> {
  const key = await writeTransaction(async (trx) => {
    const k = await insertApiKey(m.firmId, name, m.userId, trx);
    await recordAudit({ firmId: m.firmId, actorUserId: m.userId, action: 'apikey.created', targetType: 'api_key', targetId: k.id, detail: { name, prefix: k.prefix } }, trx);
    return k;
  });
  return { id: key.id, name, prefix: key.prefix, secret: key.secret };
}

export async function revokeKey(m: Member, id: string): Promise<void> {
  await writeTransaction(async (trx) => {
    if (!(await revokeApiKey(m.firmId, id, trx))) throw notFound('That API key');
    await recordAudit({ firmId: m.firmId, actorUserId: m.userId, action: 'apikey.revoked', targetType: 'api_key', targetId: id }, trx);
  });
}

const AUDIT_PAGE = 50;

/** One page of the audit log, newest first; `nextBefore` continues it. */
export async function auditPage(m: Member, before?: number): Promise<{ entries: AuditRow[]; nextBefore: number | null }> {
  const entries = await listAudit(m.firmId, { limit: AUDIT_PAGE, beforeId: before });
  return { entries, nextBefore: entries.length === AUDIT_PAGE ? entries[entries.length - 1]!.id : null };
}
