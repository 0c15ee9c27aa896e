// Serialises a chart scene to a standalone SVG document: used for "Download SVG", for PNG export
// (drawn on a canvas) and by the server's PDF renderer through svg-to-pdfkit. Fonts are named by
// family ("IBM Plex Sans", "IBM Plex Mono"); the PDF renderer registers the shipped files under those names.
import { CHART_FONTS } from './palette';
import { cumulativeGeometry, cumulativeScene, type CumulativeInput } from './cumulative';
import { driversGeometry, driversScene, type DriversInput } from './drivers';
import { rangesGeometry, rangesScene, type RangesInput } from './ranges';
import { scatterGeometry, scatterScene, type ScatterInput } from './scatter';
import type { Paint, PatternDef, Scene, SceneNode, TextNode } from './scene';
import { spreadGeometry, spreadScene } from './spread';
import type { SpreadInput } from './spread';
import type { SceneText } from './frame';

/** Escapes text and attribute values for XML. */
export function escapeXml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&apos;' })[c] as string);
}

function num(v: number): string {
  const r = Math.round(v * 100) / 100;
  return Object.is(r, -0) ? '0' : String(r);
}

function paint(p: Paint | undefined, prefix: string): string {
  if (p === undefined) return 'none';
  return typeof p === 'string' ? p : `url(#${prefix}${p.pattern})`;
}

function attrs(pairs: Array<[string, string | number | undefined | null]>): string {
  return pairs
    .filter(([, v]) => v !== undefined && v !== null && v !== '')
    .map(([k, v]) => ` ${k}="${escapeXml(typeof v === 'number' ? num(v) : (v as string))}"`)
    .join('');
}

const BASELINE: Record<NonNullable<TextNode['baseline']>, string | undefined> = {
  alphabetic: undefined,
  middle: 'middle',
  hanging: 'hanging',
};

export interface SvgOptions {
  /** Prefix for pattern and clip ids, so several charts can share one HTML document. */
  idPrefix?: string;
  /** Extra CSS placed in a <style> element (e.g. @font-face rules with embedded fonts for PNG export). */
  css?: string;
  /** Leave out the XML declaration (when inlining into HTML). */
  inline?: boolean;
}

function patternXml(p: PatternDef, prefix: string): string {
  const s = p.spacing;
  return (
    `<pattern id="${escapeXml(prefix + p.id)}" patternUnits="userSpaceOnUse" width="${num(s)}" height="${num(s)}" patternTransform="rotate(${num(p.angle)})">` +
    `<rect width="${num(s)}" height="${num(s)}" fill="${escapeXml(p.background)}"/>` +
    `<line x1="0" y1="0" x2="0" y2="${num(s)}" stroke="${escapeXml(p.color)}" stroke-width="${num(p.strokeWidth * 2)}"/>` +
    `</pattern>`
  );
}

