/**
 * The example study's appendix end to end, as `npm start` makes it: every format, twice, byte for
 * byte; every source id and the headline number in the PDF text as the HTML prints it; and the HTML
 * in a real browser with no console error and no request beyond the file itself.
 */
import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { chromium } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { CHROMIUM, PDFTOTEXT, haveTool } from '../tools.js';
import { faultbook, tempDir } from './helpers.js';

describe('the example study appendix', () => {
  const a = tempDir();
  const b = tempDir();

  it('is byte-identical over two runs in every format', async () => {
    expect((await faultbook('run', 'example-study', '--out', a, '--quiet')).code).toBe(0);
    expect((await faultbook('run', 'example-study', '--out', b, '--quiet')).code).toBe(0);
    for (const f of ['results.json', 'cutsets.csv', 'appendix.html', 'appendix.pdf']) {
      expect(readFileSync(join(a, f)).equals(readFileSync(join(b, f))), f).toBe(true);
    }
  });

  it('prints in the PDF the headline number the HTML prints, and every source id', () => {
    if (!haveTool(PDFTOTEXT, 'example PDF text check')) return;
    const results = JSON.parse(readFileSync(join(a, 'results.json'), 'utf8'));
    const html = readFileSync(join(a, 'appendix.html'), 'utf8');
    const text = execFileSync(PDFTOTEXT, ['-layout', join(a, 'appendix.pdf'), '-'], { encoding: 'utf8' });
    // The report's one probability style (1.23E-04) for the exact headline value.
    const headline = results.tops[0].probability.exact.toExponential(2).toUpperCase().replace(/E([+-])(\d)$/, 'E$10$2');
    expect(html).toContain(headline);
    expect(text).toContain(headline);
    for (const s of results.sources) expect(text, s.id).toContain(s.id);
  });

  it('loads in Chromium with no console error and no request beyond the file', async () => {
    if (!haveTool(CHROMIUM, 'example browser check')) return;
    const context = await chromium.launchPersistentContext(join(tempDir(), 'profile'), {
      executablePath: CHROMIUM,
      headless: true,
      args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
    });
    try {
      const url = pathToFileURL(join(a, 'appendix.html')).href;
      const page = await context.newPage();
      const errors: string[] = [];
      const others: string[] = [];
      page.on('console', (m) => m.type() === 'error' && errors.push(m.text()));
      page.on('pageerror', (e) => errors.push(String(e)));
      page.on('request', (r) => r.url() !== url && others.push(r.url()));
      await page.goto(url, { waitUntil: 'load' });
      expect(errors).toEqual([]);
      expect(others).toEqual([]);
      expect(await page.locator('h2').count()).toBeGreaterThan(10);
    } finally {
      await context.close();
    }
  });
});
