/**
 * Width of a line of UI text from the font size, without a browser: the advance widths of DejaVu Sans
 * (the font's own metrics, in em; from memory, and checked against the panel's legend as Chromium draws
 * it here: "symmetric about x = 0 nm" at 13 px is 174.9 px, "cumulative weight" 120.2 px). DejaVu Sans
 * is wider than the other common UI fonts (Segoe UI, SF, Ubuntu, Liberation Sans), so the estimate errs
 * on the wide side there and is exact where the panel falls back to it. Pure, so the browser bundle
 * can import it too.
 */

/** Advance widths in em of the printable ASCII characters, from the space (32) to the tilde (126). */
const ASCII = [
  0.318, 0.401, 0.46, 0.838, 0.636, 0.95, 0.78, 0.275, 0.39, 0.39, 0.5, 0.838, 0.318, 0.361, 0.318, 0.337,
  0.636, 0.636, 0.636, 0.636, 0.636, 0.636, 0.636, 0.636, 0.636, 0.636, 0.337, 0.337, 0.838, 0.838, 0.838, 0.531,
  1.0, 0.684, 0.686, 0.698, 0.77, 0.632, 0.575, 0.775, 0.752, 0.295, 0.295, 0.656, 0.557, 0.863, 0.748, 0.787,
  0.603, 0.787, 0.695, 0.635, 0.611, 0.732, 0.684, 0.989, 0.685, 0.611, 0.685, 0.39, 0.337, 0.39, 0.838, 0.5,
  0.5, 0.613, 0.635, 0.55, 0.635, 0.615, 0.352, 0.635, 0.634, 0.278, 0.278, 0.579, 0.278, 0.974, 0.634, 0.612,
  0.635, 0.635, 0.411, 0.521, 0.392, 0.634, 0.592, 0.818, 0.592, 0.592, 0.525, 0.636, 0.337, 0.636, 0.838,
];

/** The symbols the views' names use beyond ASCII (measured in the panel as above where marked). */
const OTHER: Record<string, number> = {
  'ψ': 0.656, // measured: |ψ|² is 22.5 px at 13 px
  'ρ': 0.636, // measured: ρ(x) is 26.1 px
  '⟨': 0.39, // measured: ⟨E⟩ is 18.4 px
  '⟩': 0.39,
  '²': 0.401,
  '∝': 0.838,
  '·': 0.318,
  '−': 0.838,
  '±': 0.838,
  '×': 0.838,
};

/** Any other character: wide, so an unknown glyph never makes a row look shorter than it is. */
const DEFAULT = 0.7;

/** Estimated width in pixels of `text` set on one line at `fontSize` pixels. */
export function textWidth(text: string, fontSize: number): number {
  let em = 0;
  for (const ch of text) {
    const c = ch.codePointAt(0)!;
    em += c >= 32 && c <= 126 ? ASCII[c - 32]! : (OTHER[ch] ?? DEFAULT);
  }
  return em * fontSize;
}
