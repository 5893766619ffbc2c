/**
 * The quick reader of plain YAML (src/study/plain-yaml.ts) against the full parser, the `yaml`
 * package (an independent, general-purpose YAML 1.2 implementation): whenever the quick reader
 * accepts a text, the data, the position of every value and key, and the source text of every
 * scalar must be the full parser's; whenever the full parser (with our checks) refuses a text, the
 * quick reader must decline it, so every message about a file stays the full parser's.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { isDeepStrictEqual } from 'node:util';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { readPlainYaml, type PlainYaml } from '../../src/study/plain-yaml.js';
import { MAX_EXPANDED_CHARS, MAX_TEXT_CHARS, parseYamlDocument, parseYamlFile, type YamlFile } from '../../src/study/yaml.js';

const LIMITS = { maxDepth: 64, maxTextChars: MAX_TEXT_CHARS, maxExpandedChars: MAX_EXPANDED_CHARS };

function quick(text: string): PlainYaml | undefined {
  return readPlainYaml('f.yaml', text, LIMITS);
}

function full(text: string): YamlFile | Error {
  try {
    return parseYamlDocument('f.yaml', text);
  } catch (err) {
    return err as Error;
  }
}

/** Every path into the data, and for each one a path that goes one step too far (a missing key, a missing item). */
function pathsOf(value: unknown, prefix: (string | number)[] = [], out: (string | number)[][] = []): (string | number)[][] {
  out.push(prefix, [...prefix, 'no-such-key'], [...prefix, 99999]);
  if (Array.isArray(value)) value.forEach((v, i) => pathsOf(v, [...prefix, i], out));
  else if (value !== null && typeof value === 'object') for (const [k, v] of Object.entries(value)) pathsOf(v, [...prefix, k], out);
  return out;
}

/** Differences between the quick reader and the full parser on one text (empty when they agree or the quick reader declines). */
function disagreements(text: string): string[] {
  const q = quick(text);
  if (!q) return [];
  const f = full(text);
  if (f instanceof Error) return [`quick reader accepted what the full parser refuses: ${f.message}`];
  if (!isDeepStrictEqual(q.data, f.data)) return [`data differ: ${JSON.stringify(q.data)} vs ${JSON.stringify(f.data)}`];
  const out: string[] = [];
  for (const path of pathsOf(f.data)) {
    const [qa, fa, qk, fk] = [q.at(path, false), f.at(path), q.at(path, true), f.keyAt(path)];
    if (!isDeepStrictEqual(qa, fa)) out.push(`at ${JSON.stringify(path)}: ${JSON.stringify(qa)} vs ${JSON.stringify(fa)}`);
    if (!isDeepStrictEqual(qk, fk)) out.push(`keyAt ${JSON.stringify(path)}: ${JSON.stringify(qk)} vs ${JSON.stringify(fk)}`);
    if (q.sourceAt(path) !== f.sourceAt!(path)) out.push(`sourceAt ${JSON.stringify(path)}: ${q.sourceAt(path)} vs ${f.sourceAt!(path)}`);
  }
  return out;
}

function yamlFilesUnder(dir: string, out: string[] = []): string[] {
  for (const name of readdirSync(dir).sort()) {
    const p = join(dir, name);
    if (statSync(p).isDirectory()) yamlFilesUnder(p, out);
    else if (name.endsWith('.yaml')) out.push(p);
  }
  return out;
}

