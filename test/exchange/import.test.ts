// Import of MEF documents written by hand from the standard's text (open-psa/mef, mef/*.rst; the
// section is named beside each). Every model is invented; every number here is invented. Each top
// probability after import is checked against brute-force enumeration of all states of the
// document's basic events, evaluated straight from the standard's definitions of the connectives
// (fault_tree_layer.rst, "Semantics of Boolean connectives") and of the common-cause expansions
// (meta_logical_layer.rst, "Common Cause Groups") as written out in this file — independent of
// faultbook's logic and common-cause code.
import { mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { parse } from 'yaml';
import { afterAll, describe, expect, it } from 'vitest';
import { analyze } from '../../src/analysis/analyze.js';
import { readStudy } from '../../src/study/read.js';
import { faultbook, tempDir } from '../cli/helpers.js';
import { stateProbability } from '../logic/oracle.js';

const work = tempDir('faultbook-exchange-import-');
afterAll(() => rmSync(work, { recursive: true, force: true }));
let serial = 0;

/** Writes the document and imports it (with a snapshot date, as a foreign document states none). */
async function importDoc(xml: string, ...extra: string[]) {
  const dir = join(work, `case-${++serial}`);
  mkdirSync(dir);
  const file = join(dir, 'model.xml');
  writeFileSync(file, xml);
  const out = join(dir, 'study');
  const r = await faultbook('import', file, '--out', out, '--as-of', '2026-01-01', ...extra);
  return { ...r, out, file };
}

function topProbabilities(studyDir: string): Map<string, number> {
  const results = analyze(readStudy(studyDir));
  return new Map(results.tops.map((t) => [t.id, t.probability.exact]));
}

/** P(f) by enumerating every state of the independent events `p` (name → probability). */
function brute(p: Record<string, number>, f: (s: Record<string, boolean>) => boolean): number {
  const names = Object.keys(p);
  const probs = names.map((n) => p[n]!);
  let total = 0;
  for (let state = 0; state < 2 ** names.length; state++) {
    const s: Record<string, boolean> = {};
    names.forEach((n, i) => (s[n] = ((state >>> i) & 1) === 1));
    if (f(s)) total += stateProbability(state, probs);
  }
  return total;
}

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);
const count = (...xs: boolean[]) => xs.filter(Boolean).length;
const doc = (body: string) => `<?xml version="1.0"?>\n<opsa-mef>\n${body}\n</opsa-mef>\n`;
const be = (name: string, p: number, extra = '') => `<define-basic-event name="${name}">${extra}<float value="${p}"/></define-basic-event>`;

