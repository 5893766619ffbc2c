/**
 * Errors in a large study still point at the right file, line and column: a generated study of
 * 2,000 basic events and 200 gates (invented, numbers of no meaning) with one wrong value near the
 * end of a file. The expected place is known by construction (the line the generator wrote, the
 * column where the offending text starts on it), independent of any parser.
 */
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { StudyError, StudyErrors } from '../../src/study/errors.js';
import { readPlainYaml } from '../../src/study/plain-yaml.js';
import { readStudy } from '../../src/study/read.js';
import { MAX_EXPANDED_CHARS, MAX_TEXT_CHARS } from '../../src/study/yaml.js';
import { tempDir } from '../temp.js';

const EVENTS = 2000;
const PER_GATE = 10;

interface Written {
  dir: string;
  events: string[];
  logic: string[];
}

/** The study's files as lines; `edit` changes them before they are written. */
function writeStudy(edit: (w: Omit<Written, 'dir'>) => void): Written {
  const dir = tempDir('faultbook-large-');
  const events = ['# Invented events for a test of positions; every number is made up.', 'events:'];
  for (let i = 1; i <= EVENTS; i++) {
    // Two styles, as studies mix them: a flow mapping on one line, and block mappings.
    if (i % 2) events.push(`  e${i}: { model: fixed, probability: { value: ${(i % 97) / 1e4 + 1e-4}, source: invented } }`);
    else events.push(`  e${i}:`, '    model: fixed', `    probability: { value: 2e-3, source: invented }   # even events`);
  }
  const logic = ['tops:', '  top: { title: Any group fails (invented), gate: all-groups }', 'gates:', '  all-groups:', '    any:'];
  for (let g = 1; g <= EVENTS / PER_GATE; g++) logic.push(`      - g${g}`);
  for (let g = 1; g <= EVENTS / PER_GATE; g++) {
    const inputs = Array.from({ length: PER_GATE }, (_, k) => `e${(g - 1) * PER_GATE + k + 1}`);
    logic.push(`  g${g}: { all: [${inputs.join(', ')}] }`);
  }
  const w = { events, logic };
  edit(w);
  writeFileSync(join(dir, 'study.yaml'), 'format: faultbook/1\ntitle: Large invented study\nas_of: 2026-06-30\n');
  writeFileSync(join(dir, 'sources.yaml'), 'sources:\n  invented: { title: Invented numbers for a test, invented: true }\n');
  writeFileSync(join(dir, 'events.yaml'), `${events.join('\n')}\n`);
  writeFileSync(join(dir, 'logic.yaml'), `${logic.join('\n')}\n`);
  return { dir, ...w };
}

/** The one problem readStudy reports. */
function problem(dir: string): StudyError {
  try {
    readStudy(dir);
  } catch (err) {
    if (err instanceof StudyErrors) {
      expect(err.errors).toHaveLength(1);
      return err.errors[0]!;
    }
    if (err instanceof StudyError) return err;
    throw err;
  }
  throw new Error('the study was accepted');
}

/** Line (1-based) holding `needle`, and the column where `token` starts on it. */
function place(lines: string[], needle: string, token: string): { line: number; col: number } {
  const index = lines.findIndex((l) => l.includes(needle));
  expect(index, needle).toBeGreaterThanOrEqual(0);
  return { line: index + 1, col: lines[index]!.indexOf(token) + 1 };
}

const LIMITS = { maxDepth: 64, maxTextChars: MAX_TEXT_CHARS, maxExpandedChars: MAX_EXPANDED_CHARS };

describe('positions in a 2,000-event study', () => {
  it('reads the valid study, through the quick reader, with every gate input located', () => {
    const w = writeStudy(() => {});
    // The files take the quick path (what this test is about).
    expect(readPlainYaml('events.yaml', `${w.events.join('\n')}\n`, LIMITS)).toBeDefined();
    expect(readPlainYaml('logic.yaml', `${w.logic.join('\n')}\n`, LIMITS)).toBeDefined();
    const study = readStudy(w.dir);
    expect(study.events).toHaveLength(EVENTS);
    const last = study.gates.find((g) => g.id === `g${EVENTS / PER_GATE}`)!;
    expect(last.inputsAt?.[PER_GATE - 1]).toEqual({ file: 'logic.yaml', ...place(w.logic, `g${EVENTS / PER_GATE}:`, `e${EVENTS},`.slice(0, -1)) });
    const e1999 = study.parameters.find((p) => p.key === 'e1999.probability')!;
    expect(e1999.at).toEqual({ file: 'events.yaml', ...place(w.events, 'e1999:', '{ value') });
  });

  it('points at a probability out of its domain near the end of events.yaml', () => {
    const w = writeStudy(({ events }) => {
      const i = events.findIndex((l) => l.startsWith('  e1990:'));
      events[i + 2] = '    probability: { value: 1.5, source: invented }';
    });
    const e = problem(w.dir);
    expect(e.message).toBe("'e1990.probability' is 1.5, outside its domain");
    const p = place(w.events, 'value: 1.5', '{ value');
    expect(e.describe().split('\n')[0]).toBe(`events.yaml:${p.line}:${p.col}: ${e.message}`);
  });

  it('points at an unknown key near the end of events.yaml, at the key', () => {
    const w = writeStudy(({ events }) => {
      const i = events.findIndex((l) => l.startsWith('  e1995:'));
      events[i] = '  e1995: { modle: fixed, probability: { value: 0.001, source: invented } }';
    });
    const e = problem(w.dir);
    expect(e.message).toBe("unknown key 'modle' in 'events.e1995'");
    expect(e.at).toEqual({ file: 'events.yaml', ...place(w.events, 'e1995:', 'modle') });
  });

  it('points at a gate input that names no event, near the end of logic.yaml', () => {
    const w = writeStudy(({ logic }) => {
      const i = logic.findIndex((l) => l.startsWith('  g199:'));
      logic[i] = logic[i]!.replace('e1985', 'e1985x');
    });
    const e = problem(w.dir);
    expect(e.message).toContain("'e1985x'");
    expect(e.at).toEqual({ file: 'logic.yaml', ...place(w.logic, 'g199:', 'e1985x') });
  });
});
