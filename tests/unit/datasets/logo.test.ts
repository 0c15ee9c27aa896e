import { describe, expect, it } from 'vitest';
import sharp from 'sharp';
import { processLogo, sniffImage } from '@/lib/server/datasets/logo';

const solid = (w: number, h: number) => sharp({ create: { width: w, height: h, channels: 3, background: { r: 31, g: 136, b: 123 } } });

describe('logo uploads', () => {
  it('recognises PNG, JPEG and WebP by their magic bytes and re-encodes to PNG without metadata', async () => {
    for (const [fmt, buf] of [
      ['png', await solid(40, 20).png().toBuffer()],
      ['jpeg', await solid(40, 20).withMetadata({ exif: { IFD0: { Copyright: 'Invented Studio', Artist: 'Nobody' } } }).jpeg().toBuffer()],
      ['webp', await solid(40, 20).webp().toBuffer()],
    ] as const) {
      expect(sniffImage(buf)).toBe(fmt);
      const r = await processLogo(buf, `logo.${fmt}`);
      expect(r.ok).toBe(true);
      if (!r.ok) continue;
      expect(sniffImage(r.bytes)).toBe('png');
      const meta = await sharp(r.bytes).metadata();
      expect([meta.width, meta.height]).toEqual([40, 20]);
      expect(meta.exif).toBeUndefined();
      expect(r.hash).toMatch(/^[0-9a-f]{64}$/);
    }
  });

  it('refuses an image that lies about its type (text named .png), SVG, oversize bytes and pixels, and damage', async () => {
    const lie = await processLogo(new TextEncoder().encode('hello, I am a PNG'), 'logo.png');
    expect(!lie.ok && lie.message).toMatch(/^logo\.png is not a PNG, JPEG or WebP image/);
    const svg = await processLogo(new TextEncoder().encode('<svg xmlns="http://www.w3.org/2000/svg"><script>alert(1)</script></svg>'), 'logo.svg');
    expect(!svg.ok && svg.message).toMatch(/SVG logos are refused/);
    const big = await processLogo(new Uint8Array(512 * 1024 + 1).fill(0xff), 'huge.jpg');
    expect(!big.ok && big.message).toMatch(/huge\.jpg is 513 KB; a logo may be at most 512 KB/);
    const wide = await processLogo(await solid(2001, 10).png().toBuffer(), 'wide.png');
    expect(!wide.ok && wide.message).toMatch(/wide\.png is 2001 × 10 px/);
    const png = await solid(20, 20).png().toBuffer();
    const cut = await processLogo(png.subarray(0, 30), 'cut.png');
    expect(!cut.ok && cut.message).toMatch(/cut\.png starts like a PNG image but is damaged/);
  });
});
