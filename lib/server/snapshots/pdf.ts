import 'server-only';
import PDFDocument from 'pdfkit';
import SVGtoPDF from 'svg-to-pdfkit';
import type { RunResult } from '@/lib/core/engine';
import { cumulativeGeometry, cumulativeScene, type CumulativeInput } from '@/lib/core/charts/cumulative';
import { driversGeometry, driversScene, type DriversInput } from '@/lib/core/charts/drivers';
import { spreadGeometry, spreadScene, type SpreadInput } from '@/lib/core/charts/spread';
import { sceneToSvgString } from '@/lib/core/charts/svg-string';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { CHART_PDF_FONTS, chartFontCallback, registerChartFonts, woffToSfnt } from '@/lib/server/charts/pdf-fonts';
import { brandColors } from '@/lib/core/widget/brand';
import { panelSpec } from './panels';
import { compareCurvesScene, compareSpreadsScene, COMPARE_STYLES } from '@/lib/core/charts/compare';
import { compareInput, CURRENT_LABEL, PINNED_LABEL } from '@/lib/core/results/compare';
import type { Scene } from '@/lib/core/charts/scene';
import type { SnapshotContent, Table } from './content';

// The snapshot PDF: pdfkit with the shipped IBM Plex faces, charts drawn from the same scenes as the browser
// through svg-to-pdfkit, A4 or Letter as the firm chose.

const INK = { 900: '#141c22', 700: '#33414c', 600: '#445461', 300: '#c4ccd3', 100: '#e8ecef', 50: '#f5f7f8' };
const F = CHART_PDF_FONTS;
const MARGIN = 48;
const FOOTER = 28;
/** The width the chart geometry is laid out at (CSS pixels, as in a wide widget), scaled to the text width. */
const CHART_PX = 620;
const GREEK = /[\u0370-\u03ff]/;

type Doc = PDFKit.PDFDocument;

export interface RenderedPdf {
  bytes: Buffer;
  pages: number;
}

