/**
 * The logic diagrams under hostile and huge inputs: titles full of markup characters, a chain of
 * gates thousands deep, an OR gate of thousands of inputs; and the rules that keep a figure whole,
 * put a wide one on a landscape page, and list what is beyond the drawing budget.
 */
import { execFileSync } from 'node:child_process';
import { readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import type { Results } from '../../src/analysis/results.js';
import { analyze } from '../../src/analysis/analyze.js';
import { MAX_DRAWN_PARTS, logicFigures } from '../../src/report/diagram/index.js';
import { formatProbability } from '../../src/report/format.js';
import { capacityFor } from '../../src/report/diagram/layout.js';
import { diagramModel } from '../../src/report/diagram/model.js';
import { depthOf, gatesIn, leafCount, partition, transfers } from '../../src/report/diagram/partition.js';
import { wrap } from '../../src/report/diagram/text.js';
import { buildViewModel, renderHtml, renderPdf } from '../../src/report/index.js';
import { contentBox } from '../../src/report/paper.js';
import type { Appendix, FigureBlock, TableBlock } from '../../src/report/view.js';
import { readStudy } from '../../src/study/read.js';
import { faultbook, tempDir } from '../cli/helpers.js';
import { PDFTOTEXT, XMLLINT, haveTool } from '../tools.js';
import { svgNodes } from './helpers.js';
import { MARKUP_TITLES, chainResults, writeMarkupTitleStudy } from './stress-studies.js';
import { fixtureResults } from './fixture.js';
import { wideGateResults } from './synthetic.js';

const haveXmllint = haveTool(XMLLINT, 'SVG well-formedness checks');
const havePoppler = haveTool(PDFTOTEXT, 'PDF text checks');

const dirs: string[] = [];
const scratch = () => {
  const d = tempDir('faultbook-diagram-scale-');
  dirs.push(d);
  return d;
};
afterAll(() => {
  for (const d of dirs) rmSync(d, { recursive: true, force: true });
});

function blocksOf(results: Results, paper: 'a4' | 'letter' = 'a4') {
  let f = 0;
  let t = 0;
  return logicFigures(results, paper, { nextFigure: () => `Figure 4.${++f}`, nextTable: () => `Table 4.${++t}` });
}
const figuresIn = (blocks: ReturnType<typeof blocksOf>) => blocks.filter((b): b is FigureBlock => b.kind === 'figure');
const tablesIn = (blocks: ReturnType<typeof blocksOf>) => blocks.filter((b): b is TableBlock => b.kind === 'table');

/** Every <svg> element of an HTML page, each a standalone XML document. */
function svgsOf(html: string): string[] {
  return [...html.matchAll(/<svg\b[\s\S]*?<\/svg>/g)].map((m) => m[0]);
}

/** xmllint (libxml2, an independent XML parser) on the SVGs, one document holding them all: throws if any is not well-formed. */
function assertWellFormed(svgs: string[], dir: string): void {
  const file = join(dir, `figures-${svgs.length}.xml`);
  writeFileSync(file, `<?xml version="1.0" encoding="UTF-8"?>\n<figures>${svgs.join('\n')}</figures>`);
  execFileSync(XMLLINT, ['--noout', file], { stdio: 'pipe' });
}

/** The text lines of one node's group, entities decoded (as an XML reader gets them). */
function nodeLines(svg: string, id: string): string[] {
  const group = new RegExp(`<g\\b[^>]*data-node="${id}"[^>]*>([\\s\\S]*?)</g>`).exec(svg)?.[1] ?? '';
  const decode = (s: string) => s.replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&quot;/g, '"').replace(/&amp;/g, '&');
  return [...group.matchAll(/<text\b[^>]*>([^<]*)<\/text>/g)].map((m) => decode(m[1]!));
}

