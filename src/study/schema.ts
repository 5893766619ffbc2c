/**
 * Structure checks against the published JSON Schemas in schema/ (the same files editors use), with
 * each complaint turned into a StudyError that points at the offending line and says what would fit.
 */
import type { ErrorObject, ValidateFunction } from 'ajv';
import { createRequire } from 'node:module';
import { suggest } from './check-logic.js';
import { StudyError } from './errors.js';
import { compileSchemas, FILE_KINDS, readSchemaTexts, schemaDigest, type StudyFileKind } from './schema-compile.js';
import type { YamlFile, PathSegment } from './yaml.js';

export type { StudyFileKind } from './schema-compile.js';

let validators: Map<StudyFileKind, ValidateFunction> | undefined;

/**
 * The validators made at build time (dist/study/schema-validators.cjs, beside this module once
 * compiled) when they were made from the schema files as they are now; otherwise compiled here.
 */
function load(): Map<StudyFileKind, ValidateFunction> {
  if (validators) return validators;
  const texts = readSchemaTexts();
  const generated = loadGenerated();
  if (generated && generated.schemaDigest === schemaDigest(texts)) {
    validators = new Map(FILE_KINDS.map((kind) => [kind, generated[kind] as ValidateFunction]));
  } else {
    validators = compileSchemas(texts).validators;
  }
  return validators;
}

type GeneratedModule = Record<StudyFileKind, unknown> & { schemaDigest: string };

function loadGenerated(): GeneratedModule | undefined {
  try {
    return createRequire(import.meta.url)('./schema-validators.cjs') as GeneratedModule;
  } catch {
    return undefined;
  }
}

/** Which validators `checkStructure` uses: for the test that the generated ones agree with the schema. */
export function validatorOrigin(): 'generated' | 'compiled' {
  const generated = loadGenerated();
  return generated && generated.schemaDigest === schemaDigest(readSchemaTexts()) ? 'generated' : 'compiled';
}

/** Every structural problem of one file, most useful first; empty when it fits. */
export function checkStructure(kind: StudyFileKind, file: YamlFile): StudyError[] {
  const validate = load().get(kind)!;
  if (validate(file.data)) return [];
  return translate(validate.errors ?? [], file);
}

function pathOf(instancePath: string): PathSegment[] {
  if (!instancePath) return [];
  return instancePath
    .slice(1)
    .split('/')
    .map((s) => s.replace(/~1/g, '/').replace(/~0/g, '~'))
    .map((s) => (/^\d+$/.test(s) ? Number(s) : s));
}

function describePath(path: PathSegment[], file: YamlFile): string {
  return path.length === 0 ? `the top level of ${file.file}` : `'${path.join('.')}'`;
}

/**
 * ajv reports every failed branch of a oneOf; the user wants one line per place. Keep the most
 * specific error per instance path: an unknown key beats a type mismatch beats "no branch matched".
 */
