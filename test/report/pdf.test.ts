import { execFileSync } from 'node:child_process';
import { haveTool } from '../tools.js';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import pdfmake from 'pdfmake';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildViewModel, renderHtml, renderPdf } from '../../src/report/index.js';
import { studyDate } from '../../src/report/pdf/render.js';
import { markdownToPdf } from '../../src/report/pdf/markdown.js';
import { fixtureInputs, fixtureResults } from './fixture.js';
import { PDFTOTEXT, figures } from './helpers.js';
import { hostileResults } from './synthetic.js';

const havePoppler = haveTool(PDFTOTEXT, 'PDF text checks');

let dir: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'faultbook-pdf-'));
});
afterAll(() => {
  if (dir) rmSync(dir, { recursive: true, force: true });
});

function poppler(tool: 'pdftotext' | 'pdfinfo' | 'pdffonts', pdf: Buffer, name: string, args: string[] = []): string {
  const file = join(dir, name);
  writeFileSync(file, pdf);
  return execFileSync(`/usr/bin/${tool}`, [...args, file, ...(tool === 'pdftotext' ? ['-'] : [])], { encoding: 'utf8' });
}

/** Text with line breaks and runs of spaces made single spaces (table cells wrap in the PDF). */
const squash = (s: string) => s.replace(/\s+/g, ' ');

