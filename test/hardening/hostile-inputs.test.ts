/**
 * Hostile and huge inputs (issue "bounded under hostile and huge inputs"): each case ends with exit 0
 * and correct output, or exit 2 with a located message — never a crash — and the memory-hungry ones
 * run in a child process under a small heap, so an unbounded case fails here instead of passing
 * slowly. Studies are made by hostile-studies.ts from the corpus's invented valid study.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, lstatSync, mkdirSync, readFileSync, readdirSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { nodeOutputFs, writeOutputs } from '../../src/cli/outputs.js';
import { escapeForTerminal } from '../../src/cli/terminal.js';
import { describeCycle } from '../../src/study/check-logic.js';
import { breakLongWords, LONG_WORD } from '../../src/report/pdf/long-words.js';
import { csvTextCell } from '../../src/report/cutsets-csv.js';
import { faultbook, tempDir } from '../cli/helpers.js';
import { expectNoStackTrace } from './harness.js';
import { HOSTILE_CASES, validCopy } from './hostile-studies.js';

const made: string[] = [];
afterAll(() => {
  for (const dir of made) rmSync(dir, { recursive: true, force: true });
});
function study(name: keyof typeof HOSTILE_CASES | null): string {
  const s = validCopy();
  made.push(dirname(s));
  if (name) HOSTILE_CASES[name]!(s);
  return s;
}
function temp(): string {
  const d = tempDir('faultbook-hostile-');
  made.push(d);
  return d;
}

/** The command from the sources in a child process with a small heap (bounded memory, or exit 134). */
function child(args: string[], heapMb = 512): { code: number | null; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, [`--max-old-space-size=${heapMb}`, '--import', 'tsx', join('test', 'hardening', 'cli-entry.ts'), ...args], {
    encoding: 'utf8',
    timeout: 240_000,
  });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

const PDFTOTEXT = spawnSync('pdftotext', ['-v']).error === undefined;

