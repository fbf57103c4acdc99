/**
 * The page frame's type size: the title block (page head) and the footer are printed in the page
 * margins, which have a fixed height, so long names are wrapped in their box and, when the
 * wrapped lines would not fit that height, printed smaller. The estimate is deliberately on the
 * safe side: Inter's mean advance over mixed text is about 0.52 em (0.56 em in semibold), taken
 * here as 0.58 em for every character; every line is counted as one more when it wraps at all
 * (common practice, no source). tests/sheet-layout.test.ts checks the printed result with the
 * PDF's word positions.
 */

/** Printable width between the side margins (page-setup.hbs: 17 mm left, 15 mm right). */
export function frameWidthMm(paper: 'A4' | 'Letter'): number {
  return (paper === 'Letter' ? 215.9 : 210) - 32;
}

const MM_PER_PT = 25.4 / 72;
const EM_PER_CHAR = 0.58;

/** Lines a text takes in a box: each of its own lines wrapped at the box width. */
export function linesIn(lines: string[], widthMm: number, pt: number): number {
  const perLine = Math.max(1, Math.floor(widthMm / (pt * MM_PER_PT * EM_PER_CHAR)));
  return lines.reduce((n, l) => n + Math.max(1, Math.ceil(l.length / perLine)), 0);
}

/** A margin box: its share of the frame's width and its text, line by line. */
export interface FrameBox {
  share: number;
  lines: string[];
}

/**
 * The largest type size from `sizes` at which every box's wrapped lines fit `heightMm` at the
 * given line height; the smallest size when none does (and then the box's own wrapping and the
 * layout test are what stand between a long name and the page edge).
 */
export function frameFontPt(boxes: FrameBox[], widthMm: number, heightMm: number, sizes: number[], lineHeight: number): number {
  for (const pt of sizes) {
    const fits = boxes.every((b) => linesIn(b.lines, widthMm * b.share - 2, pt) * pt * lineHeight * MM_PER_PT <= heightMm);
    if (fits) return pt;
  }
  return sizes[sizes.length - 1];
}

/** Shares of the page head's two boxes and of the footer's two (page-setup.hbs and sheet.css). */
export const HEAD_SHARES = { left: 0.4, right: 0.6 } as const;
export const FOOT_SHARES = { left: 0.56, right: 0.44 } as const;
/**
 * Height the page head may use: the 31 mm top margin less the 5 mm gap and 1.8 mm rule padding
 * under it, and 6 mm kept clear at the paper's edge (what most office printers cannot print on;
 * common practice, no source).
 */
export const HEAD_HEIGHT_MM = 31 - 5 - 1.8 - 6;
/**
 * Footer: the bottom margin (17 mm; 21 mm on an issued sheet, whose footer has the stamp line)
 * less its 3 mm gap, 1.6 mm padding, and 6 mm at the edge.
 */
export const footHeightMm = (issued: boolean) => (issued ? 21 : 17) - 3 - 1.6 - 6;
export const HEAD_SIZES = [7.4, 6.8, 6.2, 5.6];
export const FOOT_SIZES = [6.8, 6.2, 5.6];
export const FRAME_LINE_HEIGHT = 1.32;
