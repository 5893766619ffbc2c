/**
 * Studies too big or too odd for the committed corpus, made on demand from the corpus's valid
 * study (an invented two-pump station; every number and name here is invented too). Used by
 * hostile-inputs.test.ts and by `npx tsx scripts/hostile-measure.ts`, which times each case.
 */
import { cpSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

export const VALID = join(dirname(fileURLToPath(import.meta.url)), '..', 'fixtures', 'hardening', 'valid-study');

/** A fresh copy of the valid study in a temporary folder (the caller removes `dirname(study)`). */
export function validCopy(prefix = 'faultbook-hostile-'): string {
  const base = mkdtempSync(join(tmpdir(), prefix));
  const study = join(base, 'study');
  cpSync(VALID, study, { recursive: true });
  return study;
}

const edit = (study: string, file: string, fn: (text: string) => string) => writeFileSync(join(study, file), fn(readFileSync(join(study, file), 'utf8')));

export type HostileCase = (study: string) => void;

export const HOSTILE_CASES: Record<string, HostileCase> = {
  /** Four redundant trains of 100 parts each, p = 2e-3: 10^8 minimal cut sets above the default cutoff. */
  'four-trains': (study) => {
    const events: string[] = ['events:'];
    const gates: string[] = ['gates:', '  all-trains-fail: { all: [train-1, train-2, train-3, train-4] }'];
    for (let t = 1; t <= 4; t++) {
      const parts = Array.from({ length: 100 }, (_, i) => `t${t}-part-${i + 1}`);
      gates.push(`  train-${t}: { any: [${parts.join(', ')}] }`);
      for (const p of parts) events.push(`  ${p}: { title: Invented part ${p}, model: fixed, probability: { value: 2e-3, source: invented-survey } }`);
    }
    writeFileSync(join(study, 'events.yaml'), events.join('\n') + '\n');
    writeFileSync(join(study, 'logic.yaml'), `tops:\n  all-trains: { title: All four trains fail (invented), gate: all-trains-fail }\n${gates.join('\n')}\n`);
    edit(study, 'study.yaml', (t) => t.replace(/settings: .*/, 'settings: { samples: 0, horizon: 0 }'));
  },
  /** One 20,000-character word in an event title, in the scope and in an assumption. */
  'long-word': (study) => {
    const word = 'x'.repeat(20_000);
    edit(study, 'events.yaml', (t) => t.replace('Motor A fails to start', `Motor A ${word}`));
    edit(study, 'assumptions.md', (t) => `${t}\nSee ${word} here.\n`);
  },
  /** 40,000 tiny Markdown fragments (emphasis, code, links) in one assumption. */
  'markdown-fragments': (study) => {
    const frag = Array.from({ length: 10_000 }, (_, i) => `*a${i}* \`c\` **b** [l](https://example.invalid/${i})`).join(' ');
    edit(study, 'assumptions.md', (t) => `${t}\n${frag}\n`);
  },
  /** As many fragments as fit the Markdown limit (128 KiB): bounded time, styling kept for the first 1,000 pieces. */
  'markdown-fragments-fit': (study) => {
    const frag = Array.from({ length: 2_500 }, (_, i) => `*a${i}* \`c\` **b** [l](https://example.invalid/${i})`).join(' ');
    edit(study, 'assumptions.md', (t) => `${t}\n${frag}\n`);
  },
  /** 20,000 numbered assumptions. */
  'many-assumptions': (study) => {
    const more = Array.from({ length: 20_000 }, (_, i) => `## A${i + 2} Invented assumption ${i + 2}\nInvented text of assumption ${i + 2}.\n`).join('\n');
    edit(study, 'assumptions.md', (t) => `${t}\n${more}`);
  },
  /** 500 short assumptions, the most a study may number. */
  'most-assumptions': (study) => {
    const more = Array.from({ length: 499 }, (_, i) => `## A${i + 2} Invented assumption ${i + 2}\nInvented text.\n`).join('\n');
    edit(study, 'assumptions.md', (t) => `${t}\n${more}`);
  },
  /** 2,000 top events over the same gate. */
  'many-tops': (study) => {
    const tops = Array.from({ length: 2_000 }, (_, i) => `  top-${i + 1}: { title: Invented top ${i + 1}, gate: both-pumps-fail }`).join('\n');
    edit(study, 'logic.yaml', (t) => t.replace(/tops:\n.*\n/, `tops:\n${tops}\n`));
  },
  /** 50 top events, the most an appendix takes. */
  'fifty-tops': (study) => {
    const tops = Array.from({ length: 50 }, (_, i) => `  top-${i + 1}: { title: Invented top ${i + 1}, gate: both-pumps-fail }`).join('\n');
    edit(study, 'logic.yaml', (t) => t.replace(/tops:\n.*\n/, `tops:\n${tops}\n`));
  },
  /** A list nested 200 levels deep in the assumptions. */
  'nested-list': (study) => {
    edit(study, 'assumptions.md', (t) => `${t}\n${Array.from({ length: 200 }, (_, i) => `${'  '.repeat(i)}- level ${i}`).join('\n')}\n`);
  },
};