describe('import: fault trees (fault_tree_layer.rst)', () => {
  // fault_tree_layer.rst "XML Representation": the section's example structure — TOP = G1 or G2,
  // G1 = H1 and G3 and G4, G2 = not H1 and BE2 and G4, G3 = BE1 or BE3, G4 = BE3 or BE4 — with
  // invented probabilities; the house event is given "true", then left to its default "false"
  // ("Description": house events are false by default).
  const structure = (house: string) =>
    doc(`
  <define-fault-tree name="FT1">
    <define-gate name="top"><or><gate name="g1"/><gate name="g2"/></or></define-gate>
    <define-gate name="g1"><and><house-event name="h1"/><gate name="g3"/><gate name="g4"/></and></define-gate>
    <define-gate name="g2"><and><not><house-event name="h1"/></not><basic-event name="e2"/><gate name="g4"/></and></define-gate>
    <define-gate name="g3"><or><basic-event name="e1"/><basic-event name="e3"/></or></define-gate>
    <define-gate name="g4"><or><basic-event name="e3"/><basic-event name="e4"/></or></define-gate>
    ${house}
  </define-fault-tree>
  <model-data>${be('e1', 0.01)}${be('e2', 0.02)}${be('e3', 0.03)}${be('e4', 0.04)}</model-data>`);
  const p = { e1: 0.01, e2: 0.02, e3: 0.03, e4: 0.04 };
  const top = (h1: boolean) => (s: Record<string, boolean>) => {
    const g3 = s.e1! || s.e3!;
    const g4 = s.e3! || s.e4!;
    return (h1 && g3 && g4) || (!h1 && s.e2! && g4);
  };

  it('house event true: matches brute force; h1 is a switch that is on', async () => {
    const r = await importDoc(structure('<define-house-event name="h1"><constant value="true"/></define-house-event>'));
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const events = parse(readFileSync(join(r.out, 'events.yaml'), 'utf8')).events;
    expect(events.h1).toMatchObject({ model: 'switch', on: true });
    expect(rel(topProbabilities(r.out).get('top')!, brute(p, top(true)))).toBeLessThan(1e-12);
  });

  it('house event without a value is false', async () => {
    const r = await importDoc(structure('<define-house-event name="h1"/>'));
    expect(r.code).toBe(0);
    expect(rel(topProbabilities(r.out).get('top')!, brute(p, top(false)))).toBeLessThan(1e-12);
  });

  it('every connective faultbook represents, nested formulae, pass-through, untyped events and constants', async () => {
    // fault_tree_layer.rst "Semantics of Boolean connectives": and, or, not, atleast; nand = not and,
    // nor = not or. "XML Representation": <event> without a type, a pass-through gate, and formulae
    // nested inside a gate (the recommendation "Layered Models" is only a recommendation).
    const r = await importDoc(
      doc(`
  <define-fault-tree name="kinds">
    <define-gate name="top">
      <label>Everything at once</label>
      <or>
        <and><event name="a"/><not><basic-event name="b"/></not></and>
        <atleast min="2"><basic-event name="b"/><basic-event name="c"/><event name="d" type="basic-event"/></atleast>
        <gate name="pass"/>
      </or>
    </define-gate>
    <define-gate name="pass"><gate name="negations"/></define-gate>
    <define-gate name="negations"><and><nand><basic-event name="a"/><basic-event name="c"/></nand><nor><basic-event name="b"/><basic-event name="e"/></nor><constant value="true"/></and></define-gate>
  </define-fault-tree>
  <model-data>${be('a', 0.1)}${be('b', 0.2)}${be('c', 0.3)}${be('d', 0.4)}${be('e', 0.05)}</model-data>`),
    );
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const logic = parse(readFileSync(join(r.out, 'logic.yaml'), 'utf8'));
    // Nested formulae become gates named <gate>.<n>, numbered in document order.
    expect(logic.tops.top).toEqual({ title: 'Everything at once', gate: 'top' });
    expect(logic.gates.top.any).toEqual(['top.1', 'top.3', 'pass']);
    expect(logic.gates['top.1'].all).toEqual(['a', 'top.2']);
    expect(logic.gates['top.2']).toMatchObject({ not: 'b' });
    expect(logic.gates['top.3']).toMatchObject({ atleast: 2, of: ['b', 'c', 'd'] });
    expect(logic.gates.negations.all).toEqual(['negations.1', 'negations.3', 'constant.true']);
    expect(logic.gates['negations.1']).toMatchObject({ not: 'negations.2' });
    expect(logic.gates['negations.2'].all).toEqual(['a', 'c']);
    const p = { a: 0.1, b: 0.2, c: 0.3, d: 0.4, e: 0.05 };
    const expected = brute(p, (s) => {
      const negations = !(s.a! && s.c!) && !(s.b! || s.e!) && true;
      return (s.a! && !s.b!) || count(s.b!, s.c!, s.d!) >= 2 || negations;
    });
    expect(rel(topProbabilities(r.out).get('top')!, expected)).toBeLessThan(1e-12);
  });

  it('components, private elements and references by name, full path and local path', async () => {
    // fault_tree_layer.rst "Model-Data and Components" and "Solving Name Conflicts: Public versus
    // Private Elements": two private components each declare their own BE2 and gate G; outside
    // them each is reached by its full path (FT.A.G) or local path (B.G inside FT).
    const r = await importDoc(
      doc(`
  <define-fault-tree name="FT">
    <define-gate name="TOP"><and><gate name="FT.A.G"/><gate name="B.G"/></and></define-gate>
    <define-component name="A" role="private">
      <define-gate name="G"><or><basic-event name="BE1"/><basic-event name="BE2"/></or></define-gate>
      <define-basic-event name="BE2"><float value="0.02"/></define-basic-event>
      <define-basic-event name="BE1" role="public"><float value="0.01"/></define-basic-event>
    </define-component>
    <define-component name="B" role="private">
      <define-gate name="G"><or><basic-event name="BE1"/><basic-event name="BE2"/></or></define-gate>
      <define-basic-event name="BE2"><float value="0.05"/></define-basic-event>
    </define-component>
  </define-fault-tree>`),
    );
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const events = parse(readFileSync(join(r.out, 'events.yaml'), 'utf8')).events;
    // A private element keeps its full path as its id; a public one its name.
    expect(Object.keys(events).sort()).toEqual(['BE1', 'FT.A.BE2', 'FT.B.BE2']);
    const p = { BE1: 0.01, A2: 0.02, B2: 0.05 };
    const expected = brute(p, (s) => (s.BE1! || s.A2!) && (s.BE1! || s.B2!));
    expect(rel(topProbabilities(r.out).get('TOP')!, expected)).toBeLessThan(1e-12);
  });

  it('a fault tree split over several define-fault-tree blocks, references between trees, several model-data sections', async () => {
    // fault_tree_layer.rst "Description": events may be used before they are declared and a model may
    // hold several trees; model_organization.rst "Organization of a Model": a model holds any number
    // of fault trees and model-data containers; fault_tree_layer.rst "Use Portable Identifiers": space
    // around a name is noise (" x " is x).
    const r = await importDoc(
      doc(`
  <model-data><define-basic-event name=" x "><float value="0.1"/></define-basic-event></model-data>
  <define-fault-tree name="power">
    <define-gate name="no-power"><and><basic-event name="x"/><gate name="backup-lost"/></and></define-gate>
  </define-fault-tree>
  <define-fault-tree name="plant">
    <define-gate name="plant-fails"><or><gate name="no-power"/><basic-event name="y"/></or></define-gate>
  </define-fault-tree>
  <define-fault-tree name="power">
    <define-gate name="backup-lost"><or><basic-event name="z"/><basic-event name="w"/></or></define-gate>
  </define-fault-tree>
  <model-data>${be('y', 0.01)}${be('z', 0.2)}${be('w', 0.3)}</model-data>`),
    );
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const tops = topProbabilities(r.out);
    expect([...tops.keys()]).toEqual(['plant-fails']);
    const expected = brute({ x: 0.1, y: 0.01, z: 0.2, w: 0.3 }, (s) => (s.x! && (s.z! || s.w!)) || s.y!);
    expect(rel(tops.get('plant-fails')!, expected)).toBeLessThan(1e-12);
  });

  it('labels, attributes, parameters and the exponential built-in with units (stochastic_layer.rst)', async () => {
    // stochastic_layer.rst "Description": Q(t) = 1 − exp(−λt); expressions.rnc: parameters with units.
    const r = await importDoc(
      doc(`
  <label>Invented pumping station</label>
  <define-fault-tree name="station">
    <label>Station logic</label>
    <attributes><attribute name="zone" value="north"/></attributes>
    <define-gate name="no-flow"><label>No flow from either pump</label><attributes><attribute name="owner" value="team-7"/></attributes>
      <and><basic-event name="pump-a"/><basic-event name="pump-b"/></and></define-gate>
  </define-fault-tree>
  <model-data>
    <define-parameter name="lambda" unit="hours-1"><float value="2e-4"/></define-parameter>
    <define-parameter name="mission" unit="hours"><float value="24"/></define-parameter>
    <define-parameter name="p-b"><label>Pump B fails on demand</label><float value="0.003"/></define-parameter>
    <define-parameter name="spare-rate" unit="years-1"><label>Spare pump, not modelled</label><float value="0.02"/></define-parameter>
    <define-basic-event name="pump-a"><label>Pump A fails to run</label><exponential><parameter name="lambda"/><parameter name="mission"/></exponential></define-basic-event>
    <define-basic-event name="pump-b"><label>Pump B fails to start</label><parameter name="p-b"/></define-basic-event>
  </model-data>`),
    );
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const events = parse(readFileSync(join(r.out, 'events.yaml'), 'utf8')).events;
    expect(events['pump-a']).toMatchObject({ title: 'Pump A fails to run', model: 'rate', rate: { value: '0.0002 /h' }, exposure: { value: '24 h' } });
    // A parameter that gives a basic event its probability becomes a class its events share.
    expect(events['pump-b']).toEqual({ title: 'Pump B fails to start', class: 'p-b' });
    const classes = parse(readFileSync(join(r.out, 'events.yaml'), 'utf8')).classes;
    expect(classes['p-b']).toMatchObject({ title: 'Pump B fails on demand', model: 'fixed', probability: { value: 0.003, note: 'MEF parameter p-b' } });
    const study = parse(readFileSync(join(r.out, 'study.yaml'), 'utf8'));
    expect(study.title).toBe('Invented pumping station');
    const assumptions = readFileSync(join(r.out, 'assumptions.md'), 'utf8');
    expect(assumptions).toContain('| station | zone | north |');
    expect(assumptions).toContain('| no-flow | owner | team-7 |');
    // A parameter nothing uses is not part of the model, and is listed rather than dropped.
    expect(assumptions).toContain('| spare-rate | 0.02 | years-1 | Spare pump, not modelled |');
    expect(r.stdout).toContain('1 parameter of the file that nothing uses: listed in assumptions.md A3');
    const expected = (1 - Math.exp(-2e-4 * 24)) * 0.003;
    expect(rel(topProbabilities(r.out).get('no-flow')!, expected)).toBeLessThan(1e-12);
    // sources.yaml names the file and its SHA-256.
    const sources = parse(readFileSync(join(r.out, 'sources.yaml'), 'utf8')).sources;
    const { createHash } = await import('node:crypto');
    const hash = createHash('sha256').update(readFileSync(r.file)).digest('hex');
    expect(sources['imported-model'].reference).toBe(`file model.xml, SHA-256 ${hash}`);
  });
});

