import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildViewModel, renderHtml } from '../../src/report/index.js';
import { fixtureInputs, fixtureResults } from './fixture.js';
import { CHROMIUM } from './helpers.js';
import { haveTool } from '../tools.js';
import { HOSTILE, hostileResults } from './synthetic.js';

const haveBrowser = haveTool(CHROMIUM, 'browser tests');

/** Width and height from a PNG's IHDR chunk (PNG specification, ISO/IEC 15948, §11.2.2). */
function pngSize(png: Buffer): { width: number; height: number } {
  expect(png.subarray(1, 4).toString('latin1')).toBe('PNG');
  return { width: png.readUInt32BE(16), height: png.readUInt32BE(20) };
}

interface Loaded {
  page: Page;
  errors: string[];
  /** Every request except the appendix file itself. */
  others: string[];
}

describe.skipIf(!haveBrowser)('HTML appendix in a real browser (Chromium)', () => {
  let dir: string;
  let context: BrowserContext;

  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), 'faultbook-report-'));
    context = await chromium.launchPersistentContext(join(dir, 'profile'), {
      executablePath: CHROMIUM,
      headless: true,
      viewport: { width: 1200, height: 900 },
      deviceScaleFactor: 1,
      args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
    });
  });

  afterAll(async () => {
    await context?.close();
    if (dir) rmSync(dir, { recursive: true, force: true });
  });

  async function load(name: string, html: string): Promise<Loaded> {
    const file = join(dir, name);
    writeFileSync(file, html);
    const url = pathToFileURL(file).href;
    const page = await context.newPage();
    const errors: string[] = [];
    const others: string[] = [];
    page.on('console', (m) => {
      if (m.type() === 'error') errors.push(m.text());
    });
    page.on('pageerror', (e) => errors.push(String(e)));
    page.on('request', (r) => {
      if (r.url() !== url) others.push(r.url());
    });
    await page.goto(url, { waitUntil: 'load' });
    return { page, errors, others };
  }

  it('loads with no console error and no request beyond the file itself', async () => {
    const { page, errors, others } = await load('appendix.html', renderHtml(buildViewModel(fixtureResults(), fixtureInputs(), { paper: 'a4' })));
    expect(errors).toEqual([]);
    expect(others).toEqual([]);
    // The embedded font is the one in use (document.fonts lists the @font-face faces, all loaded from data URLs).
    const fonts = await page.evaluate(async () => {
      await document.fonts.ready;
      return [...document.fonts].map((f) => `${f.family} ${f.weight} ${f.style} ${f.status}`);
    });
    expect(fonts).toContain('Roboto 400 normal loaded');
    await page.close();
  });

  it('sorts the cut-set table when a column heading is clicked', async () => {
    const { page } = await load('sort.html', renderHtml(buildViewModel(fixtureResults(), fixtureInputs(), { paper: 'a4' })));
    const table = page.locator('#tab-cuts-spillway-short table');
    const column = (i: number) => table.locator(`tbody tr td:nth-child(${i})`).allTextContents();
    // As printed: by probability, most probable first.
    expect((await column(4))[0]).toBe('7.46E-03');
    const probability = table.locator('thead th', { hasText: 'Probability' });
    await probability.locator('button').click();
    expect(await probability.getAttribute('aria-sort')).toBe('ascending');
    const ascending = await column(4);
    expect(ascending[0]).toBe('6.72E-08');
    expect(ascending[ascending.length - 1]).toBe('7.46E-03');
    await probability.locator('button').click();
    expect(await probability.getAttribute('aria-sort')).toBe('descending');
    expect((await column(4))[0]).toBe('7.46E-03');
    // Text columns sort as text.
    await table.locator('thead th', { hasText: 'Basic events' }).locator('button').click();
    const names = await column(2);
    expect(names).toEqual([...names].sort((a, b) => (a.toLowerCase() < b.toLowerCase() ? -1 : a.toLowerCase() > b.toLowerCase() ? 1 : 0)));
    await page.close();
  });

  it('takes a screenshot of the size asked for, and a full-page one as tall as the document', async () => {
    const { page } = await load('shot.html', renderHtml(buildViewModel(fixtureResults(), fixtureInputs(), { paper: 'letter' })));
    expect(pngSize(await page.screenshot())).toEqual({ width: 1200, height: 900 });
    const height = await page.evaluate(() => document.documentElement.scrollHeight);
    const full = pngSize(await page.screenshot({ fullPage: true }));
    expect(full.width).toBe(1200);
    expect(full.height).toBe(height);
    expect(height).toBeGreaterThan(5000);
    await page.close();
  });

  it('shows hostile study strings as text in the DOM and runs none of them', async () => {
    const { page, errors, others } = await load('hostile.html', renderHtml(buildViewModel(hostileResults(), fixtureInputs(), { paper: 'a4' })));
    expect(errors).toEqual([]);
    expect(others).toEqual([]);
    const dom = await page.evaluate(() => ({
      pwned: (window as unknown as { __pwned?: number }).__pwned,
      scripts: document.querySelectorAll('script').length,
      images: document.querySelectorAll('img').length,
      bold: document.querySelectorAll('b').length,
      javascriptLinks: [...document.querySelectorAll('a')].filter((a) => a.getAttribute('href')?.toLowerCase().startsWith('javascript')).length,
      coverTitle: document.querySelector('.cover-title')!.textContent,
      facility: document.querySelector('.cover-facility')!.textContent,
      title: document.title,
      gateText: [...document.querySelectorAll('g[data-node="spillway-short-any"][data-kind="gate"] text')].map((t) => t.textContent).join(' '),
      sourceCell: [...document.querySelectorAll('#tab-sources td')].map((td) => td.textContent).find((t) => t?.includes('</td>')),
    }));
    expect(dom.pwned).toBeUndefined();
    expect(dom.scripts).toBe(1);
    expect(dom.images).toBe(0);
    expect(dom.bold).toBe(0);
    expect(dom.javascriptLinks).toBe(0);
    expect(dom.coverTitle).toBe(HOSTILE.title);
    expect(dom.facility).toBe(HOSTILE.facility);
    expect(dom.title).toContain(HOSTILE.title);
    expect(dom.gateText).toContain('<svg onload="window.__');
    expect(dom.sourceCell).toBe(`${HOSTILE.sourceTitle} (invented)`);
    await page.close();
  });
});
