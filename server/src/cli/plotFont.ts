/**
 * Text widths for laying out a picture without a browser. ECharts measures text on a canvas; without
 * one it falls back to a table of Helvetica's widths, narrower than the font the picture is drawn with,
 * so legend entries would overlap. This estimate follows DejaVu Sans instead: advance widths by class of
 * character, in em (digits 0.636 em and the space 0.318 em are the font's own advances; the classes
 * were fitted to resvg's rendering of the chart's strings, within 7 %: test/cli/plot.test.ts checks it).
 */

/** The fonts pictures are drawn with: DejaVu Sans (Debian installs it with most desktop packages) or a font of its widths. */
export const PICTURE_FONTS = 'DejaVu Sans, Verdana, sans-serif';

/** The font family the rasteriser falls back to. */
export const PICTURE_FONT = 'DejaVu Sans';

const CLASSES: [RegExp, number][] = [
  [/ /, 0.318],
  [/[0-9]/, 0.636],
  [/[iljI.,:;'|!]/, 0.3],
  [/[ft()[\]{}r]/, 0.4],
  [/[mwMW]/, 0.95],
  [/[A-Z]/, 0.72],
  [/[a-z_=+<>~^-]/, 0.6],
];
/** Other characters (Greek letters, brackets, superscripts): wide enough for any of the chart's. */
const OTHER = 0.85;
/** Room on top of the estimate, for the classes' spread. */
const ALLOWANCE = 1.05;

/** Width in em of one character. */
function em(c: string): number {
  for (const [re, w] of CLASSES) if (re.test(c)) return w;
  return OTHER;
}

/** The width in pixels of `text` in the CSS font `font` (its `NNpx` size; 12 px when it names none). */
export function textWidth(text: string, font?: string): number {
  const size = Number(/(\d+(?:\.\d+)?)px/.exec(font ?? '')?.[1] ?? 12);
  let w = 0;
  for (const c of text) w += em(c);
  return w * size * ALLOWANCE;
}