describe('import: common-cause groups (meta_logical_layer.rst "Common Cause Groups")', () => {
  /** Every non-empty subset of the members, as the standard's expansion makes them. */
  function subsets(members: string[]): string[][] {
    const out: string[][] = [];
    for (let mask = 1; mask < 2 ** members.length; mask++) out.push(members.filter((_, i) => (mask >>> i) & 1));
    return out;
  }
  const choose = (n: number, k: number): number => (k === 0 ? 1 : (choose(n - 1, k - 1) * n) / k);

  /** Brute force of "at least k of the members fail" under the standard's expansion with Q_k per subset size. */
  function bruteGroup(members: string[], qBySize: (k: number) => number, k: number): number {
    const vars: Record<string, number> = {};
    for (const s of subsets(members)) {
      const q = qBySize(s.length);
      if (q > 0) vars[s.join('+')] = q;
    }
    return brute(vars, (state) => {
      const failed = members.filter((m) => Object.keys(vars).some((v) => state[v] && v.split('+').includes(m)));
      return failed.length >= k;
    });
  }

  const group = (model: string, members: string[], factors: string, q: number) =>
    doc(`
  <define-fault-tree name="ccf">
    <define-gate name="two-fail"><atleast min="2">${members.map((m) => `<basic-event name="${m}"/>`).join('')}</atleast></define-gate>
    <define-CCF-group name="pumps" model="${model}">
      <label>Like pumps</label>
      <members>${members.map((m) => `<basic-event name="${m}"/>`).join('')}</members>
      <distribution><float value="${q}"/></distribution>
      ${factors}
    </define-CCF-group>
  </define-fault-tree>`);

  it('beta-factor: independent (1 − β)Q, all members together βQ', async () => {
    const members = ['pa', 'pb', 'pc'];
    const r = await importDoc(group('beta-factor', members, '<factor><float value="0.1"/></factor>', 0.01));
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const expected = bruteGroup(members, (k) => (k === 1 ? 0.9 * 0.01 : k === 3 ? 0.1 * 0.01 : 0), 2);
    expect(rel(topProbabilities(r.out).get('two-fail')!, expected)).toBeLessThan(1e-12);
  });

  it('MGL with four members and the factors of the section example (0.10, 0.20, 0.30)', async () => {
    const members = ['pumpA', 'pumpB', 'pumpC', 'pumpD'];
    const factors = '<factors><factor level="2"><float value="0.10"/></factor><factor level="3"><float value="0.20"/></factor><factor level="4"><float value="0.30"/></factor></factors>';
    const r = await importDoc(group('MGL', members, factors, 0.02));
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    // The section's Q_k for a group of 4: Q1 = (1 − ρ2)Q, Q2 = ρ2(1 − ρ3)Q/3, Q3 = ρ2ρ3(1 − ρ4)Q/3, Q4 = ρ2ρ3ρ4Q.
    const [r2, r3, r4, Q] = [0.1, 0.2, 0.3, 0.02];
    const q = [0, (1 - r2) * Q, (r2 * (1 - r3) * Q) / 3, (r2 * r3 * (1 - r4) * Q) / 3, r2 * r3 * r4 * Q];
    const expected = bruteGroup(members, (k) => q[k]!, 2);
    expect(rel(topProbabilities(r.out).get('two-fail')!, expected)).toBeLessThan(1e-12);
  });

  it('alpha-factor: Q_k = k/C(n−1,k−1) · α_k/Σ iα_i · Q', async () => {
    const members = ['va', 'vb', 'vc'];
    const alphas = [0.95, 0.04, 0.01];
    const factors = `<factors>${alphas.map((a, i) => `<factor level="${i + 1}"><float value="${a}"/></factor>`).join('')}</factors>`;
    const r = await importDoc(group('alpha-factor', members, factors, 0.003));
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const alphaT = alphas.reduce((s, a, i) => s + (i + 1) * a, 0);
    const expected = bruteGroup(members, (k) => ((k / choose(2, k - 1)) * alphas[k - 1]!) / alphaT * 0.003, 2);
    expect(rel(topProbabilities(r.out).get('two-fail')!, expected)).toBeLessThan(1e-12);
    const logic = parse(readFileSync(join(r.out, 'logic.yaml'), 'utf8'));
    expect(logic.common_cause.pumps).toMatchObject({ method: 'alpha', testing: 'non-staggered', members });

    // The section's formula divides by Σ iα_i: factors given as percentages describe the same group.
    const percent = `<factors>${alphas.map((a, i) => `<factor level="${i + 1}"><float value="${a * 100}"/></factor>`).join('')}</factors>`;
    const scaled = await importDoc(group('alpha-factor', members, percent, 0.003));
    expect(scaled.code).toBe(0);
    expect(rel(topProbabilities(scaled.out).get('two-fail')!, expected)).toBeLessThan(1e-12);
  });
});

