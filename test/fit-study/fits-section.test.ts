// The fits section of the appendix as a view model: what it says about each data set, built from
// the results of the fixture study (invented; reference records as data).
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import type { FitResult, Results } from '../../src/analysis/results.js';
import { buildAppendix } from '../../src/report/build.js';
import { formatDuration, formatRatio } from '../../src/report/format.js';
import { contentBox } from '../../src/report/paper.js';
import { SECTIONS } from '../../src/report/sections/index.js';
import type { Block, FigureBlock, KeyValueBlock, Section, TableBlock, TextBlock } from '../../src/report/view.js';
import { DATA, analyzeStudy, buildStudy, onlyFit, replaceIn } from './study.js';

function fitsSection(results: Results, paper: 'a4' | 'letter' = 'a4'): Section | undefined {
  return buildAppendix(results, [], paper).sections.find((s) => s.id === 'sec-fits');
}

const textOf = (b: Block): string => (b.kind === 'text' ? b.runs.map((r) => r.text).join('') : '');
const paragraphs = (s: Section): string[] => s.blocks.filter((b): b is TextBlock => b.kind === 'text').map(textOf);
const keyValues = (s: Section): Record<string, string> =>
  Object.fromEntries(s.blocks.filter((b): b is KeyValueBlock => b.kind === 'keyvalue').flatMap((b) => b.items.map((i) => [i.key, i.value])));

