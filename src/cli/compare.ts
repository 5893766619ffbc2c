/**
 * `faultbook compare OLD NEW [--out DIR]`: what changed between two revisions of a study and what
 * moved the answer, as comparison.json, comparison.html and comparison.pdf.
 */
import { join, resolve } from 'node:path';
import { compareStudies, comparisonJson } from '../review/compare.js';
import { formatRatio } from '../report/format.js';
import { confine, readStudy } from '../study/read.js';
import { helpText, parseCommandArgs, type CommandSpec } from './args.js';
import { EXIT, type Command } from './io.js';
import { refuseOutputsThatAreInputs } from './no-clobber.js';
import { writeOutputs, type OutputFile } from './outputs.js';
import { formatProbability, printWarnings } from './print.js';
import { parseFormats, parsePaper } from './run.js';

const spec: CommandSpec = {
  usage: 'OLD NEW [--out DIR] [--format html,pdf,json] [--paper a4|letter] [--quiet]',
  summary: 'compare two revisions of a study: changes of logic, data and results, and what moved the answer',
  options: {
    out: { type: 'string', value: 'DIR', help: 'output folder (default: out/compare)' },
    format: { type: 'string', value: 'LIST', help: 'comma-separated: html, pdf, json (default: all)' },
    paper: { type: 'string', value: 'SIZE', help: 'a4 (default) or letter' },
    quiet: { type: 'boolean', help: 'no summary; errors and warnings only' },
  },
  positionals: ['OLD', 'NEW'],
};

const run: Command = async (argv, io) => {
  const args = parseCommandArgs('compare', spec, argv);
  if (args.help) {
    io.stdout(helpText('compare', spec));
    return EXIT.ok;
  }
  const formats = parseFormats(args.values.format as string | undefined);
  formats.delete('csv');
  const paper = parsePaper(args.values.paper as string | undefined);
  const outDir = resolve((args.values.out as string | undefined) ?? 'out/compare');
  const oldStudy = readStudy(args.positionals[0]!);
  const newStudy = readStudy(args.positionals[1]!);
  printWarnings(oldStudy.warnings, io);
  printWarnings(newStudy.warnings, io);
  const { comparison, oldResults, newResults } = compareStudies(oldStudy, newStudy);

  const files: OutputFile[] = [];
  if (formats.has('json')) files.push({ name: 'comparison.json', data: comparisonJson(comparison) });
  if (formats.has('html') || formats.has('pdf')) {
    // The report stage is loaded only when asked for, as `run` does.
    const report = await import('../report/index.js');
    const { buildComparisonView } = await import('../review/report/view.js');
    const view = buildComparisonView(comparison, oldResults, newResults, paper);
    if (formats.has('html')) files.push({ name: 'comparison.html', data: report.renderHtml(view) });
    if (formats.has('pdf')) files.push({ name: 'comparison.pdf', data: await report.renderPdf(view) });
  }
  const inputs = [oldStudy, newStudy].flatMap((s) => s.files.map((f) => confine(s.root, f.path)));
  refuseOutputsThatAreInputs('compare', files.map((f) => join(outDir, f.name)), inputs);
  const written = writeOutputs(outDir, files);
  if (!args.values.quiet) {
    const c = comparison;
    io.stdout(`revision ${c.old.revision} → ${c.new.revision}: ${c.change_count} change${c.change_count === 1 ? '' : 's'} of inputs\n`);
    for (const t of c.results.tops) {
      io.stdout(`  ${t.id}: ${t.old === undefined ? '—' : formatProbability(t.old)} → ${t.new === undefined ? '—' : formatProbability(t.new)}${t.ratio === undefined ? '' : ` (×${formatRatio(t.ratio)})`}\n`);
    }
    const moved = c.attribution.effects.filter((e) => !e.error && e.tops.some((t) => t.value !== t.base)).slice(0, 3);
    if (moved.length) {
      io.stdout('  largest single effects:\n');
      for (const e of moved) io.stdout(`    ${e.label}: ${e.tops.map((t) => `${t.id} ×${formatRatio(t.ratio)}`).join(', ')}\n`);
    }
    for (const w of written) io.stdout(`wrote ${w}\n`);
  }
  return EXIT.ok;
};

export const compareCommand: Command = run;
