// Shared causes at growing size: n gates, each failing from shared station power, a shared
// controller, or its own hoist motor, the n motors in one beta-factor group (and, for n ≤ 6, an
// alpha-factor group of 2^n − 1 events instead); one count of the n gates and a two-range event tree
// asking "at least k of n fail". Prints the time of the read, the analysis and the decision-diagram
// sizes; never fails on a timing. All numbers INVENTED. Run: node bench/run.js shared-causes
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { analyze } from '../src/analysis/analyze.js';
import { readStudy } from '../src/study/read.js';

function studyText(n: number, method: 'beta' | 'alpha'): Record<string, string> {
  const gates = Array.from({ length: n }, (_, i) => `  gate-${i + 1}: { any: [power, controller, motor-${i + 1}, brake-${i + 1}] }`);
  const ids = Array.from({ length: n }, (_, i) => `gate-${i + 1}`).join(', ');
  const motors = Array.from({ length: n }, (_, i) => `motor-${i + 1}`).join(', ');
  const group =
    method === 'beta'
      ? `method: beta, beta: 0.05`
      : `method: alpha, ${Array.from({ length: n }, (_, i) => `alpha${i + 1}: ${i === 0 ? 1 - 0.02 * (n - 1) : 0.02}`).join(', ')}`;
  return {
    'study.yaml': `format: faultbook/1\ntitle: Bench (invented)\nas_of: 2026-06-30\nsettings: { samples: 0, horizon: 0, max_order: 3, cutoff: 1e-9, max_nodes: 20000000 }\n`,
    'events.yaml': `events:\n  power: { model: fixed, probability: 1e-3 }\n  controller: { model: fixed, probability: 5e-4 }\n${Array.from(
      { length: n },
      (_, i) => `  motor-${i + 1}: { model: fixed, probability: ${(1 + i / n) * 1e-3} }\n  brake-${i + 1}: { model: fixed, probability: 2e-3 }`,
    ).join('\n')}\n`,
    'logic.yaml': `tops:\n  short: { title: Half the gates fail, gate: half }\ngates:\n  half: { atleast: ${Math.ceil(n / 2)}, of: [${ids}] }\n${gates.join('\n')}\ncommon_cause:\n  motors: { members: [${motors}], ${group} }\ncounts:\n  stuck: { of: [${ids}] }\nevent_trees:\n  flood:\n    load: { ranges: { small: { aep: [0.1, 0.01] }, large: { aep: [0.01, 0.0001] } } }\n    headings:\n      enough: { fails: { atleast: { small: ${n}, large: ${Math.ceil(n / 2)} }, of: stuck } }\n      holds: { fails: { probability: 0.2 } }\n    outcomes: { safe: {}, wet: {}, breach: {} }\n    sequences:\n      - { when: { enough: works }, outcome: safe }\n      - { when: { enough: fails, holds: works }, outcome: wet }\n      - { when: { enough: fails, holds: fails }, outcome: breach }\n`,
  };
}

function measure(n: number, method: 'beta' | 'alpha'): void {
  const dir = mkdtempSync(join(tmpdir(), 'faultbook-bench-ccf-'));
  for (const [name, text] of Object.entries(studyText(n, method))) writeFileSync(join(dir, name), text);
  const t0 = performance.now();
  const study = readStudy(dir);
  const t1 = performance.now();
  const results = analyze(study);
  const t2 = performance.now();
  const c = results.gate_counts![0]!;
  const shared = results.common_cause![0]!.shared.length;
  console.log(
    `${method.padEnd(5)} n=${String(n).padStart(2)}  shared events ${String(shared).padStart(3)}  read ${(t1 - t0).toFixed(0).padStart(5)} ms  analyse ${(t2 - t1).toFixed(0).padStart(6)} ms  ` +
      `top nodes ${String(results.tops[0]!.bdd_nodes).padStart(7)}  count nodes ${String(c.bdd_nodes).padStart(7)}  P(all n) exact ${c.exact[n]!.toExponential(3)} vs independent ${c.independent[n]!.toExponential(3)}`,
  );
}

for (const n of [4, 8, 16, 24, 32]) measure(n, 'beta');
for (const n of [3, 4, 5, 6]) measure(n, 'alpha');