describe('import: what faultbook cannot represent stops the import with its position', () => {
  const cases: { name: string; xml: string; message: RegExp; line: number; col: number }[] = [
    {
      // fault_tree_layer.rst, semantics of connectives: xor exists in the standard, not in faultbook's logic.
      name: 'xor gate',
      xml: doc(`<define-fault-tree name="t">\n  <define-gate name="g">\n    <xor><basic-event name="a"/><basic-event name="b"/></xor>\n  </define-gate>\n</define-fault-tree>\n<model-data>${be('a', 0.1)}${be('b', 0.1)}</model-data>`),
      message: /<xor> in the formula of gate 'g' is not supported[\s\S]*expected: one of: and, or, not, atleast, nand, nor/,
      line: 5,
      col: 5,
    },
    {
      // model_organization.rst "Splitting the Model into Several Files": include.
      name: 'include directive',
      xml: doc('<include file="other.xml"/>'),
      message: /<include> at the top of an MEF model is not supported/,
      line: 3,
      col: 1,
    },
    {
      // meta_logical_layer.rst "Common Cause Groups": the phi-factor model.
      name: 'phi-factor group',
      xml: doc(`<define-CCF-group name="g" model="phi-factor"><members><basic-event name="a"/><basic-event name="b"/></members><distribution><float value="0.1"/></distribution><factors><factor level="1"><float value="0.9"/></factor><factor level="2"><float value="0.1"/></factor></factors></define-CCF-group>`),
      message: /CCF group 'g' uses model "phi-factor"[\s\S]*beta-factor, MGL or alpha-factor/,
      line: 3,
      col: 1,
    },
    {
      // fault_tree_layer.rst "XML Representation": basic events need not be declared — but then they have no probability.
      name: 'undeclared basic event',
      xml: doc(`<define-fault-tree name="t"><define-gate name="g"><or><basic-event name="ghost"/><basic-event name="a"/></or></define-gate></define-fault-tree>\n<model-data>${be('a', 0.1)}</model-data>`),
      message: /basic event 'ghost' is not declared, so it has no probability/,
      line: 3,
      col: 55,
    },
    {
      // fault_tree_layer.rst, semantics table: at least k of the n arguments — k above n cannot be meant.
      name: 'atleast above its argument count',
      xml: doc(`<define-fault-tree name="t">\n<define-gate name="g"><atleast min="3"><basic-event name="a"/><basic-event name="b"/></atleast></define-gate>\n</define-fault-tree>\n<model-data>${be('a', 0.1)}${be('b', 0.1)}</model-data>`),
      message: /atleast min="3" has 2 arguments[\s\S]*a min between 1 and 2/,
      line: 4,
      col: 23,
    },
    {
      name: 'declared twice',
      xml: doc(`<model-data>\n${be('a', 0.1)}\n${be('a', 0.2)}\n</model-data>`),
      message: /'a' is declared twice \(first at line 4, column 1\)/,
      line: 5,
      col: 1,
    },
    {
      // meta_logical_layer.rst "Common Cause Groups": the group gives its members their distribution.
      name: 'a CCF member declared again as a basic event',
      xml: doc(`<define-fault-tree name="t"><define-gate name="g"><and><basic-event name="a"/><basic-event name="b"/></and></define-gate>\n<define-CCF-group name="ab" model="beta-factor"><members><basic-event name="a"/><basic-event name="b"/></members><distribution><float value="0.1"/></distribution><factor><float value="0.1"/></factor></define-CCF-group></define-fault-tree>\n<model-data>${be('a', 0.1)}</model-data>`),
      message: /'a' is a member of CCF group 'ab' and is declared again \(the other declaration is at line 4, column 58\)[\s\S]*needs no define-basic-event/,
      line: 5,
      col: 13,
    },
    {
      // stochastic_layer.rst "Random Deviates": faultbook takes point values only.
      name: 'lognormal deviate',
      xml: doc(`<define-fault-tree name="t"><define-gate name="g"><or><basic-event name="a"/><basic-event name="b"/></or></define-gate></define-fault-tree>\n<model-data>${be('a', 0.1)}<define-basic-event name="b"><lognormal-deviate><float value="1e-3"/><float value="3"/><float value="0.95"/></lognormal-deviate></define-basic-event></model-data>`),
      message: /<lognormal-deviate> in basic event 'b' is not supported/,
      line: 4,
      col: 112,
    },
    {
      // fault_tree_layer.rst "Description": the equations must contain no loop.
      name: 'loop',
      xml: doc(`<define-fault-tree name="t">\n<define-gate name="g1"><or><gate name="g2"/><basic-event name="a"/></or></define-gate>\n<define-gate name="g2"><and><gate name="g1"/><basic-event name="a"/></and></define-gate>\n</define-fault-tree>\n<model-data>${be('a', 0.1)}</model-data>`),
      message: /gate 'g1' depends on itself: g1 → g2 → g1/,
      line: 4,
      col: 24,
    },
    {
      // event_tree_layer.rst: not carried (see README).
      name: 'event tree',
      xml: doc('<define-event-tree name="et"/>'),
      message: /<define-event-tree> at the top of an MEF model is not supported/,
      line: 3,
      col: 1,
    },
    {
      name: 'reference of the wrong type',
      xml: doc(`<define-fault-tree name="t"><define-gate name="g"><or><gate name="a"/><basic-event name="a"/></or></define-gate></define-fault-tree>\n<model-data>${be('a', 0.1)}</model-data>`),
      message: /'a' is referred to as a gate but declared as a basic-event/,
      line: 3,
      col: 55,
    },
    {
      name: 'not well-formed',
      xml: '<?xml version="1.0"?>\n<opsa-mef>\n  <define-fault-tree name="t">\n</opsa-mef>\n',
      message: /not well-formed XML/,
      line: 4,
      col: 11,
    },
    {
      name: 'entity declarations',
      xml: '<?xml version="1.0"?>\n<!DOCTYPE opsa-mef [ <!ENTITY part SYSTEM "part.xml"> ]>\n<opsa-mef/>\n',
      message: /declares entities/,
      line: 2,
      col: 56,
    },
    {
      name: 'formulae nested past the depth limit',
      xml: doc(`<define-fault-tree name="t"><define-gate name="g">${'<or>'.repeat(300)}<basic-event name="a"/>${'</or>'.repeat(300)}</define-gate></define-fault-tree>`),
      message: /elements are nested more than 256 deep/,
      line: 3,
      col: 50 + 4 * 253 + 1,
    },
    {
      name: 'another root element',
      xml: '<?xml version="1.0"?>\n<model/>\n',
      message: /the root element is <model>[\s\S]*<opsa-mef>/,
      line: 2,
      col: 1,
    },
  ];
  for (const c of cases) {
    it(`${c.name}: exit 2, file:line:col, what is supported; nothing written`, async () => {
      const r = await importDoc(c.xml);
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(c.message);
      expect(r.stderr).toContain(`error: model.xml:${c.line}:${c.col}:`);
      expect(r.stderr).not.toMatch(/\bat .*\.(ts|js):\d+/); // no stack trace
      expect(() => readFileSync(join(r.out, 'study.yaml'))).toThrow();
    });
  }
});