function nodeXml(n: SceneNode, prefix: string, clipIds: { next: number }, defs: string[]): string {
  const op = n.opacity !== undefined && n.opacity !== 1 ? n.opacity : undefined;
  switch (n.type) {
    case 'rect':
      return `<rect${attrs([
        ['x', n.x],
        ['y', n.y],
        ['width', n.width],
        ['height', n.height],
        ['rx', n.rx],
        ['fill', paint(n.fill, prefix)],
        ['stroke', n.stroke ? paint(n.stroke, prefix) : undefined],
        ['stroke-width', n.stroke ? n.strokeWidth : undefined],
        ['opacity', op],
      ])}/>`;
    case 'line':
      return `<line${attrs([
        ['x1', n.x1],
        ['y1', n.y1],
        ['x2', n.x2],
        ['y2', n.y2],
        ['stroke', paint(n.stroke, prefix)],
        ['stroke-width', n.strokeWidth ?? 1],
        ['stroke-dasharray', n.dash],
        ['opacity', op],
      ])}/>`;
    case 'path':
      return `<path${attrs([
        ['d', n.d],
        ['fill', paint(n.fill, prefix)],
        ['stroke', n.stroke ? paint(n.stroke, prefix) : undefined],
        ['stroke-width', n.stroke ? (n.strokeWidth ?? 1) : undefined],
        ['stroke-dasharray', n.dash],
        ['stroke-linejoin', n.strokeLinejoin],
        ['opacity', op],
      ])}/>`;
    case 'circle':
      return `<circle${attrs([
        ['cx', n.cx],
        ['cy', n.cy],
        ['r', n.r],
        ['fill', paint(n.fill, prefix)],
        ['stroke', n.stroke ? paint(n.stroke, prefix) : undefined],
        ['stroke-width', n.stroke ? (n.strokeWidth ?? 1) : undefined],
        ['opacity', op],
      ])}/>`;
    case 'text':
      return `<text${attrs([
        ['x', n.x],
        ['y', n.y],
        ['font-family', n.font === 'mono' ? CHART_FONTS.mono : CHART_FONTS.sans],
        ['font-size', n.size],
        // 600 is written "bold": browsers then pick the shipped 600 face, and svg-to-pdfkit passes bold=true to its font callback.
        ['font-weight', n.weight === 600 ? 'bold' : n.weight === 500 ? 500 : undefined],
        ['fill', n.fill],
        ['text-anchor', n.anchor && n.anchor !== 'start' ? n.anchor : undefined],
        ['dominant-baseline', n.baseline ? BASELINE[n.baseline] : undefined],
        ['transform', n.rotate ? `rotate(${num(n.rotate)} ${num(n.x)} ${num(n.y)})` : undefined],
        ['opacity', op],
      ])}>${escapeXml(n.text)}</text>`;
    case 'group': {
      let clip: string | undefined;
      if (n.clip) {
        const id = `${prefix}clip${clipIds.next++}`;
        defs.push(`<clipPath id="${id}"><rect${attrs([['x', n.clip.x], ['y', n.clip.y], ['width', n.clip.width], ['height', n.clip.height]])}/></clipPath>`);
        clip = `url(#${id})`;
      }
      const transform = n.dx || n.dy ? `translate(${num(n.dx ?? 0)} ${num(n.dy ?? 0)})` : undefined;
      const inner = n.children.map((c) => nodeXml(c, prefix, clipIds, defs)).join('');
      return `<g${attrs([['transform', transform], ['clip-path', clip], ['opacity', op]])}>${inner}</g>`;
    }
  }
}

/** Which of the two chart faces a font-family attribute asks for (for svg-to-pdfkit's fontCallback). */
export function fontRoleOf(family: string): 'sans' | 'mono' {
  return /mono/i.test(family) ? 'mono' : 'sans';
}

/** The scene as a standalone SVG document (UTF-8). */
export function sceneToSvgString(scene: Scene, opts: SvgOptions = {}): string {
  const prefix = opts.idPrefix ?? 'st-';
  const defs: string[] = scene.patterns.map((p) => patternXml(p, prefix));
  const clipIds = { next: 0 };
  const body = scene.nodes.map((n) => nodeXml(n, prefix, clipIds, defs)).join('');
  const titleId = `${prefix}title`;
  const descId = `${prefix}desc`;
  return (
    (opts.inline ? '' : '<?xml version="1.0" encoding="UTF-8"?>\n') +
    `<svg xmlns="http://www.w3.org/2000/svg" width="${num(scene.width)}" height="${num(scene.height)}" viewBox="0 0 ${num(scene.width)} ${num(scene.height)}" role="img" aria-labelledby="${titleId} ${descId}">` +
    `<title id="${titleId}">${escapeXml(scene.title)}</title>` +
    `<desc id="${descId}">${escapeXml(scene.description)}</desc>` +
    (opts.css ? `<style><![CDATA[${opts.css.replace(/\]\]>/g, '')}]]></style>` : '') +
    (defs.length ? `<defs>${defs.join('')}</defs>` : '') +
    `<rect width="100%" height="100%" fill="${escapeXml(scene.background)}"/>` +
    body +
    `</svg>`
  );
}

/** Convenience: geometry → scene → SVG in one call, for each chart. */
export function spreadSvg(input: SpreadInput, text?: Partial<SceneText>, opts?: SvgOptions): string {
  return sceneToSvgString(spreadScene(spreadGeometry(input), text), opts);
}

export function cumulativeSvg(input: CumulativeInput, text?: Partial<SceneText>, opts?: SvgOptions): string {
  return sceneToSvgString(cumulativeScene(cumulativeGeometry(input), text), opts);
}

export function driversSvg(input: DriversInput, text?: Partial<SceneText>, opts?: SvgOptions): string {
  return sceneToSvgString(driversScene(driversGeometry(input), text), opts);
}

export function scatterSvg(input: ScatterInput, text?: Partial<SceneText>, opts?: SvgOptions): string {
  return sceneToSvgString(scatterScene(scatterGeometry(input), text), opts);
}

export function rangesSvg(input: RangesInput, text?: Partial<SceneText>, opts?: SvgOptions): string {
  return sceneToSvgString(rangesScene(rangesGeometry(input), text), opts);
}
