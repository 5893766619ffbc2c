/**
 * The JSON Schemas in schema/ compiled into validators: at build time into a module of plain
 * functions (scripts/build-validators.ts writes dist/study/schema-validators.cjs with ajv's standalone
 * code generation), or here at run time when that module is missing or was made from other schema
 * text. One set of options serves both, so the two can only differ if the schema files differ,
 * and then the generated module is not used (its digest will not match).
 */
import { createHash } from 'node:crypto';
import { readdirSync, readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { join } from 'node:path';
import type AjvModule from 'ajv';
import type { ValidateFunction } from 'ajv';

// ajv is CommonJS: under NodeNext its class arrives as the default export's `default`.
type AjvClass = InstanceType<typeof AjvModule.default>;
import { packageRoot } from '../package.js';

export const SCHEMA_BASE = 'https://faultbook.invalid/schema/';
export const FILE_KINDS = ['study', 'logic', 'events', 'sources'] as const;
export type StudyFileKind = (typeof FILE_KINDS)[number];

export interface SchemaText {
  name: string;
  text: string;
}

/** The schema files as text, in name order (the order they are added to ajv and hashed). */
export function readSchemaTexts(): SchemaText[] {
  const dir = join(packageRoot, 'schema');
  return readdirSync(dir)
    .filter((f) => f.endsWith('.schema.json'))
    .sort()
    .map((name) => ({ name, text: readFileSync(join(dir, name), 'utf8') }));
}

/** SHA-256 over every schema file's name and text: what a generated module was made from. */
export function schemaDigest(texts: SchemaText[]): string {
  const hash = createHash('sha256');
  for (const { name, text } of texts) hash.update(`${name}\n${text.length}\n${text}`);
  return hash.digest('hex');
}

/**
 * A configured ajv holding every schema, and the validator of each study file kind. ajv is loaded
 * only here (it is CommonJS, so `require` keeps this synchronous), so a run that uses the generated
 * module never loads the compiler.
 */
export function compileSchemas(texts: SchemaText[], options: { source?: boolean } = {}): { ajv: AjvClass; validators: Map<StudyFileKind, ValidateFunction> } {
  const require = createRequire(import.meta.url);
  const Ajv = (require('ajv') as typeof AjvModule).default;
  // verbose: errors carry their schema, so a message can list the keys that would have fitted.
  const ajv = new Ajv({ allErrors: true, strict: false, verbose: true, ...(options.source ? { code: { source: true } } : {}) });
  for (const { text } of texts) ajv.addSchema(JSON.parse(text) as object);
  const validators = new Map<StudyFileKind, ValidateFunction>();
  for (const kind of FILE_KINDS) validators.set(kind, ajv.getSchema(`${SCHEMA_BASE}${kind}.schema.json`)!);
  return { ajv, validators };
}