describe('titles with markup characters (quotes, =, <, >, &, non-ASCII)', () => {
  it('run: exit 0, every SVG well-formed XML, each title printed as written (HTML and PDF)', async () => {
    const study = writeMarkupTitleStudy(join(scratch(), 'titles'));
    const out = join(scratch(), 'out');
    const r = await faultbook('run', study, '--out', out, '--format', 'html,pdf', '--quiet');
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const html = readFileSync(join(out, 'appendix.html'), 'utf8');
    const svgs = svgsOf(html);
    expect(svgs.length).toBeGreaterThan(2);
    if (haveXmllint) assertWellFormed(svgs, scratch());
    // The quoted part wraps across lines of the box (checked, so the case stays the hard one) …
    const wrapped = wrap(MARKUP_TITLES.first, 78, 7, 3);
    expect(wrapped.some((l) => l.endsWith('mode="automatic'))).toBe(true);
    // … and each box line is the text as wrapped, nothing rewritten (the wrap is at 84 − 6 pt, 7 pt).
    const figure = svgs.find((s) => s.includes('data-node="selector-wrong"'))!;
    const lines = nodeLines(figure, 'selector-wrong');
    for (const l of wrapped) expect(lines).toContain(l);
    const panel = nodeLines(svgs.find((s) => s.includes('data-node="panel-misreads"'))!, 'panel-misreads');
    const shown = panel.slice(1, -1).join(' ').replace(/…$/, '');
    expect(MARKUP_TITLES.second.startsWith(shown)).toBe(true);
    expect(shown).toContain("a=b & c<d>e — Ω");
    if (havePoppler) {
      const text = execFileSync(PDFTOTEXT, [join(out, 'appendix.pdf'), '-'], { encoding: 'utf8' });
      expect(text).toContain('mode="automatic');
      expect(text).toContain('c<d>e');
      expect(text).toContain('Überlauf');
    }
  });

  it('compare: exit 0 and well-formed SVG when the changed subtree carries those titles', async () => {
    const old = writeMarkupTitleStudy(join(scratch(), 'old'));
    const next = writeMarkupTitleStudy(join(scratch(), 'new'));
    const events = join(next, 'events.yaml');
    writeFileSync(events, readFileSync(events, 'utf8').replace('value: 2e-3', 'value: 5e-3'));
    writeFileSync(join(next, 'study.yaml'), readFileSync(join(next, 'study.yaml'), 'utf8').replace('revision: A', 'revision: B'));
    const out = join(scratch(), 'cmp');
    const r = await faultbook('compare', old, next, '--out', out, '--format', 'html,pdf', '--quiet');
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const html = readFileSync(join(out, readdirSync(out).find((f) => f.endsWith('.html'))!), 'utf8');
    const svgs = svgsOf(html).filter((s) => s.includes('data-node="selector-wrong"'));
    expect(svgs.length).toBeGreaterThan(0);
    if (haveXmllint) assertWellFormed(svgsOf(html), scratch());
    expect(nodeLines(svgs[0]!, 'selector-wrong').join(' ')).toContain('mode="automatic');
  });
});

describe('deep chains', () => {
  it('partitions a chain of 20,000 gates without recursion: every gate once, every figure within a page', () => {
    const model = diagramModel(chainResults(20000));
    const capacity = capacityFor('a4');
    const figs = partition(model, capacity);
    const full = figs.flatMap((f) => gatesIn(f.tree));
    expect(full.length).toBe(20000);
    expect(new Set(full).size).toBe(20000);
    const roots = new Set(figs.map((f) => f.root));
    for (const f of figs) {
      for (const t of transfers(f.tree)) expect(roots.has(t)).toBe(true);
      // A non-top figure may use the room of the top box it does not have: at most one level more.
      expect(depthOf(f.tree)).toBeLessThanOrEqual(capacity.levels + (f.tops.length > 0 ? 0 : capacity.withoutTopBox!.levels));
      expect(leafCount(f.tree)).toBeLessThanOrEqual(capacity.landscape!.columns);
    }
  });

  it('draws the upper levels of a 5,000-deep chain within the budget and lists the rest; every transfer resolves', () => {
    const blocks = blocksOf(chainResults(5000));
    const figures = figuresIn(blocks).filter((f) => f.id !== 'fig-legend');
    expect(figures.reduce((n, f) => n + f.parts.length, 0)).toBeLessThanOrEqual(MAX_DRAWN_PARTS);
    const [index, listed] = tablesIn(blocks);
    expect(index!.id).toBe('tab-transfer-index');
    expect(listed!.id).toBe('tab-logic-not-drawn');
    const anchors = new Set([...figures.map((f) => f.id), listed!.id]);
    const drawnGates = new Set<string>();
    for (const f of figures) {
      for (const n of svgNodes(f.parts[0]!.svg)) {
        if (n.kind === 'transfer') expect(anchors.has(n.target!), `${n.node} → ${n.target}`).toBe(true);
        if (n.kind === 'gate') drawnGates.add(n.node);
      }
    }
    // Every gate is drawn or listed, none both: the model stays complete on paper.
    const listedGates = listed!.rows.map((r) => r.cells[0]).filter(Boolean);
    expect(drawnGates.size + listedGates.length).toBe(5000);
    for (const g of listedGates) expect(drawnGates.has(g!)).toBe(false);
    // The index names, for every continued gate, the figure or table that has it.
    const numbers = new Set([...figures.map((f) => f.number), listed!.number]);
    for (const row of index!.rows) expect(numbers.has(row.cells[2]!), row.cells[0]).toBe(true);
    // The upper levels are the ones drawn: link-1 (the top's gate) down to some depth, contiguous.
    const linkNumbers = [...drawnGates].map((g) => Number(g.slice(5))).sort((a, b) => a - b);
    expect(linkNumbers[0]).toBe(1);
    expect(linkNumbers[linkNumbers.length - 1]).toBe(linkNumbers.length);
  });

  it('grows linearly: the diagrams of a 4,000-deep chain take about twice those of 2,000', () => {
    const size = (n: number) => JSON.stringify(blocksOf(chainResults(n))).length;
    const [a, b] = [size(2000), size(4000)];
    // Drawn figures are capped, the listed table grows with the chain: between 1× and 2.5×.
    expect(b / a).toBeGreaterThan(1);
    expect(b / a).toBeLessThan(2.5);
  });

  it('renders the diagrams of a 5,000-deep chain to HTML (well-formed SVG) and PDF', async () => {
    const view = diagramsOnly(chainResults(5000));
    const html = renderHtml(view);
    if (haveXmllint) assertWellFormed(svgsOf(html), scratch());
    const pdf = await renderPdf(view);
    expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    if (havePoppler) {
      const file = join(scratch(), 'chain.pdf');
      writeFileSync(file, pdf);
      expect(execFileSync(PDFTOTEXT, [file, '-'], { encoding: 'utf8' })).toContain('Logic not drawn');
    }
  }, 300_000);
});

