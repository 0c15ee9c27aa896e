'use client';

// "Download SVG" and "Download PNG" for charts. Both start from the same standalone SVG string as
// the server's PDF; the PNG draws that SVG on a canvas. A standalone SVG cannot see the page's
// fonts, so the PNG path embeds the app's Plex faces (already loaded by the page) as data URLs.
import { sceneToSvgString } from '@/lib/core/charts/svg-string';
import type { Scene } from '@/lib/core/charts/scene';

/** A safe file name from a chart title: "Spread of Gap" → "spread-of-gap". */
export function fileSlug(title: string): string {
  const s = title
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 80);
  return s || 'chart';
}

export function saveBlob(blob: Blob, filename: string): void {
  const url = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = url;
  a.download = filename;
  a.rel = 'noopener';
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}

export function downloadSvg(scene: Scene, filename: string): void {
  saveBlob(new Blob([sceneToSvgString(scene)], { type: 'image/svg+xml;charset=utf-8' }), filename.endsWith('.svg') ? filename : `${filename}.svg`);
}

let fontCss: Promise<string> | null = null;

function toBase64(buf: ArrayBuffer): string {
  const bytes = new Uint8Array(buf);
  let s = '';
  for (let i = 0; i < bytes.length; i += 0x8000) s += String.fromCharCode(...bytes.subarray(i, i + 0x8000));
  return btoa(s);
}

/** @font-face rules naming the page's Plex faces 'IBM Plex Sans' / 'IBM Plex Mono', with the files inlined. */
export function embeddedFontCss(): Promise<string> {
  if (fontCss) return fontCss;
  fontCss = (async () => {
    const root = getComputedStyle(document.documentElement);
    const wanted: Array<[string, string]> = [
      [root.getPropertyValue('--font-sans'), 'IBM Plex Sans'],
      [root.getPropertyValue('--font-mono'), 'IBM Plex Mono'],
    ];
    const rules: string[] = [];
    for (const [cssVar, family] of wanted) {
      const local = cssVar.split(',')[0]?.trim().replace(/^['"]|['"]$/g, '');
      if (!local) continue;
      for (const sheet of Array.from(document.styleSheets)) {
        let list: CSSRuleList;
        try {
          list = sheet.cssRules;
        } catch {
          continue; // a cross-origin sheet
        }
        for (const rule of Array.from(list)) {
          if (!(rule instanceof CSSFontFaceRule)) continue;
          if (rule.style.getPropertyValue('font-family').replace(/['"]/g, '').trim() !== local) continue;
          const m = /url\(["']?([^"')]+)["']?\)/.exec(rule.style.getPropertyValue('src'));
          if (!m) continue;
          try {
            const res = await fetch(new URL(m[1], sheet.href ?? location.href));
            if (!res.ok) continue;
            const b64 = toBase64(await res.arrayBuffer());
            const weight = rule.style.getPropertyValue('font-weight') || '400';
            rules.push(`@font-face{font-family:'${family}';font-weight:${weight};src:url(data:font/woff2;base64,${b64}) format('woff2')}`);
          } catch {
            // Without the face the PNG falls back to a system font; the picture is still correct.
          }
        }
      }
    }
    return rules.join('\n');
  })();
  return fontCss;
}

/** Renders the scene to a PNG at `scale` × its size (2 for sharp text on high-density screens). */
export async function sceneToPngBlob(scene: Scene, scale = 2): Promise<Blob> {
  const css = await embeddedFontCss();
  const svg = sceneToSvgString(scene, { css, idPrefix: 'png-' });
  const img = new Image();
  img.decoding = 'async';
  img.src = `data:image/svg+xml;charset=utf-8,${encodeURIComponent(svg)}`;
  await img.decode();
  const canvas = document.createElement('canvas');
  canvas.width = Math.round(scene.width * scale);
  canvas.height = Math.round(scene.height * scale);
  const ctx = canvas.getContext('2d');
  if (!ctx) throw new Error('This browser cannot draw on a canvas.');
  ctx.fillStyle = scene.background;
  ctx.fillRect(0, 0, canvas.width, canvas.height);
  ctx.drawImage(img, 0, 0, canvas.width, canvas.height);
  return new Promise((resolve, reject) => canvas.toBlob((b) => (b ? resolve(b) : reject(new Error('The PNG could not be made.'))), 'image/png'));
}

export async function downloadPng(scene: Scene, filename: string, scale = 2): Promise<void> {
  saveBlob(await sceneToPngBlob(scene, scale), filename.endsWith('.png') ? filename : `${filename}.png`);
}
