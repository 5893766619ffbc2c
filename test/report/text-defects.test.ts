/**
 * The class of text defect a reviewer notices and a number check never will: "1 sources",
 * "(invented) (invented)", "X exactly against X", a footnote about flagged rows when no row is
 * flagged, the same sentence twice, method text that speaks of one study's equipment in every study.
 * A checker runs over the whole appendix text of several studies (the example, the report fixture,
 * a synthetic hostile one and a small two-gate study written here) rather than over known instances.
 * Common practice of technical editing, no source.
 */
import { readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { analyze } from '../../src/analysis/analyze.js';
import type { Results } from '../../src/analysis/results.js';
import { buildViewModel } from '../../src/report/index.js';
import type { Appendix, Block, Run } from '../../src/report/view.js';
import { readStudy } from '../../src/study/read.js';
import { writeStudy } from '../analysis/helpers.js';
import { faultbook, tempDir } from '../cli/helpers.js';
import { fixtureInputs, fixtureResults } from './fixture.js';
import { hostileResults } from './synthetic.js';

/** Singular nouns that end in s: "1 analysis" is right. */
const SINGULAR_S = new Set(['analysis', 'basis', 'class', 'process', 'series', 'axis', 'status', 'loss', 'pass', 'bus', 'gas', 'yes', 'this', 'its', 'is', 'was', 'has', 'as']);

interface Piece {
  where: string;
  text: string;
}

/** Every piece of prose the appendix writes: paragraphs and callouts (code runs blanked), captions, notes, cells. */
function pieces(view: Appendix): Piece[] {
  const out: Piece[] = [];
  const prose = (runs: Run[]) => runs.map((r) => (r.code ? '‹id›' : r.text)).join('');
  for (const s of view.sections) {
    s.blocks.forEach((b: Block, i) => {
      const where = `${s.id} block ${i}`;
      if (b.kind === 'text') out.push({ where, text: prose(b.runs) });
      if (b.kind === 'callout') b.paragraphs.forEach((p, k) => out.push({ where: `${where} ¶${k}`, text: prose(p) }));
      if (b.kind === 'table') {
        out.push({ where: `${where} caption`, text: b.caption });
        if (b.note) out.push({ where: `${where} note`, text: b.note });
        b.rows.forEach((r, k) => r.cells.forEach((c, j) => out.push({ where: `${where} row ${k} cell ${j}`, text: c })));
      }
      if (b.kind === 'figure') out.push({ where: `${where} caption`, text: `${b.caption} ${b.note ?? ''}` });
      if (b.kind === 'keyvalue') b.items.forEach((it) => out.push({ where: `${where} ${it.key}`, text: it.value }));
    });
  }
  return out;
}

function sentences(text: string): string[] {
  return text.split(/(?<=[.!?])\s+/).map((s) => s.trim()).filter((s) => s.length >= 25);
}

/** Every defect found, as "where: what". */
export function textDefects(view: Appendix): string[] {
  const found: string[] = [];
  for (const { where, text } of pieces(view)) {
    const doubled = /\b([A-Za-z]{2,})\s+\1\b/i.exec(text);
    if (doubled && !/^(that|had)$/i.test(doubled[1]!)) found.push(`${where}: repeated word "${doubled[0]}"`);
    const paren = /(\([^()]{3,}\))\s*\1/.exec(text);
    if (paren) found.push(`${where}: repeated "${paren[1]}"`);
    // "Gate 1 fails" names gate 1; "cites 1 sources" counts one.
    for (const m of text.matchAll(/(?<![\d.,E-]|[A-Z][\w-]* )\b1 ([a-z]+s)\b/g)) {
      if (!SINGULAR_S.has(m[1]!)) found.push(`${where}: "1 ${m[1]}"`);
    }
    const verb = /(?<![\d.,E-]|[A-Z][\w-]* )\b1 [a-z]+ (differ|are|were|have|cite)\b/.exec(text);
    if (verb) found.push(`${where}: plural verb after one: "${verb[0]}"`);
    const same = /(\d[\d.]*(?:E[-+]\d+)?%?)(?: exactly)? against \1(?![\dE]|\.\d)/.exec(text);
    if (same) found.push(`${where}: "${same[0]}" when nothing differs`);
    const seen = new Set<string>();
    for (const s of sentences(text)) {
      if (seen.has(s)) found.push(`${where}: the same sentence twice: "${s}"`);
      seen.add(s);
    }
    if (/\{\}/.test(text)) found.push(`${where}: unresolved cross-reference`);
  }
  for (const s of view.sections) {
    for (const b of s.blocks) {
      if (b.kind === 'table' && b.note && /flagged rows/i.test(b.note) && !b.rows.some((r) => r.flag)) {
        found.push(`${s.id} ${b.id}: a note about flagged rows, and no row is flagged`);
      }
    }
  }
  // The same sentence in two places of one section's prose (e.g. a closing note per member).
  for (const s of view.sections) {
    const seen = new Map<string, number>();
    s.blocks.forEach((b, i) => {
      if (b.kind !== 'callout' && b.kind !== 'text') return;
      const text = b.kind === 'text' ? b.runs.map((r) => r.text).join('') : b.paragraphs.map((p) => p.map((r) => r.text).join('')).join(' ');
      for (const sentence of sentences(text)) {
        const before = seen.get(sentence);
        if (before !== undefined && before !== i) found.push(`${s.id}: the same sentence in blocks ${before} and ${i}: "${sentence}"`);
        seen.set(sentence, i);
      }
    });
  }
  return found;
}

/**
 * Words of the example's equipment that the report's own method text must never use: the methods
 * annex and each section's opening paragraph are the same for every study.
 */
const EXAMPLE_EQUIPMENT = /\b(hoists?|motors?|brakes?|ropes?|spillways?|floods?|operators?|controllers?)\b/i;

function methodTextDefects(view: Appendix): string[] {
  const found: string[] = [];
  const prose = (runs: Run[]) => runs.filter((r) => !r.code).map((r) => r.text).join('');
  for (const s of view.sections) {
    const blocks = s.id === 'sec-methods' ? s.blocks : s.blocks.slice(0, 1);
    for (const b of blocks) {
      if (b.kind !== 'text') continue;
      const m = EXAMPLE_EQUIPMENT.exec(prose(b.runs));
      if (m) found.push(`${s.id}: method text speaks of "${m[0]}"`);
    }
  }
  return found;
}

/** A small invented study with two pumps (not gates), a shared cause and a count of two. */
function twoPumpStudy(): Results {
  const dir = writeStudy({
    logic: [
      'tops:',
      '  both-pumps-fail:',
      '    title: Both fire pumps fail to deliver (invented)',
      '    gate: both-fail',
      'gates:',
      '  both-fail: { title: Both pumps fail, all: [pump-a-fails, pump-b-fails] }',
      '  pump-a-fails: { title: Pump A fails, any: [pump-a-motor, pump-a-valve, supply-lost] }',
      '  pump-b-fails: { title: Pump B fails, any: [pump-b-motor, pump-b-valve, supply-lost] }',
      'common_cause:',
      '  pump-motors:',
      '    title: Pump motors fail from one shared cause',
      '    members: [pump-a-motor, pump-b-motor]',
      '    method: beta',
      '    beta: { value: 0.1, source: test-data }',
      'counts:',
      '  pumps-failing:',
      '    title: Pumps that fail to deliver',
      '    of: [pump-a-fails, pump-b-fails]',
      '',
    ].join('\n'),
    events: [
      'events:',
      '  pump-a-motor: { title: Pump A motor fails, model: fixed, probability: { value: 0.01, source: test-data } }',
      '  pump-b-motor: { title: Pump B motor fails, model: fixed, probability: { value: 0.01, source: test-data } }',
      '  pump-a-valve: { title: Pump A valve stuck, model: fixed, probability: { value: 0.002, source: test-data } }',
      '  pump-b-valve: { title: Pump B valve stuck, model: fixed, probability: { value: 0.002, source: test-data } }',
      '  supply-lost: { title: Water supply lost, model: rate, rate: { value: 1e-4 /h, source: test-data }, exposure: { value: 24 h, source: test-data } }',
      '',
    ].join('\n'),
  });
  try {
    return analyze(readStudy(dir));
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

describe('text defects across studies', () => {
  const out = tempDir('faultbook-defects-');
  let example: Results;
  beforeAll(async () => {
    expect((await faultbook('run', 'example-study', '--out', out, '--quiet', '--format', 'json')).code).toBe(0);
    example = JSON.parse(readFileSync(join(out, 'results.json'), 'utf8')) as Results;
  }, 120_000);
  afterAll(() => rmSync(out, { recursive: true, force: true }));

  const views = (): [string, Appendix][] => [
    ['example study', buildViewModel(example, [], { paper: 'a4' })],
    ['report fixture', buildViewModel(fixtureResults(), fixtureInputs(), { paper: 'a4' })],
    ['hostile fixture', buildViewModel(hostileResults(), [], { paper: 'a4' })],
    ['two-pump study', buildViewModel(twoPumpStudy(), [], { paper: 'a4' })],
  ];

  it('finds none of the defect class in any of them', () => {
    for (const [name, v] of views()) expect(textDefects(v), name).toEqual([]);
  });

  it('keeps the method text free of the example’s equipment in every study', () => {
    for (const [name, v] of views()) expect(methodTextDefects(v), name).toEqual([]);
  });

  it('says the two-of-two figure once, and the count’s numbers in the units written', () => {
    const v = buildViewModel(twoPumpStudy(), [], { paper: 'a4' });
    const counts = v.sections.find((s) => s.id === 'sec-gate-counts')!;
    const closing = counts.blocks.find((b) => b.kind === 'callout')!;
    const text = closing.kind === 'callout' ? closing.paragraphs.map((p) => p.map((r) => r.text).join('')).join(' ') : '';
    expect(text.match(/All 2 fail/g)).toHaveLength(1);
    expect(text).not.toMatch(/At least 2 of 2/);
    const events = v.sections.find((s) => s.id === 'sec-events')!;
    const table = events.blocks.find((b) => b.kind === 'table');
    const row = table && table.kind === 'table' ? table.rows.find((r) => r.cells[0] === 'supply-lost')! : undefined;
    expect(row!.cells[3]).toBe('rate 1e-4 /h; exposure 24 h');
  });

  it('catches each kind of defect when it is there (the checker can fail)', () => {
    const v = buildViewModel(fixtureResults(), fixtureInputs(), { paper: 'a4' });
    const planted = JSON.parse(JSON.stringify(v)) as Appendix;
    const s = planted.sections.find((x) => x.id === 'sec-scope')!;
    s.blocks.push(
      { kind: 'text', runs: [{ text: 'The study cites 1 sources. 1 number differ here. Survey (invented) (invented). It gives 1.40E-03 exactly against 1.40E-03.' }] },
      { kind: 'text', runs: [{ text: 'A long enough sentence that is said twice here. A long enough sentence that is said twice here.' }] },
      { kind: 'table', id: 't', number: '', caption: 'c', columns: [{ label: 'a', align: 'left' }], rows: [{ cells: ['x'] }], note: 'Flagged rows use a number that cites no source.' },
      { kind: 'text', runs: [{ text: 'Reading the the plots.' }] },
    );
    const defects = textDefects(planted).join('\n');
    expect(defects).toMatch(/"1 sources"/);
    expect(defects).toMatch(/plural verb after one/);
    expect(defects).toMatch(/repeated "\(invented\)"/);
    expect(defects).toMatch(/when nothing differs/);
    expect(defects).toMatch(/the same sentence twice/);
    expect(defects).toMatch(/no row is flagged/);
    expect(defects).toMatch(/repeated word "the the"/);
    const methods = JSON.parse(JSON.stringify(v)) as Appendix;
    methods.sections.find((x) => x.id === 'sec-methods')!.blocks.push({ kind: 'text', runs: [{ text: 'The hoist motors, for example.' }] });
    expect(methodTextDefects(methods)).toEqual(['sec-methods: method text speaks of "hoist"']);
  });
});
