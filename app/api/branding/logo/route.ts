import { route, json, noContent, readForm } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { AppError, notFound } from '@/lib/http/errors';
import { deleteLogo, getLogo, putLogo } from '@/db/logos';
import { writeTransaction } from '@/db/knex';
import { recordAudit } from '@/db/audit';
import { processLogo, MAX_LOGO_BYTES } from '@/lib/datasets/logo';
import { logoResponse } from '@/lib/datasets/logo-http';
import type { LogoSaved } from '@/lib/api-types';

const fail = (message: string) => new AppError('validation_failed', message, { fields: { file: [message] } });

export const GET = route(async (req) => {
  const m = await requireMember('firm.read');
  const logo = await getLogo(m.firmId);
  if (!logo) throw notFound('A logo for your firm');
  return logoResponse(req, logo, 'private, no-cache');
});

/** Multipart `file`: PNG, JPEG or WebP by magic bytes, ≤ 512 KB and 2000 × 2000 px; stored re-encoded as PNG. */
export const PUT = route(async (req) => {
  const m = await requireMember('settings.manage');
  if (!(req.headers.get('content-type') ?? '').startsWith('multipart/form-data')) throw new AppError('unsupported_media_type', 'Send the logo as multipart/form-data with a "file" field.');
  // A logo of 512 KB plus 64 KiB for the form around it; bytes are counted as they arrive (413 beyond).
  const file = (await readForm(req, MAX_LOGO_BYTES + 64 * 1024, 'logo upload')).get('file');
  if (!file || typeof file === 'string') throw fail('Choose a PNG, JPEG or WebP file.');
  const r = await processLogo(new Uint8Array(await file.arrayBuffer()), file.name || 'logo');
  if (!r.ok) throw fail(r.message);
  await writeTransaction(async (trx) => {
    await putLogo(m.firmId, m.userId, r, trx);
    await recordAudit({ firmId: m.firmId, actorUserId: m.userId, action: 'branding.logo_changed', targetType: 'firm', targetId: m.firmId, detail: { hash: r.hash, width: r.width, height: r.height, from: r.source } }, trx);
  });
  return json<LogoSaved>({ hash: r.hash, width: r.width, height: r.height, contentType: r.contentType, url: `/api/branding/logo/${m.firmId}` });
});

export const DELETE = route(async () => {
  const m = await requireMember('settings.manage');
  await writeTransaction(async (trx) => {
    if (!(await deleteLogo(m.firmId, trx))) throw notFound('A logo for your firm');
    await recordAudit({ firmId: m.firmId, actorUserId: m.userId, action: 'branding.logo_removed', targetType: 'firm', targetId: m.firmId }, trx);
  });
  return noContent();
});