/** The appendix's view model cut to its logic-diagrams section (the part these tests are about). */
function diagramsOnly(results: Results): Appendix {
  const view = buildViewModel(results, [], { paper: 'a4' });
  return { ...view, sections: view.sections.filter((s) => s.id === 'sec-diagrams') };
}

describe('wide gates', () => {
  it('output grows linearly with the number of inputs (1,000 → 2,000 → 4,000 inputs of one OR)', () => {
    const size = (n: number) => JSON.stringify(blocksOf(wideGateResults(n))).length;
    const [a, b, c] = [size(1000), size(2000), size(4000)];
    expect(b / a).toBeGreaterThan(1.6);
    expect(b / a).toBeLessThan(2.4);
    expect(c / b).toBeGreaterThan(1.6);
    expect(c / b).toBeLessThan(2.4);
  });

  it('a gate drawn in parts: each part holds a page of its inputs, so parts grow linearly (36 → 72 inputs)', () => {
    const parts = (n: number) => figuresIn(blocksOf(wideGateResults(n))).find((f) => f.id !== 'fig-legend')!;
    const [a, b] = [parts(36), parts(72)];
    const bytes = (f: FigureBlock) => f.parts.reduce((s, p) => s + p.svg.length, 0);
    expect(b.parts.length).toBeGreaterThanOrEqual(2 * a.parts.length - 1);
    expect(bytes(b) / bytes(a)).toBeGreaterThan(1.6);
    expect(bytes(b) / bytes(a)).toBeLessThan(2.4);
  });

  it('lists the inputs of a gate too wide to draw, and every input is in the list', () => {
    const blocks = blocksOf(wideGateResults(2000));
    const listed = tablesIn(blocks).find((t) => t.id === 'tab-logic-not-drawn')!;
    const ids = listed.rows.flatMap((r) => r.cells[4]!.replace(/ \(\d+–\d+ of \d+\)$/, '').split(', '));
    expect(ids).toEqual(Array.from({ length: 2000 }, (_, i) => `wide-${i + 1}`));
    // The top's figure still shows the top event over its gate, and says where the inputs are.
    const top = figuresIn(blocks).find((f) => f.id !== 'fig-legend')!;
    expect(top.parts).toHaveLength(1);
    expect(top.note).toContain(listed.number.toLowerCase());
  });

  for (const n of [2000, 10000]) {
    it(`renders the HTML of one OR of ${n.toLocaleString('en-US')} inputs, every SVG well-formed`, () => {
      const html = renderHtml(buildViewModel(wideGateResults(n), [], { paper: 'a4' }));
      expect(html).toContain(`wide-${n}`);
      if (haveXmllint) assertWellFormed(svgsOf(html), scratch());
    });
  }

  it('renders the diagrams of one OR of 10,000 inputs to PDF', async () => {
    const pdf = await renderPdf(diagramsOnly(wideGateResults(10000)));
    if (havePoppler) {
      const file = join(scratch(), 'wide.pdf');
      writeFileSync(file, pdf);
      const text = execFileSync(PDFTOTEXT, [file, '-'], { encoding: 'utf8' });
      expect(text).toContain('wide-10000');
    }
  }, 300_000);
});