/** `logo`: the firm's re-encoded PNG, drawn in the header when the widget keeps the logo slot. */
export async function renderSnapshotPdf(c: SnapshotContent, result: RunResult, logo: Buffer | null = null, pinned: RunResult | null = null): Promise<RenderedPdf> {
  const doc = new PDFDocument({
    size: c.paperSize === 'Letter' ? 'LETTER' : 'A4',
    margins: { top: MARGIN, bottom: MARGIN + FOOTER, left: MARGIN, right: MARGIN },
    bufferPages: true,
    info: { Title: `${c.title} — snapshot for ${c.clientName}`, Author: c.firmName, Subject: `${c.versionText}; ${c.dateText}`, Creator: 'Stochos' },
    // Reproducible bytes apart from the dates pdfkit writes: no compression surprises across runs.
    compress: true,
  });
  registerChartFonts(doc);
  registerGreek(doc);
  const chunks: Buffer[] = [];
  doc.on('data', (b: Buffer) => chunks.push(b));
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });

  const brand = brandColors(c.brandColor);
  const W = doc.page.width - 2 * MARGIN;
  const bottom = () => doc.page.height - MARGIN - FOOTER;
  const need = (h: number) => {
    if (doc.y + h > bottom()) doc.addPage();
  };

  // Brand band and header.
  doc.rect(0, 0, doc.page.width, 6).fill(brand.accent);
  let nameX = MARGIN;
  if (logo) {
    try {
      doc.image(logo, MARGIN, MARGIN - 22, { fit: [72, 22] });
      nameX = MARGIN + 80;
    } catch {
      // An unreadable logo leaves the firm's name alone in the header.
    }
  }
  doc.font(F['sans-bold']).fontSize(10).fillColor(brand.accentText).text(c.firmName, nameX, MARGIN - 14, { width: W * 0.6 });
  doc.font(F.sans).fontSize(8.5).fillColor(INK[600]).text('Snapshot of an interactive model', MARGIN, MARGIN - 13, { width: W, align: 'right' });
  doc.moveDown(0.9);
  doc.font(F['sans-bold']).fontSize(19).fillColor(INK[900]).text(c.title, MARGIN, doc.y, { width: W });
  doc.moveDown(0.25);
  const meta: [string, string][] = [
    ['Prepared for', c.clientName],
    ['Requested', c.dateText],
    ['Model', c.versionText],
  ];
  for (const [k, v] of meta) {
    const y = doc.y;
    doc.font(F.sans).fontSize(9).fillColor(INK[600]).text(k, MARGIN, y, { width: 80 });
    doc.font(F.sans).fontSize(9).fillColor(INK[900]).text(v, MARGIN + 84, y, { width: W - 84 });
    doc.moveDown(0.15);
  }
  doc.moveDown(0.6);

  // Dial values beside the headline figure.
  const top = doc.y;
  const colW = (W - 16) / 2;
  let leftBottom = top;
  if (c.dials.length) {
    heading(doc, 'Values chosen', MARGIN, top, colW);
    let y = doc.y + 2;
    for (const d of c.dials) {
      doc.font(F.sans).fontSize(9.5).fillColor(INK[700]).text(d.label, MARGIN, y, { width: colW * 0.6 });
      const h = doc.y - y;
      rightRuns(doc, [{ text: d.value, font: F.mono }, ...(d.unit ? [{ text: ` ${d.unit}`, font: F.sans }] : [])], MARGIN + colW, y, 9.5);
      y += Math.max(h, doc.y - y) + 3;
      doc.moveTo(MARGIN, y - 1.5).lineTo(MARGIN + colW, y - 1.5).lineWidth(0.5).strokeColor(INK[100]).stroke();
    }
    leftBottom = y;
  }
  let rightBottom = top;
  if (c.headline) {
    const x = c.dials.length ? MARGIN + colW + 16 : MARGIN;
    const w = c.dials.length ? colW : W;
    const h = c.headline;
    doc.font(F.sans).fontSize(9.5);
    const labelH = doc.heightOfString(h.label, { width: w - 24 });
    doc.font(F.sans).fontSize(8.5);
    const subH = h.sub ? doc.heightOfString(h.sub, { width: w - 24 }) + 4 : 0;
    const boxH = 14 + labelH + 32 + subH + 10;
    doc.rect(x, top, w, boxH).lineWidth(0.75).strokeColor(INK[300]).stroke();
    doc.rect(x, top, 4, boxH).fill(brand.accent);
    doc.font(F.sans).fontSize(9.5).fillColor(INK[700]).text(h.label, x + 16, top + 12, { width: w - 24 });
    doc.font(F['sans-bold']).fontSize(24).fillColor(INK[900]).text(h.value, x + 16, doc.y + 2, { width: w - 24, lineBreak: false });
    if (h.sub) doc.font(F.sans).fontSize(8.5).fillColor(INK[600]).text(h.sub, x + 16, top + 14 + labelH + 34, { width: w - 24 });
    rightBottom = top + boxH;
  }
  doc.x = MARGIN;
  doc.y = Math.max(leftBottom, rightBottom) + 14;

  const drawScene = (scene: Scene, title: string, idPrefix: string) => {
    const scale = W / scene.width;
    const h = scene.height * scale;
    need(h + 24);
    heading(doc, title, MARGIN, doc.y, W);
    const y = doc.y + 2;
    doc.save();
    doc.translate(MARGIN, y).scale(scale);
    SVGtoPDF(doc, sceneToSvgString(scene, { idPrefix }), 0, 0, { width: scene.width, height: scene.height, fontCallback: chartFontCallback, assumePt: true });
    doc.restore();
    doc.x = MARGIN;
    doc.y = y + h + 12;
  };

  // Two views: the pinned one beside the current one, figures with the difference and the overlaid charts,
  // the same strings and scenes as the widget's comparison.
  if (c.compare && pinned) {
    need(120);
    section(doc, 'Two views side by side', W);
    doc
      .font(F.sans)
      .fontSize(8.5)
      .fillColor(INK[700])
      .text(
        `The ${CURRENT_LABEL.toLowerCase()} is the one above (values chosen). The ${PINNED_LABEL.toLowerCase()} is the one the viewer pinned before moving the dials. Both are re-run with the same seed and trials. In the charts the current view is a ${COMPARE_STYLES.current.legend} and the pinned view a ${COMPARE_STYLES.pinned.legend}.`,
        MARGIN,
        doc.y,
        { width: W },
      );
    doc.moveDown(0.4);
    table(
      doc,
      {
        title: 'Figures of both views (difference = current − pinned)',
        columns: [
          { header: 'Figure', weight: 4 },
          { header: PINNED_LABEL, align: 'right', weight: 1.8 },
          { header: CURRENT_LABEL, align: 'right', weight: 1.8 },
          { header: 'Difference', align: 'right', weight: 1.8 },
        ],
        rows: c.compare.rows.map((r) => [r.label, r.pinned, r.current, r.difference]),
      },
      W,
      bottom,
    );
    if (c.dials.length)
      table(
        doc,
        {
          title: 'Dial values of both views',
          columns: [
            { header: 'Dial', weight: 4 },
            { header: PINNED_LABEL, align: 'right', weight: 1.8 },
            { header: CURRENT_LABEL, align: 'right', weight: 1.8 },
          ],
          rows: c.dials.map((d, i) => [d.label, `${c.compare!.pinnedDials[i]?.value ?? '—'}${d.unit ? ` ${d.unit}` : ''}`, `${d.value}${d.unit ? ` ${d.unit}` : ''}`]),
        },
        W,
        bottom,
      );
    const input = compareInput(pinned, result, CHART_PX);
    drawScene(compareCurvesScene(input), 'S-curves of both views', 'cmp-curves-');
    drawScene(compareSpreadsScene(input), 'Spreads of both views', 'cmp-spreads-');
    doc.moveDown(0.3);
    need(40);
    heading(doc, `Charts of the ${CURRENT_LABEL.toLowerCase()}`, MARGIN, doc.y, W);
  }

  // Charts from the browser's scenes, scaled to the text width.
  for (const panel of c.charts) {
    const spec = panelSpec(result, panel, CHART_PX);
    const scene =
      panel === 'spread'
        ? spreadScene(spreadGeometry(spec.input as SpreadInput), { title: `Spread of ${(spec.input as SpreadInput).name}` })
        : panel === 'cumulative'
          ? cumulativeScene(cumulativeGeometry(spec.input as CumulativeInput))
          : driversScene(driversGeometry(spec.input as DriversInput));
    const scale = W / scene.width;
    const h = scene.height * scale;
    need(h + 24);
    heading(doc, spec.title, MARGIN, doc.y, W);
    const y = doc.y + 2;
    // Drawn at the browser's pixel size, then scaled: chart text keeps its proportions to the plot.
    doc.save();
    doc.translate(MARGIN, y).scale(scale);
    SVGtoPDF(doc, sceneToSvgString(scene, { idPrefix: `${panel}-` }), 0, 0, { width: scene.width, height: scene.height, fontCallback: chartFontCallback, assumePt: true });
    doc.restore();
    doc.x = MARGIN;
    doc.y = y + h + 12;
  }

  // Assumptions.
  need(60);
  section(doc, 'Assumptions', W);
  for (const t of c.assumptions) table(doc, t, W, bottom);

  // Method and convergence.
  need(80);
  section(doc, 'Method', W);
  for (const [k, v] of c.method) {
    doc.font(F.sans).fontSize(8.5);
    const h = Math.max(doc.heightOfString(v, { width: W - 120 }), 10);
    need(h + 3);
    const y = doc.y;
    doc.fillColor(INK[600]).text(k, MARGIN, y, { width: 112 });
    doc.fillColor(INK[900]).text(v, MARGIN + 120, y, { width: W - 120 });
    doc.y = y + h + 3;
  }
  doc.moveDown(0.4);
  need(40);
  heading(doc, 'Convergence', MARGIN, doc.y, W);
  for (const cv of c.convergence) {
    const text = `${c.convergence.length > 1 ? `${cv.output}: ` : ''}${cv.verdict}`;
    doc.font(F.sans).fontSize(8.5);
    need(doc.heightOfString(text, { width: W - 14 }) + 4);
    const y = doc.y;
    doc.circle(MARGIN + 4, y + 5, 2.6).fill(cv.enough ? '#00704f' : '#a64400');
    doc.fillColor(INK[900]).text(text, MARGIN + 14, y, { width: W - 14 });
    doc.moveDown(0.2);
  }

  // Cautions.
  doc.moveDown(0.6);
  need(60);
  section(doc, 'Cautions', W);
  for (const k of c.cautions) {
    doc.font(F.sans).fontSize(8.5);
    need(doc.heightOfString(k.text, { width: W }) + 16);
    doc.font(F['sans-bold']).fontSize(8.5).fillColor(INK[900]).text(k.title, MARGIN, doc.y, { width: W });
    doc.font(F.sans).fontSize(8.5).fillColor(INK[700]).text(k.text, MARGIN, doc.y, { width: W });
    doc.moveDown(0.5);
  }

  // Footer on every page: who, what, page n of m.
  const range = doc.bufferedPageRange();
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i);
    const y = doc.page.height - MARGIN - 10;
    const saved = doc.page.margins.bottom;
    doc.page.margins.bottom = 0;
    doc.moveTo(MARGIN, y - 6).lineTo(MARGIN + W, y - 6).lineWidth(0.5).strokeColor(INK[300]).stroke();
    doc.font(F.sans).fontSize(7.5).fillColor(INK[600]);
    doc.text(`${c.firmName} · ${c.title} · for ${c.clientName} · ${c.dateText}`, MARGIN, y, { width: W - 70, lineBreak: false, ellipsis: true });
    doc.text(`Page ${i - range.start + 1} of ${range.count}`, MARGIN + W - 70, y, { width: 70, align: 'right', lineBreak: false });
    doc.page.margins.bottom = saved;
  }
  const pages = range.count;
  doc.end();
  return { bytes: await done, pages };
}

