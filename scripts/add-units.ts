/**
 * `npx tsx scripts/add-units.ts FILE_OR_FOLDER…`: writes the unit a bare duration or rate used to
 * mean (years, per year) after it, in place, so a study written before units became required reads
 * exactly as before. YAML files get `75` → `75 years` and `2e-3` → `2e-3 /year` in model fields,
 * ranges, uncertainty numbers, scenario `set:` values and event-tree frequencies; a life-data CSV
 * whose `life` column holds bare numbers gets the header `life_years`. Nothing else in a file
 * changes (the edits are made in the text, so comments and layout stay).
 */
import { readdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { isMap, isScalar, isSeq, parseDocument, Scalar, type Node } from 'yaml';
import { isBareNumber } from '../src/reliability/units.js';
import { quantityOfField } from '../src/study/quantities.js';

type Unitful = 'duration' | 'rate';
interface Edit {
  at: number;
  text: string;
}

/** Which numbers of an uncertainty distribution are in the parameter's own unit. */
const SAME_UNIT: Record<string, string[]> = {
  lognormal: ['median', 'mean'],
  normal: ['mean', 'sd', 'min', 'max'],
  uniform: ['min', 'max'],
  triangular: ['min', 'mode', 'max'],
  gamma: ['scale'],
};

function unitFor(q: Unitful, text: string): string {
  if (q === 'rate') return ' /year';
  return Number(text) === 1 ? ' year' : ' years';
}

function fixScalar(node: unknown, q: Unitful, edits: Edit[]): void {
  if (!isScalar(node) || !node.range) return;
  const v = node.value;
  if (typeof v !== 'number' && !(typeof v === 'string' && isBareNumber(v))) return;
  if (typeof v === 'string' && v.trim() === '') return;
  const text = String(v);
  const quoted = node.type === Scalar.QUOTE_DOUBLE || node.type === Scalar.QUOTE_SINGLE;
  edits.push({ at: quoted ? node.range[1] - 1 : node.range[1], text: unitFor(q, text) });
}

function fixParameter(node: unknown, q: Unitful, edits: Edit[]): void {
  if (isScalar(node)) return fixScalar(node, q, edits);
  if (!isMap(node)) return;
  fixScalar(node.get('value', true), q, edits);
  const range = node.get('range', true);
  if (isSeq(range)) for (const item of range.items) fixScalar(item, q, edits);
  const unc = node.get('uncertainty', true);
  if (!isMap(unc)) return;
  for (const pair of unc.items) {
    const kind = isScalar(pair.key) ? String(pair.key.value) : '';
    if (!isMap(pair.value)) continue;
    for (const name of SAME_UNIT[kind] ?? []) fixScalar(pair.value.get(name, true), q, edits);
  }
}

function unitful(field: string): Unitful | undefined {
  const q = quantityOfField(field);
  return q === 'duration' || q === 'rate' ? q : undefined;
}

function entries(node: unknown): [string, Node][] {
  if (!isMap(node)) return [];
  return node.items.filter((p) => isScalar(p.key)).map((p) => [String((p.key as Scalar).value), p.value as Node]);
}

export function addUnitsToYaml(text: string): string {
  const doc = parseDocument(text, { keepSourceTokens: false });
  if (doc.errors.length) return text;
  const edits: Edit[] = [];
  for (const [section, body] of entries(doc.contents)) {
    if (section === 'events' || section === 'classes') {
      for (const [, owner] of entries(body)) for (const [field, value] of entries(owner)) {
        const q = unitful(field);
        if (q) fixParameter(value, q, edits);
      }
    } else if (section === 'scenarios') {
      for (const [, scenario] of entries(body)) for (const [key, value] of entries(isMap(scenario) ? scenario.get('set', true) : undefined)) {
        const q = unitful(key.slice(key.lastIndexOf('.') + 1));
        if (q) fixScalar(value, q, edits);
      }
    } else if (section === 'event_trees') {
      for (const [, tree] of entries(body)) {
        const load = isMap(tree) ? tree.get('load', true) : undefined;
        const ranges = isMap(load) ? load.get('ranges', true) : undefined;
        const list = isSeq(ranges) ? ranges.items : entries(ranges).map(([, v]) => v);
        for (const r of list) if (isMap(r)) fixParameter(r.get('frequency', true), 'rate', edits);
      }
    }
  }
  let out = text;
  for (const e of edits.sort((a, b) => b.at - a.at)) out = out.slice(0, e.at) + e.text + out.slice(e.at);
  return out;
}

/** A CSV whose `life` column holds bare numbers: the header says they are years. */
export function addUnitsToCsv(text: string): string {
  const lines = text.split('\n');
  const h = lines.findIndex((l) => l.trim() !== '' && !l.trimStart().startsWith('#'));
  if (h < 0) return text;
  const cols = lines[h]!.split(',');
  const k = cols.findIndex((c) => c.trim().toLowerCase() === 'life');
  if (k < 0) return text;
  const bare = lines.slice(h + 1).some((l) => l.trim() !== '' && !l.trimStart().startsWith('#') && isBareNumber((l.split(',')[k] ?? '').trim() || 'x'));
  if (!bare) return text;
  cols[k] = cols[k]!.replace(/life/i, 'life_years');
  lines[h] = cols.join(',');
  return lines.join('\n');
}

function walk(path: string): string[] {
  if (statSync(path).isDirectory()) return readdirSync(path).sort().flatMap((n) => (n === 'node_modules' || n.startsWith('.') ? [] : walk(join(path, n))));
  return [path];
}

if (process.argv[1]?.endsWith('add-units.ts')) {
  let changed = 0;
  for (const file of process.argv.slice(2).flatMap(walk)) {
    const fix = /\.ya?ml$/.test(file) ? addUnitsToYaml : /\.csv$/.test(file) ? addUnitsToCsv : undefined;
    if (!fix) continue;
    const before = readFileSync(file, 'utf8');
    const after = fix(before);
    if (after !== before) {
      writeFileSync(file, after);
      changed++;
      console.log(`units added: ${file}`);
    }
  }
  console.log(`${changed} file(s) changed`);
}