describe('splitting rules', () => {
  it('keeps a tree that fits on one figure, with no transfer', () => {
    // Top OR of an OR of two events, an AND of two events, and one event: 5 columns, 3 levels.
    const r = wideGateResults(5);
    r.logic.gates = [
      { id: 'wide-or', op: 'any', inputs: ['small-or', 'small-and', 'wide-5'] },
      { id: 'small-or', op: 'any', inputs: ['wide-1', 'wide-2'] },
      { id: 'small-and', op: 'all', inputs: ['wide-3', 'wide-4'] },
    ];
    const figs = partition(diagramModel(r), capacityFor('a4'));
    expect(figs).toHaveLength(1);
    expect(transfers(figs[0]!.tree)).toEqual([]);
  });

  it('the example: an unshared subtree stays with its parent, a wide one goes on a landscape page', () => {
    const results = analyze(readStudy('example-study'));
    const figs = figuresIn(blocksOf(results));
    const holding = (gate: string) => figs.filter((f) => svgNodes(f.parts[0]!.svg).some((n) => n.node === gate && n.kind === 'gate'));
    // station-power-lost (used only by hoist-power-lost) is drawn inside its parent's figure …
    expect(holding('station-power-lost').map((f) => f.id)).toEqual(['fig-hoist-power-lost']);
    // … which is wider than a portrait page holds, so it takes a landscape one.
    const wide = figs.find((f) => f.id === 'fig-hoist-power-lost')!;
    expect(wide.landscape).toBe(true);
    expect(wide.parts[0]!.width).toBeGreaterThan(contentBox('a4').width);
    expect(wide.parts[0]!.width).toBeLessThanOrEqual(contentBox('a4', 'landscape').width);
    // Each manual-control gate stays with its control gate (a few events, unshared).
    for (const g of [1, 2, 3]) expect(holding(`gate-${g}-manual-fails`).map((f) => f.id)).toEqual([`fig-gate-${g}-fails`]);
    // A continued subtree follows the figure that refers to it.
    const order = figs.map((f) => f.id);
    expect(order.indexOf('fig-gate-1-hoist-fails')).toBe(order.indexOf('fig-gate-1-fails') + 1);
  });

  it('prints a landscape figure on a landscape PDF page, and turns back for what follows', async () => {
    if (!havePoppler) return;
    const study = 'example-study';
    const out = join(scratch(), 'example');
    const r = await faultbook('run', study, '--out', out, '--format', 'pdf', '--quiet');
    expect(r.code).toBe(0);
    const info = execFileSync('/usr/bin/pdfinfo', ['-f', '1', '-l', '200', join(out, 'appendix.pdf')], { encoding: 'utf8' });
    const sizes = [...info.matchAll(/Page\s+(\d+) size:\s+([\d.]+) x ([\d.]+)/g)].map((m) => ({ page: Number(m[1]), w: Number(m[2]), h: Number(m[3]) }));
    const landscape = sizes.filter((s) => s.w > s.h);
    expect(landscape.length).toBeGreaterThan(0);
    const text = (page: number) => execFileSync(PDFTOTEXT, ['-f', String(page), '-l', String(page), join(out, 'appendix.pdf'), '-'], { encoding: 'utf8' });
    expect(text(landscape[0]!.page)).toContain('hoist-power-lost');
    // The page after the last landscape one is portrait again.
    const after = sizes.find((s) => s.page === landscape[landscape.length - 1]!.page + 1)!;
    expect(after.h).toBeGreaterThan(after.w);
  }, 120_000);
});

describe('common-cause members in the diagrams', () => {
  it('label the total and the independent part, the same numbers the results give', () => {
    const results = analyze(readStudy('example-study'));
    const svg = figuresIn(blocksOf(results)).map((f) => f.parts.map((p) => p.svg).join('')).join('');
    const members = results.events.filter((e) => e.common_cause_role === 'independent');
    expect(members.length).toBeGreaterThan(0);
    for (const m of members) {
      const lines = nodeLines(svg, m.id);
      const fmt = (x: number) => formatProbability(x);
      expect(lines, m.id).toContain(`total P = ${fmt(m.total_probability!)}`);
      expect(lines, m.id).toContain(`independent ${fmt(m.probability)}`);
    }
  });

  it('the fixture still draws without any common-cause group', () => {
    expect(figuresIn(blocksOf(fixtureResults())).length).toBeGreaterThan(1);
  });
});
