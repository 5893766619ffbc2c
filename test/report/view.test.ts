import { describe, expect, it } from 'vitest';
import { buildViewModel } from '../../src/report/index.js';
import { CUT_SETS_SHOWN } from '../../src/report/sections/cut-sets.js';
import { SECTIONS } from '../../src/report/sections/index.js';
import { formatProbability } from '../../src/report/format.js';
import { fixtureInputs, fixtureResults } from './fixture.js';
import { allBlocks, section, tables, viewText } from './helpers.js';
import { bigTreeResults } from './synthetic.js';

const view = () => buildViewModel(fixtureResults(), fixtureInputs(), { paper: 'a4' });

describe('view model', () => {
  it('is plain data (survives a JSON round trip unchanged)', () => {
    const v = view();
    expect(JSON.parse(JSON.stringify(v))).toEqual(v);
  });

  it('runs the sections in the fixed order of the section list, numbering only those present', () => {
    const v = view();
    const order = SECTIONS.map((s) => `sec-${s.name}`);
    // Key findings are built last (they point at the other sections) but sit where the list puts them.
    const ids = v.sections.map((s) => s.id);
    const positions = ids.map((id) => order.indexOf(id));
    expect(positions.every((p) => p >= 0)).toBe(true);
    expect([...positions].sort((a, b) => a - b)).toEqual(positions);
    const numbers = v.sections.filter((s) => s.number).map((s) => Number(s.number));
    expect(numbers).toEqual(numbers.map((_, i) => i + 1));
    expect(v.sections[0]!.id).toBe('sec-title-block');
    expect(v.sections[0]!.number).toBeUndefined();
  });

  it('puts the cautions on the first pages: before the diagrams, tables of data and results', () => {
    const ids = view().sections.map((s) => s.id);
    const cautions = ids.indexOf('sec-cautions');
    expect(cautions).toBeGreaterThan(-1);
    // Only document control, the key findings (which point to the cautions) and the scope come first.
    expect(ids.slice(0, cautions)).toEqual(['sec-title-block', 'sec-key-findings', 'sec-scope']);
    for (const later of ['sec-diagrams', 'sec-events', 'sec-results', 'sec-cut-sets']) expect(ids.indexOf(later)).toBeGreaterThan(cautions);
    const text = viewText(view());
    // The four points the cautions must make (DESIGN.md, "The appendix").
    expect(text).toMatch(/licensed professional engineer/);
    expect(text).toMatch(/regulations, codes and standards, and the owner’s dam-safety guidelines, govern/);
    expect(text).toMatch(/independent except where a common cause is modelled/);
    expect(text).toMatch(/snapshot at 2026-06-30/);
    expect(text).toMatch(/scarce/);
  });

  it('leaves out a section whose data is absent, and closes the numbering up', () => {
    const r = fixtureResults();
    delete r.study.description;
    for (const t of r.tops) delete t.importance;
    const v = buildViewModel(r, fixtureInputs(), { paper: 'a4' });
    expect(section(v, 'sec-description')).toBeUndefined();
    expect(section(v, 'sec-importance')).toBeUndefined();
    const numbers = v.sections.filter((s) => s.number).map((s) => Number(s.number));
    expect(numbers).toEqual(numbers.map((_, i) => i + 1));
    expect(buildViewModel(r, [], { paper: 'a4' }).sections.some((s) => s.id === 'sec-inputs')).toBe(false);
  });

  it('prints the top-event numbers as the analysis gave them, through the one formatter', () => {
    const r = fixtureResults();
    const summary = tables(view()).find((t) => t.id === 'tab-results-summary')!;
    expect(summary.rows.map((row) => row.cells[2])).toEqual(r.tops.map((t) => formatProbability(t.probability.exact)));
    expect(summary.rows[0]!.cells[2]).toBe('1.08E-02');
    const three = tables(view()).find((t) => t.id === 'tab-result-spillway-short')!;
    expect(three.rows.map((row) => row.cells[1])).toEqual(['1.08E-02', '1.08E-02', '1.08E-02']);
  });

  it('shows a visible notice when the result is only a bound, and none otherwise', () => {
    const exact = allBlocks(view()).filter((b) => b.kind === 'callout' && b.tone === 'bound');
    expect(exact).toHaveLength(0);
    const r = fixtureResults();
    r.tops[0]!.probability.basis = 'bound';
    const v = buildViewModel(r, fixtureInputs(), { paper: 'a4' });
    const bound = allBlocks(v).filter((b) => b.kind === 'callout' && b.tone === 'bound');
    expect(bound).toHaveLength(1);
    expect(viewText(v)).toMatch(/This result is a bound, not an exact value/);
    expect(tables(v).find((t) => t.id === 'tab-results-summary')!.rows[0]!.cells[3]).toMatch(/BOUND/);
  });

  it('flags every unsourced number in the provenance register and lists every source', () => {
    const r = fixtureResults();
    const v = view();
    const register = tables(v).find((t) => t.id === 'tab-parameters')!;
    const flagged = register.rows.filter((row) => row.flag).map((row) => row.cells[0]);
    expect(flagged).toEqual(r.parameters.filter((p) => !p.source).map((p) => p.key));
    expect(flagged).toEqual(['hoist-brake.interval', 'generator-fuel-contaminated.probability']);
    const sources = tables(v).find((t) => t.id === 'tab-sources')!;
    expect(sources.rows.map((row) => row.cells[0])).toEqual(r.sources.map((s) => s.id));
    expect(sources.rows.find((row) => row.cells[0] === 'seismic-review-2018')!.cells[4]).toBe('not cited by any number');
  });

  it('lists each assumption with the events and parameters resting on it', () => {
    const v = view();
    const a3 = section(v, 'sec-assumptions')!.blocks;
    const i = a3.findIndex((b) => b.kind === 'subheading' && b.text.startsWith('A3 '));
    const kv = a3.slice(i).find((b) => b.kind === 'keyvalue');
    expect(kv && kv.kind === 'keyvalue' && kv.items.map((x) => x.value)).toEqual([
      'hoist-1-motor, hoist-2-motor, hoist-3-motor, generator-fails-start, plc-fails',
      'hoist-1-motor.exercise, generator-fails-start.interval, plc-fails.interval',
    ]);
  });

  it('shows the basic events with units, ages at as_of and the interval', () => {
    const t = tables(view()).find((x) => x.id === 'tab-events')!;
    const motor = t.rows.find((row) => row.cells[0] === 'hoist-1-motor')!.cells;
    expect(motor).toEqual([
      'hoist-1-motor',
      'Gate 1 hoist motor fails to start or run',
      'Weibull (age)',
      'shape 3.1; scale 75 years',
      '32.2 years',
      '1 month',
      '5.83E-04',
      'field-survey-2019, om-manual-2021',
    ]);
    const brake = t.rows.find((row) => row.cells[0] === 'hoist-1-brake')!;
    expect(brake.flag).toBe(true);
    expect(brake.cells[7]).toBe('brake-vendor-note, unsourced: interval');
    expect(t.rows.find((row) => row.cells[0] === 'crew-on-site')!.cells[6]).toBe('off (0)');
  });

  it('lists at most CUT_SETS_SHOWN cut sets, most probable first, and says how many were left out', () => {
    const v = buildViewModel(bigTreeResults(), [], { paper: 'a4' });
    const t = tables(v).find((x) => x.id === 'tab-cuts-synthetic-top')!;
    expect(t.rows).toHaveLength(CUT_SETS_SHOWN);
    const keys = t.rows.map((row) => row.sortKeys![3] as number);
    expect(keys).toEqual([...keys].sort((a, b) => b - a));
    const text = viewText(v);
    expect(text).toMatch(/The 25 most probable are shown; 35 more are in the cut-set CSV file\./);
    expect(text).toMatch(/12 cut sets were dropped by the cutoff or the order limit, with a total probability of 3\.20E-09\./);
  });

  it('ranks importance by Fussell–Vesely, showing the events that carry a share or would raise the top', () => {
    const v = view();
    const t = tables(v).find((x) => x.id === 'tab-importance-spillway-short')!;
    expect(t.rows.slice(0, 3).map((row) => row.cells[1])).toEqual(['plc-fails', 'telemetry-link-lost', 'debris-blocks-spillway']);
    expect(t.rows[0]!.cells.slice(2)).toEqual(['6.90E-01', '9.97E-01', '6.90E-01', '92.7', '3.22']);
    // Shown: FV at least 1E-03 or RAW at least 10 (src/report/sections/importance.ts); the note counts the rest.
    const all = fixtureResults().tops.find((x) => x.id === 'spillway-short')!.importance!;
    const shown = all.filter((i) => i.fussell_vesely >= 1e-3 || i.raw >= 10);
    expect(t.rows).toHaveLength(shown.length);
    if (shown.length < all.length) expect(t.note).toMatch(new RegExp(`^${all.length - shown.length} events? with FV below`));
  });

  it('records the manifest: tool version, every input digest, the settings and the seed', () => {
    const r = fixtureResults();
    const text = viewText(view());
    expect(text).toContain('faultbook 0.1.0');
    expect(text).toContain(r.inputs.sha256);
    for (const f of r.inputs.files) expect(text).toContain(f.sha256);
    expect(text).toContain('20260630');
    const settings = tables(view()).find((x) => x.id === 'tab-settings')!;
    expect(settings.rows.find((row) => row.cells[0] === 'cutoff')!.cells[1]).toBe('1.00E-12');
  });

  it('carries every input file verbatim in the annex', () => {
    const annex = section(view(), 'sec-inputs')!;
    const pres = annex.blocks.filter((b) => b.kind === 'pre');
    expect(pres.map((p) => p.kind === 'pre' && p.label).sort()).toEqual(fixtureInputs().map((f) => f.path).sort());
    for (const f of fixtureInputs()) {
      const block = pres.find((p) => p.kind === 'pre' && p.label === f.path)!;
      expect(block.kind === 'pre' && `${block.lines.join('\n')}\n`).toBe(f.text);
    }
  });

  it('takes the PDF date from the study (issued, else as_of), never the clock', () => {
    expect(view().meta.date).toBe('2026-11-20');
    const r = fixtureResults();
    delete r.study.issued;
    expect(buildViewModel(r, [], { paper: 'a4' }).meta.date).toBe('2026-06-30');
  });
});
