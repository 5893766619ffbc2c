/**
 * Small studies written to a temporary folder for the review tests. Everything here is INVENTED
 * (the "Little Fen sluice", its people, sources and numbers); no real facility or data.
 *
 * The base study uses fixed probabilities only, so every top-event probability has a closed form
 * for independent events (common practice, no source):
 *   gate-fails   = OR(motor, brake, no-power)  → 1 − (1 − pm)(1 − pb)(1 − pu·pg)
 *   no-power-top = AND(utility, generator)     → pu·pg
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { tempDir } from '../cli/helpers.js';

export interface StudyParts {
  revision?: string;
  asOf?: string;
  issued?: string;
  /** events.yaml body. */
  events?: string;
  /** logic.yaml body. */
  logic?: string;
  sources?: string;
  assumptions?: string;
}

export const P = { motor: 2e-3, brake: 1e-3, utility: 0.02, generator: 5e-3 };

export const BASE_EVENTS = `# INVENTED numbers for a test study.
events:
  motor:
    title: Sluice hoist motor fails to start
    model: fixed
    probability: { value: ${P.motor}, source: fen-notes, note: "page 1" }
  brake:
    title: Sluice hoist brake fails to release
    model: fixed
    probability: { value: ${P.brake}, source: fen-notes, note: "page 2" }
  utility:
    title: Utility supply lost
    model: fixed
    probability: { value: ${P.utility}, source: fen-notes }
  generator:
    title: Standby generator fails
    model: fixed
    probability: { value: ${P.generator}, source: fen-notes }
`;

export const BASE_LOGIC = `# INVENTED logic for a test study.
tops:
  gate-fails:
    title: The sluice gate does not open
    gate: gate-fails-to-open
  no-power-top:
    title: No power at the sluice
    gate: no-power
gates:
  gate-fails-to-open:
    title: Gate fails to open
    any: [motor, brake, no-power]
  no-power:
    title: Utility and standby both lost
    all: [utility, generator]
`;

export const BASE_SOURCES = `sources:
  fen-notes:
    title: Little Fen sluice maintenance notes (invented)
    invented: true
  fen-survey:
    title: Little Fen hoist survey (invented)
    invented: true
`;

export function writeStudy(parts: StudyParts = {}, dir = join(tempDir('faultbook-review-'), 'study')): string {
  mkdirSync(dir, { recursive: true });
  writeFileSync(
    join(dir, 'study.yaml'),
    `# INVENTED test study: the Little Fen sluice does not exist.
format: faultbook/1
title: Little Fen sluice gate study (invented)
facility: Little Fen sluice (invented)
revision: ${parts.revision ?? 'A'}
status: draft
issued: ${parts.issued ?? '2026-02-01'}
prepared_by: [T. Tester (invented)]
reviewed_by: []
as_of: ${parts.asOf ?? '2026-01-01'}
settings: { cutoff: 1e-15, max_order: 4, samples: 200, seed: 7, horizon: 5 }
`,
  );
  writeFileSync(join(dir, 'events.yaml'), parts.events ?? BASE_EVENTS);
  writeFileSync(join(dir, 'logic.yaml'), parts.logic ?? BASE_LOGIC);
  writeFileSync(join(dir, 'sources.yaml'), parts.sources ?? BASE_SOURCES);
  writeFileSync(join(dir, 'assumptions.md'), parts.assumptions ?? '# Assumptions (invented)\n\n## A1 Independence\nAll events are independent.\n');
  return dir;
}

/** The closed forms of the base study's tops for given event probabilities. */
export function baseTops(p: typeof P): { 'gate-fails': number; 'no-power-top': number } {
  return { 'gate-fails': 1 - (1 - p.motor) * (1 - p.brake) * (1 - p.utility * p.generator), 'no-power-top': p.utility * p.generator };
}
