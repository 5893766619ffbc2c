/**
 * The appendix renderer: `Results` (and the verbatim input files) → a view model of plain data →
 * HTML and PDF. It formats and lays out; it computes no probability or other result.
 *
 *   const view = buildViewModel(results, inputs, { paper: 'a4' });
 *   writeFileSync('appendix.html', renderHtml(view));
 *   writeFileSync('appendix.pdf', await renderPdf(view));
 */
import type { Results } from '../analysis/results.js';
import type { InputFile } from '../study/types.js';
import { buildAppendix } from './build.js';
import type { Appendix } from './view.js';

export interface RenderOptions {
  paper: 'a4' | 'letter';
}

export function buildViewModel(results: Results, inputs: InputFile[], options: RenderOptions): Appendix {
  return buildAppendix(results, inputs, options.paper);
}

export { renderHtml } from './html/render.js';
export { renderPdf } from './pdf/render.js';
export type * from './view.js';
export { SECTIONS, type SectionSlot } from './sections/index.js';
export type { SectionRule, BuildContext } from './context.js';
