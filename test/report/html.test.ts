import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { buildViewModel, renderHtml } from '../../src/report/index.js';
import { cssString } from '../../src/report/html/render.js';
import { fixtureInputs, fixtureResults } from './fixture.js';
import { HOSTILE, hostileResults } from './synthetic.js';

/** HTML character references back to characters (what a browser does to attribute values). */
function decode(text: string): string {
  return text
    .replace(/&#x([0-9a-f]+);/gi, (_m, hex: string) => String.fromCodePoint(parseInt(hex, 16)))
    .replace(/&#(\d+);/g, (_m, dec: string) => String.fromCodePoint(Number(dec)))
    .replace(/&quot;/g, '"')
    .replace(/&lt;/g, '<')
    .replace(/&gt;/g, '>')
    .replace(/&amp;/g, '&');
}

const html = renderHtml(buildViewModel(fixtureResults(), fixtureInputs(), { paper: 'a4' }));

describe('HTML appendix: one self-contained file', () => {
  it('declares a Content-Security-Policy first in <head> that allows no request at all', () => {
    const head = html.slice(html.indexOf('<head>'), html.indexOf('</head>'));
    expect(head.indexOf('http-equiv="Content-Security-Policy"')).toBeLessThan(head.indexOf('<style>'));
    const csp = decode(/http-equiv="Content-Security-Policy" content="([^"]*)"/.exec(head)![1]!);
    expect(csp).toContain("default-src 'none'");
    expect(csp).toContain('font-src data:');
    expect(csp).toContain('img-src data:');
    expect(csp).not.toMatch(/https?:|\*/);
  });

  it('hashes its one inline script into the policy (CSP level 2 sha256 source)', () => {
    const scripts = [...html.matchAll(/<script>([\s\S]*?)<\/script>/g)].map((m) => m[1]!);
    expect(scripts).toHaveLength(1);
    const hash = createHash('sha256').update(scripts[0]!, 'utf8').digest('base64');
    const csp = decode(/http-equiv="Content-Security-Policy" content="([^"]*)"/.exec(html)![1]!);
    expect(csp).toContain(`script-src 'sha256-${hash}'`);
  });

  it('inlines the fonts and refers to nothing outside itself', () => {
    expect(html.match(/@font-face\{[^}]*src:url\(data:font\/ttf;base64,/g)?.length).toBe(3);
    expect(html).not.toMatch(/<link\b|<img\b|<iframe\b|<object\b|<embed\b/);
    // No attribute or CSS url() pointing anywhere but a data: URL or an in-page anchor.
    for (const m of html.matchAll(/\b(?:src|href)="([^"]*)"/g)) expect(m[1]).toMatch(/^(#|data:)/);
    for (const m of html.matchAll(/url\(([^)]*)\)/g)) expect(m[1]).toMatch(/^data:/);
  });

  it('sets the paper size and running header and footer for print', () => {
    expect(html).toContain('@page{size:A4;');
    expect(html).toContain('counter(page) " of " counter(pages)');
    const letter = renderHtml(buildViewModel(fixtureResults(), fixtureInputs(), { paper: 'letter' }));
    expect(letter).toContain('@page{size:letter;');
  });

  it('is byte-identical from one render to the next', () => {
    const again = renderHtml(buildViewModel(fixtureResults(), fixtureInputs(), { paper: 'a4' }));
    expect(again === html).toBe(true);
  });

  it('pre-sorts the cut-set table by probability and marks that column order for readers without scripts', () => {
    const table = html.slice(html.indexOf('id="tab-cuts-spillway-short"'));
    expect(table).toMatch(/<th scope="col" class="a-right" aria-sort="ascending">Rank<\/th>/);
    const probabilities = [...table.slice(0, table.indexOf('</table>')).matchAll(/<td class="a-right" data-sort="([^"]+)">\d\.\d\dE-\d\d<\/td>/g)].map((m) => Number(m[1]));
    expect(probabilities.length).toBe(19);
    expect(probabilities).toEqual([...probabilities].sort((a, b) => b - a));
  });
});

describe('HTML appendix: study strings are text, never markup', () => {
  const hostile = renderHtml(buildViewModel(hostileResults(), fixtureInputs(), { paper: 'a4' }));

  it('escapes titles with script tags, quotes, handlebars and style breakers', () => {
    expect(hostile).not.toContain('<script>window.__pwned');
    expect(hostile).not.toContain('<img src=x');
    expect(hostile).not.toContain('<svg onload');
    expect(hostile).not.toContain('<b onclick');
    expect(hostile).toContain(
      'Gate &lt;script&gt;window.__pwned&#x3D;1&lt;/script&gt; &quot;quoted&quot; &amp; &#x27;single&#x27; {{handlebars}} {{{triple}}} &lt;/style&gt;',
    );
    // Handlebars syntax in data is not evaluated: it comes out as the characters it went in as.
    expect(hostile).toContain('{{#each x}}loop{{/each}}');
    // The study title in the print header's CSS string cannot end the style element.
    const style = hostile.slice(hostile.indexOf('<style>'), hostile.indexOf('</style>'));
    expect(style).not.toMatch(/<\/style/i);
  });

  it('renders Markdown with raw HTML shown as text, no javascript: links and no remote images', () => {
    expect(hostile).toContain('<strong>bold</strong>');
    expect(hostile).toContain('&lt;script&gt;window.__pwned=1&lt;/script&gt;');
    expect(hostile).not.toMatch(/href="javascript:/i);
    expect(hostile).not.toContain('src="https://example.invalid');
    expect(hostile).toContain('https://example.invalid/x.png'); // as visible text only
  });

  it('keeps hostile strings inside the SVG as text too', () => {
    const svgs = [...hostile.matchAll(/<svg\b[\s\S]*?<\/svg>/g)].map((m) => m[0]);
    const all = svgs.join('\n');
    expect(all).not.toContain('<svg onload');
    expect(all).not.toMatch(/<script/i);
    expect(HOSTILE.eventTitle).toContain('<svg onload');
  });
});

describe('cssString', () => {
  it('escapes quotes, backslashes, newlines and angle brackets (CSS Syntax 3, §4.3.5 string escapes)', () => {
    expect(cssString('a"b\\c\n</style>')).toBe('"a\\22 b\\5c c\\a \\3c /style\\3e "');
  });
});
