import { createHash } from 'node:crypto';
import { readdirSync } from 'node:fs';
import { join } from 'node:path';
import Handlebars from 'handlebars';
import { TEMPLATES_DIR, FONT_FILES, fontBytes, templateText } from '../assets.js';
import { PAGES, cssPageSize } from '../paper.js';
import type { Appendix, Block, Run, TableBlock } from '../view.js';
import { markdownRenderer } from './markdown.js';

/**
 * The appendix as one self-contained HTML file: CSS, fonts (base64 data URLs) and SVG inline, one
 * hashed inline script (table sorting), and a Content-Security-Policy that forbids every request.
 *
 * Handlebars templates in templates/ do the markup: a layout and one partial per block kind. Study
 * strings reach them only as data, so `{{…}}` in a title is text; every `{{ }}` escapes, and the
 * few triple-stashes carry HTML this module built (Markdown with raw HTML off, SVG serialised by a DOM).
 */
export function renderHtml(view: Appendix): string {
  const env = environment();
  const css = stylesheet(view);
  const script = templateText('sort-table.js');
  const scriptHash = `sha256-${createHash('sha256').update(script, 'utf8').digest('base64')}`;
  const csp = [
    "default-src 'none'",
    "style-src 'unsafe-inline'",
    'font-src data:',
    'img-src data:',
    `script-src '${scriptHash}'`,
    "base-uri 'none'",
    "form-action 'none'",
  ].join('; ');
  const layout = env.compile(templateText('appendix.hbs'));
  return layout({ view, css, script, csp, tocSections: view.toc.filter((t) => t.number) });
}

type Env = typeof Handlebars;

let cached: Env | undefined;

function environment(): Env {
  if (cached) return cached;
  const env = Handlebars.create();
  const md = markdownRenderer();
  const partialsDir = join(TEMPLATES_DIR, 'partials');
  for (const file of readdirSync(partialsDir).filter((f) => f.endsWith('.hbs')).sort()) {
    env.registerPartial(file.replace(/\.hbs$/, ''), templateText(join('partials', file)));
  }
  env.registerHelper('blockPartial', (block: Block) => `block-${block.kind}`);
  env.registerHelper('markdown', (source: string) => new env.SafeString(md.render(source)));
  env.registerHelper('runs', (runs: Run[]) => new env.SafeString(runsHtml(runs, env)));
  env.registerHelper('table', (block: TableBlock) => tableModel(block));
  env.registerHelper('eq', (a: unknown, b: unknown) => a === b);
  env.registerHelper('inc', (n: number) => n + 1);
  cached = env;
  return env;
}

function runsHtml(runs: Run[], env: Env): string {
  return runs
    .map((r) => {
      let h = env.escapeExpression(r.text);
      if (r.code) h = `<code>${h}</code>`;
      if (r.em) h = `<em>${h}</em>`;
      if (r.strong) h = `<strong>${h}</strong>`;
      return h;
    })
    .join('');
}

/** Template-ready table: each cell with its column's class and its sort key. */
function tableModel(block: TableBlock) {
  const sorted = block.sortedBy;
  return {
    columns: block.columns.map((c, i) => ({
      label: c.label,
      cls: `a-${c.align}`,
      ariaSort: sorted && sorted.column === i ? (sorted.descending ? 'descending' : 'ascending') : undefined,
    })),
    rows: block.rows.map((r) => ({
      cls: r.flag ? 'flag' : '',
      cells: r.cells.map((text, i) => {
        const col = block.columns[i];
        const key = r.sortKeys?.[i];
        return {
          text,
          cls: [`a-${col?.align ?? 'left'}`, col?.code ? 'id' : ''].filter(Boolean).join(' '),
          sort: key === undefined ? undefined : String(key),
        };
      }),
    })),
  };
}

/** The stylesheet: fonts as data URLs, the paper size and running header/footer, then templates/appendix.css. */
function stylesheet(view: Appendix): string {
  const face = (file: string, weight: number, style: string) =>
    `@font-face{font-family:"Roboto";font-weight:${weight};font-style:${style};` +
    `src:url(data:font/ttf;base64,${fontBytes(file).toString('base64')}) format("truetype");}`;
  const page = PAGES[view.paper];
  const [left, top, right, bottom] = page.margins;
  const header = `${view.header.title} · Rev. ${view.header.revision} · ${view.header.status}`;
  const printPage = [
    `@page{size:${cssPageSize(view.paper)};margin:${top}pt ${right}pt ${bottom}pt ${left}pt;`,
    `@top-left{content:${cssString(header)};font:7.5pt Roboto,sans-serif;color:#4a525c;}`,
    `@bottom-right{content:"Page " counter(page) " of " counter(pages);font:7.5pt Roboto,sans-serif;color:#4a525c;}}`,
    '@page:first{@top-left{content:none;}}',
    // A logic diagram wider than a portrait page prints on a landscape one (same margins).
    `@page diagram-landscape{size:${cssPageSize(view.paper)} landscape;}`,
    '@media print{.figure-landscape{page:diagram-landscape;}}',
  ].join('');
  return [
    face(FONT_FILES.normal, 400, 'normal'),
    face(FONT_FILES.bold, 700, 'normal'),
    face(FONT_FILES.italics, 400, 'italic'),
    printPage,
    templateText('appendix.css'),
  ].join('\n');
}

/**
 * A CSS string literal. Quotes, backslashes and line breaks are escaped, and so is `<`, so the
 * text can never close the style element it sits in.
 */
export function cssString(text: string): string {
  return `"${text.replace(/[\\"<>\n\r\f]/g, (c) => `\\${c.codePointAt(0)!.toString(16)} `)}"`;
}
