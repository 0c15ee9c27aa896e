import { textWidth, type FontRole } from './scene';

/** A label that belongs to a vertical line at x, to be placed in a row above the plot. */
export interface LabelRequest {
  x: number;
  text: string;
  size: number;
  font: FontRole;
  /** Where the text sits relative to x: to its left ('end'), centred, or to its right ('start'). */
  prefer: 'start' | 'middle' | 'end';
}

export interface PlacedLabel extends LabelRequest {
  /** Left edge of the text box. */
  left: number;
  width: number;
  row: number;
}

/**
 * Places labels in as few rows as possible without overlaps, each kept inside [0, width].
 * Greedy by x: a label takes the first row whose last label ends before it starts.
 */
export function placeLabels(labels: readonly LabelRequest[], width: number, gap = 6): PlacedLabel[] {
  const withBox = labels.map((l) => {
    const w = textWidth(l.text, l.size, l.font);
    let left = l.prefer === 'end' ? l.x - w - 3 : l.prefer === 'middle' ? l.x - w / 2 : l.x + 3;
    left = Math.max(1, Math.min(width - w - 1, left));
    return { ...l, left, width: w, row: 0 };
  });
  const order = withBox.map((_, i) => i).sort((a, b) => withBox[a].left - withBox[b].left);
  const rowEnds: number[] = [];
  for (const i of order) {
    const l = withBox[i];
    let row = rowEnds.findIndex((end) => end + gap <= l.left);
    if (row === -1) {
      row = rowEnds.length;
      rowEnds.push(0);
    }
    rowEnds[row] = l.left + l.width;
    l.row = row;
  }
  return withBox;
}

export function rowCount(placed: readonly PlacedLabel[]): number {
  return placed.reduce((m, l) => Math.max(m, l.row + 1), 0);
}
