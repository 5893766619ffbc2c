/**
 * Issue 12: the appendix a reviewer signs. The example study end to end (PDF read back with
 * pdftotext): key findings after document control and before the contents, on one page, with the
 * same top-event and outcome numbers as their own sections; outcome percentiles in results.json and
 * in the appendix; values in the units the study wrote. Then the `report:` block of study.yaml:
 * an appendix label that numbers sections, tables and figures, names, a logo, omitted sections.
 *
 * The numbers themselves are checked elsewhere against their sources; here the check is that the
 * appendix shows each one once, the same way everywhere (the report's one formatter).
 */
import { execFileSync } from 'node:child_process';
import { cpSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Results } from '../../src/analysis/results.js';
import { buildViewModel, renderHtml, renderPdf } from '../../src/report/index.js';
import { formatProbability } from '../../src/report/format.js';
import { SECTIONS } from '../../src/report/sections/index.js';
import { StudyError, StudyErrors } from '../../src/study/errors.js';
import { readStudy } from '../../src/study/read.js';
import { OPTIONAL_SECTIONS } from '../../src/study/types.js';
import { faultbook, tempDir } from '../cli/helpers.js';
import { PDFTOTEXT, haveTool } from '../tools.js';
import { fixtureInputs, fixtureResults } from './fixture.js';
import { section, tables, viewText } from './helpers.js';

const squash = (s: string) => s.replace(/\s+/g, ' ');

describe('the example appendix as a reviewer reads it (PDF text)', () => {
  const out = tempDir('faultbook-keyfindings-');
  let results: Results;
  let pages: string[] = [];
  beforeAll(async () => {
    expect((await faultbook('run', 'example-study', '--out', out, '--quiet')).code).toBe(0);
    results = JSON.parse(readFileSync(join(out, 'results.json'), 'utf8')) as Results;
    if (haveTool(PDFTOTEXT, 'key-findings PDF checks')) {
      // pdftotext separates pages with a form feed.
      pages = execFileSync(PDFTOTEXT, ['-layout', join(out, 'appendix.pdf'), '-'], { encoding: 'utf8' }).split('\f');
    }
  }, 120_000);
  afterAll(() => rmSync(out, { recursive: true, force: true }));

  const pageOf = (needle: RegExp) => pages.findIndex((p) => needle.test(p));

  it('puts the key findings after document control and before the contents, on one page', () => {
    if (pages.length === 0) return;
    const control = pageOf(/Document control/);
    const findings = pageOf(/^\s*Key findings\s*$/m);
    const contents = pageOf(/^\s*Contents\s*$/m);
    expect(control).toBe(0);
    expect(findings).toBeGreaterThan(control);
    expect(contents).toBeGreaterThan(findings);
    // One page: its first heading and its last line (the caution) are on the same page.
    expect(pages[findings]).toMatch(/Use with the cautions/);
  });

  it('shows each top event with the same point, mean and percentiles as its sections', () => {
    if (pages.length === 0) return;
    const findings = squash(pages[pageOf(/^\s*Key findings\s*$/m)]!);
    const rest = squash(pages.slice(pageOf(/^\s*Contents\s*$/m)).join(' '));
    for (const top of results.tops) {
      const u = results.uncertainty!.find((x) => x.top === top.id)!;
      const cells = [top.probability.exact, u.mean, u.p05, u.p95].map(formatProbability);
      expect(findings, top.id).toContain(`${top.id} `);
      for (const c of cells) {
        expect(findings, `${top.id} ${c}`).toContain(c);
        expect(rest, `${top.id} ${c} in its section`).toContain(c);
      }
      // In the row, in that order: point, mean, 5th, 95th.
      expect(findings).toMatch(new RegExp(cells.map((c) => c.replace(/[.+-]/g, '\\$&')).join(' ')));
    }
  });

  it('carries outcome percentiles in results.json and prints them in the key findings and the event-tree section', () => {
    const outcomes = (results.outcome_uncertainty ?? []).filter((q) => q.kind === 'event-tree-outcome');
    const tree = results.event_trees![0]!;
    expect(outcomes.map((q) => q.id).sort()).toEqual(tree.outcomes.map((o) => o.id).sort());
    for (const q of outcomes) {
      expect(q.p05).toBeLessThanOrEqual(q.median);
      expect(q.median).toBeLessThanOrEqual(q.p95);
      // The point value is the one printed in the outcome's own table.
      expect(q.point).toBe(tree.outcomes.find((o) => o.id === q.id)!.probability);
    }
    if (pages.length === 0) return;
    const findings = squash(pages[pageOf(/^\s*Key findings\s*$/m)]!);
    const trees = squash(pages.slice(pageOf(/Uncertainty of the outcomes of/)).join(' '));
    for (const q of outcomes) {
      const row = [q.point, q.mean, q.p05, q.p95].map(formatProbability).join(' ');
      expect(findings, q.id).toContain(row);
      expect(trees, q.id).toContain(`${q.id} ${[q.point, q.mean, q.median, q.p05, q.p95].map(formatProbability).join(' ')}`);
    }
  });

  it('shows values in the units the study wrote them in', () => {
    if (pages.length === 0) return;
    const text = squash(pages.join(' '));
    // events.yaml: generator-fails-to-run rate 1e-3 /h, exposure 72 h; utility-feed-lost repair 6 h.
    // (A table cell that wraps loses its space in the extracted text, hence \s*.)
    expect(/rate 1e-3 \/h/.test(text)).toBe(true);
    expect(/exposure 72\s*h/.test(text)).toBe(true);
    expect(/repair\s*6\s*h/.test(text)).toBe(true);
    expect(text.includes('8.766 /year')).toBe(false);
    // A swept value stays in its written unit: 1 month halved is 0.5 months, not 2.174 weeks.
    expect(/hoist-motor\.exercise 0\.5 months 2 months/.test(text)).toBe(true);
    expect(/\d\.\d{3} (weeks|months|days|h)\b/.test(text)).toBe(false);
  });

  it('labels common-cause members as independent parts, and their totals, in the basic-event table', () => {
    // Table cells as the HTML holds them (the PDF's layout text interleaves wrapped cells).
    const html = readFileSync(join(out, 'appendix.html'), 'utf8');
    const events = html.slice(html.indexOf('id="tab-events"'), html.indexOf('id="sec-provenance"'));
    const member = results.events.find((e) => e.common_cause_role === 'independent' || (e.common_cause_group && !e.common_cause_members))!;
    expect(events).toContain(`${formatProbability(member.probability)} independent part`);
    expect(events).toContain(`total ${formatProbability(member.total_probability)}`);
    const shared = results.events.find((e) => e.common_cause_role === 'shared')!;
    expect(events).toContain(`${formatProbability(shared.probability)} shared part`);
  });

  it('names the life-data bounds and the probability-plot axis in plain statistical words', () => {
    if (pages.length === 0) return;
    const text = squash(pages.join(' '));
    expect(text).toContain('normal-approximation (Fisher information) bounds');
    expect(readFileSync(join(out, 'appendix.html'), 'utf8')).toContain('fraction failed, F(t)');
  });
});

