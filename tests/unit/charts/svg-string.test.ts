import { describe, expect, it } from 'vitest';
import PDFDocument from 'pdfkit';
import SVGtoPDF from 'svg-to-pdfkit';
import path from 'node:path';
import seedrandom from 'seedrandom';
import { binValues } from '@/lib/core/charts/spread';
import { cumulativeSvg, driversSvg, escapeXml, fontRoleOf, rangesSvg, scatterSvg, sceneToSvgString, spreadSvg } from '@/lib/core/charts/svg-string';
import { chartFontCallback, registerChartFonts } from '@/lib/server/charts/pdf-fonts';
import { allElements, parseXml } from './xml-check';

const rng = seedrandom('svg');
const gap = Array.from({ length: 4000 }, () => 0.15 + 0.03 * (rng() + rng() + rng() + rng() - 2));
const cost = Array.from({ length: 4000 }, () => 9e6 + 3e6 * rng() * rng() + 1e6 * rng());
const sortedCost = [...cost].sort((a, b) => a - b);
const ecdf = sortedCost.filter((_, i) => i % 20 === 0 || i === sortedCost.length - 1).map((x) => ({ x, p: (sortedCost.indexOf(x) + 1) / sortedCost.length }));

const charts: Record<string, string> = {
  spread: spreadSvg(
    { bins: binValues(gap, { count: 30, limits: { lower: 0.1, upper: 0.2 } }), name: 'Gap <A&B>', unit: 'mm', limits: { lower: 0.1, upper: 0.2 }, markers: [{ value: 0.15, label: 'Mean "0.15"', kind: 'mean' }], width: 640 },
    { title: 'Spread of "Gap" & friends' },
  ),
  cumulative: cumulativeSvg({
    ecdf,
    name: 'Total cost',
    unit: 'EUR',
    percentiles: [0.1, 0.5, 0.8, 0.9].map((p) => ({ p, value: sortedCost[Math.floor(p * sortedCost.length)] })),
    markers: [
      { value: 11e6, label: 'Budget', kind: 'budget' },
      { value: 10e6, label: "Sum of most likely (O'Neil's)", kind: 'most-likely-sum' },
    ],
    limits: { upper: 11e6, upperLabel: 'Budget' },
    width: 360,
  }),
  drivers: driversSvg({
    name: 'Gap',
    drivers: [
      { id: 'a', label: 'Bore < depth', share: 0.6, correlation: 0.7 },
      { id: 'b', label: 'Shaft & collar', share: 0.4, correlation: -0.5 },
    ],
    width: 500,
  }),
  ranges: rangesSvg({
    name: 'Gap',
    unit: 'mm',
    limits: { lower: 0.05, upper: 0.4 },
    rows: [
      { id: 'wc', label: 'Worst case', min: -0.07, max: 0.51, centre: 0.22 },
      { id: 'rss', label: 'RSS', min: 0.099, max: 0.341, centre: 0.22 },
    ],
    width: 600,
  }),
  scatter: scatterSvg({ x: gap.map((v) => v * 10), y: gap, xName: 'Bore', xUnit: 'mm', yName: 'Gap', yUnit: 'mm', limits: { lower: 0.1 }, width: 420, maxPoints: 300 }),
};

