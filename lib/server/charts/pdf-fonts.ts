import 'server-only';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { inflateSync } from 'node:zlib';
import { fontRoleOf } from '@/lib/core/charts/svg-string';

// Fonts for drawing chart SVGs into a PDF with svg-to-pdfkit. The charts name 'IBM Plex Sans' and
// 'IBM Plex Mono'; these helpers register the same latin subsets the app ships (from @fontsource)
// and map the SVG's font-family to them. fontkit (inside pdfkit) misreads empty glyphs such as the
// space in Plex Mono's WOFF and fails to subset the WOFF2 files, so the WOFF files are unpacked to
// plain SFNT (TrueType) first; that path was checked glyph by glyph.

/**
 * WOFF 1.0 → SFNT, following the W3C "WOFF File Format 1.0" recommendation (§4 header, §5 table
 * directory): each table is zlib-inflated when its compressed length is below its original length.
 */
export function woffToSfnt(woff: Buffer): Buffer {
  if (woff.readUInt32BE(0) !== 0x774f4646) throw new Error('Not a WOFF 1.0 file');
  const flavor = woff.readUInt32BE(4);
  const numTables = woff.readUInt16BE(12);
  let entrySelector = 0;
  while (1 << (entrySelector + 1) <= numTables) entrySelector++;
  const searchRange = (1 << entrySelector) * 16;
  const header = Buffer.alloc(12 + 16 * numTables);
  header.writeUInt32BE(flavor, 0);
  header.writeUInt16BE(numTables, 4);
  header.writeUInt16BE(searchRange, 6);
  header.writeUInt16BE(entrySelector, 8);
  header.writeUInt16BE(numTables * 16 - searchRange, 10);
  const blocks: Buffer[] = [];
  let offset = header.length;
  for (let i = 0; i < numTables; i++) {
    const d = 44 + i * 20;
    const tag = woff.readUInt32BE(d);
    const at = woff.readUInt32BE(d + 4);
    const compLength = woff.readUInt32BE(d + 8);
    const origLength = woff.readUInt32BE(d + 12);
    const checksum = woff.readUInt32BE(d + 16);
    const raw = woff.subarray(at, at + compLength);
    const data = compLength < origLength ? inflateSync(raw) : raw;
    if (data.length !== origLength) throw new Error(`WOFF table ${i} inflated to ${data.length} bytes, expected ${origLength}`);
    const e = 12 + i * 16;
    header.writeUInt32BE(tag, e);
    header.writeUInt32BE(checksum, e + 4);
    header.writeUInt32BE(offset, e + 8);
    header.writeUInt32BE(origLength, e + 12);
    const padded = Buffer.alloc((data.length + 3) & ~3);
    data.copy(padded);
    blocks.push(padded);
    offset += padded.length;
  }
  return Buffer.concat([header, ...blocks]);
}

/** Names under which registerChartFonts registers the four faces. */
export const CHART_PDF_FONTS = {
  sans: 'StochosChartSans',
  'sans-bold': 'StochosChartSans-Bold',
  mono: 'StochosChartMono',
  'mono-bold': 'StochosChartMono-Bold',
} as const;

function fontFile(root: string, family: 'ibm-plex-sans' | 'ibm-plex-mono', weight: 400 | 600): string {
  return path.join(root, 'node_modules', '@fontsource', family, 'files', `${family}-latin-${weight}-normal.woff`);
}

interface FontRegistrar {
  registerFont(name: string, src: Buffer): unknown;
}

/** Registers the chart faces on a pdfkit document. `root` is the app directory (default: the working directory). */
export function registerChartFonts(doc: FontRegistrar, root: string = process.cwd()): void {
  doc.registerFont(CHART_PDF_FONTS.sans, woffToSfnt(readFileSync(fontFile(root, 'ibm-plex-sans', 400))));
  doc.registerFont(CHART_PDF_FONTS['sans-bold'], woffToSfnt(readFileSync(fontFile(root, 'ibm-plex-sans', 600))));
  doc.registerFont(CHART_PDF_FONTS.mono, woffToSfnt(readFileSync(fontFile(root, 'ibm-plex-mono', 400))));
  doc.registerFont(CHART_PDF_FONTS['mono-bold'], woffToSfnt(readFileSync(fontFile(root, 'ibm-plex-mono', 600))));
}

/** svg-to-pdfkit `fontCallback`: maps a chart's font-family and weight to a registered face. */
export function chartFontCallback(family: string, bold: boolean): string {
  const role = fontRoleOf(family);
  return CHART_PDF_FONTS[bold ? (`${role}-bold` as const) : role];
}
