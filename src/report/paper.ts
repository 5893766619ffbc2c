import type { Paper } from './view.js';

/**
 * Page geometry shared by the PDF layout, the print CSS and the diagram sizing, in points
 * (1/72 in). ISO 216 A4 is 210 × 297 mm; US letter is 8.5 × 11 in (common practice, no source).
 */
export interface PageGeometry {
  width: number;
  height: number;
  /** left, top, right, bottom */
  margins: [number, number, number, number];
}

const MM = 72 / 25.4;

export const PAGES: Record<Paper, PageGeometry> = {
  a4: { width: 210 * MM, height: 297 * MM, margins: [48, 62, 48, 54] },
  letter: { width: 8.5 * 72, height: 11 * 72, margins: [54, 60, 54, 52] },
};

/** The printable area of a page, in points; a landscape page (turned, same margins) for wide figures. */
export function contentBox(paper: Paper, orientation: 'portrait' | 'landscape' = 'portrait'): { width: number; height: number } {
  const p = PAGES[paper];
  const [w, h] = orientation === 'landscape' ? [p.height, p.width] : [p.width, p.height];
  return { width: w - p.margins[0] - p.margins[2], height: h - p.margins[1] - p.margins[3] };
}

/** What CSS `@page size` calls the paper. */
export function cssPageSize(paper: Paper): string {
  return paper === 'a4' ? 'A4' : 'letter';
}

/** What pdfmake calls the paper. */
export function pdfPageSize(paper: Paper): 'A4' | 'LETTER' {
  return paper === 'a4' ? 'A4' : 'LETTER';
}
