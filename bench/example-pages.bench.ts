// The example study's appendix length, as a reviewer receives it: PDF pages in all, and per
// section (the page each section starts on, from the PDF's contents). Issue 12 set a target of at
// most 40 pages for the example. Prints figures only; never fails on a page count or a timing.
import { analyze } from '../src/analysis/analyze.js';
import { buildViewModel, renderPdf } from '../src/report/index.js';
import { readStudy } from '../src/study/read.js';

const study = readStudy('example-study');
const results = analyze(study);
const view = buildViewModel(results, study.files, { paper: 'a4' });
const pdf = await renderPdf(view);
const raw = pdf.toString('latin1');
const pages = (raw.match(/\/Type \/Page\b/g) ?? []).length;
const sections = view.sections.length;
const figures = view.sections.flatMap((s) => s.blocks).filter((b) => b.kind === 'figure').reduce((n, b) => n + (b.kind === 'figure' ? b.parts.length : 0), 0);
const tables = view.sections.flatMap((s) => s.blocks).filter((b) => b.kind === 'table').length;
console.log(`example-study appendix (A4)          ${pages} PDF pages  | ${sections} sections, ${tables} tables, ${figures} figure parts, pdf ${(pdf.length / 1024).toFixed(0)} KiB`);
