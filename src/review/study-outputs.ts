/**
 * The outputs of one study run, in memory, made exactly as `faultbook run` makes them (the same
 * serialisers, the same report stage), so that an archive holds what a run would have written and
 * verify can remake it.
 */
import type { Results } from '../analysis/results.js';
import { cutSetsCsv } from '../report/cutsets-csv.js';
import { resultsJson } from '../report/results-json.js';
import type { InputFile } from '../study/types.js';

export interface MadeOutputs {
  /** File name → bytes: results.json, cutsets.csv, and appendix.html/.pdf when asked for. */
  files: Map<string, Buffer>;
}

export async function makeOutputs(results: Results, inputs: InputFile[], options: { paper: 'a4' | 'letter'; appendix: boolean }): Promise<MadeOutputs> {
  const files = new Map<string, Buffer>();
  files.set('results.json', Buffer.from(resultsJson(results), 'utf8'));
  files.set('cutsets.csv', Buffer.from(cutSetsCsv(results), 'utf8'));
  if (options.appendix) {
    // Loaded only when asked for, as `run` does: json/csv need none of the report's libraries.
    const report = await import('../report/index.js');
    const view = report.buildViewModel(results, inputs, { paper: options.paper });
    files.set('appendix.html', Buffer.from(report.renderHtml(view), 'utf8'));
    files.set('appendix.pdf', Buffer.from(await report.renderPdf(view)));
  }
  return { files };
}
