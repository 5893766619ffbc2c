/**
 * The plain model → the text of a new study folder (study.yaml, logic.yaml, events.yaml,
 * sources.yaml, assumptions.md). Nothing is written to disk here: the command does that, after
 * the whole folder has been made in memory.
 *
 * Numbers are written with the shortest text that reads back to the same double, so a model
 * exported by faultbook and imported again quantifies to the same bits; rates and times keep
 * their units.
 */
import { stringify } from 'yaml';
import type { PlainModel, PlainProbability } from './plain-model.js';

export const IMPORT_SOURCE_ID = 'imported-model';

export interface ImportedFrom {
  /** File name as given on the command line, without folders (a folder name may be private). */
  fileName: string;
  sha256: string;
  /** `--as-of` when the document carries no snapshot date. */
  asOf?: string;
}

/** Settings an export records on the root element; the import restores those it is given. */
const SETTINGS: Record<string, 'number' | 'text'> = {
  cutoff: 'number',
  max_order: 'number',
  max_cut_sets: 'number',
  samples: 'number',
  seed: 'number',
  max_nodes: 'number',
  sensitivity_factor: 'number',
  on_node_budget: 'text',
  sampling: 'text',
};

const num = (v: number): string => String(v);

function probabilityFields(p: PlainProbability, note: string | undefined): Record<string, unknown> {
  const cite = (value: string | number) => ({ value, source: IMPORT_SOURCE_ID, ...(note ? { note } : {}) });
  if (p.kind === 'fixed') return { model: 'fixed', probability: cite(p.value) };
  return { model: 'rate', rate: cite(`${num(p.rate)} ${p.rateUnit}`), exposure: cite(`${num(p.exposure)} ${p.exposureUnit}`) };
}

const header = (from: ImportedFrom) =>
  `# Made by 'faultbook import' from ${from.fileName} (Open-PSA MEF), SHA-256 ${from.sha256}.\n# See assumptions.md A1 for what the import carried.\n`;

export function studyFiles(model: PlainModel, from: ImportedFrom): Map<string, string> {
  const files = new Map<string, string>();
  const meta = model.meta;
  const settings: Record<string, unknown> = {};
  for (const [name, kind] of Object.entries(SETTINGS)) {
    const text = meta[`setting-${name}`];
    if (text !== undefined) settings[name] = kind === 'number' ? Number(text) : text;
  }
  const study = {
    format: 'faultbook/1',
    title: meta.title ?? model.title ?? `Model imported from ${from.fileName}`,
    facility: meta.facility ?? 'not stated in the imported model',
    revision: meta.revision ?? 'A',
    status: 'draft',
    prepared_by: [],
    reviewed_by: [],
    as_of: meta['as-of'] ?? from.asOf,
    ...(Object.keys(settings).length ? { settings } : {}),
  };
  files.set('study.yaml', header(from) + stringify(study, { lineWidth: 0 }));

  const tops = Object.fromEntries(model.tops.map((t) => [t.id, { title: t.title ?? t.id, gate: t.gate }]));
  const gates = Object.fromEntries(
    model.gates.map((g) => {
      const title = g.title ?? (g.generatedFrom ? `Part of the formula of ${g.generatedFrom} (a gate made on import)` : undefined);
      const logic = g.op === 'atleast' ? { atleast: g.k, of: g.inputs } : g.op === 'not' ? { not: g.inputs[0] } : { [g.op]: g.inputs };
      return [g.id, { ...(title ? { title } : {}), ...logic }];
    }),
  );
  const logic: Record<string, unknown> = { tops, gates };
  if (model.groups.length) {
    logic.common_cause = Object.fromEntries(
      model.groups.map((g) => [
        g.id,
        {
          ...(g.title ? { title: g.title } : {}),
          members: g.members,
          method: g.method,
          ...(g.method === 'alpha' ? { testing: 'non-staggered' } : {}),
          ...Object.fromEntries(Object.entries(g.factors).map(([k, v]) => [k, { value: v, source: IMPORT_SOURCE_ID }])),
        },
      ]),
    );
  }
  files.set('logic.yaml', header(from) + stringify(logic, { lineWidth: 0 }));

  // An MEF parameter that gives basic events their probability is one faultbook class: one
  // parameter shared by its events (for sensitivity and uncertainty), as in the document.
  const classes = Object.fromEntries(
    model.classes.map((c) => [c.id, { title: c.title ?? c.id, ...probabilityFields({ kind: 'fixed', value: c.probability }, `MEF parameter ${c.parameter}`) }]),
  );
  const events = Object.fromEntries(
    model.events.map((e) => {
      const title = e.title ?? e.id;
      if (e.kind === 'house') return [e.id, { title, model: 'switch', on: e.on ?? false }];
      if (e.class) return [e.id, { title, class: e.class }];
      return [e.id, { title, ...probabilityFields(e.probability!, e.note) }];
    }),
  );
  files.set('events.yaml', header(from) + stringify({ ...(model.classes.length ? { classes } : {}), events }, { lineWidth: 0 }));

  const sources = {
    sources: {
      [IMPORT_SOURCE_ID]: {
        title: `Open-PSA MEF model ${from.fileName}`,
        reference: `file ${from.fileName}, SHA-256 ${from.sha256}`,
        note: 'every number of this study was read from this file by faultbook import',
      },
    },
  };
  files.set('sources.yaml', header(from) + stringify(sources, { lineWidth: 0 }));
  files.set('assumptions.md', assumptions(model, from));
  return files;
}

