/**
 * The output files of one run, in memory: results.json, cutsets.csv, appendix.html, appendix.pdf
 * (those asked for), made by the one set of serialisers and the one report stage. `faultbook run`
 * writes them; `archive` packs them; `verify` remakes them.
 */
import type { Results } from '../analysis/results.js';
import type { InputFile } from '../study/types.js';
import { cutSetsCsv } from './cutsets-csv.js';
import { resultsJson } from './results-json.js';

export const OUTPUT_FORMATS = ['html', 'pdf', 'json', 'csv'] as const;
export type OutputFormat = (typeof OUTPUT_FORMATS)[number];

export interface OutputOptions {
  paper: 'a4' | 'letter';
  formats: ReadonlySet<OutputFormat>;
}

/** File name → bytes, in a fixed order. */
export async function renderOutputs(results: Results, inputs: InputFile[], options: OutputOptions): Promise<Map<string, Buffer>> {
  const files = new Map<string, Buffer>();
  if (options.formats.has('json')) files.set('results.json', Buffer.from(resultsJson(results), 'utf8'));
  if (options.formats.has('csv')) files.set('cutsets.csv', Buffer.from(cutSetsCsv(results), 'utf8'));
  if (options.formats.has('html') || options.formats.has('pdf')) {
    // Loaded only when asked for: json/csv runs need none of the templating and PDF libraries.
    const report = await import('./index.js');
    const view = report.buildViewModel(results, inputs, { paper: options.paper });
    if (options.formats.has('html')) files.set('appendix.html', Buffer.from(report.renderHtml(view), 'utf8'));
    if (options.formats.has('pdf')) files.set('appendix.pdf', Buffer.from(await report.renderPdf(view)));
  }
  return files;
}
