/**
 * Where the labels of the sweep view's located places go: in a band of rows reserved above the plot
 * area, so they never cover a curve (drawn inside the plot area only). Each label is written level
 * with its line's top, centred on the line, or starting or ending at it; a label that meets one
 * already placed in its row tries the other two ways, then the next row up. Pure arithmetic on
 * pixels, with the text widths of textWidth.ts (which err on the wide side), so the panel and the
 * command line's pictures lay the labels out alike.
 */
import { textWidth } from '../../../server/src/shared/textWidth';

/** How a label sits against its line: centred on it, starting at it (text to the right) or ending at it. */
export type LabelAlign = 'center' | 'left' | 'right';

/** One label's place: its row above the plot (0 the nearest) and its alignment on the line. */
export interface LabelPlace {
  row: number;
  align: LabelAlign;
}

/** The places of all labels (null: no room within `MAX_LABEL_ROWS`) and the rows used. */
export interface LabelBand {
  places: (LabelPlace | null)[];
  rows: number;
}

/** At most this many rows of labels above the plot; a label that fits in none is left out (and named in the notes). */
export const MAX_LABEL_ROWS = 4;

/** The gap kept between two labels of a row, and between the lowest row and the plot, in pixels. */
export const LABEL_GAP = 4;

/** The height of one row of labels at font size `fontSize`. */
export const labelRowHeight = (fontSize: number) => fontSize + LABEL_GAP;

/** The height of the band that `rows` rows of labels need (nothing when there are none). */
export const labelBandHeight = (rows: number, fontSize: number) => (rows === 0 ? 0 : rows * labelRowHeight(fontSize) + LABEL_GAP);

/** The order in which a label tries the ways of sitting on its line within a row. */
const ALIGNS: readonly LabelAlign[] = ['center', 'left', 'right'];

/**
 * Places labels (texts at line positions `x`, pixels from the chart's left, in any order) within the
 * horizontal span `[from, to]`, taking them from left to right; see the header.
 */
export function placeLabels(labels: { x: number; text: string }[], from: number, to: number, fontSize: number): LabelBand {
  const taken: [number, number][][] = Array.from({ length: MAX_LABEL_ROWS }, () => []);
  const places: (LabelPlace | null)[] = labels.map(() => null);
  const order = labels.map((_, k) => k).sort((a, b) => labels[a]!.x - labels[b]!.x);
  let rows = 0;
  for (const k of order) {
    const { x, text } = labels[k]!;
    const w = textWidth(text, fontSize);
    places[k] = firstFree(taken, x, w, from, to);
    const place = places[k];
    if (place === null) continue;
    taken[place.row]!.push(span(x, w, place.align));
    rows = Math.max(rows, place.row + 1);
  }
  return { places, rows };
}

/** The first row and alignment where a label of width `w` on the line at `x` fits in `[from, to]` clear of the taken spans. */
function firstFree(taken: [number, number][][], x: number, w: number, from: number, to: number): LabelPlace | null {
  for (let row = 0; row < taken.length; row++) {
    for (const align of ALIGNS) {
      const [a, b] = span(x, w, align);
      if (a < from || b > to) continue;
      if (taken[row]!.every(([c, d]) => b + LABEL_GAP <= c || d + LABEL_GAP <= a)) return { row, align };
    }
  }
  return null;
}

/** The horizontal span of a label of width `w` on the line at `x`. */
function span(x: number, w: number, align: LabelAlign): [number, number] {
  if (align === 'center') return [x - w / 2, x + w / 2];
  return align === 'left' ? [x, x + w] : [x - w, x];
}