function assumptions(model: PlainModel, from: ImportedFrom): string {
  const lines = [
    '# Assumptions (imported model)',
    '',
    '## A1 Imported from an Open-PSA MEF file',
    `This study was made by \`faultbook import\` from \`${from.fileName}\` (SHA-256 \`${from.sha256}\`), a document in`,
    'the Open-PSA Model Exchange Format. Its gates, house events, basic events and common-cause groups',
    'map one to one to this study; formulae nested inside a gate became gates of their own, named',
    '`<gate>.<n>`. A probability the file gives as a number is a `fixed` probability here, one it',
    'gives as a parameter is a `fixed` class shared by the events that name the parameter, and an',
    'exponential of a rate and a time is a `rate` model with both units. Nothing in the file was left',
    'out: an element faultbook cannot represent stops the import. Check every number against its',
    'original source before relying on the study, and replace the single source in sources.yaml by',
    'the real ones.',
    '',
    '## A2 Attributes carried from the file',
  ];
  const seen = new Set<string>();
  const rows = model.attributes.filter((a) => {
    const key = `${a.owner}\u0000${a.name}\u0000${a.value}`;
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
  if (rows.length === 0) lines.push('The file gives no attributes.');
  else {
    lines.push('The attributes the file gives its elements, as written there.', '', '| element | attribute | value |', '|---|---|---|');
    for (const a of rows) lines.push(`| ${cell(a.owner)} | ${cell(a.name)} | ${cell(a.value)} |`);
  }
  lines.push('', '## A3 Parameters of the file that nothing uses');
  if (model.unusedParameters.length === 0) lines.push('Every parameter of the file is used by a basic event or a common-cause group.');
  else {
    lines.push(
      'The file declares these parameters but no basic event or common-cause group uses them, so they',
      'are not part of this study (a file written by faultbook export holds every parameter of its',
      'study this way). They are listed as written there.',
      '',
      '| parameter | value | unit | label |',
      '|---|---|---|---|',
    );
    for (const p of model.unusedParameters) lines.push(`| ${cell(p.name)} | ${cell(p.value)} | ${cell(p.unit ?? '')} | ${cell(p.title ?? '')} |`);
  }
  return lines.join('\n') + '\n';
}

const cell = (s: string) => s.replace(/\|/g, '\\|').replace(/\s+/g, ' ');