describe('svg-string', () => {
  it.each(Object.keys(charts))('%s is a well-formed standalone SVG document', (name) => {
    const svg = charts[name];
    expect(svg.startsWith('<?xml version="1.0" encoding="UTF-8"?>\n<svg ')).toBe(true);
    const root = parseXml(svg);
    expect(root.name).toBe('svg');
    expect(root.attrs.xmlns).toBe('http://www.w3.org/2000/svg');
    expect(Number(root.attrs.width)).toBeGreaterThan(0);
    expect(root.attrs.viewBox).toBe(`0 0 ${root.attrs.width} ${root.attrs.height}`);
    const els = allElements(root);
    // Text alternative inside the file.
    expect(root.children[0].name).toBe('title');
    expect(root.children[1].name).toBe('desc');
    expect(root.children[1].text.length).toBeGreaterThan(20);
    // Every url(#id) reference points at a defined id.
    const ids = new Set(els.map((e) => e.attrs.id).filter(Boolean));
    for (const e of els)
      for (const v of Object.values(e.attrs)) {
        const m = /^url\(#(.+)\)$/.exec(v);
        if (m) expect(ids.has(m[1])).toBe(true);
      }
    // No NaN or Infinity leaked into coordinates.
    expect(svg).not.toMatch(/NaN|Infinity/);
  });

  it('escapes markup in user text (labels, names, titles)', () => {
    const spread = parseXml(charts.spread);
    expect(spread.children[0].text).toBe('Spread of "Gap" & friends');
    const texts = allElements(spread).filter((e) => e.name === 'text').map((e) => e.text);
    expect(texts).toContain('Gap <A&B> (mm)');
    expect(texts).toContain('Mean "0.15"');
    const drivers = allElements(parseXml(charts.drivers)).filter((e) => e.name === 'text').map((e) => e.text);
    expect(drivers).toContain('Bore < depth');
    expect(drivers).toContain('Shaft & collar');
    expect(escapeXml(`<a href="x">'&'</a>`)).toBe('&lt;a href=&quot;x&quot;&gt;&apos;&amp;&apos;&lt;/a&gt;');
  });

  it('out-of-spec areas are filled with a hatch pattern (not colour alone)', () => {
    const root = parseXml(charts.spread);
    const patterns = allElements(root).filter((e) => e.name === 'pattern');
    expect(patterns.length).toBe(2);
    for (const p of patterns) {
      expect(p.attrs.patternTransform).toMatch(/^rotate\(/);
      expect(p.children.some((c) => c.name === 'line')).toBe(true);
    }
    const hatched = allElements(root).filter((e) => e.name === 'rect' && /^url\(#/.test(e.attrs.fill ?? ''));
    expect(hatched.length).toBeGreaterThan(2);
  });

  it('names fonts by family, so the PDF renderer can map them', () => {
    const families = new Set(allElements(parseXml(charts.cumulative)).map((e) => e.attrs['font-family']).filter(Boolean));
    expect([...families].map(fontRoleOf).sort()).toEqual(['mono', 'sans']);
    for (const f of families) expect(f).toMatch(/^'IBM Plex (Sans|Mono)'/);
  });

  it('embeds CSS safely (CDATA) for PNG export', () => {
    const svg = sceneToSvgString({ width: 10, height: 10, title: 't', description: 'd', background: '#fff', patterns: [], nodes: [] }, { css: "@font-face{font-family:'X';src:url(data:font/woff2;base64,AAAA)} a>b{}" });
    const root = parseXml(svg);
    const style = root.children.find((c) => c.name === 'style')!;
    expect(style.text).toContain("font-family:'X'");
    expect(style.text).toContain('a>b{}');
  });

  it('renders through svg-to-pdfkit with the shipped fonts, without warnings or missing glyphs', async () => {
    const doc = new PDFDocument({ size: 'A4', margin: 36, autoFirstPage: true });
    registerChartFonts(doc, path.resolve(__dirname, '../../..'));
    const chunks: Buffer[] = [];
    doc.on('data', (c: Buffer) => chunks.push(c));
    const done = new Promise<void>((resolve) => doc.on('end', () => resolve()));
    const warnings: string[] = [];
    const missing = new Set<string>();
    for (const [name, svg] of Object.entries(charts)) {
      // Every character of every text element must exist in the face the text uses.
      for (const e of allElements(parseXml(svg)).filter((x) => x.name === 'text')) {
        const face = chartFontCallback(e.attrs['font-family'], e.attrs['font-weight'] === 'bold');
        doc.font(face);
        const font = (doc as unknown as { _font: { font: { hasGlyphForCodePoint(c: number): boolean } } })._font.font;
        for (const ch of e.text) if (!font.hasGlyphForCodePoint(ch.codePointAt(0)!)) missing.add(`${name}:${face}:U+${ch.codePointAt(0)!.toString(16)}`);
      }
      SVGtoPDF(doc, svg, 36, 36, {
        warningCallback: (w: string) => warnings.push(`${name}: ${w}`),
        fontCallback: chartFontCallback,
      });
      doc.addPage();
    }
    doc.end();
    await done;
    expect(warnings).toEqual([]);
    expect([...missing]).toEqual([]);
    const pdf = Buffer.concat(chunks);
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
    expect(pdf.length).toBeGreaterThan(5000);
  });
});