describe('the fits section', () => {
  const { results } = analyzeStudy(buildStudy());
  const fit = onlyFit(results);
  const section = fitsSection(results)!;

  it('sits in the slot reserved for fits and is left out when there are no fits', () => {
    const names = SECTIONS.map((s) => s.name);
    expect(names.indexOf('fits')).toBeGreaterThan(names.indexOf('event-trees'));
    expect(names.indexOf('fits')).toBeLessThan(names.indexOf('manifest'));
    expect(SECTIONS.find((s) => s.name === 'fits')!.rule).toBeDefined();
    expect(section.title).toBe('Life-data fits');
    const { fits: _dropped, ...withoutFits } = results;
    expect(fitsSection(withoutFits as Results)).toBeUndefined();
    expect(fitsSection({ ...results, fits: [] })).toBeUndefined();
  });

  it('summarises the data set: file, rows, failures, suspensions, exclusions, source', () => {
    const kv = keyValues(section);
    expect(kv['Data file']).toBe(DATA);
    expect(kv['Rows in the file']).toBe('23');
    expect(kv['Lives fitted']).toBe('23');
    expect(kv['Failures']).toBe('23');
    expect(kv['Suspensions']).toBe('0');
    expect(kv['Rows excluded']).toBe('0');
    expect(kv['Source']).toBe('bearing-records: Bearing life records for the fit tests (invented)');
  });

  it('tabulates β, η and B10 with their bounds, as the report formats numbers', () => {
    const t = section.blocks.find((b): b is TableBlock => b.kind === 'table')!;
    expect(t.number).toMatch(/^Table \d+\.1$/);
    expect(t.caption).toContain('maximum likelihood');
    expect(t.columns.map((c) => c.label)).toEqual(['Quantity', 'Estimate', 'Lower 90%', 'Upper 90%']);
    const rows = Object.fromEntries(t.rows.map((r) => [r.cells[0]!.split(' (')[0], r.cells.slice(1)]));
    expect(rows['Shape β']).toEqual([formatRatio(fit.shape), formatRatio(fit.bounds.shape.lower), formatRatio(fit.bounds.shape.upper)]);
    expect(rows['Scale η']).toEqual([formatDuration(fit.scale), formatDuration(fit.bounds.scale.lower), formatDuration(fit.bounds.scale.upper)]);
    expect(rows['B10 life']).toEqual([formatDuration(fit.b10), formatDuration(fit.bounds.b10.lower), formatDuration(fit.bounds.b10.upper)]);
    // Published β̂ = 2.102, η̂ = 81.88 (Lawless 2003, from memory; README) as the report rounds them.
    expect(rows['Shape β']![0]).toBe('2.10');
    expect(rows['Scale η']![0]).toBe('81.88 years');
    expect(t.note).toContain('two-sided 80%');
  });

  it('gives the method, the goodness-of-fit verdict, the provenance line and what uses the fit', () => {
    const p = paragraphs(section);
    expect(p).toContain('Method: maximum likelihood, each suspension counted as a life known only to exceed its age (right-censored).');
    const gof = p.find((x) => x.startsWith('Goodness of fit: '))!;
    // Complete sample, MLE: A*² against the 5% critical value 0.757 (D’Agostino & Stephens 1986,
    // from memory, as the fit code cites it); for these data the Weibull law is not rejected.
    expect(fit.goodness_of_fit.rejected_05).toBe(false);
    expect(gof).toContain(`A*² = ${formatRatio(fit.goodness_of_fit.adjusted as number)}`);
    expect(gof).toContain('0.757');
    expect(gof).toContain('no reason at the 5% level to reject the Weibull law');
    expect(p).toContain('Provenance: fitted from data/ball-bearings.csv: 23 failures, 0 suspensions, maximum likelihood.');
    expect(p).toContain('Used by: drum-bearing.shape and drum-bearing.scale, for 2 basic events: drum-bearing-1 and drum-bearing-2.');
    // How to read the plots is said once, in the methods annex, and the section points there.
    expect(section.blocks.some((b) => b.kind === 'text' && b.runs.some((r) => r.link === 'method-fits' && /^Method and how to read the plots: \d+\.$/.test(r.text)))).toBe(true);
    expect(section.blocks.some((b) => b.kind === 'callout')).toBe(false);
  });

  it('says when the Weibull law is rejected, when no verdict applies, and shows warnings', () => {
    const rejected: FitResult = { ...fit, goodness_of_fit: { ...fit.goodness_of_fit, adjusted: 0.9, rejected_05: true }, warnings: ['only a test warning'] };
    const s = fitsSection({ ...results, fits: [rejected] })!;
    expect(paragraphs(s).find((x) => x.startsWith('Goodness of fit: '))).toContain('rejected at the 5% level');
    const callout = s.blocks.find((b) => b.kind === 'callout');
    expect(callout).toMatchObject({ tone: 'warning', paragraphs: [[{ text: 'Only a test warning.' }]] });
    const noVerdict: FitResult = { ...fit, goodness_of_fit: { anderson_darling: 0.4, note: 'n/a' } };
    const gof = paragraphs(fitsSection({ ...results, fits: [noVerdict] })!).find((x) => x.startsWith('Goodness of fit: '))!;
    expect(gof).toContain('gives no verdict');
    expect(gof).not.toContain('critical value 0.757');
  });

  it('draws the plot within the text width of A4 and of letter', () => {
    for (const paper of ['a4', 'letter'] as const) {
      const s = fitsSection(results, paper)!;
      const fig = s.blocks.find((b): b is FigureBlock => b.kind === 'figure')!;
      expect(fig.number).toMatch(/^Figure \d+\.1$/);
      expect(fig.caption).toBe('Weibull probability plot of bearing-life (data/ball-bearings.csv)');
      expect(fig.parts).toHaveLength(1);
      expect(fig.parts[0]!.width).toBeLessThanOrEqual(contentBox(paper).width);
      // Printed at full size: the PDF shrinks only figures taller than the text height less 60 pt
      // (src/report/pdf/render.ts); this one leaves room for text on its page as well.
      expect(fig.parts[0]!.height).toBeLessThanOrEqual(contentBox(paper).height * 0.6);
      expect(fig.parts[0]!.svg).toContain('data-series="points"');
    }
  });

  it('shows a group fit as such and gives no excluded count it cannot know', () => {
    // Rows alternate between two invented groups, A and B; the fit takes group A (12 of the 23 rows).
    const dir = buildStudy((d) => {
      let k = 0;
      const path = join(d, DATA);
      const text = readFileSync(path, 'utf8')
        .replace('life,status', 'life,status,group')
        .replace(/^(\d[^\n]*)$/gm, (row) => `${row},${k++ % 2 === 0 ? 'A' : 'B'}`);
      writeFileSync(path, text);
      replaceIn(d, 'events.yaml', 'method: mle', 'method: mle\n    group: A');
    });
    const grouped = onlyFit(analyzeStudy(dir).results);
    expect(grouped.group).toBe('A');
    expect([grouped.rows, grouped.n, grouped.failures]).toEqual([23, 12, 12]);
    expect(grouped.provenance).toBe('fitted from data/ball-bearings.csv (group A): 12 failures, 0 suspensions, maximum likelihood');
    const s = fitsSection(analyzeStudy(dir).results)!;
    const kv = keyValues(s);
    expect(kv['Group fitted']).toBe('A');
    expect(kv['Rows in the file (all groups)']).toBe('23');
    expect(kv['Lives fitted']).toBe('12');
    expect(kv['Rows excluded']).toBeUndefined();
    expect(s.blocks.find((b): b is FigureBlock => b.kind === 'figure')!.caption).toContain('group A');
  });
});