describe('study.yaml report: block', () => {
  const labelled = (report: NonNullable<Results['study']['report']>): Results => {
    const r = fixtureResults();
    r.study.report = report;
    return r;
  };

  it('numbers sections, tables and figures with the appendix label', () => {
    const v = buildViewModel(labelled({ appendix: 'C' }), fixtureInputs(), { paper: 'a4' });
    const numbered = v.sections.filter((s) => s.number);
    expect(numbered.map((s) => s.number)).toEqual(numbered.map((_, i) => `C.${i + 1}`));
    const first = tables(v).find((t) => t.number)!;
    const firstSection = v.sections.find((s) => s.blocks.includes(first))!;
    expect(first.number).toBe(`Table ${firstSection.number}.1`);
    expect(first.number).toMatch(/^Table C\.\d+\.1$/);
    const figures = v.sections.flatMap((s) => s.blocks).filter((b) => b.kind === 'figure');
    for (const f of figures) if (f.kind === 'figure') expect(f.number).toMatch(/^Figure C\.\d+\.\d+$/);
    expect(v.toc.filter((t) => t.number).every((t) => t.number!.startsWith('C.'))).toBe(true);
    // Cross-references take the label too.
    expect(viewText(v)).toMatch(/Method: C\.\d+\./);
  });

  it('prints the label in the PDF: the first table reads "Table C.1.1"', async () => {
    if (!haveTool(PDFTOTEXT, 'appendix label PDF check')) return;
    const dir = tempDir('faultbook-label-');
    try {
      const pdf = await renderPdf(buildViewModel(labelled({ appendix: 'C', client: 'River Authority (invented)', consultant: 'Sample Engineers (invented)' }), fixtureInputs(), { paper: 'a4' }));
      writeFileSync(join(dir, 'a.pdf'), pdf);
      const text = squash(execFileSync(PDFTOTEXT, ['-layout', join(dir, 'a.pdf'), '-'], { encoding: 'utf8' }));
      expect(text).toContain('Table C.1.1');
      expect(text).toContain('C.1 Scope and purpose');
      expect(text).toContain('Client: River Authority (invented)');
      expect(text).toContain('Sample Engineers (invented)');
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it('leaves out the sections the study names, and nothing else', () => {
    const all = buildViewModel(fixtureResults(), fixtureInputs(), { paper: 'a4' });
    const v = buildViewModel(labelled({ omit: ['forecast', 'inputs'] }), fixtureInputs(), { paper: 'a4' });
    expect(section(v, 'sec-forecast')).toBeUndefined();
    expect(section(v, 'sec-inputs')).toBeUndefined();
    expect(v.sections.length).toBe(all.sections.length - (section(all, 'sec-forecast') ? 1 : 0) - 1);
    // A pointer to an omitted section disappears rather than pointing nowhere.
    for (const s of v.sections) for (const b of s.blocks) if (b.kind === 'text') expect(b.runs.every((r) => !r.ref && !/\{\}/.test(r.text))).toBe(true);
  });

  it('knows every optional section name as a section of the appendix', () => {
    const names = SECTIONS.map((s) => s.name);
    for (const n of OPTIONAL_SECTIONS) expect(names, n).toContain(n);
    for (const never of ['title-block', 'key-findings', 'cautions', 'results']) expect(OPTIONAL_SECTIONS as readonly string[]).not.toContain(never);
  });
});

describe('reading the report: block', () => {
  const study = (extra: string, files: Record<string, Buffer | string> = {}) => {
    const dir = tempDir('faultbook-report-block-');
    cpSync('templates/starter', dir, { recursive: true });
    const text = readFileSync(join(dir, 'study.yaml'), 'utf8').replace(/^report:\n(  .*\n)*/m, '');
    writeFileSync(join(dir, 'study.yaml'), `${text}${extra}`);
    for (const [rel, data] of Object.entries(files)) writeFileSync(join(dir, rel), data);
    return dir;
  };
  const readError = (dir: string): StudyError => {
    try {
      readStudy(dir);
    } catch (err) {
      // The reader collects errors; a single one may come wrapped.
      if (err instanceof StudyErrors && err.errors.length === 1) return err.errors[0]!;
      return err as StudyError;
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
    throw new Error('expected an input error');
  };
  // The 8-byte PNG signature (ISO/IEC 15948, 5.2) and a 1×1 image, made by hand.
  const png = Buffer.from(
    '89504e470d0a1a0a0000000d49484452000000010000000108060000001f15c4890000000d4944415478da63f8cfc0f01f0005000201a2fd5a7a0000000049454e44ae426082',
    'hex',
  );

  it('names an unknown section with its position and the closest optional one', () => {
    const e = readError(study('report:\n  omit: [forecast, uncertanty]\n'));
    expect(e).toBeInstanceOf(StudyError);
    expect(e.message).toBe("report: omit names unknown section 'uncertanty'");
    expect(e.at).toMatchObject({ file: 'study.yaml' });
    expect(e.at!.line).toBeGreaterThan(1);
    expect(e.hint).toMatch(/did you mean 'uncertainty'/);
  });

  it('reads a PNG logo inside the folder as an input file, hashed, and embeds it', () => {
    const dir = study('report:\n  appendix: C\n  logo: logo.png\n', { 'logo.png': png });
    try {
      const s = readStudy(dir);
      const logo = s.files.find((f) => f.path === 'logo.png')!;
      expect(logo.image?.media_type).toBe('image/png');
      expect(logo.sha256).toMatch(/^[0-9a-f]{64}$/);
      expect(s.meta.report).toMatchObject({ appendix: 'C', logo: 'logo.png' });
      const r = fixtureResults();
      r.study.report = { logo: 'logo.png' };
      const html = renderHtml(buildViewModel(r, [logo], { paper: 'a4' }));
      expect(html).toContain(`src="data:image/png;base64,${png.toString('base64').replace(/=/g, '&#x3D;')}"`);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it('refuses a logo that is not a PNG or JPEG, or that lies outside the folder', () => {
    expect(readError(study('report:\n  logo: logo.png\n', { 'logo.png': 'not an image' })).message).toMatch(/neither a PNG nor a JPEG/);
    expect(readError(study('report:\n  logo: ../logo.png\n')).message).toMatch(/outside the study folder/);
  });
});

describe('key findings of a study without a Monte Carlo run or event trees', () => {
  it('still gives each top event, and says the spread is not available', () => {
    const r = fixtureResults();
    delete r.uncertainty;
    delete r.outcome_uncertainty;
    const v = buildViewModel(r, fixtureInputs(), { paper: 'a4' });
    const tops = tables(v).find((t) => t.id === 'tab-key-tops')!;
    expect(tops.rows.map((row) => row.cells[0])).toEqual(r.tops.map((t) => t.id));
    expect(tops.rows[0]!.cells.slice(2, 6)).toEqual([formatProbability(r.tops[0]!.probability.exact), '—', '—', '—']);
    expect(tops.note).toMatch(/No Monte Carlo run/);
  });
});
