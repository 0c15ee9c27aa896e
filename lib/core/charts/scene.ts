// A renderer-neutral description of a chart: plain shapes in pixel coordinates. The React components
// draw a scene as SVG elements, and svg-string.ts serialises the very same scene for downloads and
// the server's PDF, so the picture a viewer sees and the one they download cannot drift apart.

export type FontRole = 'sans' | 'mono';

/** A fill or stroke: a colour, or a reference to a pattern defined in the scene. */
export type Paint = string | { pattern: string };

interface Base {
  /** Stable key for React lists. */
  key?: string;
  opacity?: number;
}

export interface RectNode extends Base {
  type: 'rect';
  x: number;
  y: number;
  width: number;
  height: number;
  fill: Paint;
  stroke?: Paint;
  strokeWidth?: number;
  rx?: number;
}

export interface LineNode extends Base {
  type: 'line';
  x1: number;
  y1: number;
  x2: number;
  y2: number;
  stroke: Paint;
  strokeWidth?: number;
  /** e.g. "6 3" */
  dash?: string;
}

export interface PathNode extends Base {
  type: 'path';
  d: string;
  fill?: Paint;
  stroke?: Paint;
  strokeWidth?: number;
  dash?: string;
  strokeLinejoin?: 'round' | 'miter' | 'bevel';
}

export interface CircleNode extends Base {
  type: 'circle';
  cx: number;
  cy: number;
  r: number;
  fill: Paint;
  stroke?: Paint;
  strokeWidth?: number;
}

export interface TextNode extends Base {
  type: 'text';
  x: number;
  y: number;
  text: string;
  font: FontRole;
  size: number;
  fill: string;
  weight?: 400 | 500 | 600;
  anchor?: 'start' | 'middle' | 'end';
  /** Vertical placement relative to y. */
  baseline?: 'alphabetic' | 'middle' | 'hanging';
  /** Rotation in degrees about (x, y). */
  rotate?: number;
}

export interface GroupNode extends Base {
  type: 'group';
  children: SceneNode[];
  /** Offset applied to the children (translate). */
  dx?: number;
  dy?: number;
  /** Clip children to this rectangle (pixel coordinates). */
  clip?: { x: number; y: number; width: number; height: number };
  /** Hidden from assistive technology in the React renderer (decoration). */
  decorative?: boolean;
}

export type SceneNode = RectNode | LineNode | PathNode | CircleNode | TextNode | GroupNode;

/** Diagonal stripes on a background, used for out-of-specification areas. */
export interface HatchPattern {
  id: string;
  kind: 'hatch';
  color: string;
  background: string;
  spacing: number;
  strokeWidth: number;
  angle: number;
}

export type PatternDef = HatchPattern;

export interface Scene {
  width: number;
  height: number;
  /** Short title (SVG <title>). */
  title: string;
  /** Text alternative summarising the result (SVG <desc>). */
  description: string;
  background: string;
  patterns: PatternDef[];
  nodes: SceneNode[];
}

/** Estimated text width for layout (no DOM on the server): Plex Mono advances are 0.6 em; Plex Sans averages about 0.56 em. */
export function textWidth(text: string, size: number, font: FontRole): number {
  const per = font === 'mono' ? 0.6 : 0.56;
  return [...text].length * size * per;
}

/** Shortens a label to fit a width, ending with an ellipsis. */
export function fitText(text: string, maxWidth: number, size: number, font: FontRole): string {
  if (textWidth(text, size, font) <= maxWidth) return text;
  const chars = [...text];
  let n = chars.length;
  while (n > 1 && textWidth(chars.slice(0, n).join('') + '…', size, font) > maxWidth) n--;
  return chars.slice(0, n).join('').trimEnd() + '…';
}

/** Rounds coordinates so the serialised SVG stays small and stable across platforms. */
export function r2(v: number): number {
  return Math.round(v * 100) / 100;
}
