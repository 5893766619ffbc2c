/**
 * The descriptive parts of `Results` that come straight from the study: metadata, logic, sources,
 * assumptions, parameters and the input manifest. No probability is computed here.
 */
import { createHash } from 'node:crypto';
import { toolVersion } from '../package.js';
import type { Study } from '../study/types.js';
import type { ParameterResult, Results } from './results.js';

/** Hash of the whole input: SHA-256 over `path␠sha256\n` lines in path order. */
export function inputsDigest(files: { path: string; sha256: string }[]): string {
  const h = createHash('sha256');
  for (const f of [...files].sort((a, b) => (a.path < b.path ? -1 : 1))) h.update(`${f.path} ${f.sha256}\n`);
  return h.digest('hex');
}

export function describeStudy(study: Study): Pick<Results, 'format' | 'tool' | 'study' | 'inputs' | 'settings' | 'logic' | 'sources' | 'assumptions' | 'parameters' | 'warnings'> {
  const usedBy = new Map<string, string[]>();
  for (const e of study.events) {
    for (const key of Object.values(e.fields)) {
      const list = usedBy.get(key) ?? [];
      list.push(e.id);
      usedBy.set(key, list);
    }
  }
  for (const g of study.commonCause) {
    for (const key of Object.values(g.fields)) usedBy.set(key, [...(usedBy.get(key) ?? []), ...g.members]);
  }
  const parameters: ParameterResult[] = study.parameters.map((p) => {
    const r: ParameterResult = {
      key: p.key,
      owner: p.owner,
      owner_kind: p.ownerKind,
      field: p.field,
      quantity: p.quantity,
      value: p.value,
      written: p.written,
      used_by: usedBy.get(p.key) ?? [],
      at: { file: p.at.file, line: p.at.line },
    };
    if (p.source) r.source = p.source;
    if (p.note) r.note = p.note;
    if (p.range) r.range = p.range;
    if (p.uncertainty) r.uncertainty = { ...p.uncertainty };
    if (p.fit) r.fit = p.fit;
    return r;
  });
  const study_: Results['study'] = {
    title: study.meta.title,
    facility: study.meta.facility,
    revision: study.meta.revision,
    status: study.meta.status,
    as_of: study.meta.as_of,
    prepared_by: study.meta.prepared_by,
    reviewed_by: study.meta.reviewed_by,
  };
  if (study.meta.issued) study_.issued = study.meta.issued;
  if (study.meta.scope) study_.scope = study.meta.scope;
  if (study.meta.description) study_.description = study.meta.description;
  if (study.meta.report) study_.report = { ...study.meta.report, ...(study.meta.report.omit ? { omit: [...study.meta.report.omit] } : {}) };
  const files = study.files.map((f) => ({ path: f.path, sha256: f.sha256 }));
  return {
    format: 'faultbook-results/1',
    tool: { name: 'faultbook', version: toolVersion },
    study: study_,
    inputs: { sha256: inputsDigest(files), files },
    settings: { ...study.settings },
    logic: {
      tops: study.tops.map((t) => ({ id: t.id, title: t.title, gate: t.gate })),
      gates: study.gates.map((g) => {
        const out: Results['logic']['gates'][number] = { id: g.id, op: g.op, inputs: [...g.inputs] };
        if (g.title) out.title = g.title;
        if (g.k !== undefined) out.k = g.k;
        return out;
      }),
    },
    sources: study.sources.map((s) => {
      const out: Results['sources'][number] = { id: s.id, title: s.title, used_by: parameters.filter((p) => p.source === s.id).map((p) => p.key) };
      if (s.reference) out.reference = s.reference;
      if (s.invented) out.invented = true;
      if (s.note) out.note = s.note;
      return out;
    }),
    assumptions: study.assumptions.map((a) => {
      const events = study.events.filter((e) => e.assumptions.includes(a.id));
      // The numbers resting on an assumption are those of the events that cite it.
      const keys = [...new Set(events.flatMap((e) => Object.values(e.fields)))].sort();
      return { id: a.id, title: a.title, body: a.body, events: events.map((e) => e.id), parameters: keys };
    }),
    parameters,
    warnings: study.warnings.map((w) => {
      const out: Results['warnings'][number] = { code: w.code, message: w.message };
      if (w.at) out.at = { file: w.at.file, line: w.at.line };
      return out;
    }),
  };
}
