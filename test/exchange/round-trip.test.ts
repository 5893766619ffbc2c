// Every valid study in the repository → faultbook export → faultbook import → analysis gives the
// same tops (exact probability to 1e-12 relative) and the same minimal cut sets. The reference is
// the study's own analysis; the exported document is also checked against the standard's
// published grammar with a general-purpose validator (libxml2's xmllint, RELAX NG), and an export
// is byte-identical when repeated.
import { cpSync, copyFileSync, mkdirSync, readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { analyze } from '../../src/analysis/analyze.js';
import { readStudy } from '../../src/study/read.js';
import { faultbook, tempDir } from '../cli/helpers.js';
import { BALL_BEARINGS_PATH } from '../fit/helpers.js';
import { expectSameTops, haveXmllint, validateAgainstGrammar } from './helpers.js';

const work = tempDir('faultbook-exchange-rt-');
afterAll(() => rmSync(work, { recursive: true, force: true }));

/** The valid studies of the repository; the fit fixture needs its shared data file beside it. */
const STUDIES: { name: string; folder: () => string }[] = [
  { name: 'example-study', folder: () => 'example-study' },
  { name: 'example-study/earlier-revision', folder: () => join('example-study', 'earlier-revision') },
  { name: 'templates/starter', folder: () => join('templates', 'starter') },
  { name: 'test/fixtures/hardening/valid-study', folder: () => join('test', 'fixtures', 'hardening', 'valid-study') },
  {
    name: 'test/fixtures/fit-study',
    folder: () => {
      const dir = join(work, 'fit-study');
      cpSync(join('test', 'fixtures', 'fit-study'), dir, { recursive: true });
      mkdirSync(join(dir, 'data'), { recursive: true });
      copyFileSync(BALL_BEARINGS_PATH, join(dir, 'data', 'ball-bearings.csv'));
      return dir;
    },
  },
];

describe('round trip through the open model-exchange standard', () => {
  for (const [i, s] of STUDIES.entries()) {
    it(`${s.name}: export → import → run gives the same tops and cut sets`, async () => {
      const folder = s.folder();
      const xml = join(work, `model-${i}.xml`);
      const exported = await faultbook('export', folder, '--out', xml);
      expect(exported.stderr.replace(/^warning: .*\n/gm, '')).toBe('');
      expect(exported.code).toBe(0);

      if (haveXmllint()) {
        const verdict = validateAgainstGrammar(xml);
        expect(verdict.output).toContain('validates');
        expect(verdict.ok).toBe(true);
      }

      // Deterministic: the same study exports to the same bytes.
      const again = join(work, `model-${i}-again.xml`);
      expect((await faultbook('export', folder, '--out', again)).code).toBe(0);
      expect(readFileSync(again)).toEqual(readFileSync(xml));

      const imported = join(work, `imported-${i}`);
      const back = await faultbook('import', xml, '--out', imported);
      expect(back.stderr).toBe('');
      expect(back.code).toBe(0);

      const before = analyze(readStudy(folder));
      const after = analyze(readStudy(imported));
      expectSameTops(before, after);
    }, 120_000);
  }
});