describe('import: encodings (fault_tree_layer.rst "Use Portable Identifiers": UTF-8 and UTF-16)', () => {
  const text = doc(`<define-fault-tree name="t"><define-gate name="g"><or><basic-event name="a"/><basic-event name="b"/></or></define-gate></define-fault-tree><model-data>${be('a', 0.1)}${be('b', 0.2)}</model-data>`)
    .replace('<?xml version="1.0"?>', '<?xml version="1.0" encoding="UTF-16"?>')

  const expected = 1 - 0.9 * 0.8;
  const cases: [string, Buffer][] = [
    ['UTF-8 with a byte-order mark', Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from(text.replace('UTF-16', 'UTF-8'))])],
    ['UTF-16 little-endian', Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(text, 'utf16le')])],
    ['UTF-16 big-endian', Buffer.concat([Buffer.from([0xfe, 0xff]), Buffer.from(text, 'utf16le').swap16()])],
  ];
  for (const [name, bytes] of cases) {
    it(name, async () => {
      const dir = join(work, `enc-${++serial}`);
      mkdirSync(dir);
      const file = join(dir, 'model.xml');
      writeFileSync(file, bytes);
      const r = await faultbook('import', file, '--out', join(dir, 'study'), '--as-of', '2026-01-01');
      expect(r.stderr).toBe('');
      expect(r.code).toBe(0);
      expect(rel(topProbabilities(join(dir, 'study')).get('g')!, expected)).toBeLessThan(1e-12);
    });
  }
});

