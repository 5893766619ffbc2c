import { cpSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import AjvModule from 'ajv';
import { parse } from 'yaml';
import { describe, expect, it } from 'vitest';
import { readStudy } from '../../src/study/read.js';
import { tempDir } from '../cli/helpers.js';

const Ajv = AjvModule.default;

describe('published JSON Schemas', () => {
  // The schemas in schema/ are what editors use; check them with a plain validator, apart from our reader.
  const ajv = new Ajv({ allErrors: true, strict: false });
  for (const f of readdirSync('schema').sort()) ajv.addSchema(JSON.parse(readFileSync(join('schema', f), 'utf8')));

  for (const name of ['study', 'logic', 'events', 'sources']) {
    it(`${name}.schema.json accepts the example study's ${name}.yaml and rejects a misspelt key`, () => {
      const validate = ajv.getSchema(`https://faultbook.invalid/schema/${name}.schema.json`)!;
      const data = parse(readFileSync(`example-study/${name}.yaml`, 'utf8'));
      expect(validate(data), JSON.stringify(validate.errors)).toBe(true);
      expect(validate({ ...data, 'not-a-section': 1 })).toBe(false);
    });
  }
});

describe('lint warnings', () => {
  it('flags an unused event, a parameter with no source, an odd Weibull shape and an exercise interval longer than the age', () => {
    const dir = join(tempDir(), 'study');
    cpSync('templates/starter', dir, { recursive: true });
    const events = readFileSync(join(dir, 'events.yaml'), 'utf8')
      .replace('shape: { value: 2.5, source: example-source, note: "replace with your data" }', 'shape: 9')
      .replace('installed: 1990', 'installed: 2026-06-01')
      .concat('  spare-event:\n    title: Not used anywhere\n    model: fixed\n    probability: { value: 0.1, source: example-source }\n');
    writeFileSync(join(dir, 'events.yaml'), events);
    const codes = readStudy(dir).warnings.map((w) => w.code).sort();
    expect(codes).toEqual(['exercise-over-age', 'shape-band', 'unsourced', 'unused-event']);
  });

  it('gives no warnings for the starter study', () => {
    expect(readStudy('templates/starter').warnings).toEqual([]);
  });
});