describe('quick reader of plain YAML', () => {
  it('agrees with the full parser on every study file in the repository, and reads the large ones itself', () => {
    const files = [...yamlFilesUnder('example-study'), ...yamlFilesUnder('templates'), ...yamlFilesUnder('test')];
    let accepted = 0;
    for (const file of files) {
      const text = readFileSync(file, 'utf8');
      expect(disagreements(text), file).toEqual([]);
      if (quick(text)) accepted++;
    }
    // Not vacuous: most files are plain, and so are the example's logic and events (block and flow, comments).
    expect(accepted).toBeGreaterThan(files.length / 2);
    expect(quick(readFileSync('example-study/events.yaml', 'utf8'))).toBeDefined();
    expect(quick(readFileSync('example-study/logic.yaml', 'utf8'))).toBeDefined();
    const crlf = readFileSync('example-study/events.yaml', 'utf8').replace(/\n/g, '\r\n');
    expect(quick(crlf)).toBeDefined();
    expect(disagreements(crlf)).toEqual([]);
  });

  it('resolves plain scalars by the YAML 1.2 core schema, as the full parser does', () => {
    // YAML 1.2.2 section 10.3.2, tag resolution of the core schema (from memory): null, bool, int
    // (decimal, 0o octal, 0x hex), float (with .inf/.nan); anything else, 'no', 'on', dates and
    // underscores included, stays a string.
    const cases: [string, unknown][] = [
      ['no', 'no'], ['on', 'on'], ['yes', 'yes'], ['0x1F', 31], ['0o17', 15], ['017', 17], ['1_000', '1_000'],
      ['2026-06-30', '2026-06-30'], ['.inf', Infinity], ['-.inf', -Infinity], ['1e3', 1000], ['2e-3', 0.002], ['+1', 1],
      ['-.5', -0.5], ['1.', 1], ['~', null], ['null', null], ['NULL', null], ['True', true], ['FALSE', false], ['tRUE', 'tRUE'],
      ['2e-3 /year', '2e-3 /year'], ['75 years', '75 years'], ['0o8', '0o8'], ['0x', '0x'], ['+0x1F', '+0x1F'], ['-0', -0],
      ['+.inf', Infinity], ['.NaN', NaN], ['.Inf', Infinity], ['Null', null], ['nULL', 'nULL'], ['00', 0], ['1.5e+3', 1500],
      ['.5e1', 5], ['1e', '1e'], ['99999999999999999999', 1e20], ['1_0', '1_0'], ['0.', 0], ['.', '.'],
    ];
    for (const [written, expected] of cases) {
      const text = `a: ${written}\nb: [${written}]\nc: { d: ${written} }\n`;
      expect(quick(text)?.data, written).toEqual({ a: expected, b: [expected], c: { d: expected } });
      expect(disagreements(text), written).toEqual([]);
    }
    expect(Number.isNaN((quick('a: .nan\n')!.data as { a: number }).a)).toBe(true);
    expect(Object.is((quick('a: -0\n')!.data as { a: number }).a, -0)).toBe(true);
  });

  it('reads flow indicators inside block scalars, spaced and empty flow collections and comments in odd places as the full parser does', () => {
    const texts = [
      'title: Gate [A], left\n', 'a: x{b}\n', 'a: x, y\n', 'a: { b:\n    1 }\n', 'a: { b: 1, }\n', 'a: {}\nb: []\n', 'a: [ ]\n', 'a: { }\n',
      'a: [x,\n  # c\n  y]\n', 'a: [x,\n\n   y]\n', 'a:\n  - { b: 1 }\n  - [c]\n', 'a: { b: "x" , c: \'y\' }\n', 'a: [x , y]\n',
      'k: v\n# c\n  # d\nj: w\n', 'a:\n  b: 1\n# c at column 1\n  c: 2\n', 'a: [x]  # c\n', 'x: -x\ny: --\nz: a-\n', 'a: 1.2.3\nb: 0b101\nc: 😀 z\n',
    ];
    for (const text of texts) {
      expect(quick(text), text).toBeDefined();
      expect(disagreements(text), text).toEqual([]);
    }
  });

  it('declines what it does not read itself, and the full parser then reports it as before', () => {
    const declined = [
      'a: &x 1\nb: *x\n', // anchor and alias
      'a: !!str 1\n', // tag
      'a: |\n  text\n', // block scalar
      'a: 1\na: 2\n', // duplicate key
      'a:\n\tb: 1\n', // tab
      'a: 1\rb: 2\n', // a CR that does not end a line with LF
      'a:\n', // empty value
      'a: one\n  two\n', // multi-line plain scalar
      'a: "x\\ty"\n', // escape
      '---\na: 1\n', // document marker
      'a: b: c\n', // compact mapping
      'a: { b: 1\n', // unclosed flow mapping
      '"quoted key": 1\n',
      '__proto__: 1\n',
      '- a\n- b\n', // not a mapping
      `a: ${'x'.repeat(MAX_TEXT_CHARS + 1)}\n`,
      `${'a:\n'.replace('a', 'k')}${Array.from({ length: 70 }, (_, i) => `${'  '.repeat(i + 1)}k${i}:`).join('\n')} 1\n`, // deeper than the limit
    ];
    for (const text of declined) expect(quick(text), text.slice(0, 40)).toBeUndefined();
    // One the full parser refuses, with its own message and place.
    expect(() => parseYamlFile('f.yaml', 'a: 1\na: 2\n')).toThrow("the key 'a' appears twice in one mapping");
  });

  // RUNS=20000 SEED=n npx vitest run test/study/plain-yaml.test.ts searches longer (prints how many texts were read quickly).
  it('agrees with the full parser on generated study-like texts and on their mutations', () => {
    const scalar = fc.constantFrom('1', '2e-3', '0.004', '75 years', '2e-3 /year', 'no', 'on', '0x1F', '~', 'True', '2026-06-30', 'x#y', 'a b', '"q"', "'it''s'", '"a # b"', '-5', '.5', 'p1-feed.2', 'é', '0o8', '+.inf', '.NaN', '-0', '00', '1.5e+3', 'Null', 'nULL', '0x', '+0x1F', '99999999999999999999', '.', 'Gate [A], left', 'x]', 'a, b');
    const key = fc.constantFrom('a', 'motor-1', 'p.value', 'g_2', '1', 'true', 'x.y-z');
    const comment = fc.constantFrom('', ' # note', '  #c');
    type Tree = string | { map: [string, Tree][] } | { seq: Tree[] };
    const tree: fc.Arbitrary<Tree> = fc.letrec<{ t: Tree }>((tie) => ({
      t: fc.oneof(
        { depthSize: 'small', withCrossShrink: true },
        scalar,
        fc.record({ map: fc.uniqueArray(fc.tuple(key, tie('t')), { minLength: 1, maxLength: 4, selector: ([k]) => k }) }),
        fc.record({ seq: fc.array(tie('t'), { minLength: 1, maxLength: 4 }) }),
      ),
    })).t;
    const flowText = (t: Tree, br: boolean): string => {
      const sep = br ? ',\n      ' : ', ';
      if (typeof t === 'string') return t;
      if ('map' in t) return `{ ${t.map.map(([k, v]) => `${k}: ${flowText(v, false)}`).join(sep)} }`;
      return `[${t.seq.map((v) => flowText(v, false)).join(sep)}]`;
    };
    const blockText = (t: Tree, indent: number, style: number[], note: string): string => {
      const pad = ' '.repeat(indent);
      const pick = style[indent % style.length]!;
      if (typeof t === 'string' || pick === 0) return ` ${flowText(t, pick === 0 && indent % 3 === 1)}${typeof t === 'string' ? note : ''}\n`;
      if ('map' in t) return `${note}\n${t.map.map(([k, v]) => `${pad}  ${k}:${blockText(v, indent + 2, style, note)}`).join('')}`;
      return `\n${t.seq.map((v) => (typeof v === 'object' && 'map' in v && pick === 2 ? `${pad}  - ${v.map.map(([k, w], i) => `${i ? `${pad}    ` : ''}${k}:${blockText(w, indent + 4, style, note)}`).join('')}` : `${pad}  - ${typeof v === 'string' ? v : flowText(v, false)}${note}\n`)).join('')}`;
    };
    const document = fc.tuple(fc.uniqueArray(fc.tuple(key, tree), { minLength: 1, maxLength: 5, selector: ([k]) => k }), fc.array(fc.integer({ min: 0, max: 2 }), { minLength: 1, maxLength: 4 }), comment).map(([entries, style, note]) =>
      entries.map(([k, v]) => `${k}:${blockText(v, 0, style, note)}`).join(''),
    );
    const edit = fc.tuple(fc.nat(), fc.constantFrom(':', '#', ' ', '\n', '-', '{', '}', '[', ']', ',', '"', "'", ' #', ': ', '\n  ', '\n- ', '- ', '?', '&a ', '*a', '!', '|', '>', '%', '@', '\t', '\\', ''));
    const mutated = fc.tuple(document, fc.array(edit, { minLength: 1, maxLength: 2 })).map(([text, edits]) =>
      edits.reduce((t, [at, insert]) => {
        const i = at % (t.length + 1);
        return insert === '' ? t.slice(0, i) + t.slice(i + 1) : t.slice(0, i) + insert + t.slice(i);
      }, text),
    );
    // Files saved with CRLF line ends read the same (the full parser takes CRLF as one line break).
    const anyText = fc.tuple(fc.oneof(document, mutated), fc.boolean()).map(([text, crlf]) => (crlf ? text.replace(/\n/g, '\r\n') : text));
    let accepted = 0;
    fc.assert(
      fc.property(anyText, (text) => {
        expect(disagreements(text), text).toEqual([]);
        if (quick(text)) accepted++;
      }),
      { numRuns: Number(process.env.RUNS ?? 3000), seed: Number(process.env.SEED ?? 14) },
    );
    if (process.env.RUNS) console.log('accepted', accepted);
    expect(accepted).toBeGreaterThan(500);
  });
});
