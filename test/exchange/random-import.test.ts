// Random MEF fault trees (seeded fast-check): nested formulae of every connective faultbook imports
// (and, or, not, atleast, nand, nor), pass-throughs, house events and Boolean constants, written as
// XML and imported. Each top's probability after import must equal brute-force enumeration of the
// document's basic events, evaluated straight from the XML with the standard's semantics of the
// connectives (fault_tree_layer.rst, "Semantics of Boolean connectives"; house events false unless
// given, "Description"; a gate nobody references is a top). A random document that mixes in
// constructs faultbook does not import must end in exit 2, never in a fault (exit 1).
import { rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import fc from 'fast-check';
import { afterAll, describe, expect, it } from 'vitest';
import { analyze } from '../../src/analysis/analyze.js';
import { parseXml, type XmlElement } from '../../src/exchange/xml-read.js';
import { readStudy } from '../../src/study/read.js';
import { faultbook, tempDir } from '../cli/helpers.js';
import { stateProbability } from '../logic/oracle.js';

const work = tempDir('faultbook-exchange-random-');
afterAll(() => rmSync(work, { recursive: true, force: true }));

const EVENTS = 6;
const HOUSES = 2;
const GATES = 4;

type Formula =
  | { ref: 'basic-event' | 'house-event' | 'gate'; index: number }
  | { constant: boolean }
  | { op: 'and' | 'or' | 'nand' | 'nor' | 'xor'; args: Formula[] }
  | { op: 'not'; args: [Formula] }
  | { op: 'atleast'; k: number; args: Formula[] };

/** A formula of gate `g`: it may name basic events, house events and gates after g (no loops). */
function formula(g: number, allowUnsupported: boolean): fc.Arbitrary<Formula> {
  const refs: fc.Arbitrary<Formula>[] = [
    fc.integer({ min: 0, max: EVENTS - 1 }).map((index) => ({ ref: 'basic-event' as const, index })),
    fc.integer({ min: 0, max: HOUSES - 1 }).map((index) => ({ ref: 'house-event' as const, index })),
    fc.boolean().map((constant) => ({ constant })),
  ];
  if (g + 1 < GATES) refs.push(fc.integer({ min: g + 1, max: GATES - 1 }).map((index) => ({ ref: 'gate' as const, index })));
  const leaf = fc.oneof(...refs);
  const { node } = fc.letrec<{ node: Formula }>((tie) => {
    const args = fc.array(tie('node'), { minLength: 1, maxLength: 3 });
    const ops: fc.Arbitrary<Formula>[] = [
      leaf,
      fc.record({ op: fc.constantFrom('and' as const, 'or' as const, 'nand' as const, 'nor' as const), args }),
      tie('node').map((a) => ({ op: 'not' as const, args: [a] as [Formula] })),
      args.chain((as) => fc.integer({ min: 1, max: as.length }).map((k) => ({ op: 'atleast' as const, k, args: as }))),
    ];
    if (allowUnsupported) ops.push(fc.record({ op: fc.constant('xor' as const), args }));
    return { node: fc.oneof({ depthSize: 'small', maxDepth: 3, withCrossShrink: true }, ...ops) };
  });
  return node;
}

const toXml = (f: Formula): string => {
  if ('ref' in f) return `<${f.ref} name="${f.ref === 'gate' ? 'g' : f.ref === 'house-event' ? 'h' : 'e'}${f.index}"/>`;
  if ('constant' in f) return `<constant value="${f.constant}"/>`;
  const inner = f.args.map(toXml).join('');
  return f.op === 'atleast' ? `<atleast min="${f.k}">${inner}</atleast>` : `<${f.op}>${inner}</${f.op}>`;
};

/** The standard's semantics, evaluated on the XML itself. */
function evaluate(el: XmlElement, state: (name: string) => boolean, gates: Map<string, XmlElement>): boolean {
  const args = () => el.children.map((c) => evaluate(c, state, gates));
  switch (el.name) {
    case 'basic-event':
    case 'house-event':
      return state(el.attributes.name!);
    case 'gate':
      return evaluate(gates.get(el.attributes.name!)!, state, gates);
    case 'constant':
      return el.attributes.value === 'true';
    case 'and':
      return args().every(Boolean);
    case 'or':
      return args().some(Boolean);
    case 'not':
      return !args()[0];
    case 'nand':
      return !args().every(Boolean);
    case 'nor':
      return !args().some(Boolean);
    case 'atleast':
      return args().filter(Boolean).length >= Number(el.attributes.min);
    default:
      throw new Error(`unexpected <${el.name}>`);
  }
}

const documentOf = (gates: Formula[], p: number[], houses: boolean[]) =>
  `<?xml version="1.0"?>\n<opsa-mef>\n<define-fault-tree name="random">\n${gates
    .map((f, g) => `<define-gate name="g${g}">${toXml(f)}</define-gate>`)
    .join('\n')}\n</define-fault-tree>\n<model-data>\n${p.map((q, i) => `<define-basic-event name="e${i}"><float value="${q}"/></define-basic-event>`).join('\n')}\n${houses
    .map((h, i) => `<define-house-event name="h${i}"><constant value="${h}"/></define-house-event>`)
    .join('\n')}\n</model-data>\n</opsa-mef>\n`;

let serial = 0;
let compared = 0;

describe('import of random MEF fault trees', () => {
  it('gives every top the probability brute force gives the document', async () => {
    const gateFormulas = fc.tuple(...Array.from({ length: GATES }, (_, g) => formula(g, false)));
    const probs = fc.array(fc.double({ min: 0.01, max: 0.9, noNaN: true }), { minLength: EVENTS, maxLength: EVENTS });
    const houses = fc.array(fc.boolean(), { minLength: HOUSES, maxLength: HOUSES });
    await fc.assert(
      fc.asyncProperty(gateFormulas, probs, houses, async (gates, p, h) => {
        const dir = join(work, `ok-${++serial}`);
        const file = `${dir}.xml`;
        const xml = documentOf(gates, p, h);
        writeFileSync(file, xml);
        const r = await faultbook('import', file, '--out', dir, '--as-of', '2026-01-01');
        // An atleast that lists one reference twice is refused (exit 2) by design; anything else must import.
        if (r.code === 2 && /atleast lists an argument twice/.test(r.stderr)) return;
        expect(r.stderr).toBe('');
        expect(r.code).toBe(0);

        const root = parseXml('random.xml', xml);
        const gateEls = new Map(
          root.children[0]!.children.map((d) => [d.attributes.name!, d.children[0]!] as [string, XmlElement]),
        );
        const referenced = new Set<string>();
        const walk = (e: XmlElement) => (e.name === 'gate' ? referenced.add(e.attributes.name!) : e.children.forEach(walk));
        gateEls.forEach(walk);
        const houseOf = (name: string) => h[Number(name.slice(1))]!;
        const results = analyze(readStudy(dir));
        for (const [name, body] of gateEls) {
          if (referenced.has(name)) continue;
          let expected = 0;
          for (let s = 0; s < 2 ** EVENTS; s++) {
            const state = (n: string) => (n.startsWith('h') ? houseOf(n) : ((s >>> Number(n.slice(1))) & 1) === 1);
            if (evaluate(body, state, gateEls)) expected += stateProbability(s, p);
          }
          const top = results.tops.find((t) => t.id === name);
          expect(top, `top ${name}`).toBeDefined();
          compared++;
          expect(Math.abs(top!.probability.exact - expected), `top ${name}`).toBeLessThanOrEqual(1e-12 * Math.max(1, expected));
        }
        rmSync(dir, { recursive: true, force: true });
        rmSync(file, { force: true });
      }),
      { numRuns: 40, seed: 20261204 },
    );
    // The property must have compared tops in most runs (a skip for every case would prove nothing).
    expect(compared).toBeGreaterThanOrEqual(40);
  }, 240_000);

  it('refuses what it cannot represent with exit 2, never a fault', async () => {
    const gateFormulas = fc.tuple(...Array.from({ length: GATES }, (_, g) => formula(g, true)));
    const probs = fc.array(fc.double({ min: 0.01, max: 0.9, noNaN: true }), { minLength: EVENTS, maxLength: EVENTS });
    await fc.assert(
      fc.asyncProperty(gateFormulas, probs, async (gates, p) => {
        const dir = join(work, `any-${++serial}`);
        const file = `${dir}.xml`;
        const xml = documentOf(gates, p, [false, true]);
        writeFileSync(file, xml);
        const r = await faultbook('import', file, '--out', dir, '--as-of', '2026-01-01');
        expect([0, 2], r.stderr).toContain(r.code);
        if (xml.includes('<xor>')) {
          expect(r.code).toBe(2);
          expect(r.stderr).toMatch(/error: any-\d+\.xml:\d+:\d+: <xor> in the formula of gate/);
        }
        rmSync(dir, { recursive: true, force: true });
        rmSync(file, { force: true });
      }),
      { numRuns: 40, seed: 20261205 },
    );
  }, 240_000);
});