function translate(errors: ErrorObject[], file: YamlFile): StudyError[] {
  const rank: Record<string, number> = { additionalProperties: 0, required: 1, enum: 2, const: 2, pattern: 3, type: 4, minimum: 5, maximum: 5, maxProperties: 6 };
  // A duration or rate written without its unit: the reader says so with the field and the likely
  // units, far better than "not a valid parameter", so every complaint at that place is left to it.
  const unitless = new Set(errors.filter((e) => /\/(durationText|rateText)\//.test(e.schemaPath) || /#\/definitions\/(durationText|rateText)$/.test(e.schemaPath.replace(/\/(type|pattern)$/, ''))).map((e) => e.instancePath));
  const byPath = new Map<string, ErrorObject>();
  const badIds: StudyError[] = [];
  for (const e of errors) {
    // A key that breaks the id rule (propertyNames): one error per key, at the key itself.
    if (e.keyword === 'propertyNames') continue;
    if (e.propertyName !== undefined) {
      badIds.push(badIdError(e.propertyName, pathOf(e.instancePath), file));
      continue;
    }
    if (unitless.has(e.instancePath) || [...unitless].some((p) => e.instancePath === p.slice(0, p.lastIndexOf('/')) && e.keyword === 'oneOf')) continue;
    const key = e.instancePath;
    const prev = byPath.get(key);
    if (!prev || (rank[e.keyword] ?? 9) < (rank[prev.keyword] ?? 9)) byPath.set(key, e);
  }
  // A oneOf failure at a parent is only noise when a child path already explains it.
  const paths = [...byPath.keys()];
  const out: StudyError[] = [...badIds];
  for (const [instancePath, e] of byPath) {
    if (e.keyword === 'oneOf' && paths.some((p) => p !== instancePath && p.startsWith(instancePath + '/'))) continue;
    out.push(toStudyError(e, pathOf(instancePath), file));
  }
  return out;
}

function toStudyError(e: ErrorObject, path: PathSegment[], file: YamlFile): StudyError {
  const params = e.params as Record<string, unknown>;
  const where = describePath(path, file);
  switch (e.keyword) {
    case 'additionalProperties': {
      const key = String(params.additionalProperty);
      const allowed = allowedKeys(e);
      return new StudyError(`unknown key '${key}' in ${where}`, file.keyAt([...path, key]), allowed.length ? suggest(key, allowed, `one of: ${allowed.join(', ')}`) : 'remove it or check its spelling');
    }
    case 'required':
      return new StudyError(`${where} is missing '${String(params.missingProperty)}'`, file.at(path), `add '${String(params.missingProperty)}:'`);
    case 'enum': {
      const allowed = (params.allowedValues as unknown[]).map(String);
      const written = typeof e.data === 'string' ? ` '${e.data}'` : '';
      return new StudyError(`${where} has a value${written} that is not allowed`, file.at(path), typeof e.data === 'string' ? suggest(e.data, allowed, `one of: ${allowed.join(', ')}`) : `one of: ${allowed.join(', ')}`);
    }
    case 'const':
      return new StudyError(`${where} must be ${JSON.stringify(params.allowedValue)}`, file.at(path), JSON.stringify(params.allowedValue));
    case 'type':
      return new StudyError(`${where} has the wrong type`, file.at(path), `a value of type ${String(params.type).replace(',', ' or ')}`);
    case 'pattern':
      return new StudyError(`${where} is not in the expected form`, file.at(path), (e.parentSchema as { description?: string } | undefined)?.description ?? `text matching ${String(params.pattern)}`);
    case 'minimum':
    case 'maximum':
    case 'exclusiveMinimum':
    case 'exclusiveMaximum':
      // ajv's own text ("must be >= 1000") reads as code; say the value and the range instead.
      return new StudyError(`${where} is ${typeof e.data === 'number' ? String(e.data) : JSON.stringify(e.data)}, out of range`, file.at(path), `a number ${String(params.comparison)} ${String(params.limit)}`);
    case 'maxProperties': {
      const count = e.data && typeof e.data === 'object' ? Object.keys(e.data).length : undefined;
      const desc = (e.parentSchema as { description?: string } | undefined)?.description;
      return new StudyError(`${where} has ${count ?? 'too many'} entries, more than ${String(params.limit)}`, file.at(path), desc ?? `at most ${String(params.limit)}`);
    }
    case 'oneOf':
      return new StudyError(`${where} is not a valid parameter`, file.at(path), (e.parentSchema as { description?: string } | undefined)?.description ?? 'see the study format in the README');
    default:
      return new StudyError(`${where} ${e.message ?? 'is not valid'}`, file.at(path), (e.parentSchema as { description?: string } | undefined)?.description ?? 'see the study format in the README');
  }
}

/** An id key (of a top, gate, event, group, tree, scenario …) that is not a letter followed by letters, digits, '-', '_' or '.'. */
function badIdError(key: string, path: PathSegment[], file: YamlFile): StudyError {
  const what = key === '' ? 'an empty id' : `the id ${JSON.stringify(key)}, which is not a valid id`;
  return new StudyError(
    `${describePath(path, file)} has ${what}`,
    file.keyAt([...path, key]),
    "an id: a letter, then letters, digits, '-', '_' or '.' (no spaces, slashes, formulas or control characters)",
  );
}

function allowedKeys(e: ErrorObject): string[] {
  const schema = e.parentSchema as { properties?: Record<string, unknown> } | undefined;
  return schema?.properties ? Object.keys(schema.properties) : [];
}
