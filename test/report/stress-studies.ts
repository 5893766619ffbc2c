/**
 * Study folders that stress the logic diagrams (INVENTED structures and numbers, built only to test
 * the drawing, not any real system): a chain of gates thousands deep, one OR gate of thousands of
 * inputs, and titles full of characters that markup gives a meaning to.
 *
 * Each writes a complete study (study.yaml, events.yaml, logic.yaml, sources.yaml) into `dir`;
 * the caller owns the folder and removes it.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { EventResult, Results } from '../../src/analysis/results.js';
import { fixtureResults } from './fixture.js';

interface StudyParts {
  title: string;
  events: string[];
  logic: string[];
  /** Monte Carlo trials; few, since these studies test the report. */
  samples?: number;
}

function writeStudy(dir: string, parts: StudyParts): string {
  mkdirSync(dir, { recursive: true });
  writeFileSync(
    join(dir, 'study.yaml'),
    [
      'format: faultbook/1',
      `title: ${JSON.stringify(parts.title)}`,
      'facility: Stress facility (invented)',
      'revision: A',
      'status: draft',
      'prepared_by: [Test author]',
      'reviewed_by: []',
      'as_of: 2026-06-30',
      'scope: |',
      '  An invented structure that stresses the logic diagrams.',
      'description: |',
      '  Invented for a test; no real system.',
      `settings: { cutoff: 1e-15, max_order: 4, samples: ${parts.samples ?? 200}, seed: 7 }`,
      '',
    ].join('\n'),
  );
  writeFileSync(join(dir, 'events.yaml'), ['events:', ...parts.events, ''].join('\n'));
  writeFileSync(join(dir, 'logic.yaml'), [...parts.logic, ''].join('\n'));
  writeFileSync(join(dir, 'sources.yaml'), ['sources:', '  stress-source:', '    title: Values invented for a test', '    invented: true', ''].join('\n'));
  return dir;
}

function demandEvent(id: string, title: string, p: string): string[] {
  return [`  ${id}:`, `    title: ${JSON.stringify(title)}`, '    model: demand', `    probability: { value: ${p}, source: stress-source }`];
}

/**
 * A chain `depth` gates deep: gate i is an OR of gate i+1 and one basic event; the last gate is an
 * OR of two events. Every gate is used once (nothing shared), so only size can split it.
 */
export function writeChainStudy(dir: string, depth: number): string {
  const events: string[] = [];
  const logic = ['tops:', '  chain-top:', '    title: The end of a long chain fails (invented)', '    gate: link-1', 'gates:'];
  for (let i = 1; i <= depth; i++) {
    events.push(...demandEvent(`part-${i}`, `Part ${i} of the chain fails`, '1e-7'));
    const next = i === depth ? `part-${depth + 1}` : `link-${i + 1}`;
    logic.push(`  link-${i}:`, `    title: Link ${i} fails`, `    any: [part-${i}, ${next}]`);
  }
  events.push(...demandEvent(`part-${depth + 1}`, 'Last part of the chain fails', '1e-7'));
  return writeStudy(dir, { title: `Chain of ${depth} gates (invented)`, events, logic, samples: 50 });
}

/** One OR gate of `inputs` basic events. */
export function writeWideStudy(dir: string, inputs: number): string {
  const events: string[] = [];
  for (let i = 1; i <= inputs; i++) events.push(...demandEvent(`input-${i}`, `Input ${i} of the wide gate fails`, '1e-6'));
  const ids = Array.from({ length: inputs }, (_, i) => `input-${i + 1}`);
  const logic = ['tops:', '  wide-top:', '    title: Any of many inputs fails (invented)', '    gate: wide-or', 'gates:', '  wide-or:', '    title: Any input fails', `    any: [${ids.join(', ')}]`];
  return writeStudy(dir, { title: `One OR gate of ${inputs} inputs (invented)`, events, logic, samples: 50 });
}

/**
 * Titles that markup gives a meaning to: a quoted `name="value"` part long enough to wrap across
 * the lines of a diagram box, `<`, `>`, `&`, `=`, apostrophes and non-ASCII letters.
 */
export const MARKUP_TITLES = {
  top: 'Gate stays shut in mode="automatic standby" while the <flood> & debris rise — Überlauf',
  gate: 'Control in mode="automatic standby" & "manual override" both fail',
  first: 'Selector left in mode="automatic standby" (position <A> & <B>)',
  second: "Operator's panel shows a=b & c<d>e — Ω ≥ 5 °C, naïve café",
  third: 'Valve "V-7" reads mode="closed" > 90 % & < 100 %',
} as const;

export function writeMarkupTitleStudy(dir: string): string {
  const t = MARKUP_TITLES;
  const events = [...demandEvent('selector-wrong', t.first, '2e-3'), ...demandEvent('panel-misreads', t.second, '3e-3'), ...demandEvent('valve-misreads', t.third, '4e-3')];
  const logic = [
    'tops:',
    '  gate-shut:',
    `    title: ${JSON.stringify(t.top)}`,
    '    gate: control-lost',
    'gates:',
    '  control-lost:',
    `    title: ${JSON.stringify(t.gate)}`,
    '    any: [selector-wrong, both-misread]',
    '  both-misread:',
    '    title: "Both <readings> are wrong & nobody notices \\"it\\""',
    '    all: [panel-misreads, valve-misreads]',
  ];
  return writeStudy(dir, { title: 'Titles with markup characters (invented)', events, logic });
}

/**
 * The same chain as `writeChainStudy`, as `Results` (for the report alone, without the analysis):
 * placeholder probabilities, not computed; the tests using it check the drawing, not numbers.
 */
export function chainResults(depth: number): Results {
  const r = fixtureResults();
  const events: EventResult[] = [];
  const gates: Results['logic']['gates'] = [];
  const event = (id: string) => events.push({ id, title: `Part ${id} fails`, model: 'fixed', probability: 1e-7, parameters: { probability: 1e-7 }, parameter_keys: {}, assumptions: [] });
  for (let i = 1; i <= depth; i++) {
    event(`part-${i}`);
    gates.push({ id: `link-${i}`, title: `Link ${i} fails`, op: 'any', inputs: [`part-${i}`, i === depth ? `part-${depth + 1}` : `link-${i + 1}`] });
  }
  event(`part-${depth + 1}`);
  r.logic = { tops: [{ id: 'chain-top', title: 'The end of a long chain fails (invented)', gate: 'link-1' }], gates };
  r.events = events;
  r.parameters = [];
  r.assumptions = [];
  r.tops = [{ ...r.tops[0]!, id: 'chain-top', title: 'The end of a long chain fails (invented)', gate: 'link-1', gate_probabilities: {}, cut_sets: [], cut_set_summary: { listed: 0, truncated: 0, cutoff: 1e-12, max_order: 4, coherent: true } }];
  r.tops.length = 1;
  return r;
}