describe('PDF appendix', () => {
  it('is byte-identical from one render to the next', async () => {
    const a = await renderPdf(buildViewModel(fixtureResults(), fixtureInputs(), { paper: 'a4' }));
    const b = await renderPdf(buildViewModel(fixtureResults(), fixtureInputs(), { paper: 'a4' }));
    expect(a.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    expect(a.equals(b)).toBe(true);
  });

  it('dates its metadata from the study, in UTC, whatever the clock says', () => {
    expect(studyDate('2026-11-20').toISOString()).toBe('2026-11-20T00:00:00.000Z');
    expect(studyDate('1994-05').toISOString()).toBe('1994-05-01T00:00:00.000Z');
  });

  it('has a bookmark (outline) entry per section and subheading', async () => {
    const view = buildViewModel(fixtureResults(), fixtureInputs(), { paper: 'a4' });
    const raw = (await renderPdf(view)).toString('latin1');
    expect(raw).toContain('/Outlines');
    // Outline titles are written as plain PDF strings for ASCII text (ISO 32000-1, 12.3.3).
    for (const s of view.sections) expect(raw, s.title).toContain(`/Title (${s.number ? `${s.number} ` : ''}${s.title})`);
    expect(raw).toContain('/Title (A3 Exercise and test intervals)');
  });

  it('leaves pdfmake unable to fetch a URL or read any local file but the fonts', async () => {
    await renderPdf(buildViewModel(fixtureResults(), [], { paper: 'a4' }));
    // The policies renderPdf installed stay in force on pdfmake (a process-wide singleton).
    const local = pdfmake.createPdf({ content: [{ image: '/etc/hostname' }] }).getBuffer();
    await expect(local).rejects.toThrow(/Access to local file denied/);
    // Named images with an http(s) address are what pdfmake would download before layout.
    const remote = pdfmake.createPdf({ images: { remote: 'https://example.invalid/x.png' }, content: [{ image: 'remote' }] }).getBuffer();
    await expect(remote).rejects.toThrow(/Access to URL denied/);
  });

  it('renders hostile strings without failing (the SVG stays well-formed XML)', async () => {
    const pdf = await renderPdf(buildViewModel(hostileResults(), fixtureInputs(), { paper: 'letter' }));
    expect(pdf.length).toBeGreaterThan(10_000);
  });
});

describe.skipIf(!havePoppler)('PDF appendix read back with poppler', () => {
  const results = fixtureResults();
  const view = buildViewModel(results, fixtureInputs(), { paper: 'a4' });
  let text = '';
  let info = '';
  beforeAll(async () => {
    const pdf = await renderPdf(view);
    text = poppler('pdftotext', pdf, 'fixture.pdf');
    info = poppler('pdfinfo', pdf, 'fixture.pdf');
  });

  it('contains every section heading', () => {
    for (const s of view.sections) expect(squash(text), s.title).toContain(s.number ? `${s.number} ${s.title}` : s.title);
  });

  it('prints the top-event number exactly as the HTML does', () => {
    const html = renderHtml(view);
    const summary = html.slice(html.indexOf('id="tab-results-summary"'));
    const printed = /<td class="a-right">(\d\.\d\dE[-+]\d\d)<\/td>/.exec(summary)![1]!;
    expect(printed).toBe('1.08E-02');
    expect(text).toContain(printed);
    expect(text).toContain('2.72E-05');
  });

  it('names every source id', () => {
    for (const s of results.sources) expect(squash(text), s.id).toContain(s.id);
  });

  it('carries the cautions, the running header and footer, and the draft watermark', () => {
    const t = squash(text);
    expect(t).toContain('licensed professional engineer');
    expect(t).toMatch(/Rev\. B · DRAFT/);
    const pages = Number(/Pages:\s+(\d+)/.exec(info)![1]);
    expect(t).toContain(`Page ${pages} of ${pages}`);
    expect(t).toContain('DRAFT');
  });

  it('writes the fixed metadata and the paper size asked for', async () => {
    expect(info).toMatch(/CreationDate:\s+Fri Nov 20 00:00:00 2026 UTC/);
    expect(info).toMatch(/Creator:\s+faultbook 0\.1\.0/);
    expect(info).toMatch(/Page size:\s+595\.28 x 841\.89 pts \(A4\)/);
    const letter = poppler('pdfinfo', await renderPdf(buildViewModel(results, fixtureInputs(), { paper: 'letter' })), 'letter.pdf');
    expect(letter).toMatch(/Page size:\s+612 x 792 pts \(letter\)/);
  });

  it('embeds every font it uses, and uses only the Roboto faces', async () => {
    const fonts = poppler('pdffonts', await renderPdf(view), 'fonts.pdf')
      .split('\n')
      .slice(2)
      .filter((l) => l.trim() !== '');
    expect(fonts.length).toBeGreaterThanOrEqual(2);
    for (const line of fonts) {
      // Columns: name, type (two words), encoding, emb, sub, uni, object, generation.
      const cols = line.trim().split(/\s+/);
      expect(cols[0], line).toMatch(/^[A-Z]{6}\+Roboto-(Regular|Medium|Italic|MediumItalic)$/);
      expect(cols[cols.length - 5], line).toBe('yes');
    }
  });

  it('shows no watermark once the study is issued', async () => {
    const r = fixtureResults();
    r.study.status = 'issued';
    const t = poppler('pdftotext', await renderPdf(buildViewModel(r, fixtureInputs(), { paper: 'a4' })), 'issued.pdf');
    expect(t).not.toContain('DRAFT');
    expect(t).toContain('ISSUED');
  });

  it('puts the diagram labels in the PDF as text (ids and transfer references)', () => {
    for (const f of figures(view)) expect(squash(text)).toContain(`${f.number} ${f.caption.slice(0, 30)}`);
    expect(text).toContain('see figure 5.4');
    expect(text).toContain('hoist-motors-ccf');
  });
});

describe('Markdown to PDF', () => {
  it('keeps structure and shows raw HTML and link targets as text', () => {
    const content = JSON.stringify(markdownToPdf('Intro **strong** and `code-id`.\n\n- one\n- two\n\n<b>raw</b> [site](https://example.invalid)'));
    expect(content).toContain('"bold":true');
    expect(content).toContain('"style":"id"');
    expect(content).toContain('"ul"');
    expect(content).toContain('<b>raw</b>');
    expect(content).toContain(' (https://example.invalid)');
  });
});
