// Cost of the appendix: view model, HTML and PDF, for the hand-written fixture (invented dam) and a
// generated tree far too big for one page. Prints figures only; never fails on a timing.
import { performance } from 'node:perf_hooks';
import type { Results } from '../src/analysis/results.js';
import { buildViewModel, renderHtml, renderPdf } from '../src/report/index.js';
import { fixtureInputs, fixtureResults } from '../test/report/fixture.js';
import { bigTreeResults } from '../test/report/synthetic.js';

async function measure(name: string, results: Results): Promise<void> {
  const inputs = fixtureInputs();
  // One warm-up pass (module loading, font reading, template compilation happen once per process).
  await renderPdf(buildViewModel(results, inputs, { paper: 'a4' }));
  const t0 = performance.now();
  const view = buildViewModel(results, inputs, { paper: 'a4' });
  const t1 = performance.now();
  const html = renderHtml(view);
  const t2 = performance.now();
  const pdf = await renderPdf(view);
  const t3 = performance.now();
  const figures = view.sections.flatMap((s) => s.blocks).filter((b) => b.kind === 'figure').length;
  const pages = (pdf.toString('latin1').match(/\/Type \/Page\b/g) ?? []).length;
  console.log(
    `${name.padEnd(34)} view ${(t1 - t0).toFixed(0).padStart(6)} ms  html ${(t2 - t1).toFixed(0).padStart(5)} ms  pdf ${(t3 - t2).toFixed(0).padStart(6)} ms` +
      `  | ${results.logic.gates.length} gates, ${results.events.length} events, ${figures} figures, ${pages} pages,` +
      ` html ${(html.length / 1024).toFixed(0)} KiB, pdf ${(pdf.length / 1024).toFixed(0)} KiB`,
  );
}

await measure('fixture (13 gates, 15 events)', fixtureResults());
await measure('generated tree, depth 5, fan-out 3', bigTreeResults(5, 3));
await measure('generated tree, depth 6, fan-out 3', bigTreeResults(6, 3));
