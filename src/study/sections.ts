/**
 * A study's sections may sit in any of its YAML files (the split into study/logic/events/sources is
 * a convention). This merges them, remembering which file holds each, and refuses a section given twice.
 */
import { StudyError } from './errors.js';
import type { YamlFile } from './yaml.js';

export interface Located<T> {
  value: T;
  file: YamlFile;
}

export type Sections = Map<string, Located<unknown>>;

export function mergeSections(files: YamlFile[]): Sections {
  const out: Sections = new Map();
  for (const file of files) {
    const data = file.data as Record<string, unknown>;
    for (const [key, value] of Object.entries(data)) {
      const prev = out.get(key);
      if (prev) {
        throw new StudyError(`section '${key}' appears in both ${prev.file.file} and ${file.file}`, file.keyAt([key]), `'${key}:' in one file only`);
      }
      out.set(key, { value, file });
    }
  }
  return out;
}

/** The entries of a mapping section (`gates:`, `events:` …) in the order written. */
export function entriesOf(sections: Sections, key: string): { id: string; raw: Record<string, unknown>; file: YamlFile }[] {
  const s = sections.get(key);
  if (!s || s.value === null || s.value === undefined) return [];
  return Object.entries(s.value as Record<string, unknown>).map(([id, raw]) => ({ id, raw: (raw ?? {}) as Record<string, unknown>, file: s.file }));
}
