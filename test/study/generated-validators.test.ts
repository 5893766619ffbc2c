/**
 * The validators `npm run build` generates from schema/ (dist/study/schema-validators.cjs, ajv's
 * standalone code) against the same schemas compiled by ajv at run time: the same verdict and the
 * same error objects on valid and broken study files, so a study is refused with the same message
 * whichever is used. ajv is the reference here (a general-purpose JSON Schema validator from npm).
 * Needs `npm run build` first (`npm test` builds).
 */
import { spawnSync } from 'node:child_process';
import { cpSync, existsSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { join } from 'node:path';
import type { ValidateFunction } from 'ajv';
import { parse } from 'yaml';
import { describe, expect, it } from 'vitest';
import { compileSchemas, FILE_KINDS, readSchemaTexts, schemaDigest, type StudyFileKind } from '../../src/study/schema-compile.js';
import { tempDir } from '../temp.js';

const GENERATED = 'dist/study/schema-validators.cjs';

function generated(): Record<StudyFileKind, ValidateFunction> & { schemaDigest: string } {
  if (!existsSync(GENERATED)) throw new Error(`${GENERATED} is missing: run 'npm run build' first`);
  return createRequire(import.meta.url)(`../../${GENERATED}`) as Record<StudyFileKind, ValidateFunction> & { schemaDigest: string };
}

/** Study files to validate: the example's, the starter's and the bad-study corpus's, as data, each under the kind its name gives. */
function corpus(): { name: string; kind: StudyFileKind; data: unknown }[] {
  const out: { name: string; kind: StudyFileKind; data: unknown }[] = [];
  const add = (dir: string) => {
    for (const kind of FILE_KINDS) {
      const file = join(dir, `${kind}.yaml`);
      if (!existsSync(file)) continue;
      try {
        out.push({ name: file, kind, data: parse(readFileSync(file, 'utf8'), { logLevel: 'error' }) });
      } catch {
        // Not YAML at all (a bad-study case for the parser): nothing to validate.
      }
    }
  };
  add('example-study');
  add('templates/starter');
  for (const c of readdirSync('test/bad-studies').sort()) if (!c.includes('.')) add(join('test/bad-studies', c));
  return out;
}

/** Broken variants of the example's files: each kind of schema complaint the reader translates. */
function broken(): { name: string; kind: StudyFileKind; data: unknown }[] {
  const read = (kind: StudyFileKind) => parse(readFileSync(`example-study/${kind}.yaml`, 'utf8')) as Record<string, Record<string, Record<string, unknown>>>;
  const out: { name: string; kind: StudyFileKind; data: unknown }[] = [];
  const events = read('events');
  const firstEvent = Object.keys(events.events!)[0]!;
  const variants: [string, (e: typeof events) => void][] = [
    ['unknown key', (e) => void (e.events![firstEvent]!.modle = 'fixed')],
    ['wrong type', (e) => void (e.events![firstEvent]!.title = ['a', 'list'])],
    ['enum', (e) => void (e.events![firstEvent]!.model = 'weibul')],
    ['bad id', (e) => void (e.events!['has space'] = { model: 'fixed', probability: 0.1 })],
    ['bare duration', (e) => void (e.events![firstEvent]!.repair = 5)],
    ['not a mapping', (e) => void (e.events = [] as never)],
  ];
  for (const [name, change] of variants) {
    const copy = structuredClone(events);
    change(copy);
    out.push({ name, kind: 'events', data: copy });
  }
  const study = read('study');
  out.push({ name: 'unknown setting', kind: 'study', data: { ...study, settings: { ...study.settings, max_cutsets: 3 } } });
  out.push({ name: 'no format', kind: 'study', data: { ...study, format: 'faultbook/2' } });
  return out;
}

describe('validators generated at build time', () => {
  it('were made from the schema files as they are now', () => {
    expect(generated().schemaDigest).toBe(schemaDigest(readSchemaTexts()));
  });

  it('give the verdict and the errors of the schemas compiled at run time, on valid and broken study files', () => {
    const made = generated();
    const compiled = compileSchemas(readSchemaTexts()).validators;
    const cases = [...corpus(), ...broken()];
    let refused = 0;
    for (const { name, kind, data } of cases) {
      const a = made[kind];
      const b = compiled.get(kind)!;
      const verdict = a(data);
      expect(verdict, name).toBe(b(data));
      expect(a.errors ?? null, name).toEqual(b.errors ?? null);
      if (!verdict) refused++;
    }
    // Not vacuous: the broken variants and several corpus cases fail the schema.
    expect(refused).toBeGreaterThanOrEqual(broken().length);
  });

  it('are what the built command uses, and it refuses a misspelt key with the message it always gave', async () => {
    const built: string = '../../dist/study/schema.js';
    const schema = (await import(built)) as { validatorOrigin(): string };
    expect(schema.validatorOrigin()).toBe('generated');
    const dir = join(tempDir(), 'study');
    cpSync('example-study', dir, { recursive: true });
    const events = readFileSync(join(dir, 'events.yaml'), 'utf8');
    const lines = events.split('\n');
    const at = lines.findIndex((l) => l.trim() === 'model: weibull');
    lines[at] = lines[at]!.replace('model: weibull', 'modle: weibull');
    writeFileSync(join(dir, 'events.yaml'), lines.join('\n'));
    const r = spawnSync(process.execPath, ['bin/faultbook.js', 'check', dir], { encoding: 'utf8' });
    expect(r.status).toBe(2);
    const owner = lines.slice(0, at).reverse().find((l) => /^ {2}\S.*:$/.test(l))!.trim().slice(0, -1);
    const col = lines[at]!.indexOf('modle') + 1;
    expect(r.stderr).toContain(`events.yaml:${at + 1}:${col}: unknown key 'modle' in 'classes.${owner}'`);
    // The hint as the reader gave it before the validators were generated (its keys come from the schema's properties).
    expect(r.stderr).toContain(
      '  expected: one of: title, model, source, note, assumptions, probability, rate, exposure, repair, interval, test_duration, shape, scale, location, exercise; did you mean \'model\'?',
    );
  });
});
