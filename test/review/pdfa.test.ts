/**
 * The appendix PDF as an archival PDF/A-2b file, read back with poppler's pdfinfo and pdffonts (an
 * independent PDF reader). What is checked is what ISO 19005-2 asks of level B that these tools can
 * see (from memory of the standard's clauses): the XMP declaration of part 2 / conformance B, every
 * font embedded, an output intent with an embedded ICC profile, Info entries mirrored in XMP (no
 * ModDate without xmp:ModifyDate), well-formed metadata, and byte-identical reruns.
 */
import { execFileSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { readFileSync, rmSync, writeFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { inflateSync } from 'node:zlib';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { haveTool } from '../tools.js';
import { faultbook, tempDir } from '../cli/helpers.js';
import { writeStudy } from './studies.js';

const PDFINFO = '/usr/bin/pdfinfo';
const PDFFONTS = '/usr/bin/pdffonts';
const ready = haveTool(PDFINFO, 'PDF/A tests (pdfinfo, poppler-utils)') && haveTool(PDFFONTS, 'PDF/A tests (pdffonts, poppler-utils)');

const made: string[] = [];
afterAll(() => {
  for (const dir of made) rmSync(dir, { recursive: true, force: true });
});

/** The study's title carries `&` and `<`, which the metadata must keep well-formed. */
const TITLE = 'Gate & hoist <north> study (invented)';

describe.runIf(ready)('appendix.pdf as PDF/A-2b', () => {
  let pdf = '';
  let bytes = Buffer.alloc(0);
  let study = '';

  beforeAll(async () => {
    study = writeStudy();
    made.push(dirname(study));
    const yaml = readFileSync(join(study, 'study.yaml'), 'utf8').replace('title: Little Fen sluice gate study (invented)', `title: "${TITLE}"`);
    writeFileSync(join(study, 'study.yaml'), yaml);
    const out = tempDir('faultbook-pdfa-');
    made.push(out);
    const r = await faultbook('run', study, '--out', out, '--format', 'html,pdf');
    expect(r.code).toBe(0);
    pdf = join(out, 'appendix.pdf');
    bytes = readFileSync(pdf);
  });

  it('declares PDF/A part 2, conformance B in its XMP metadata, and the metadata is well-formed', () => {
    const xmp = execFileSync(PDFINFO, ['-meta', pdf], { encoding: 'utf8' });
    expect(xmp).toContain('<pdfaid:part>2</pdfaid:part>');
    expect(xmp).toContain('<pdfaid:conformance>B</pdfaid:conformance>');
    expect(xmp.trimStart().startsWith('<?xpacket begin=')).toBe(true);
    // XML 1.0: a bare `&` or a `<` that starts no tag makes the packet ill-formed.
    expect(xmp).not.toMatch(/&(?!(amp|lt|gt|quot|apos|#\d+|#x[0-9a-fA-F]+);)/);
    expect(xmp).not.toMatch(/<(?![?/!A-Za-z])/);
    expect(xmp).toContain('Gate ＆ hoist ＜north＞ study (invented)');
  });

  it('mirrors the Info entries in XMP: same title and creation date, no ModDate', () => {
    const info = execFileSync(PDFINFO, ['-isodates', pdf], { encoding: 'utf8' });
    expect(info).toMatch(/^PDF version:\s+1\.7$/m);
    expect(info).toMatch(/^Title:\s+Gate ＆ hoist ＜north＞ study \(invented\)/m);
    expect(info).not.toMatch(/^ModDate:/m);
    const created = /^CreationDate:\s+(\S+)/m.exec(info)?.[1];
    const xmp = execFileSync(PDFINFO, ['-meta', pdf], { encoding: 'utf8' });
    // The study's issued date (2026-02-01) in both places, never the clock.
    expect(created).toBe('2026-02-01T00:00:00Z');
    expect(xmp).toContain('<xmp:CreateDate>2026-02-01T00:00:00Z</xmp:CreateDate>');
  });

  it('embeds every font (pdffonts lists each with emb = yes)', () => {
    const rows = execFileSync(PDFFONTS, [pdf], { encoding: 'utf8' }).trim().split('\n').slice(2);
    expect(rows.length).toBeGreaterThan(0);
    for (const row of rows) {
      // Columns: name, type (may hold spaces), encoding, emb, sub, uni, object, generation.
      const cols = row.trim().split(/\s+/);
      expect(cols[cols.length - 5], row).toBe('yes');
    }
  });

  it('has a PDF/A output intent whose embedded ICC profile is an RGB display profile, the same bytes every run', () => {
    const text = bytes.toString('latin1');
    const intent = /\/Type \/OutputIntent\s*\/S \/GTS_PDFA1[\s\S]*?\/DestOutputProfile (\d+) 0 R/.exec(text);
    expect(intent).not.toBeNull();
    const profile = streamOf(bytes, Number(intent![1]));
    // ICC.1 header (from memory of ICC.1:2010 §7.2): device class at 12, colour space at 16, 'acsp' at 36.
    expect(profile.toString('latin1', 12, 16)).toBe('mntr');
    expect(profile.toString('latin1', 16, 20)).toBe('RGB ');
    expect(profile.toString('latin1', 36, 40)).toBe('acsp');
    // It is the sRGB profile shipped inside the PDF library pdfmake uses.
    const require = createRequire(import.meta.url);
    const pdfkitDir = dirname(require.resolve('pdfkit/package.json', { paths: [dirname(require.resolve('pdfmake/package.json'))] }));
    expect(profile.equals(readFileSync(join(pdfkitDir, 'js', 'data', 'sRGB_IEC61966_2_1.icc')))).toBe(true);
    // Unaltered: its profile ID (bytes 84–99) is the MD5 of the profile with the flags, rendering
    // intent and profile ID fields zeroed (ICC.1:2010 §7.2.18, from memory).
    const zeroed = Buffer.from(profile);
    zeroed.fill(0, 44, 48).fill(0, 64, 68).fill(0, 84, 100);
    expect(createHash('md5').update(zeroed).digest('hex')).toBe(profile.toString('hex', 84, 100));
    expect(profile.toString('latin1')).toContain('sRGB');
  });

  it('is tagged, and its structure tree holds the section headings, the tables with header cells, and the figures with their captions as alternative text', () => {
    const info = execFileSync(PDFINFO, [pdf], { encoding: 'utf8' });
    expect(info).toMatch(/^Tagged:\s+yes$/m);
    const tree = execFileSync(PDFINFO, ['-struct-text', pdf], { encoding: 'utf8' });
    const lines = tree.split('\n');
    const textAfter = (i: number) => lines.slice(i + 1).find((l) => l.trim().startsWith('"'))?.trim().replace(/^"|"$/g, '') ?? '';
    // Every numbered section heading of the HTML appendix (made from the same view) is an H2 of the
    // PDF's structure, in the same order.
    const html = readFileSync(join(dirname(pdf), 'appendix.html'), 'utf8');
    const htmlHeadings = [...html.matchAll(/<h2><span class="num">(\d+)<\/span>([^<]*)<\/h2>/g)].map((m) => `${m[1]} ${m[2]}`);
    expect(htmlHeadings.length).toBeGreaterThan(3);
    const h2 = lines.flatMap((l, i) => (/^\s*H2\b/.test(l) ? [textAfter(i)] : []));
    const sectionHeadings = h2.filter((t) => /^\d+\s/.test(t)).map((t) => t.replace(/\s+/g, ' '));
    expect(sectionHeadings).toEqual(htmlHeadings.map((t) => t.replace(/&amp;/g, '&')));
    // Tables: a header row of TH cells scoped to their columns, then rows of TD.
    expect(tree).toMatch(/Table \(block\)\n +TR\n +TH:\n +\/Scope \/(Column|Row)/);
    expect(tree).toContain('"Top event"');
    expect(lines.filter((l) => /^\s*TD\b/.test(l)).length).toBeGreaterThan(10);
    // Figures carry their caption as /Alt (read from the file: pdfinfo does not print it).
    // Literal strings, ASCII or UTF-16BE with its byte-order mark (PDF 1.7 §7.9.2.2).
    const alts = [...bytes.toString('latin1').matchAll(/\/S \/Figure\s*\/Alt \(((?:[^()\\]|\\.)*)\)/g)].map((m) => {
      const raw = Buffer.from(m[1]!.replace(/\\(.)/g, '$1'), 'latin1');
      return raw[0] === 0xfe && raw[1] === 0xff ? raw.subarray(2).swap16().toString('utf16le') : raw.toString('latin1');
    });
    expect(alts.length).toBeGreaterThan(0);
    for (const alt of alts) expect(alt).toMatch(/^Figure \d/);
    // Page furniture (running header and footer) is an artifact, not text of the structure.
    expect(tree).not.toContain('Page 2 of');
    expect(execFileSync('pdftotext', [pdf, '-'], { encoding: 'utf8' })).toContain('Page 2 of');
  });

  it('is byte-identical when rendered again', async () => {
    const out = tempDir('faultbook-pdfa-');
    made.push(out);
    const again = await faultbook('run', study, '--out', out, '--format', 'pdf');
    expect(again.code).toBe(0);
    expect(readFileSync(join(out, 'appendix.pdf')).equals(bytes)).toBe(true);
  });
});

/** The decoded stream of object `id` (Flate or plain). */
function streamOf(pdf: Buffer, id: number): Buffer {
  const text = pdf.toString('latin1');
  const at = text.indexOf(`\n${id} 0 obj`);
  if (at < 0) throw new Error(`object ${id} not found`);
  const dict = text.slice(at, text.indexOf('stream', at));
  const start = text.indexOf('stream', at) + 'stream'.length + 1;
  const length = Number(/\/Length (\d+)/.exec(dict)?.[1]);
  const raw = pdf.subarray(start, start + length);
  return /\/FlateDecode/.test(dict) ? inflateSync(raw) : raw;
}
