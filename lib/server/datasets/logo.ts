import 'server-only';
import { createHash } from 'node:crypto';
import sharp from 'sharp';

// Firm logos: recognised by their magic bytes (never the file name or declared type), limited in bytes and pixels,
// decoded and re-encoded to PNG by sharp, which drops every metadata block (EXIF, XMP, ICC text) on output.
// PNG because PDFs (pdfkit) embed PNG and JPEG only.

export const MAX_LOGO_BYTES = 512 * 1024;
export const MAX_LOGO_SIDE = 2000;

export type ImageKind = 'png' | 'jpeg' | 'webp';

export function sniffImage(b: Uint8Array): ImageKind | null {
  if (b.length >= 8 && b[0] === 0x89 && b[1] === 0x50 && b[2] === 0x4e && b[3] === 0x47 && b[4] === 0x0d && b[5] === 0x0a && b[6] === 0x1a && b[7] === 0x0a) return 'png';
  if (b.length >= 3 && b[0] === 0xff && b[1] === 0xd8 && b[2] === 0xff) return 'jpeg';
  const ascii = (from: number, to: number) => String.fromCharCode(...b.subarray(from, to));
  if (b.length >= 12 && ascii(0, 4) === 'RIFF' && ascii(8, 12) === 'WEBP') return 'webp';
  return null;
}

export type LogoResult =
  | { ok: true; bytes: Buffer; contentType: 'image/png'; hash: string; width: number; height: number; source: ImageKind }
  | { ok: false; message: string };

export async function processLogo(input: Uint8Array, fileName: string): Promise<LogoResult> {
  if (input.length === 0) return { ok: false, message: `${fileName} is empty.` };
  if (input.length > MAX_LOGO_BYTES) return { ok: false, message: `${fileName} is ${Math.ceil(input.length / 1024)} KB; a logo may be at most 512 KB.` };
  const kind = sniffImage(input);
  if (!kind) {
    const text = new TextDecoder().decode(input.subarray(0, 256)).toLowerCase();
    const svg = text.includes('<svg') || text.includes('<?xml');
    return {
      ok: false,
      message: svg
        ? `${fileName} is an SVG (or other XML) file; SVG logos are refused because they can carry scripts. Upload a PNG, JPEG or WebP.`
        : `${fileName} is not a PNG, JPEG or WebP image: its contents do not start like one, whatever its name says.`,
    };
  }
  try {
    const img = sharp(input, { limitInputPixels: MAX_LOGO_SIDE * MAX_LOGO_SIDE, failOn: 'error' });
    const meta = await img.metadata();
    if (meta.format !== kind) return { ok: false, message: `${fileName} starts like a ${kind.toUpperCase()} image but does not decode as one.` };
    const w = meta.autoOrient?.width ?? meta.width ?? 0;
    const h = meta.autoOrient?.height ?? meta.height ?? 0;
    if (w > MAX_LOGO_SIDE || h > MAX_LOGO_SIDE) return { ok: false, message: `${fileName} is ${w} × ${h} px; a logo may be at most 2000 × 2000 px.` };
    const { data, info } = await img.rotate().png({ compressionLevel: 9 }).toBuffer({ resolveWithObject: true });
    return { ok: true, bytes: data, contentType: 'image/png', hash: createHash('sha256').update(data).digest('hex'), width: info.width, height: info.height, source: kind };
  } catch (err) {
    const m = (err as Error).message;
    if (/pixel limit/i.test(m)) return { ok: false, message: `${fileName} is larger than 2000 × 2000 px.` };
    return { ok: false, message: `${fileName} starts like a ${kind.toUpperCase()} image but is damaged or truncated, so it cannot be read.` };
  }
}
