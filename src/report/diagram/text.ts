/**
 * Text measurement for diagram layout without a browser: the advance widths of Roboto (the font
 * the appendix embeds in both the HTML and the PDF), so wrapped labels fit their boxes in both.
 *
 * The tables are the advance widths of printable ASCII (U+0020–U+007E) in thousandths of an em, read
 * once from node_modules/pdfmake/build/fonts/Roboto/Roboto-Regular.ttf and Roboto-Medium.ttf
 * (hmtx table, 2048 units per em). Other characters use a typical lower-case width.
 */

const REGULAR = [
  248, 258, 320, 616, 562, 732, 622, 175, 342, 348, 431, 567, 197, 276, 264, 413, 562, 562, 562, 562, 562, 562, 562,
  562, 562, 562, 242, 211, 508, 549, 523, 473, 898, 652, 623, 651, 656, 568, 553, 681, 713, 272, 552, 627, 539, 873,
  713, 688, 631, 688, 616, 594, 597, 648, 637, 887, 627, 601, 599, 265, 411, 265, 418, 451, 309, 544, 562, 523, 564,
  530, 348, 562, 551, 243, 239, 507, 243, 877, 552, 570, 562, 568, 339, 516, 327, 551, 484, 751, 496, 473, 496, 338,
  244, 338, 680,
];

const MEDIUM = [
  249, 265, 319, 603, 568, 736, 641, 167, 346, 350, 443, 555, 224, 340, 278, 390, 568, 568, 568, 568, 568, 568, 568,
  568, 568, 568, 264, 240, 509, 563, 520, 486, 897, 663, 631, 653, 653, 565, 551, 681, 709, 283, 556, 632, 540, 875,
  709, 689, 638, 689, 629, 605, 609, 654, 646, 880, 631, 611, 603, 271, 417, 271, 429, 448, 320, 539, 562, 522, 563,
  536, 353, 567, 556, 255, 251, 521, 255, 871, 557, 567, 562, 566, 354, 515, 333, 556, 496, 742, 503, 490, 503, 333,
  249, 333, 663,
];

const OTHER = 560;

export type Weight = 'regular' | 'medium';

/** Width of `text` in points at `size` points. */
export function textWidth(text: string, size: number, weight: Weight = 'regular'): number {
  const table = weight === 'medium' ? MEDIUM : REGULAR;
  let units = 0;
  for (const ch of text) {
    const c = ch.codePointAt(0)!;
    units += c >= 32 && c < 127 ? table[c - 32]! : OTHER;
  }
  return (units * size) / 1000;
}

/**
 * Greedy word wrap into at most `maxLines` lines of at most `width` points. Words longer than a
 * line break after a hyphen or underscore where possible, else anywhere. If the text does not fit,
 * the last line ends with an ellipsis (the full text is in the tables of the appendix).
 */
export function wrap(text: string, width: number, size: number, maxLines: number, weight: Weight = 'regular'): string[] {
  const fits = (s: string) => textWidth(s, size, weight) <= width;
  const words = text.split(/\s+/).filter(Boolean).flatMap((w) => splitLong(w, fits));
  const lines: string[] = [];
  let current = '';
  for (const word of words) {
    const candidate = current ? `${current} ${word}` : word;
    if (fits(candidate) || !current) {
      current = candidate;
    } else {
      lines.push(current);
      current = word;
    }
  }
  if (current) lines.push(current);
  if (lines.length <= maxLines) return lines;
  const kept = lines.slice(0, maxLines);
  kept[maxLines - 1] = ellipsize(`${kept[maxLines - 1]} ${lines[maxLines]}`, fits);
  return kept;
}

/** Cut a word that is wider than a line into pieces that fit, preferring breaks after - or _. */
function splitLong(word: string, fits: (s: string) => boolean): string[] {
  if (fits(word)) return [word];
  const pieces: string[] = [];
  let rest = word;
  while (rest && !fits(rest)) {
    let cut = 1;
    while (cut < rest.length && fits(rest.slice(0, cut + 1))) cut++;
    const soft = Math.max(rest.lastIndexOf('-', cut - 1), rest.lastIndexOf('_', cut - 1));
    if (soft > 0 && soft + 1 >= cut / 2) cut = soft + 1;
    pieces.push(rest.slice(0, cut));
    rest = rest.slice(cut);
  }
  if (rest) pieces.push(rest);
  return pieces;
}

function ellipsize(line: string, fits: (s: string) => boolean): string {
  let s = line;
  while (s.length > 1 && !fits(`${s}…`)) s = s.slice(0, -1);
  return `${s.trimEnd()}…`;
}
