/**
 * The diagrams section of a comparison stays bounded on a study of many like trains: a change to
 * one shared parameter marks every train that reads it, and without a budget each train was drawn
 * on its own page. The checks are invariants of the rule the section states (no external source:
 * common practice for a reviewer's document, no source): every changed subtree is either drawn or
 * listed, never both; the drawings fit the stated budget; the structural change comes first.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { compareStudies } from '../../src/review/compare.js';
import { revisionName } from '../../src/review/describe.js';
import { MAX_COMPARE_PARTS } from '../../src/review/report/diagrams.js';
import { buildComparisonView } from '../../src/review/report/view.js';
import type { FigureBlock, TableBlock } from '../../src/report/view.js';
import { readStudy } from '../../src/study/read.js';
import { tempDir } from '../temp.js';

const TRAINS = 60;

/** An invented sluice with TRAINS like gate trains; each reads the shared `seal` class. */
function writeTrains(revision: string, sealValue: number, rewireLast: boolean): string {
  const dir = join(tempDir('faultbook-cmp-diagrams-'), `rev-${revision}`);
  mkdirSync(dir, { recursive: true });
  writeFileSync(
    join(dir, 'study.yaml'),
    `# INVENTED test study.\nformat: faultbook/1\ntitle: Many-train sluice (invented)\nfacility: none (invented)\nrevision: ${revision}\nstatus: draft\nas_of: 2026-01-01\nsettings: { samples: 0, horizon: 0 }\n`,
  );
  writeFileSync(join(dir, 'sources.yaml'), 'sources:\n  notes: { title: Invented test values, invented: true }\n');
  const events = ['classes:', `  seal: { model: fixed, probability: { value: ${sealValue}, source: notes } }`, 'events:'];
  const gates = ['tops:', '  all-lost: { title: Every train lost (invented), gate: trains-lost }', 'gates:'];
  const trainIds: string[] = [];
  for (let i = 1; i <= TRAINS; i++) {
    events.push(`  t${i}-seal: { class: seal }`, `  t${i}-drive: { model: fixed, probability: { value: 0.01, source: notes } }`);
    const inputs = rewireLast && i === TRAINS ? `[t${i}-seal]` : `[t${i}-seal, t${i}-drive]`;
    gates.push(`  t${i}-lost: { any: ${inputs} }`);
    trainIds.push(`t${i}-lost`);
  }
  gates.splice(3, 0, `  trains-lost: { atleast: 2, of: [${trainIds.join(', ')}] }`);
  writeFileSync(join(dir, 'events.yaml'), `${events.join('\n')}\n`);
  writeFileSync(join(dir, 'logic.yaml'), `${gates.join('\n')}\n`);
  return dir;
}

describe('compare: the diagrams of many changed subtrees', () => {
  const { comparison, oldResults, newResults } = compareStudies(readStudy(writeTrains('A', 1e-3, false)), readStudy(writeTrains('B', 2e-3, true)));
  const view = buildComparisonView(comparison, oldResults, newResults, 'a4');
  const section = view.sections.find((s) => s.id === 'sec-cmp-diagrams')!;
  const figures = section.blocks.filter((b): b is FigureBlock => b.kind === 'figure');
  const listTable = section.blocks.find((b): b is TableBlock => b.kind === 'table' && b.id === 'tab-cmp-not-drawn');

  it('draws within the budget and lists the rest', () => {
    const subtreeParts = figures.filter((f) => f.id !== 'fig-compare-legend').reduce((n, f) => n + f.parts.length, 0);
    expect(subtreeParts).toBeGreaterThan(0);
    expect(subtreeParts).toBeLessThanOrEqual(MAX_COMPARE_PARTS);
    expect(listTable).toBeDefined();
  });

  it('accounts for every changed train exactly once, drawn or listed', () => {
    const drawn = figures.filter((f) => f.caption.startsWith('Changed subtree ')).map((f) => /^Changed subtree (\S+),/.exec(f.caption)![1]!);
    const listed = listTable!.rows.map((r) => r.cells[0]!);
    const all = [...drawn, ...listed].sort();
    const expected = Array.from({ length: TRAINS }, (_, i) => `t${i + 1}-lost`).sort();
    expect(all).toEqual(expected);
    expect(new Set(all).size).toBe(all.length);
  });

  it('draws the re-wired train first, though it is last in study order', () => {
    const first = figures.find((f) => f.caption.startsWith('Changed subtree '))!;
    expect(first.caption).toContain(`t${TRAINS}-lost`);
    expect(first.note).toContain(`[RE-WIRED] t${TRAINS}-lost`);
  });
});

describe('compare: naming the two revisions', () => {
  it('uses the names when they differ, and old/new when they do not or are missing', () => {
    expect(revisionName({ old: { revision: 'A' }, new: { revision: 'B' } }, 'old')).toBe('revision A');
    expect(revisionName({ old: { revision: 'B' }, new: { revision: 'B' } }, 'new')).toBe('new revision B');
    expect(revisionName({ old: { revision: '' }, new: { revision: '' } }, 'old')).toBe('old revision');
  });
});