function heading(doc: Doc, text: string, x: number, y: number, w: number): void {
  doc.font(F['sans-bold']).fontSize(10.5).fillColor(INK[900]).text(text, x, y, { width: w });
  doc.moveDown(0.2);
}

function section(doc: Doc, text: string, w: number): void {
  const y = doc.y;
  doc.font(F['sans-bold']).fontSize(12.5).fillColor(INK[900]).text(text, MARGIN, y, { width: w });
  doc
    .moveTo(MARGIN, doc.y + 1)
    .lineTo(MARGIN + w, doc.y + 1)
    .lineWidth(0.75)
    .strokeColor(INK[300])
    .stroke();
  doc.y += 6;
}

function table(doc: Doc, t: Table, w: number, bottom: () => number): void {
  const total = t.columns.reduce((s, c) => s + c.weight, 0);
  const widths = t.columns.map((c) => (c.weight / total) * w);
  const pad = 4;
  const rowHeight = (cells: string[], font: string) => {
    doc.font(font).fontSize(8);
    return Math.max(...cells.map((s, i) => doc.heightOfString(s || ' ', { width: widths[i]! - 2 * pad }))) + 2 * pad - 1;
  };
  const drawRow = (cells: string[], font: string, fill: string | null, color: string) => {
    const h = rowHeight(cells, font);
    if (doc.y + h > bottom()) {
      doc.addPage();
      drawHeader();
    }
    const y = doc.y;
    if (fill) doc.rect(MARGIN, y, w, h).fill(fill);
    let x = MARGIN;
    cells.forEach((s, i) => {
      doc.font(font).fontSize(8).fillColor(color).text(s, x + pad, y + pad, { width: widths[i]! - 2 * pad, align: t.columns[i]!.align ?? 'left' });
      x += widths[i]!;
    });
    doc.moveTo(MARGIN, y + h).lineTo(MARGIN + w, y + h).lineWidth(0.4).strokeColor(INK[100]).stroke();
    doc.x = MARGIN;
    doc.y = y + h;
  };
  const drawHeader = () => drawRow(t.columns.map((c) => c.header), F['sans-bold'], INK[50], INK[700]);
  if (doc.y + 60 > bottom()) doc.addPage();
  heading(doc, t.title, MARGIN, doc.y + 4, w);
  drawHeader();
  for (const r of t.rows) drawRow(r, F.sans, null, INK[900]);
  if (t.note) {
    doc.font(F.sans).fontSize(8).fillColor(INK[600]).text(t.note, MARGIN, doc.y + 4, { width: w });
  }
  doc.moveDown(0.6);
}