describe('import: the output folder', () => {
  const model = doc(`<define-fault-tree name="t"><define-gate name="g"><or><basic-event name="a"/><basic-event name="b"/></or></define-gate></define-fault-tree><model-data>${be('a', 0.1)}${be('b', 0.2)}</model-data>`);

  it('refuses a non-empty folder unless --force, and leaves it as it was', async () => {
    const dir = join(work, 'busy');
    mkdirSync(dir);
    writeFileSync(join(dir, 'notes.txt'), 'mine');
    const file = join(work, 'busy-model.xml');
    writeFileSync(file, model);
    const refused = await faultbook('import', file, '--out', dir, '--as-of', '2026-01-01');
    expect(refused.code).toBe(2);
    expect(refused.stderr).toMatch(/exists and is not empty[\s\S]*--force/);
    expect(readFileSync(join(dir, 'notes.txt'), 'utf8')).toBe('mine');
    const forced = await faultbook('import', file, '--out', dir, '--as-of', '2026-01-01', '--force');
    expect(forced.code).toBe(0);
    expect(readFileSync(join(dir, 'notes.txt'), 'utf8')).toBe('mine');
    expect(readStudy(dir).tops.map((t) => t.id)).toEqual(['g']);
  });

  it('refuses --out naming the input file', async () => {
    const file = join(work, 'self.xml');
    writeFileSync(file, model);
    const r = await faultbook('import', file, '--out', file, '--as-of', '2026-01-01', '--force');
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/is the input/);
    expect(readFileSync(file, 'utf8')).toBe(model);
  });

  it('asks for --as-of when the document states no snapshot date', async () => {
    const file = join(work, 'undated.xml');
    writeFileSync(file, model);
    const r = await faultbook('import', file, '--out', join(work, 'undated'));
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/states no snapshot date[\s\S]*--as-of/);
  });
});
