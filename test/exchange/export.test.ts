// faultbook export on an invented study that uses every construct the export maps: each gate kind
// (any, all, atleast, not), a top whose id is its gate's, switch events on and off, fixed (through a
// class) and rate models, a Weibull written as its value at as_of, and common-cause groups of each
// method (beta in the example study; MGL, alpha non-staggered and alpha staggered here). Checked:
// the document against the standard's grammar (xmllint, RELAX NG), the elements the standard's text
// names for each construct (section beside each), and export → import → analysis giving the same
// tops and cut sets as the study itself.
import { mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { analyze } from '../../src/analysis/analyze.js';
import { parseXml, type XmlElement } from '../../src/exchange/xml-read.js';
import { readStudy } from '../../src/study/read.js';
import { faultbook, tempDir } from '../cli/helpers.js';
import { expectSameTops, haveXmllint, validateAgainstGrammar } from './helpers.js';

const work = tempDir('faultbook-exchange-export-');
afterAll(() => rmSync(work, { recursive: true, force: true }));

// An INVENTED study: no real facility, every number invented.
const FILES: Record<string, string> = {
  'study.yaml': `# Invented study for the exchange tests; every number is invented.
format: faultbook/1
title: Invented flood pumping station (exchange test)
facility: Invented station
revision: C
status: draft
prepared_by: [Invented author]
reviewed_by: []
as_of: 2026-06-30
settings: { cutoff: 1e-15, max_order: 5 }
`,
  'logic.yaml': `tops:
  station-fails: { title: Station cannot pump the flood, gate: station-fails }
  no-control: { title: No control of the pumps, gate: control-lost }
gates:
  station-fails: { title: Station fails, any: [pumps-short, valves-stuck, control-lost] }
  pumps-short: { title: Two of three pumps fail, atleast: 2, of: [pump-a, pump-b, pump-c] }
  valves-stuck: { title: Both discharge valves stuck, all: [valve-a, valve-b, valve-c] }
  control-lost: { title: Control lost, any: [plc-fails, manual-lost] }
  manual-lost: { title: Manual control lost while not bypassed at night, all: [operator-absent, no-bypass, night-shift] }
  no-bypass: { not: bypass-installed }
common_cause:
  pumps:
    members: [pump-a, pump-b, pump-c]
    method: mgl
    beta: { value: 0.08, source: invented-data }
    gamma: { value: 0.3, source: invented-data }
  valves:
    members: [valve-a, valve-b, valve-c]
    method: alpha
    testing: staggered
    alpha1: 0.96
    alpha2: 0.03
    alpha3: 0.01
  sensors:
    members: [sensor-a, sensor-b]
    method: alpha
    testing: non-staggered
    alpha1: 0.97
    alpha2: 0.03
`,
  'events.yaml': `classes:
  pump: { title: Pump fails to start, model: fixed, probability: { value: 3e-3, source: invented-data } }
  valve: { title: Valve fails to open, model: rate, rate: { value: 2e-6 /h, source: invented-data }, exposure: 1 month }
events:
  pump-a: { class: pump, title: Pump A fails to start }
  pump-b: { class: pump, title: Pump B fails to start }
  pump-c: { class: pump, title: Pump C fails to start }
  valve-a: { class: valve, title: Valve A stuck }
  valve-b: { class: valve, title: Valve B stuck }
  valve-c: { class: valve, title: Valve C stuck }
  sensor-a: { title: Level sensor A fails, model: fixed, probability: 1e-3 }
  sensor-b: { title: Level sensor B fails, model: fixed, probability: 1e-3 }
  plc-fails:
    title: Controller fails
    model: weibull
    shape: 1.8
    scale: 40 years
    installed: 2001-04
    exercise: 1 week
  operator-absent: { title: No operator on site, model: fixed, probability: 0.05 }
  bypass-installed: { title: Hard-wired bypass installed, model: switch, on: false }
  night-shift: { title: Station in its night-shift mode, model: switch, on: true }
`,
  'sources.yaml': `sources:
  invented-data: { title: Invented data for the exchange tests, invented: true }
`,
  'assumptions.md': '# Assumptions (invented)\n\n## A1 Invented\nEverything here is invented.\n',
};

function makeStudy(): string {
  const dir = join(work, 'study');
  mkdirSync(dir, { recursive: true });
  for (const [name, text] of Object.entries(FILES)) writeFileSync(join(dir, name), text);
  return dir;
}

const find = (root: XmlElement, name: string, attr?: Record<string, string>): XmlElement[] => {
  const out: XmlElement[] = [];
  const walk = (e: XmlElement) => {
    if (e.name === name && Object.entries(attr ?? {}).every(([k, v]) => e.attributes[k] === v)) out.push(e);
    e.children.forEach(walk);
  };
  walk(root);
  return out;
};

describe('faultbook export', () => {
  it('maps every construct, is valid against the standard grammar, and round-trips to the same numbers', async () => {
    const study = makeStudy();
    const xmlFile = join(work, 'station.xml');
    const r = await faultbook('export', study, '--out', xmlFile);
    // The invented study leaves some values without a source on purpose; nothing else may be said.
    expect(r.stderr.replace(/^warning: .*\[unsourced\].*\n/gm, '')).toBe('');
    expect(r.code).toBe(0);
    // The Weibull has no expression in the standard: its value at as_of, listed in the output.
    expect(r.stdout).toMatch(/plc-fails: weibull: shape = 1\.8, scale = 40 years, exercise = 1 week, age [\d.]+ years from 2001-04, exercise basis end → [\d.e-]+ at 2026-06-30/);
    expect(r.stdout).toMatch(/common-cause group valves: alpha factors for staggered testing/);

    if (haveXmllint()) {
      const verdict = validateAgainstGrammar(xmlFile);
      expect(verdict.output).toContain('validates');
      expect(verdict.ok).toBe(true);
    }

    const root = parseXml('station.xml', readFileSync(xmlFile, 'utf8'));
    // fault_tree_layer.rst "XML Representation": a top whose id is not its gate's is a pass-through gate.
    const topGate = find(root, 'define-gate', { name: 'no-control' })[0]!;
    expect(topGate.children.map((c) => c.name)).toEqual(['label', 'gate']);
    // Connectives (fault_tree_layer.rst, semantics table): atleast with min, and, or, not.
    expect(find(find(root, 'define-gate', { name: 'pumps-short' })[0]!, 'atleast', { min: '2' })).toHaveLength(1);
    expect(find(find(root, 'define-gate', { name: 'no-bypass' })[0]!, 'not')).toHaveLength(1);
    // House events (fault_tree_layer.rst "Description") carry their base-case value.
    expect(find(find(root, 'define-house-event', { name: 'night-shift' })[0]!, 'constant', { value: 'true' })).toHaveLength(1);
    // stochastic_layer.rst: the rate model is the exponential built-in of parameters with units.
    const operator = find(root, 'define-basic-event', { name: 'operator-absent' })[0]!;
    expect(find(operator, 'parameter', { name: 'operator-absent-probability' })).toHaveLength(1);
    expect(find(root, 'define-parameter', { name: 'valve-rate', unit: 'years-1' })).toHaveLength(1);
    // meta_logical_layer.rst "Common Cause Groups": the models by name.
    expect(find(root, 'define-CCF-group').map((g) => `${g.attributes.name}:${g.attributes.model}`)).toEqual(['pumps:MGL', 'valves:alpha-factor', 'sensors:alpha-factor']);
    expect(find(find(root, 'define-CCF-group', { name: 'pumps' })[0]!, 'factor').map((f) => f.attributes.level)).toEqual(['2', '3']);

    const imported = join(work, 'imported');
    const back = await faultbook('import', xmlFile, '--out', imported);
    expect(back.stderr).toBe('');
    expect(back.code).toBe(0);
    expectSameTops(analyze(readStudy(study)), analyze(readStudy(imported)));
  }, 60_000);

  it('refuses an --out that is one of the study files, and an existing file without --force', async () => {
    const study = makeStudy();
    const own = await faultbook('export', study, '--out', join(study, 'logic.yaml'));
    expect(own.code).toBe(2);
    expect(own.stderr).toMatch(/one of the study's own files/);
    expect(readFileSync(join(study, 'logic.yaml'), 'utf8')).toBe(FILES['logic.yaml']);
    const file = join(work, 'taken.xml');
    writeFileSync(file, 'keep');
    const taken = await faultbook('export', study, '--out', file);
    expect(taken.code).toBe(2);
    expect(readFileSync(file, 'utf8')).toBe('keep');
    expect((await faultbook('export', study, '--out', file, '--force')).code).toBe(0);
  });

  it('a top named like a gate that other gates use is an input error (it would come back as no top)', async () => {
    // fault_tree_layer.rst "Description": a top event is a variable that appears on no right-hand side.
    const study = makeStudy();
    writeFileSync(join(study, 'logic.yaml'), FILES['logic.yaml']!.replace('no-control: { title: No control of the pumps, gate: control-lost }', 'control-lost: { title: No control of the pumps, gate: control-lost }'));
    const r = await faultbook('export', study, '--out', join(work, 'top.xml'));
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/error: logic\.yaml:3:\d+: top 'control-lost' has the id of its gate, which other gates use/);
  });

  it('an id the standard cannot carry is an input error naming it', async () => {
    const study = makeStudy();
    writeFileSync(join(study, 'logic.yaml'), FILES['logic.yaml']!.replaceAll('control-lost', 'control.lost'));
    const r = await faultbook('export', study, '--out', join(work, 'bad.xml'));
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/error: logic\.yaml:\d+:\d+: gate 'control\.lost' is not a portable MEF name/);
  });
});
