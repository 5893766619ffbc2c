/**
 * Writes a study of the "many gates" family for measuring the appendix of a large study (INVENTED
 * structure and numbers; no real facility): M gate subsystems, each failing through its own hoist
 * (two trains of four parts, both trains needed to fail), its local control (a panel or a sensor,
 * or the shared controller its block of 20 gates hangs on), or its power (at least two of the three
 * site feeds lost AND both site generators failed: one of two is enough); or it jams. The top
 * event is "at least K of the M gates fail".
 *
 *   npx tsx bench/gate-family-study.ts M K DIR [max_nodes]
 *
 * then e.g. `time node bin/faultbook.js run DIR --out OUT` (all formats).
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { seededRandom } from './synthetic.js';

export function writeGateFamilyStudy(dir: string, m: number, k: number, maxNodes?: number): void {
  const rnd = seededRandom(20261204);
  const p = () => (1e-4 * Math.pow(100, rnd())).toPrecision(3);
  const feeds = 3;
  const generators = 2;
  const controllers = Math.max(2, Math.ceil(m / 20));
  const events: string[] = ['events:'];
  const event = (id: string, title: string) =>
    events.push(`  ${id}:`, `    title: ${title}`, '    model: demand', `    probability: { value: ${p()}, source: family-values }`);
  for (let f = 1; f <= feeds; f++) event(`feed-${f}`, `Supply feed ${f} lost`);
  for (let g = 1; g <= generators; g++) event(`generator-${g}`, `Standby generator ${g} fails`);
  for (let c = 1; c <= controllers; c++) event(`controller-${c}`, `Shared controller ${c} fails`);
  const gates: string[] = ['gates:'];
  const gate = (id: string, title: string, logic: string) => gates.push(`  ${id}:`, `    title: ${title}`, `    ${logic}`);
  const subsystems: string[] = [];
  for (let i = 1; i <= m; i++) {
    const s = `g${i}`;
    for (const train of ['a', 'b']) {
      const parts = ['motor', 'brake', 'gearbox', 'rope'].map((part) => `${s}-${train}-${part}`);
      parts.forEach((id, j) => event(id, `Gate ${i} train ${train} ${['motor', 'brake', 'gearbox', 'rope'][j]} fails`));
      gate(`${s}-train-${train}`, `Gate ${i} hoist train ${train} fails`, `any: [${parts.join(', ')}]`);
    }
    event(`${s}-panel`, `Gate ${i} local panel fails`);
    event(`${s}-sensor`, `Gate ${i} position sensor fails`);
    event(`${s}-jam`, `Gate ${i} jams in its guides`);
    gate(`${s}-hoist`, `Gate ${i} hoist fails (both trains)`, `all: [${s}-train-a, ${s}-train-b]`);
    gate(`${s}-control`, `Gate ${i} control fails`, `any: [${s}-panel, ${s}-sensor, controller-${1 + Math.floor((i - 1) / 20)}]`);
    const f = [1, 2, 3].map((d) => `feed-${d}`);
    const g = [1, 2].map((d) => `generator-${d}`);
    gate(`${s}-feeds`, `Two of gate ${i}'s three feeds lost`, `atleast: 2\n    of: [${f.join(', ')}]`);
    gate(`${s}-standby`, `Gate ${i}'s generators both fail`, `all: [${g.join(', ')}]`);
    gate(`${s}-power`, `No power at gate ${i}`, `all: [${s}-feeds, ${s}-standby]`);
    gate(`${s}-fails`, `Gate ${i} fails to open`, `any: [${s}-hoist, ${s}-control, ${s}-power, ${s}-jam]`);
    subsystems.push(`${s}-fails`);
  }
  gate('gates-short', `At least ${k} of ${m} gates fail`, `atleast: ${k}\n    of: [${subsystems.join(', ')}]`);
  mkdirSync(dir, { recursive: true });
  writeFileSync(
    join(dir, 'study.yaml'),
    [
      'format: faultbook/1',
      `title: Gate family ${m}/${k} (invented, for measuring)`,
      'facility: Many-gate spillway (invented)',
      'revision: A',
      'status: draft',
      'prepared_by: [Benchmark]',
      'reviewed_by: []',
      'as_of: 2026-06-30',
      'scope: |',
      '  An invented model family used to measure a large appendix.',
      'description: |',
      '  Invented: no real facility.',
      `settings: { cutoff: 1e-12, max_order: 4, samples: 2000, seed: 1${maxNodes ? `, max_nodes: ${maxNodes}` : ''} }`,
      '',
    ].join('\n'),
  );
  writeFileSync(join(dir, 'events.yaml'), events.join('\n') + '\n');
  writeFileSync(join(dir, 'logic.yaml'), ['tops:', '  gates-short:', `    title: At least ${k} of the ${m} gates fail to open`, '    gate: gates-short', ...gates, ''].join('\n'));
  writeFileSync(join(dir, 'sources.yaml'), 'sources:\n  family-values:\n    title: Values invented for a benchmark\n    invented: true\n');
}

if (process.argv[1]?.endsWith('gate-family-study.ts')) {
  const [m, k, dir, maxNodes] = process.argv.slice(2);
  if (!m || !k || !dir) {
    console.error('usage: npx tsx bench/gate-family-study.ts M K DIR [max_nodes]');
    process.exit(2);
  }
  writeGateFamilyStudy(dir, Number(m), Number(k), maxNodes ? Number(maxNodes) : undefined);
}
