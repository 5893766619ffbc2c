/** Seeded synthetic study folders for the benchmarks (invented structure and numbers). */
import { mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { syntheticTree } from './synthetic.js';

/** A study folder from the seeded synthetic tree (invented structure and numbers); the caller removes it. */
export function syntheticStudy(events: number): string {
  const tree = syntheticTree({ events, seed: 7 });
  const dir = mkdtempSync(join(tmpdir(), 'faultbook-bench-study-'));
  mkdirSync(dir, { recursive: true });
  writeFileSync(join(dir, 'study.yaml'), `format: faultbook/1\ntitle: Synthetic benchmark study (invented)\nfacility: none (invented)\nas_of: 2026-06-30\nsettings: { samples: 2000, horizon: 5 }\n`);
  writeFileSync(join(dir, 'sources.yaml'), 'sources:\n  synthetic: { title: Seeded synthetic values (invented), invented: true }\n');
  const ev = tree.graph.variables.map((id, i) => `  ${id}: { title: Synthetic event ${i}, model: fixed, probability: { value: ${tree.p[i]!.toPrecision(6)}, source: synthetic } }`);
  writeFileSync(join(dir, 'events.yaml'), `events:\n${ev.join('\n')}\n`);
  const ref = (r: { kind: string; index?: number; value?: boolean }) => (r.kind === 'var' ? tree.graph.variables[r.index!] : tree.graph.gates[r.index!]!.id);
  const gates = tree.graph.gates.map((g) => {
    const inputs = `[${g.inputs.map(ref).join(', ')}]`;
    const body = g.op === 'or' ? `any: ${inputs}` : g.op === 'and' ? `all: ${inputs}` : g.op === 'atleast' ? `atleast: ${g.k}, of: ${inputs}` : `not: ${ref(g.inputs[0]!)}`;
    return `  ${g.id}: { ${body} }`;
  });
  writeFileSync(join(dir, 'logic.yaml'), `tops:\n  top: { title: Synthetic top event, gate: ${tree.graph.gates[tree.top]!.id} }\ngates:\n${gates.join('\n')}\n`);
  return dir;
}