// The shipped latin faces have no Greek letters (units such as σ): those characters are drawn from the Greek subset.
const GREEK_FONT = 'StochosSans-Greek';
function registerGreek(doc: Doc): void {
  const file = path.join(process.cwd(), 'node_modules', '@fontsource', 'ibm-plex-sans', 'files', 'ibm-plex-sans-greek-400-normal.woff');
  doc.registerFont(GREEK_FONT, woffToSfnt(readFileSync(file)));
}

/** Single-line text ending at `right`, in runs of fonts (Greek letters from the Greek face). */
function rightRuns(doc: Doc, runs: { text: string; font: string }[], right: number, y: number, size: number): void {
  const parts: { text: string; font: string }[] = [];
  for (const r of runs)
    for (const ch of r.text) {
      const font = GREEK.test(ch) ? GREEK_FONT : r.font;
      const last = parts[parts.length - 1];
      if (last && last.font === font) last.text += ch;
      else parts.push({ text: ch, font });
    }
  const widths = parts.map((p) => doc.font(p.font).fontSize(size).widthOfString(p.text));
  let x = right - widths.reduce((s, w) => s + w, 0);
  parts.forEach((p, i) => {
    doc.font(p.font).fontSize(size).fillColor(INK[900]).text(p.text, x, y, { lineBreak: false });
    x += widths[i]!;
  });
  doc.x = MARGIN;
  doc.y = y + size * 1.3;
}