describe('cut sets beyond the cap', () => {
  it('four trains of 100 parts (10^8 cut sets): run and verify finish in a 512 MB heap, with the cap reported', () => {
    const s = study('four-trains');
    const out = join(dirname(s), 'out');
    const r = child(['run', s, '--out', out, '--format', 'json,csv,html', '--quiet']);
    expect(r.stderr).toContain('[cut-sets-capped]');
    expect(r.code).toBe(0);
    const results = JSON.parse(readFileSync(join(out, 'results.json'), 'utf8'));
    const top = results.tops[0];
    const p = 2e-3;
    // Independent trains in parallel, each a series of 100 parts (common practice, no source):
    // P = (1 − (1 − p)^100)^4.
    expect(top.probability.exact).toBeCloseTo((1 - (1 - p) ** 100) ** 4, 15);
    expect(top.cut_set_summary.listed).toBe(10_000);
    expect(top.cut_set_summary.max_cut_sets).toBe(10_000);
    // The minimal cut sets are one part of each train: 100^4, each p^4 (common practice, no source).
    expect(top.cut_set_summary.capped).toBe(1e8 - 1e4);
    expect(top.cut_set_summary.capped_probability).toBeCloseTo((1e8 - 1e4) * p ** 4, 15);
    expect(results.warnings.map((w: { code: string }) => w.code)).toContain('cut-sets-capped');
    expect(readFileSync(join(out, 'cutsets.csv'), 'utf8').trim().split('\n')).toHaveLength(10_001);
    expect(readFileSync(join(out, 'appendix.html'), 'utf8')).toMatch(/Only the 10,000 most probable were kept \(settings\.max_cut_sets (=|&#x3D;) 10,000\): at most 99,990,000 more/);

    const archive = join(dirname(s), 'trains.tar.gz');
    expect(child(['archive', s, '--out', archive, '--quiet']).code).toBe(0);
    const v = child(['verify', archive]);
    expect(v.stderr).not.toMatch(/internal error|heap/i);
    expect(v.code).toBe(0);
  }, 300_000);

  it('settings.max_cut_sets sets the cap', async () => {
    const s = study('four-trains');
    const file = join(s, 'study.yaml');
    writeFileSync(file, readFileSync(file, 'utf8').replace('settings: { samples: 0, horizon: 0 }', 'settings: { samples: 0, horizon: 0, max_cut_sets: 25 }'));
    const out = join(dirname(s), 'out');
    const r = await faultbook('run', s, '--out', out, '--format', 'json', '--quiet');
    expect(r.code).toBe(0);
    const summary = JSON.parse(readFileSync(join(out, 'results.json'), 'utf8')).tops[0].cut_set_summary;
    expect(summary.listed).toBe(25);
    expect(summary.capped).toBe(1e8 - 25);
  });
});

describe('the PDF stage is bounded', () => {
  it('breaks words longer than LONG_WORD and only those, losing no character', () => {
    const id = 'a'.repeat(LONG_WORD);
    expect(breakLongWords(`keep ${id} as is`)).toBe(`keep ${id} as is`);
    const long = 'y'.repeat(1000);
    const broken = breakLongWords(`x ${long} z`);
    expect(broken).not.toBe(`x ${long} z`);
    expect(broken.replace(/\u200b/g, '')).toBe(`x ${long} z`);
    for (const piece of broken.split(/[\s\u200b]/)) expect(piece.length).toBeLessThanOrEqual(LONG_WORD);
  });

  it.skipIf(!PDFTOTEXT && !process.env.CI)('a 20,000-character word: the PDF holds every character', async () => {
    const s = study('long-word');
    const out = join(dirname(s), 'out');
    const r = await faultbook('run', s, '--out', out, '--format', 'pdf,html', '--quiet');
    expect(r.code).toBe(0);
    const text = spawnSync('pdftotext', [join(out, 'appendix.pdf'), '-'], { encoding: 'utf8', maxBuffer: 64 * 1024 * 1024 }).stdout;
    // The word appears in an event title (twice: table and diagram) and in an assumption.
    expect((text.match(/x/g) ?? []).length).toBeGreaterThanOrEqual(20_000);
  }, 120_000);

  it('a list nested 200 deep: the PDF is made and nothing but the result reaches stderr', () => {
    const s = study('nested-list');
    const r = child(['run', s, '--out', join(dirname(s), 'out'), '--format', 'pdf', '--quiet']);
    expect(r.code).toBe(0);
    expect(r.stderr).toBe('');
  }, 120_000);

  const refused: [keyof typeof HOSTILE_CASES, RegExp][] = [
    ['many-tops', /^error: logic\.yaml:3:3: 'tops' has 2000 entries, more than 50\n {2}expected: At most 50 top events/],
    ['many-assumptions', /^error: assumptions\.md:1:1: assumptions\.md is \d+ KiB, more Markdown than an appendix can hold/],
    ['markdown-fragments', /^error: assumptions\.md:1:1: assumptions\.md is \d+ KiB, more Markdown/],
  ];
  for (const [name, message] of refused) {
    it(`${name}: refused with exit 2 at its place`, async () => {
      const r = await faultbook('check', study(name));
      expect(r.stderr).toMatch(message);
      expect(r.code).toBe(2);
      expectNoStackTrace(r.stderr);
    });
  }

  it('501 assumptions: refused at the 501st', async () => {
    const s = study('most-assumptions');
    writeFileSync(join(s, 'assumptions.md'), `${readFileSync(join(s, 'assumptions.md'), 'utf8')}\n## A501 One too many (invented)\nText.\n`);
    const r = await faultbook('check', s);
    const line = readFileSync(join(s, 'assumptions.md'), 'utf8').split('\n').indexOf('## A501 One too many (invented)') + 1;
    expect(r.stderr).toContain(`error: assumptions.md:${line}:1: more than 500 assumptions`);
    expect(r.code).toBe(2);
  });

  it('the most an appendix takes (500 assumptions) still passes check', async () => {
    const r = await faultbook('check', study('most-assumptions'));
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
  });

  it('a text value of over 64 Ki characters is refused where it starts', async () => {
    const s = study(null);
    const file = join(s, 'events.yaml');
    writeFileSync(file, readFileSync(file, 'utf8').replace('Motor A fails to start', 'z'.repeat(70_000)));
    const r = await faultbook('check', s);
    expect(r.stderr).toMatch(/^error: events\.yaml:5:\d+: a text of 70,000 characters, longer than a study text may be/);
    expect(r.code).toBe(2);
  });
});

describe('reading', () => {
  it('aliases that expand one long value past 16 M characters are refused at the first alias', async () => {
    const s = study(null);
    const file = join(s, 'study.yaml');
    const text = readFileSync(file, 'utf8');
    const lines = text.split('\n').length;
    writeFileSync(file, `${text}x-pad: &big "${'a'.repeat(60_000)}"\nx-many: [${Array(300).fill('*big').join(', ')}]\n`);
    const r = await faultbook('check', s);
    expect(r.stderr).toContain(`error: study.yaml:${lines + 1}:10: YAML: aliases expand this file to about`);
    expect(r.code).toBe(2);
  });

  it('a duplicate key after 20,000 others is found, at its line', async () => {
    const s = study(null);
    const many = Array.from({ length: 20_000 }, (_, i) => `  extra-${i}: { title: Invented extra ${i}, model: fixed, probability: { value: 1e-3, source: invented-survey } }`);
    const file = join(s, 'events.yaml');
    const text = readFileSync(file, 'utf8').trimEnd();
    const body = `${text}\n${many.join('\n')}\n  extra-7: { title: Twice, model: fixed, probability: 0.1 }\n`;
    writeFileSync(file, body);
    const r = await faultbook('check', s);
    expect(r.stderr).toContain(`error: events.yaml:${body.split('\n').length - 1}:3: YAML: the key 'extra-7' appears twice in one mapping`);
    expect(r.code).toBe(2);
  }, 60_000);

  it('a cycle of 2,000 gates is told by its first and last steps', async () => {
    const s = study(null);
    const gates = Array.from({ length: 2000 }, (_, i) => `  loop-${i}: { any: [loop-${(i + 1) % 2000}, motor-a] }`);
    writeFileSync(join(s, 'logic.yaml'), `tops:\n  station-fails: { title: Invented, gate: loop-0 }\ngates:\n${gates.join('\n')}\n`);
    const r = await faultbook('check', s);
    expect(r.code).toBe(2);
    const first = r.stderr.split('\n')[0]!;
    expect(first).toContain('the logic loops back on itself: loop-0 → loop-1 → loop-2 → loop-3 → … 1,993 more gates … → loop-1997 → loop-1998 → loop-1999 → loop-0');
    expect(first.length).toBeLessThan(300);
  });

  it('describeCycle keeps short loops whole', () => {
    expect(describeCycle(['a', 'b', 'a'])).toBe('a → b → a');
  });
});

describe('spreadsheet and terminal safety', () => {
  it('CSV text cells that start like a formula are neutralised (spreadsheet-injection practice, no source)', () => {
    expect(csvTextCell('=HYPERLINK("x")')).toBe(`"'=HYPERLINK(""x"")"`);
    expect(csvTextCell('+1')).toBe("'+1");
    expect(csvTextCell('-1')).toBe("'-1");
    expect(csvTextCell('@SUM(A1)')).toBe("'@SUM(A1)");
    expect(csvTextCell('motor-a pump-b')).toBe('motor-a pump-b');
  });

  it('control and bidirectional characters are printed escaped, our own progress erase kept', () => {
    expect(escapeForTerminal('ok\x1b[2J\x1b[1;1Hfake ok\u202e\u0085\n')).toBe('ok\\u001B[2J\\u001B[1;1Hfake ok\\u202E\\u0085\n');
    expect(escapeForTerminal('\r\x1b[2Kbar\ttab')).toBe('\r\x1b[2Kbar\ttab');
  });

  it('a study value with an escape sequence reaches stderr escaped', async () => {
    const s = study(null);
    const file = join(s, 'events.yaml');
    writeFileSync(file, readFileSync(file, 'utf8').replace('repair: 8 h,', 'repair: "8 h\\e[2K",'));
    const r = await faultbook('check', s);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('"8 h\\u001B[2K" is not a number with a unit');
    expect(r.stderr).not.toContain('\x1b');
  });
});

describe('staging files', () => {
  it('a staging write never follows a symbolic link', () => {
    const dir = temp();
    const victim = join(dir, 'victim.txt');
    writeFileSync(victim, 'keep\n');
    symlinkSync(victim, join(dir, '.results.json.1.partial'));
    expect(() => nodeOutputFs.write(join(dir, '.results.json.1.partial'), 'attack')).toThrow(/EEXIST/);
    expect(readFileSync(victim, 'utf8')).toBe('keep\n');
  });

  it('leftovers of a killed run are cleaned (and an orphaned earlier output put back) by the next run', () => {
    const dir = temp();
    // Pid 999999999 is above any pid_max, so no live process owns these.
    writeFileSync(join(dir, '.results.json.999999999.partial'), 'half');
    writeFileSync(join(dir, '.results.json.999999999.0a1b.old'), 'older');
    writeFileSync(join(dir, 'results.json'), 'old');
    writeFileSync(join(dir, '.cutsets.csv.999999999.0a1b.old'), 'earlier csv');
    writeFileSync(join(dir, '.unrelated.txt.999999999.partial'), 'not ours to touch');
    writeOutputs(dir, [{ name: 'results.json', data: 'new' }]);
    expect(readdirSync(dir).sort()).toEqual(['.cutsets.csv.999999999.0a1b.old', '.unrelated.txt.999999999.partial', 'results.json']);
    writeOutputs(dir, [{ name: 'cutsets.csv', data: 'new csv' }]);
    // The csv's earlier output was moved aside and never put back: it is restored, then replaced.
    expect(readdirSync(dir).sort()).toEqual(['.unrelated.txt.999999999.partial', 'cutsets.csv', 'results.json']);
    expect(readFileSync(join(dir, 'cutsets.csv'), 'utf8')).toBe('new csv');
    expect(existsSync(join(dir, 'results.json')) && lstatSync(join(dir, 'results.json')).isFile()).toBe(true);
  });

  it('staging names are not predictable from the pid alone', () => {
    const dir = temp();
    mkdirSync(join(dir, 'out'));
    const seen: string[] = [];
    writeOutputs(join(dir, 'out'), [{ name: 'a.txt', data: 'x' }], { ...nodeOutputFs, write: (p, d) => (seen.push(p), nodeOutputFs.write(p, d)) });
    expect(seen[0]).toMatch(new RegExp(`/\\.a\\.txt\\.${process.pid}\\.[0-9a-f]{12}\\.partial$`));
  });
});
