import { route, json, noContent, readForm } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { AppError } from '@/lib/server/http/errors';
import { MAX_LOGO_BYTES } from '@/lib/server/datasets/logo';
import { logoResponse } from '@/lib/server/datasets/logo-http';
import { logoFieldError, ownLogo, removeLogo, replaceLogo } from '@/lib/server/firm/service';

export const GET = route(async (req) => {
  const m = await requireMember('firm.read');
  return logoResponse(req, await ownLogo(m), 'private, no-cache');
});

/** Multipart `file`: PNG, JPEG or WebP by magic bytes, ≤ 512 KB and 2000 × 2000 px; stored re-encoded as PNG. */
export const PUT = route(async (req) => {
  const m = await requireMember('settings.manage');
  if (!(req.headers.get('content-type') ?? '').startsWith('multipart/form-data')) throw new AppError('unsupported_media_type', 'Send the logo as multipart/form-data with a "file" field.');
  // A logo of 512 KB plus 64 KiB for the form around it; bytes are counted as they arrive (413 beyond).
  const file = (await readForm(req, MAX_LOGO_BYTES + 64 * 1024, 'logo upload')).get('file');
  if (!file || typeof file === 'string') throw logoFieldError('Choose a PNG, JPEG or WebP file.');
  return json(await replaceLogo(m, new Uint8Array(await file.arrayBuffer()), file.name || 'logo'));
});

export const DELETE = route(async () => {
  const m = await requireMember('settings.manage');
  await removeLogo(m);
  return noContent();
});
